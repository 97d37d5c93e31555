#!/usr/bin/env python3
"""Interop check: cube files written by ASE (ase.io.cube.write_cube) are read by
lobecast, and the numbers `lobecast inspect --json` reports agree with numpy on the
same data (as ASE's own reader reads it back). Also checks the gzip and ångström
variants and `lobecast combine` against numpy's difference of the two inputs.

Exit status 0 when every check passes; the first failure raises and prints why.
"""

import argparse
import gzip
import json
import subprocess
from pathlib import Path

import numpy as np
from ase import Atoms
from ase.io.cube import read_cube, write_cube
from ase.units import Bohr

FRACTION = 0.9
# lobecast converts ångström with CODATA 2018 (README); ASE's own Bohr may differ in
# the tenth digit, which matters only to the tight checks of the ångström variant.
BOHR_2018 = 0.529177210903


def inspect(lobecast, path, extra=()):
    out = subprocess.run(
        [lobecast, "inspect", str(path), "--json", "--enclose", str(FRACTION), *extra],
        check=True,
        capture_output=True,
        text=True,
    )
    return json.loads(out.stdout)


def header_axes(path):
    """The step vectors and counts exactly as printed in the file (bohr)."""
    opener = gzip.open if str(path).endswith(".gz") else open
    with opener(path, "rt") as f:
        lines = [f.readline() for _ in range(6)]
    counts, axes = [], []
    for line in lines[3:6]:
        t = line.split()
        counts.append(int(t[0]))
        axes.append([float(x) for x in t[1:4]])
    return counts, np.array(axes)


def level_by_sorting(values, signed, fraction):
    """The enclosed-fraction level from its definition (README): sort |f| from the
    largest; the level x* is where the running measure (|f|, or f² for a signed
    field) first reaches the fraction of the total. Returns x* and the next value."""
    mags = np.sort(np.abs(values).ravel())[::-1]
    w = mags**2 if signed else mags
    c = np.cumsum(w)
    i = int(np.searchsorted(c, fraction * c[-1]))
    return mags[i], mags[min(i + 1, len(mags) - 1)]


def close(what, got, want, rel, absolute=0.0):
    got, want = np.asarray(got, float), np.asarray(want, float)
    dev = np.max(np.abs(got - want))
    scale = max(np.max(np.abs(want)), 1e-300)
    ok = dev <= rel * scale + absolute
    print(f"  {what}: deviation {dev:.3e} (relative {dev / scale:.3e}) {'ok' if ok else 'FAIL'}")
    if not ok:
        raise SystemExit(f"check failed: {what}: lobecast {got} vs reference {want}")


def check_file(lobecast, path, atoms, origin_ang, data):
    """`data`: the values the file holds, as ASE's reader reads them."""
    print(f"{path.name}:")
    rep = inspect(lobecast, path)
    counts, axes = header_axes(path)
    n = data.shape
    if rep["points"] != list(n):
        raise SystemExit(f"points: {rep['points']} vs {list(n)}")
    print(f"  points {rep['points']} ok")
    unit = 1.0 if rep["length_unit_in_file"] == "bohr" else 1.0 / BOHR_2018
    # ASE writes origin/Bohr and cell[i]/n/Bohr with six decimals (ase/io/cube.py).
    close("origin (bohr)", rep["origin_bohr"], np.asarray(origin_ang) / Bohr, 0, 1e-6 * unit + 1e-9)
    close(
        "step vectors (bohr)",
        rep["axes_bohr"],
        np.array([atoms.cell[i] / n[i] / Bohr for i in range(3)]),
        0,
        1e-6 * unit + 1e-9,
    )
    close(
        "atom positions (bohr)",
        [a["position_bohr"] for a in rep["atoms"]],
        atoms.positions / Bohr,
        0,
        1e-6 * unit + 1e-9,
    )
    if [a["atomic_number"] for a in rep["atoms"]] != list(atoms.numbers):
        raise SystemExit("atomic numbers differ")
    dv_file = abs(np.linalg.det(axes * unit))
    dv_ase = abs(np.linalg.det(np.array(atoms.cell)) / np.prod(n)) / Bohr**3
    close("voxel volume vs the printed steps", rep["voxel_volume_bohr3"], dv_file, 1e-12)
    close("voxel volume vs ASE's cell", rep["voxel_volume_bohr3"], dv_ase, 2e-5)
    fld = rep["fields"][0]
    close("min", fld["min"], data.min(), 1e-12)
    close("max", fld["max"], data.max(), 1e-12)
    close("mean", fld["mean"], data.mean(), 1e-9)
    close("integral", fld["integral"], data.sum() * dv_file, 1e-9)
    close("integral of the square", fld["integral_squared"], (data**2).sum() * dv_file, 1e-9)
    signed = data.min() < -1e-6 * np.abs(data).max()
    if fld["signed"] != bool(signed):
        raise SystemExit(f"signed: {fld['signed']} vs {signed}")
    hi, lo = level_by_sorting(data, signed, FRACTION)
    t = fld["isovalue"]
    ok = lo * (1 - 1e-6) <= t <= hi * (1 + 1e-6)
    print(
        f"  isovalue {t:.6e} vs sorting {hi:.6e} (relative {abs(t / hi - 1):.2e}; "
        f"next value {lo:.6e}) {'ok' if ok else 'FAIL'}"
    )
    if not ok:
        raise SystemExit("check failed: isovalue")


