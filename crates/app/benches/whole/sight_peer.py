#!/usr/bin/env python3
"""The peer for `gradewright sight`: the brute-force scan a designer would
write with numpy, timed side by side with the command line by `run.py`.

It reads a PVI table (station,elevation,curve_length; symmetric curves,
metres), evaluates the profile on the station grid, and for every station,
both directions, marches the sight line over the grid ahead with a running
maximum of the road's angle from the eye (daylight: the object is hidden
once its angle falls below that maximum) and marches the headlight beam
until the road meets it. Stations are taken in blocks as 2-D arrays, so the
scan is vectorised. It writes the same CSV columns as `gradewright sight`
(the sight distances to the grid step, not exact).

usage: sight_peer.py PVI_CSV STEP CAP SSD > OUT.csv
"""
import sys

import numpy as np

EYE, OBJECT, LAMP, BEAM_DEG = 1.08, 0.60, 0.60, 1.0
BLOCK = 512


def read_pvis(path):
    data = np.loadtxt(path, delimiter=",", skiprows=1)
    return data[:, 0], data[:, 1], data[:, 2]


def evaluate(stations, elevations, lengths, x):
    """Elevation and decimal grade of the profile at x (sorted)."""
    grades = np.diff(elevations) / np.diff(stations)
    k = np.clip(np.searchsorted(stations, x, side="right") - 1, 0, len(grades) - 1)
    y = elevations[k] + grades[k] * (x - stations[k])
    g = grades[k].copy()
    for i in range(1, len(stations) - 1):
        half = lengths[i] / 2.0
        if half <= 0.0:
            continue
        lo, hi = np.searchsorted(x, [stations[i] - half, stations[i] + half])
        u = x[lo:hi] - (stations[i] - half)
        g1, g2 = grades[i - 1], grades[i]
        rate = (g2 - g1) / lengths[i]
        y[lo:hi] = elevations[i] - g1 * half + g1 * u + rate * u * u / 2.0
        g[lo:hi] = g1 + rate * u
    return y, g


def scan(y, g, step, cap):
    """Daylight and headlight distance ahead at every grid point (the road
    beyond the last point runs on at the last grade)."""
    n = len(y)
    ahead = int(round(cap / step))
    tail = y[-1] + g[-1] * step * np.arange(1, ahead + 1)
    road = np.concatenate([y, tail])
    t = step * np.arange(1, ahead + 1)
    tilt = np.tan(np.radians(BEAM_DEG))
    day = np.empty(n)
    lamp = np.empty(n)
    for a in range(0, n, BLOCK):
        b = min(a + BLOCK, n)
        idx = np.arange(a, b)[:, None] + np.arange(1, ahead + 1)[None, :]
        seen = road[idx]
        eye = y[a:b, None] + EYE
        angle = (seen - eye) / t
        highest = np.maximum.accumulate(angle, axis=1)
        hidden = (seen + OBJECT - eye)[:, 1:] / t[1:] < highest[:, :-1]
        first = np.where(hidden.any(axis=1), hidden.argmax(axis=1) + 1, ahead - 1)
        day[a:b] = t[first]
        beam = y[a:b, None] + LAMP + (g[a:b, None] + tilt) * t
        hit = seen >= beam
        first = np.where(hit.any(axis=1), hit.argmax(axis=1), ahead - 1)
        lamp[a:b] = t[first]
    return np.minimum(day, lamp)


def main():
    if len(sys.argv) != 5:
        sys.exit(__doc__)
    path, step, cap, ssd = sys.argv[1], float(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4])
    stations, elevations, lengths = read_pvis(path)
    x = np.arange(stations[0], stations[-1] + step / 2, step)
    y, g = evaluate(stations, elevations, lengths, x)
    forward = scan(y, g, step, cap)
    # Backward: the same scan on the road reversed, grades negated.
    backward = scan(y[::-1], -g[::-1], step, cap)[::-1]
    required = np.full(len(x), ssd)
    capped = np.where(forward >= cap, 1, 0) + np.where(backward >= cap, 2, 0)
    names = np.array(["none", "forward", "backward", "both"])[capped]
    out = sys.stdout
    out.write("station,available_forward,available_backward,required_forward,required_backward,reaches_cap\n")
    rows = np.column_stack([x, forward, backward, required, required])
    text = [",".join(f"{v:.6g}" for v in r) + "," + c for r, c in zip(rows, names)]
    out.write("\n".join(text) + "\n")


if __name__ == "__main__":
    main()
