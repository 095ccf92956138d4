#!/usr/bin/env python3
"""Runs every output-producing command of a `gradewright` binary on the
demo projects and the benchmark profiles, and writes what each printed
(standard output, standard error, exit status, and every file it wrote)
into one folder. Two builds are then compared with `diff -r`:

    cargo build --release && cp target/release/gradewright /tmp/gw-before
    ... change the code ...
    cargo build --release
    python3 tests/outputs/snapshot.py /tmp/gw-before /tmp/out-before
    python3 tests/outputs/snapshot.py target/release/gradewright /tmp/out-after
    diff -r /tmp/out-before /tmp/out-after && echo byte-identical

or in one go: `python3 tests/outputs/snapshot.py --compare OLD_BIN NEW_BIN`.

The only things normalised are the date and time a LandXML file is stamped
with (the schema requires them), the temporary folder's name, and the PDF,
compared as its pages read and look (pdftotext, pdftoppm: Debian's
poppler-utils); everything else is compared byte for byte.
The inputs are written fresh into a temporary folder: the demo files from
`assets/`, the benchmarks' rolling profiles (`crates/app/benches/whole/
make_profile.py`), one with a synthetic ground line, control points and a
section, and LandXML exports read back.
"""
import filecmp
import os
import re
import shutil
import subprocess
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.abspath(os.path.join(HERE, "..", ".."))
MAKE = os.path.join(ROOT, "crates", "app", "benches", "whole", "make_profile.py")
STAMP = re.compile(rb'(<LandXML[^>]*?) date="[^"]*" time="[^"]*"')


def inputs(folder):
    """The input files, by name."""
    files = {}
    for name in ["alder-brook-road.ron", "cedar-hollow-lane.csv"]:
        shutil.copy(os.path.join(ROOT, "assets", name), os.path.join(folder, name))
        files[name] = os.path.join(folder, name)
    for pvis, length in [(200, 20_000.0), (1001, 20_000.0), (2001, 40_000.0)]:
        path = os.path.join(folder, f"rolling-{pvis}.csv")
        subprocess.run([sys.executable, MAKE, str(pvis), str(length), path], check=True)
        files[f"rolling-{pvis}"] = path
    # A site: ground along the rolling profile, controls and an undercrossing.
    ground = os.path.join(folder, "ground.csv")
    with open(ground, "w", encoding="utf-8") as f:
        f.write("station,elevation\n")
        import math

        for i in range(4001):
            s = 5.0 * i
            f.write(f"{s:.3f},{100.0 + 6.0 * math.sin(s / 900.0) + 0.3 * math.sin(s / 37.0):.3f}\n")
    controls = os.path.join(folder, "controls.csv")
    with open(controls, "w", encoding="utf-8") as f:
        f.write("station,kind,elevation,tolerance,name,clearance\n")
        f.write("0,fixed,100.0,0.02,Tie-in west,\n")
        f.write("2450,min,103.5,,Culvert,\n")
        f.write("5050,max,140,,Rail bridge,5.2\n")
        f.write("9999,max,98,,Overhead line,\n")
        f.write("25000,min,1,,Off the road,\n")
    files["ground.csv"] = ground
    files["controls.csv"] = controls
    # The demo with other criteria: grade-adjusted SSD, a lit road with the
    # comfort check, and overrides (the general formulas).
    demo = open(os.path.join(ROOT, "assets", "alder-brook-road.ron"), encoding="utf-8").read()
    for name, extra in [
        ("graded.ron", "grade_adjusted_ssd: true,"),
        ("lit.ron", "headlight_check: false, sag_comfort: true,"),
        ("overridden.ron", "eye_height: Override(1.2), sag_k: Override(28.0), max_bare_break: Override(0.2),"),
    ]:
        path = os.path.join(folder, name)
        with open(path, "w", encoding="utf-8") as f:
            f.write(demo.replace("terrain: Rolling,", "terrain: Rolling, " + extra, 1))
        files[name] = path
    return files


def run(binary, args, out, name, cwd):
    """Runs one command and keeps what it printed and its status."""
    done = subprocess.run([binary, *args], cwd=cwd, capture_output=True, env={**os.environ, "RUST_BACKTRACE": "0"})
    with open(os.path.join(out, f"{name}.stdout"), "wb") as f:
        f.write(done.stdout.replace(cwd.encode(), b"<work>"))
    with open(os.path.join(out, f"{name}.stderr"), "wb") as f:
        f.write(done.stderr.replace(cwd.encode(), b"<work>"))
    with open(os.path.join(out, f"{name}.status"), "w", encoding="utf-8") as f:
        f.write(f"{done.returncode}\n")


