#!/usr/bin/env python3
"""Whole-process timings, as a user runs the commands (output included),
side by side in one run: `gradewright sight` against the numpy peer
(`sight_peer.py`), `check` and `fit` at 10x sizes (is the time linear?),
and the peak memory of `table` and `sight` on a million PVIs.

Build first (`cargo build --release`), then:

    python3 crates/app/benches/whole/run.py [--quick]

The profiles are the benchmarks' synthetic rolling profile
(`make_profile.py`), written to a temporary directory. Each timing is the
median of several runs, the command and its peer alternating.
"""
import os
import statistics
import subprocess
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.abspath(os.path.join(HERE, "..", "..", "..", ".."))
BIN = os.path.join(ROOT, "target", "release", "gradewright")


def make(directory, pvis, length):
    path = os.path.join(directory, f"rolling-{pvis}-{int(length)}.csv")
    if not os.path.exists(path):
        subprocess.run([sys.executable, os.path.join(HERE, "make_profile.py"), str(pvis), str(length), path], check=True)
    return path


def once(args):
    """Wall time (s) and peak memory (MB) of one run, output discarded."""
    start = time.perf_counter()
    child = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    _, status, usage = os.wait4(child.pid, 0)
    wall = time.perf_counter() - start
    code = os.waitstatus_to_exitcode(status)
    if code not in (0, 1):
        sys.exit(f"{' '.join(args)}: exit status {code}")
    return wall, usage.ru_maxrss / 1024.0


def timed(commands, runs):
    """Median wall time and peak memory of each command, run alternately."""
    walls = [[] for _ in commands]
    peaks = [0.0 for _ in commands]
    for _ in range(runs):
        for i, args in enumerate(commands):
            wall, peak = once(args)
            walls[i].append(wall)
            peaks[i] = max(peaks[i], peak)
    return [(statistics.median(w), p) for w, p in zip(walls, peaks)]


def main():
    quick = "--quick" in sys.argv
    runs = 3 if quick else 7
    if not os.path.exists(BIN):
        sys.exit(f"{BIN}: build it first with cargo build --release")
    with tempfile.TemporaryDirectory() as tmp:
        speed = ["--units", "metric", "--design-speed", "90"]
        p200 = make(tmp, 200, 20_000.0)
        (ours, _), (peer, _) = timed(
            [
                [BIN, "sight", p200, *speed],
                [sys.executable, os.path.join(HERE, "sight_peer.py"), p200, "1", "480", "160"],
            ],
            runs,
        )
        print(f"sight, 20 km / 200 PVIs / 1 m, both directions: gradewright {ours * 1e3:.1f} ms, "
              f"numpy peer {peer * 1e3:.0f} ms ({peer / ours:.0f}x)")
        for label, sizes, step in [
            ("check, PVIs 100 m apart, 5 m sight step", [10_000, 100_000], "5"),
            ("check, PVIs 20 m apart, 1 m sight step", [10_000, 100_000], "1"),
        ]:
            spacing = 100.0 if "100 m" in label else 20.0
            results = timed(
                [[BIN, "check", make(tmp, n, spacing * (n - 1)), *speed, "--step", step] for n in sizes],
                1 if quick else 3,
            )
            (a, _), (b, _) = results
            print(f"{label}: {sizes[0]} PVIs {a:.2f} s, {sizes[1]} PVIs {b:.2f} s ({b / a:.1f}x the time)")
        out = os.path.join(tmp, "fitted.csv")
        results = timed(
            [[BIN, "fit", make(tmp, n, 100.0 * (n - 1)), *speed, "-o", out] for n in [1_000, 10_000]],
            1 if quick else 3,
        )
        (a, _), (b, _) = results
        print(f"fit, every curve failing, PVIs 100 m apart: 1000 PVIs {a:.2f} s, 10000 PVIs {b:.2f} s "
              f"({b / a:.1f}x the time)")
        million = make(tmp, 1_000_000, 9_000_000.0)
        (t_table, m_table), (t_sight, m_sight) = timed(
            [[BIN, "table", million, "--units", "metric"], [BIN, "sight", million, *speed, "--step", "5"]],
            1,
        )
        print(f"1,000,000 PVIs (9 m apart): table {t_table:.1f} s, peak {m_table:.0f} MB; "
              f"sight at a 5 m step {t_sight:.1f} s, peak {m_sight:.0f} MB")
        fitted = os.path.join(tmp, "fitted.xml")
        (t_check, m_check), (t_fit, m_fit) = timed(
            [[BIN, "check", million, *speed, "--step", "10"], [BIN, "fit", million, *speed, "--step", "10", "-o", fitted]],
            1,
        )
        print(f"1,000,000 PVIs, every curve failing: check at a 10 m step {t_check:.1f} s, peak {m_check:.0f} MB; "
              f"fit to LandXML {t_fit:.1f} s, peak {m_fit:.0f} MB")


if __name__ == "__main__":
    main()
