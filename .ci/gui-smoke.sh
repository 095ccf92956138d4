#!/usr/bin/env bash
# Starts the binary (the one `cargo test` built, or $GUI_SMOKE_BIN) under Xvfb with Mesa's software OpenGL, waits for
# its window, checks it stays up, closes it with Ctrl+Q and fails on a crash.
set -euo pipefail
cd "$(dirname "$0")/.."
bin=${GUI_SMOKE_BIN:-target/debug/gradewright}
display=:97
work=$(mktemp -d)
trap 'kill "${xvfb_pid:-0}" "${app_pid:-0}" 2>/dev/null || true; rm -rf "$work"' EXIT

Xvfb "$display" -screen 0 1600x1000x24 -nolisten tcp >"$work/xvfb.log" 2>&1 &
xvfb_pid=$!
sleep 1
mkdir -m 700 "$work/xdg"
DISPLAY=$display XDG_RUNTIME_DIR="$work/xdg" GRADEWRIGHT_CONFIG_DIR="$work/config" LIBGL_ALWAYS_SOFTWARE=1 \
  "$bin" >"$work/app.log" 2>&1 &
app_pid=$!

window=""
for _ in $(seq 1 60); do
  if ! kill -0 "$app_pid" 2>/dev/null; then
    echo "gui-smoke: the app exited before its window appeared"; cat "$work/app.log"; exit 1
  fi
  window=$(DISPLAY=$display xdotool search --name "Gradewright" 2>/dev/null | head -n 1 || true)
  [ -n "$window" ] && break
  sleep 1
done
[ -n "$window" ] || { echo "gui-smoke: no window after 60 s"; cat "$work/app.log"; exit 1; }
echo "gui-smoke: window $window is up"
sleep 3
kill -0 "$app_pid" 2>/dev/null || { echo "gui-smoke: the app crashed"; cat "$work/app.log"; exit 1; }
if [ -n "${GUI_SMOKE_SCREENSHOT:-}" ]; then
  DISPLAY=$display import -window root "$GUI_SMOKE_SCREENSHOT"
fi
# No window manager runs here: give the window the keyboard focus, then press
# Ctrl+Q through XTEST as a user would.
DISPLAY=$display xdotool windowfocus --sync "$window" 2>/dev/null || true
sleep 0.5
DISPLAY=$display xdotool key ctrl+q
for _ in $(seq 1 20); do
  kill -0 "$app_pid" 2>/dev/null || break
  sleep 0.5
done
if kill -0 "$app_pid" 2>/dev/null; then
  echo "gui-smoke: the app did not close on Ctrl+Q"; cat "$work/app.log"; exit 1
fi
wait "$app_pid" && status=0 || status=$?
[ "$status" -eq 0 ] || { echo "gui-smoke: exit status $status"; cat "$work/app.log"; exit 1; }
echo "gui-smoke: ok (window opened, stayed up, closed cleanly)"