def keep(work, out, name, produced):
    """Moves the files a command wrote into the snapshot (LandXML stamps
    normalised)."""
    for rel in produced:
        src = os.path.join(work, rel)
        if os.path.isdir(src):
            for entry in sorted(os.listdir(src)):
                keep(work, out, name, [os.path.join(rel, entry)])
            continue
        if not os.path.exists(src):
            continue
        with open(src, "rb") as f:
            data = f.read()
        if rel.endswith(".xml"):
            data = STAMP.sub(rb'\1 date="D" time="T"', data)
        if rel.endswith(".pdf"):
            data = pdf_pages(src)
        dest = os.path.join(out, f"{name}.{rel.replace(os.sep, '_')}")
        with open(dest, "wb") as f:
            f.write(data)


def pdf_pages(path):
    """A PDF as its pages look and read: the text of each page (pdftotext)
    and each page rasterised at 50 dpi (pdftoppm). The PDF's own bytes are
    not reproducible: the converter orders its resource dictionaries as a
    hash map does, differently on every run."""
    text = subprocess.run(["pdftotext", "-layout", path, "-"], capture_output=True, check=True).stdout
    with tempfile.TemporaryDirectory() as pages:
        subprocess.run(["pdftoppm", "-png", "-r", "50", path, os.path.join(pages, "p")], check=True)
        pictures = b"".join(open(os.path.join(pages, n), "rb").read() for n in sorted(os.listdir(pages)))
    return text + b"\n--- pages (PNG, 50 dpi) ---\n" + pictures


