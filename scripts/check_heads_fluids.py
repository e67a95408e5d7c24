#!/usr/bin/env python3
"""Check the head study of `knuckle heads --json` against the fluids library.

The open-source Python library `fluids` (Chemical Engineering Design Library,
module fluids.geometry) computes the depth, volume and surface area of formed
heads independently of Knuckle. This script reads a head-study JSON document

    {"diameter_mm": D, "rows": [{"shape": ..., "crown_radius": ...,
      "knuckle_radius": ..., "inside_depth": mm, "volume": m3,
      "inside_area": m2, ...}, ...]}

and compares inside_depth, volume and inside_area of every row with fluids to
a relative tolerance of 1e-6. It exits with status 0 when every value agrees,
1 on any mismatch and 2 when the input cannot be read.

Usage:
    check_heads_fluids.py STUDY.json        read the JSON from a file ('-' for stdin)
    check_heads_fluids.py --run CMD ARG...  run a command and read its standard output

Conventions of fluids (checked in its documentation and source): D is the
inside diameter of the cylinder; a is the head depth; f and k are the crown
(dish) and knuckle radii as fractions of that same inside D; the volume of a
head alone is the vertical-tank volume filled to h = a.
"""

import json
import subprocess
import sys

TOLERANCE = 1e-6


def load(argv):
    """Return the parsed study document named by the command line."""
    if len(argv) >= 2 and argv[1] == "--run":
        if len(argv) < 3:
            raise ValueError("--run needs a command to run")
        done = subprocess.run(argv[2:], capture_output=True, text=True)
        if done.returncode != 0:
            raise ValueError(
                f"command {' '.join(argv[2:])!r} failed with status {done.returncode}: {done.stderr.strip()}"
            )
        return json.loads(done.stdout)
    if len(argv) != 2:
        raise ValueError("give one JSON file ('-' for standard input) or --run CMD ARG...")
    if argv[1] == "-":
        return json.load(sys.stdin)
    with open(argv[1], encoding="utf-8") as fh:
        return json.load(fh)


def expected(g, diameter, row):
    """Depth (mm), volume (m3) and area (m2) of one row's head computed by fluids."""
    shape = row["shape"]
    L = row.get("crown_radius")
    r = row.get("knuckle_radius")
    if L is not None and r is not None:
        f, k = L / diameter, r / diameter
        a = g.a_torispherical(D=diameter, f=f, k=k)
        v = g.V_vertical_torispherical(D=diameter, f=f, k=k, h=a)
        s = g.SA_torispheroidal(D=diameter, f=f, k=k)
    elif shape == "2:1-ellipsoidal":
        a = diameter / 4.0
        v = g.V_vertical_ellipsoidal(D=diameter, a=a, h=a)
        s = g.SA_ellipsoidal_head(D=diameter, a=a)
    elif shape == "hemispherical":
        a = diameter / 2.0
        v = g.V_vertical_spherical(D=diameter, a=a, h=a)
        s = g.SA_ellipsoidal_head(D=diameter, a=a)
    else:
        raise ValueError(f"row with shape {shape!r} has no crown and knuckle radius and is not a known shape")
    return a, v * 1e-9, s * 1e-6


def main(argv):
    try:
        import fluids
        import fluids.geometry as g
    except ImportError:
        print("error: the Python package 'fluids' is not installed (pip install fluids)", file=sys.stderr)
        return 2
    try:
        doc = load(argv)
        diameter = float(doc["diameter_mm"])
        rows = doc["rows"]
    except (OSError, ValueError, KeyError, TypeError) as err:
        print(f"error: cannot read the head study: {err}", file=sys.stderr)
        return 2
    if not rows:
        print("error: the head study has no rows", file=sys.stderr)
        return 2
    failures = 0
    checked = 0
    print(f"fluids {fluids.__version__}, D = {diameter} mm, relative tolerance {TOLERANCE}")
    for row in rows:
        try:
            want = expected(g, diameter, row)
        except ValueError as err:
            print(f"MISMATCH {row.get('shape')!r}: {err}")
            failures += 1
            continue
        for name, w in zip(("inside_depth", "volume", "inside_area"), want):
            got = row.get(name)
            checked += 1
            if not isinstance(got, (int, float)):
                print(f"MISMATCH {row['shape']}: {name} is missing or not a number ({got!r})")
                failures += 1
                continue
            rel = abs(got - w) / abs(w)
            status = "ok" if rel <= TOLERANCE else "MISMATCH"
            if rel > TOLERANCE:
                failures += 1
            print(f"{status:8} {row['shape']:16} {name:13} knuckle {got:.10g}  fluids {w:.10g}  rel {rel:.1e}")
    print(f"{checked - failures} passed, {failures} failed")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