def ase_read(path):
    with (gzip.open(path, "rt") if path.suffix == ".gz" else open(path)) as f:
        return read_cube(f)["data"]


def main():
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True)
    args = ap.parse_args()
    work = Path(args.workdir)
    work.mkdir(parents=True, exist_ok=True)

    # A water-like molecule (geometry from memory; any geometry serves) in an
    # orthogonal box and in a skewed cell.
    pos = np.array([[3.0, 3.5, 4.0], [3.76, 4.09, 4.0], [2.24, 4.09, 4.0]])
    cells = {
        "ortho": np.diag([6.0, 7.0, 8.0]),
        "skew": np.array([[6.0, 0.0, 0.0], [1.2, 6.5, 0.0], [0.4, -0.6, 7.5]]),
    }
    origin = np.array([0.15, -0.1, 0.05])
    for name, cell in cells.items():
        atoms = Atoms("OH2", positions=pos, cell=cell)
        shape = (30, 34, 38)
        frac = np.stack(
            np.meshgrid(*[np.arange(k) / k for k in shape], indexing="ij"), axis=-1
        )
        pts = frac @ cell + origin  # Å
        r0 = pts - pos[0]
        r2 = np.sum(r0**2, axis=-1)
        density = np.exp(-1.3 * r2) + 0.3 * np.exp(-2.0 * np.sum((pts - pos[1]) ** 2, axis=-1))
        orbital = r0[..., 2] * np.exp(-0.9 * r2) - 0.2 * np.exp(-1.5 * np.sum((pts - pos[2]) ** 2, axis=-1))
        files = {}
        for label, data in (("density", density), ("orbital", orbital)):
            p = work / f"ase-{name}-{label}.cube"
            with open(p, "w") as f:
                write_cube(f, atoms, data, origin=origin, comment=f"ASE {name} {label}")
            files[label] = p
            back = ase_read(p)
            print(f"{p.name} (written by ASE):")
            close("values as written vs as re-read by ASE", back, data, 5e-6)
            check_file(args.lobecast, p, atoms, origin, back)
            gz = p.with_suffix(".cube.gz")
            gz.write_bytes(gzip.compress(p.read_bytes()))
            check_file(args.lobecast, gz, atoms, origin, ase_read(gz))
        # The ångström variant: the same file with lengths in Å and negative counts.
        text = files["density"].read_text().splitlines()
        out = text[:2]
        t = text[2].split()
        out.append(f"{int(t[0]):5}" + "".join(f"{float(x) * Bohr:12.6f}" for x in t[1:4]))
        for line in text[3:6]:
            t = line.split()
            out.append(f"{-int(t[0]):5}" + "".join(f"{float(x) * Bohr:12.6f}" for x in t[1:4]))
        for line in text[6 : 6 + len(atoms)]:
            t = line.split()
            out.append(f"{int(t[0]):5}{float(t[1]):12.6f}" + "".join(f"{float(x) * Bohr:12.6f}" for x in t[2:5]))
        out += text[6 + len(atoms) :]
        ang = work / f"ase-{name}-density-angstrom.cube"
        ang.write_text("\n".join(out) + "\n")
        check_file(args.lobecast, ang, atoms, origin, ase_read(files["density"]))

        # combine: density − orbital, against numpy's difference of what ASE reads.
        c = work / f"combined-{name}.cube"
        subprocess.run(
            [args.lobecast, "combine", "--out", str(c), f"{files['density']}:1", f"{files['orbital']}:-1"],
            check=True,
            capture_output=True,
        )
        a, b, got = ase_read(files["density"]), ase_read(files["orbital"]), ase_read(c)
        want = a - b
        rel = np.max(np.abs(got - want) / np.maximum(np.abs(want), 1e-300))
        print(f"combined-{name}.cube: largest relative deviation from numpy a − b: {rel:.3e}")
        # %13.5E keeps six significant digits: at most 5e-6 relative (common practice).
        if rel > 5.0001e-6:
            raise SystemExit("check failed: combine")
    print("ASE-written cube files: all checks passed")


if __name__ == "__main__":
    main()
