#!/usr/bin/env python3
"""Writes the synthetic rolling profile of the benchmarks as a PVI table (CSV).

The same profile as `gradewright_geometry::synthetic::rolling_profile`: PVIs
spread evenly over LENGTH, grades alternating up and down between about 1 %
and 4 % (a fixed xorshift sequence), a symmetric curve at every interior PVI
filling 60 % of the spacing. Not design data.

usage: make_profile.py PVIS LENGTH OUT.csv
"""
import sys

MASK = (1 << 64) - 1


def rolling_profile(pvis, length):
    n = max(pvis, 2)
    spacing = length / (n - 1)
    state = 0x9E3779B97F4A7C15
    rows = []
    elevation = 100.0
    for i in range(n):
        station = i * spacing
        curve = 0.6 * spacing if 0 < i < n - 1 else 0.0
        rows.append((station, elevation, curve))
        state ^= (state << 13) & MASK
        state ^= state >> 7
        state ^= (state << 17) & MASK
        unit = (state >> 11) / float(1 << 53)
        sign = 1.0 if i % 2 == 0 else -1.0
        elevation += sign * (1.0 + 3.0 * unit) / 100.0 * spacing
    return rows


def main():
    if len(sys.argv) != 4:
        sys.exit(__doc__)
    pvis, length, out = int(sys.argv[1]), float(sys.argv[2]), sys.argv[3]
    with open(out, "w", encoding="utf-8") as f:
        f.write("station,elevation,curve_length\n")
        for station, elevation, curve in rolling_profile(pvis, length):
            f.write(f"{station!r},{elevation!r},{curve!r}\n")


if __name__ == "__main__":
    main()