def snapshot(binary, out):
    os.makedirs(out, exist_ok=True)
    with tempfile.TemporaryDirectory() as work:
        # The binary under its own name: usage lines name it.
        os.makedirs(os.path.join(work, "bin"))
        shutil.copy(binary, os.path.join(work, "bin", "gradewright"))
        binary = os.path.join(work, "bin", "gradewright")
        f = inputs(work)
        metric = ["--units", "metric", "--design-speed", "90"]
        site = os.path.join(work, "site.ron")
        subprocess.run(
            [binary, "import", f["rolling-200"], *metric[:2], "--ground", f["ground.csv"], "--controls",
             f["controls.csv"], "-o", site],
            check=True, capture_output=True,
        )
        demo = f["alder-brook-road.ron"]
        cedar = [f["cedar-hollow-lane.csv"], "--units", "us", "--design-speed", "45"]
        runs = []
        # The demo and the US PVI table: every command.
        variants = [(n[:-4], [f[n]], [f[n]]) for n in ["graded.ron", "lit.ron", "overridden.ron"]]
        for tag, base, plain in [("demo", [demo], [demo]), ("cedar", cedar, cedar[:3]),
                                 ("site", [site, "--design-speed", "90"], [site])] + variants:
            runs += [
                (f"{tag}-table", ["table", *plain], []),
                (f"{tag}-table-20-3", ["table", *plain, "--interval", "20", "--decimals", "3"], []),
                (f"{tag}-check-text", ["check", *base], []),
                (f"{tag}-check-json", ["check", *base, "--format", "json"], []),
                (f"{tag}-sight", ["sight", *base], []),
                (f"{tag}-sight-5", ["sight", *base, "--step", "5"], []),
                (f"{tag}-fit-ron", ["fit", *base, "-o", f"{tag}-fit.ron"], [f"{tag}-fit.ron"]),
                (f"{tag}-fit-csv", ["fit", *base, "-o", f"{tag}-fit.csv"], [f"{tag}-fit.csv"]),
                (f"{tag}-fit-xml", ["fit", *base, "-o", f"{tag}-fit.xml"], [f"{tag}-fit.xml"]),
                (f"{tag}-fit-inc", ["fit", *base, "--increment", "1", "-o", f"{tag}-fit1.ron"], [f"{tag}-fit1.ron"]),
                (
                    f"{tag}-export",
                    ["export", *base, "--png", f"{tag}.png", "--svg", f"{tag}.svg", "--pdf", f"{tag}.pdf",
                     "--csv-dir", f"{tag}-csv", "--landxml", f"{tag}.xml", "--road", "Test road",
                     "--designer", "A", "--checker", "B", "--date", "2026-12-04", "--revision", "0",
                     "--dpi", "60"],
                    [f"{tag}.png", f"{tag}.svg", f"{tag}-1.svg", f"{tag}-2.svg", f"{tag}-3.svg", f"{tag}.pdf",
                     f"{tag}-csv", f"{tag}.xml"],
                ),
                (
                    f"{tag}-export-scaled",
                    ["export", *base, "--svg", f"{tag}-s.svg", "--h-scale", "1000", "--v-scale", "100",
                     "--sheet", "a3", "--overlap", "20", "--no-sight-band"],
                    [f"{tag}-s.svg"] + [f"{tag}-s-{k}.svg" for k in range(1, 40)],
                ),
            ]
        runs += [
            ("demo-earthwork", ["earthwork", demo, "--width", "10", "--cut-slope", "2", "--fill-slope", "3",
                                "--shrinkage", "10"], []),
            ("site-earthwork", ["earthwork", site, "--width", "12", "--cut-slope", "1.5", "--fill-slope", "2",
                                "--interval", "10"], []),
            ("demo-table-at", ["table", demo, "--at", "0+350", "--at", "1+100", "--at", "1999.5"], []),
            ("cedar-table-at", ["table", *cedar[:3], "--at", "14+00", "--at", "1720.5"], []),
        ]
        for name in ["rolling-200", "rolling-1001", "rolling-2001"]:
            base = [f[name], *metric]
            runs += [
                (f"{name}-table", ["table", *base[:3]], []),
                (f"{name}-check-json", ["check", *base, "--format", "json"], []),
                (f"{name}-check-text", ["check", *base], []),
                (f"{name}-sight", ["sight", *base], []),
                (f"{name}-fit", ["fit", *base, "-o", f"{name}-fit.csv"], [f"{name}-fit.csv"]),
                (f"{name}-export", ["export", *base, "--svg", f"{name}.svg", "--csv-dir", f"{name}-csv",
                                    "--landxml", f"{name}.xml"],
                 [f"{name}.svg", f"{name}-csv", f"{name}.xml"] + [f"{name}-{k}.svg" for k in range(1, 40)]),
            ]
        # LandXML read back: the demo's own export, and the site's.
        runs += [
            ("demo-landxml-out", ["export", demo, "--landxml", "demo-rt.xml"], ["demo-rt.xml"]),
            ("site-landxml-out", ["export", site, "--design-speed", "90", "--landxml", "site-rt.xml"],
             ["site-rt.xml"]),
        ]
        for name, args, produced in runs:
            run(binary, args, out, name, work)
            keep(work, out, name, produced)
        for tag, xml in [("demo-rt", "demo-rt.xml"), ("site-rt", "site-rt.xml")]:
            base = [os.path.join(work, xml), "--design-speed", "80"]
            for name, args, produced in [
                (f"{tag}-check-json", ["check", *base, "--format", "json"], []),
                (f"{tag}-table", ["table", base[0]], []),
                (f"{tag}-sight", ["sight", *base, "--step", "5"], []),
                (f"{tag}-fit", ["fit", *base, "-o", f"{tag}-fit.xml"], [f"{tag}-fit.xml"]),
                (f"{tag}-import", ["import", demo, "--ground", base[0], "-o", f"{tag}-imp.ron"], [f"{tag}-imp.ron"]),
            ]:
                run(binary, args, out, name, work)
                keep(work, out, name, produced)
    return out


def main():
    if len(sys.argv) == 4 and sys.argv[1] == "--compare":
        with tempfile.TemporaryDirectory() as tmp:
            a = snapshot(sys.argv[2], os.path.join(tmp, "before"))
            b = snapshot(sys.argv[3], os.path.join(tmp, "after"))
            names = sorted(set(os.listdir(a)) | set(os.listdir(b)))
            differ = [n for n in names if not (os.path.exists(os.path.join(a, n)) and os.path.exists(
                os.path.join(b, n)) and filecmp.cmp(os.path.join(a, n), os.path.join(b, n), shallow=False))]
            for n in differ:
                print(f"differs: {n}")
            print(f"{len(names)} outputs compared, {len(differ)} differ")
            sys.exit(1 if differ else 0)
    if len(sys.argv) != 3:
        sys.exit(__doc__)
    snapshot(sys.argv[1], sys.argv[2])
    print(f"{len(os.listdir(sys.argv[2]))} outputs in {sys.argv[2]}")


if __name__ == "__main__":
    main()
