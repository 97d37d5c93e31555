#!/usr/bin/env python3
"""Interop check: read lobecast's cube files with ASE and compare with an
independent numpy evaluation of the H2+ minimal-basis LCAO orbitals.

Usage (what .ci/run does):
    python check_ase_cube.py --lobecast target/release/lobecast \
        --model examples/h2-cation.toml --workdir DIR

The script runs lobecast twice:
    volume MODEL --field orbital:1 --field orbital:2 --spacing 0.1 --units bohr --out DIR/sigma.cube
    volume MODEL --field orbital:1 --spacing 0.2 --units bohr --out DIR/bonding.cube
and then checks, with ASE's cube reader (ase.io.cube.read_cube / read_cube_data)
as the independent reader: atoms, origin, axes, data shape, every grid value,
the normalisation of both orbitals and the antibonding node on z = 0.
A separate plain-text parse checks the line layout that ASE does not look at.

Prints one line per check ("PASS"/"FAIL"/"SKIP" + what was compared + the
deviation) and exits 1 if any check failed.

How ASE 3.29.0 handles multi-orbital cubes (read from the installed source with
inspect.getsource(ase.io.cube.read_cube), not guessed):
  * a negative atom count on line 3 only tells it to read the extra
    "N id1 .. idN" line after the atoms; those ids come back as dct['labels'];
  * the number of values stored per grid point (num_val) is taken from an
    OPTIONAL FIFTH field on line 3, default 1. The ids line is NOT used for it;
  * all values are read in one go and split with raw[offset::num_val], each
    reshaped to (nx, ny, nz) (i slowest, k fastest) and returned stacked as
    dct['datas'] with shape (num_val, nx, ny, nz); dct['data'] is datas[0];
  * origin and spacing come back in Å (multiplied by ase.units.Bohr), atom
    positions too; read_cube_data(filename) returns (datas[0], atoms) only.
So a multi-field file whose line 3 has just "count x y z" is read by ASE as one
value per point and fails to reshape. The script reports that as a failure and
then, so the remaining numbers are still measured, re-reads the same bytes
through ASE with the field count appended to line 3 (clearly marked
"[diagnostic]"); the run still exits non-zero in that case.
"""

import argparse
import inspect
import io
import math
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import ase
import ase.units
from ase.io.cube import read_cube, read_cube_data

# --- reference values ------------------------------------------------------
# Bohr radius in Å, CODATA 2018 recommended value (a0 = 0.529177210903(80) e-10 m).
BOHR_CODATA2018 = 0.529177210903
# The model (examples/h2-cation.toml, as given by the lobecast contract):
# two H nuclei (Z = 1) at z = -1 and z = +1 bohr, one 1s Slater function each.
NUCLEI_BOHR = np.array([[0.0, 0.0, -1.0], [0.0, 0.0, 1.0]])
NUCLEAR_Z = [1, 1]
ZETA = 1.0
R_AB = 2.0  # internuclear distance, bohr (from the positions above)
# Default box padding of `lobecast volume` (its --help: "--padding ... [default: 5 bohr]").
PADDING_BOHR = 5.0

# Tolerances.
# Values are printed as %13.5E: 5 decimals in the mantissa, so the rounding
# error is at most 0.5e-5 of a mantissa in [1, 10), i.e. <= 5e-6 relative.
# We allow relative 1e-5 plus an absolute floor of 1e-10 (for values that are
# zero in exact arithmetic, e.g. the antibonding node). Derived from the
# printed precision, as the contract asks.
VALUE_RTOL = 1e-5
VALUE_ATOL = 1e-10
# Header numbers are printed with 6 decimals (bohr): rounding <= 5e-7 bohr.
# We allow 1e-6 bohr (printed precision plus margin); in Å that is
# 1e-6 * 0.529 Å, and the CODATA 2018 / ASE-constant difference (~1e-9 Å per
# bohr if ASE uses an older CODATA set) is far below it.
HEADER_TOL_BOHR = 1e-6
# Normalisation: sum psi^2 * voxel volume = 1 to 1e-3 (common practice).
NORM_TOL = 1e-3
# The z = 0 plane is identified to 1e-6 bohr (printed header precision).
PLANE_TOL_BOHR = 1e-6


def overlap_1s1s(zeta, r):
    """Overlap of two normalised 1s Slater functions with equal exponent:
    S = exp(-zeta R) (1 + zeta R + (zeta R)^2 / 3)
    (standard result, e.g. Levine, Quantum Chemistry, Sec. 13.5; from memory)."""
    t = zeta * r
    return math.exp(-t) * (1.0 + t + t * t / 3.0)


def slater_1s(points, centre, zeta):
    """phi(r) = sqrt(zeta^3 / pi) exp(-zeta |r - R|), normalised 1s Slater function."""
    d = np.linalg.norm(points - centre, axis=-1)
    return math.sqrt(zeta ** 3 / math.pi) * np.exp(-zeta * d)


def reference_orbitals(points):
    """Bonding (phi1 + phi2)/sqrt(2(1+S)) and antibonding (phi1 - phi2)/sqrt(2(1-S)),
    atom 1 being the first listed (z = -1)."""
    s = overlap_1s1s(ZETA, R_AB)
    p1 = slater_1s(points, NUCLEI_BOHR[0], ZETA)
    p2 = slater_1s(points, NUCLEI_BOHR[1], ZETA)
    bonding = (p1 + p2) / math.sqrt(2.0 * (1.0 + s))
    antibonding = (p1 - p2) / math.sqrt(2.0 * (1.0 - s))
    return {1: bonding, 2: antibonding}, s


# --- reporting ---------------------------------------------------------------
class Report:
    def __init__(self):
        self.passed = 0
        self.failed = 0
        self.skipped = 0

    def check(self, ok, name, detail):
        tag = "PASS" if ok else "FAIL"
        if ok:
            self.passed += 1
        else:
            self.failed += 1
        print(f"{tag} {name}: {detail}", flush=True)
        return ok

    def skip(self, name, detail):
        self.skipped += 1
        print(f"SKIP {name}: {detail}", flush=True)


def fmt(v):
    return np.array2string(np.asarray(v, dtype=float), precision=10, separator=", ",
                           max_line_width=10 ** 6).replace("\n", "")


# --- running lobecast --------------------------------------------------------
def run_lobecast(rep, exe, model, fields, spacing, out):
    cmd = [str(exe), "volume", str(model)]
    for f in fields:
        cmd += ["--field", f]
    cmd += ["--spacing", str(spacing), "--units", "bohr", "--out", str(out)]
    name = f"run {out.name}"
    try:
        proc = subprocess.run(cmd, capture_output=True, text=True, timeout=600)
    except (OSError, subprocess.TimeoutExpired) as e:
        rep.check(False, name, f"{' '.join(cmd)} could not run: {e}")
        return False
    ok = proc.returncode == 0 and out.is_file()
    detail = f"`{' '.join(cmd)}` exit status {proc.returncode} (expected 0)"
    detail += f", output {'present' if out.is_file() else 'MISSING'}"
    if not ok:
        detail += f"; stderr: {proc.stderr.strip()[:2000]}"
    return rep.check(ok, name, detail)


# --- plain-text layout check (not ASE) ---------------------------------------
VALUE_TOKEN = re.compile(r" *-?\d\.\d{5}E[+-]\d{2,3}")


def check_layout(rep, path, n_fields, ids):
    """Check the text layout against the contract: header lines, the ids line,
    %13.5E values 6 per line, a new line after every innermost (z) row."""
    name = f"{path.name} layout"
    lines = path.read_text().split("\n")
    if lines and lines[-1] == "":
        lines.pop()
    problems = []
    if len(lines) < 7:
        rep.check(False, name, f"only {len(lines)} lines")
        return
    l3 = lines[2].split()
    try:
        count = int(l3[0])
    except (IndexError, ValueError):
        rep.check(False, name, f"line 3 not an atom count: {lines[2]!r}")
        return
    want_sign = -1 if n_fields > 1 else 1
    if count != want_sign * len(NUCLEAR_Z):
        problems.append(f"line 3 atom count {count}, expected {want_sign * len(NUCLEAR_Z)}")
    if len(l3) not in (4, 5):
        problems.append(f"line 3 has {len(l3)} fields (expected count + origin)")
    elif len(l3) == 5 and l3[4] != str(n_fields):
        # An optional 5th field is what ASE reads as values per point.
        problems.append(f"line 3 5th field {l3[4]!r}, but {n_fields} value(s) per point")
    shape = []
    for ln in lines[3:6]:
        try:
            shape.append(int(ln.split()[0]))
        except (IndexError, ValueError):
            problems.append(f"bad axis line {ln!r}")
            shape.append(0)
    if any(n <= 0 for n in shape):
        problems.append(f"voxel counts {shape} not all positive (positive = bohr)")
    pos = 6 + abs(count)
    if n_fields > 1:
        got_ids = lines[pos].split()
        want = [str(n_fields)] + [str(i) for i in ids]
        if got_ids != want:
            problems.append(f"ids line {lines[pos]!r}, expected {' '.join(want)!r}")
        pos += 1
    row_len = shape[2] * n_fields
    per_row = [6] * (row_len // 6) + ([row_len % 6] if row_len % 6 else [])
    n_rows = shape[0] * shape[1]
    body = lines[pos:]
    if len(body) != n_rows * len(per_row):
        problems.append(
            f"{len(body)} value lines, expected {n_rows} z-rows x {len(per_row)} "
            f"lines = {n_rows * len(per_row)}")
    bad_line = None
    for idx, ln in enumerate(body):
        want_n = per_row[idx % len(per_row)] if per_row else 0
        if len(ln) != 13 * want_n or any(
                VALUE_TOKEN.fullmatch(ln[13 * t:13 * t + 13]) is None for t in range(want_n)):
            bad_line = (pos + idx + 1, ln, want_n)
            break
    if bad_line:
        problems.append(
            f"line {bad_line[0]} is {bad_line[1]!r}, expected {bad_line[2]} values in %13.5E")
    rep.check(not problems, name,
              "; ".join(problems) if problems else
              f"line 3 count {count}, shape {shape}, {len(body)} value lines of "
              f"%13.5E (6 per line, new line after each {row_len}-value z-row)"
              + (f", ids line '{lines[6 + abs(count)]}'" if n_fields > 1 else ""))


# --- ASE-based checks --------------------------------------------------------
def ase_read(rep, path, n_fields):
    """Read with ase.io.cube.read_cube on an open file. Returns the dict or None.
    For a multi-field file that ASE cannot split, falls back to a diagnostic
    re-read with NVal appended to line 3 (the failure is reported first)."""
    name = f"{path.name} ASE read_cube"
    try:
        with open(path) as fh:
            dct = read_cube(fh)
    except Exception as e:  # noqa: BLE001 - report whatever ASE raised
        why = f"{type(e).__name__}: {e}"
        if n_fields > 1:
            why += (f" -- ASE {ase.__version__} takes the values per point from an "
                    "optional 5th field on line 3 (default 1) and does not use the "
                    "ids line for it; this file's line 3 gives no such field")
        rep.check(False, name, why)
        if n_fields == 1:
            return None
        lines = path.read_text().split("\n")
        if len(lines[2].split()) != 4:
            return None
        lines[2] = lines[2] + f" {n_fields:4d}"
        try:
            dct = read_cube(io.StringIO("\n".join(lines)))
        except Exception as e2:  # noqa: BLE001
            print(f"     [diagnostic] re-read with NVal={n_fields} also failed: "
                  f"{type(e2).__name__}: {e2}", flush=True)
            return None
        print(f"     [diagnostic] re-read the same file with ' {n_fields}' appended to "
              "line 3 so ASE splits the fields; the checks below use that read",
              flush=True)
        dct["_diagnostic"] = True
        return dct
    rep.check(True, name, f"read; datas shape {dct['datas'].shape}, labels {dct['labels']}")
    return dct


def check_atoms(rep, tag, atoms):
    nums = [int(x) for x in atoms.numbers]
    rep.check(nums == NUCLEAR_Z, f"{tag} atomic numbers", f"got {nums}, expected {NUCLEAR_Z}")
    want = NUCLEI_BOHR * BOHR_CODATA2018
    dev = float(np.max(np.abs(atoms.positions - want)))
    tol = HEADER_TOL_BOHR * BOHR_CODATA2018
    rep.check(dev <= tol, f"{tag} atom positions (Å)",
              f"got {fmt(atoms.positions)}, expected {fmt(want)} "
              f"(bohr x CODATA 2018 {BOHR_CODATA2018}); max |dev| {dev:.3e} Å, tol {tol:.1e} Å")


def expected_grid(spacing):
    lo = NUCLEI_BOHR.min(axis=0) - PADDING_BOHR
    hi = NUCLEI_BOHR.max(axis=0) + PADDING_BOHR
    counts = np.rint((hi - lo) / spacing).astype(int) + 1
    return lo, counts


def check_grid(rep, tag, dct, spacing, n_fields, ids):
    """Origin, axes, shape, labels. Returns the file's own grid (bohr) for the value check."""
    dev_tag = " [diagnostic]" if dct.get("_diagnostic") else ""
    lo, counts = expected_grid(spacing)
    origin_bohr = np.asarray(dct["origin"]) / BOHR_CODATA2018
    dev = float(np.max(np.abs(origin_bohr - lo)))
    rep.check(dev <= HEADER_TOL_BOHR, f"{tag} origin{dev_tag}",
              f"ASE origin {fmt(dct['origin'])} Å = {fmt(origin_bohr)} bohr, expected "
              f"{fmt(lo)} bohr (nuclei -/+ default padding {PADDING_BOHR} bohr); "
              f"max |dev| {dev:.3e} bohr, tol {HEADER_TOL_BOHR:.0e}")
    axes_bohr = np.asarray(dct["spacing"]) / BOHR_CODATA2018
    want_axes = np.eye(3) * spacing
    dev = float(np.max(np.abs(axes_bohr - want_axes)))
    rep.check(dev <= HEADER_TOL_BOHR, f"{tag} axes/spacing{dev_tag}",
              f"ASE spacing rows (bohr) {fmt(axes_bohr)}, expected diag({spacing}); "
              f"max |dev| {dev:.3e} bohr, tol {HEADER_TOL_BOHR:.0e}")
    datas = np.asarray(dct["datas"])
    want_shape = (n_fields,) + tuple(int(c) for c in counts)
    rep.check(datas.shape == want_shape, f"{tag} data shape{dev_tag}",
              f"ASE datas shape {datas.shape}, expected {want_shape}")
    if n_fields > 1:
        rep.check(list(dct["labels"]) == list(ids), f"{tag} orbital ids{dev_tag}",
                  f"ASE labels {dct['labels']}, expected {list(ids)}")
    # The points the file itself declares, in bohr, using ASE's own constant to
    # undo its conversion exactly; i slowest, k fastest.
    o = np.asarray(dct["origin"]) / ase.units.Bohr
    a = np.asarray(dct["spacing"]) / ase.units.Bohr
    n = datas.shape[1:]
    i, j, k = np.meshgrid(np.arange(n[0]), np.arange(n[1]), np.arange(n[2]), indexing="ij")
    pts = o + i[..., None] * a[0] + j[..., None] * a[1] + k[..., None] * a[2]
    return pts, a, datas


def check_values(rep, tag, pts, axes, datas, ids, dev_tag=""):
    ref, s = reference_orbitals(pts)
    dv = abs(float(np.linalg.det(axes)))
    for f, orb in enumerate(ids):
        got = datas[f]
        want = ref[orb]
        if got.shape != want.shape:
            rep.check(False, f"{tag} orbital {orb} values{dev_tag}",
                      f"shape {got.shape} vs reference {want.shape}")
            continue
        err = np.abs(got - want)
        allowed = VALUE_RTOL * np.abs(want) + VALUE_ATOL
        worst = np.unravel_index(int(np.argmax(err / allowed)), got.shape)
        n_bad = int(np.count_nonzero(err > allowed))
        rel = err / np.maximum(np.abs(want), VALUE_ATOL)
        rep.check(n_bad == 0, f"{tag} orbital {orb} values{dev_tag}",
                  f"{got.size} points vs numpy LCAO (S = {s:.10f}); max |dev| "
                  f"{err.max():.3e}, max rel dev {rel.max():.3e}; worst at index "
                  f"{tuple(int(x) for x in worst)} got {got[worst]:.6e} ref {want[worst]:.6e}; "
                  f"{n_bad} outside |dev| <= {VALUE_RTOL:.0e}*|ref| + {VALUE_ATOL:.0e}")
        norm = float(np.sum(got.astype(float) ** 2) * dv)
        ref_norm = float(np.sum(want ** 2) * dv)
        rep.check(abs(norm - 1.0) <= NORM_TOL, f"{tag} orbital {orb} normalisation{dev_tag}",
                  f"sum psi^2 dV = {norm:.6f} (dV = {dv:.6g} bohr^3), |dev from 1| "
                  f"{abs(norm - 1.0):.3e}, tol {NORM_TOL:.0e} (same sum of the numpy "
                  f"reference on this grid: {ref_norm:.6f})")
    if 2 in ids:
        f = list(ids).index(2)
        zs = pts[0, 0, :, 2]
        ks = np.nonzero(np.abs(zs) <= PLANE_TOL_BOHR)[0]
        name = f"{tag} antibonding node z=0{dev_tag}"
        if len(ks) == 0:
            rep.skip(name, f"grid has no z = 0 plane (z from {zs[0]:.6f} step "
                           f"{zs[1] - zs[0]:.6f} bohr)")
        else:
            k = int(ks[0])
            plane = datas[f][:, :, k]
            mx = float(np.max(np.abs(plane)))
            peak = float(np.max(np.abs(datas[f])))
            rep.check(mx <= VALUE_ATOL, name,
                      f"plane k = {k} (z = {zs[k]:.2e} bohr), {plane.size} points: max |psi| "
                      f"{mx:.3e} (orbital's max |psi| {peak:.3e}), tol {VALUE_ATOL:.0e}")


def check_read_cube_data(rep, path, datas0):
    name = f"{path.name} ASE read_cube_data"
    try:
        data, atoms = read_cube_data(str(path))
    except Exception as e:  # noqa: BLE001
        rep.check(False, name, f"{type(e).__name__}: {e}")
        return
    same = datas0 is not None and data.shape == datas0.shape and np.array_equal(data, datas0)
    rep.check(same, name,
              f"returned data shape {data.shape} and {len(atoms)} atoms; "
              f"{'identical to' if same else 'DIFFERS from'} read_cube's first field")
    check_atoms(rep, f"{path.name} (read_cube_data)", atoms)


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--lobecast", required=True, type=Path)
    ap.add_argument("--model", required=True, type=Path)
    ap.add_argument("--workdir", required=True, type=Path)
    args = ap.parse_args()
    args.workdir.mkdir(parents=True, exist_ok=True)

    print(f"python {sys.version.split()[0]}, ase {ase.__version__} (ase.units.Bohr = "
          f"{ase.units.Bohr!r} Å), numpy {np.__version__}; reference bohr = "
          f"{BOHR_CODATA2018} Å (CODATA 2018)", flush=True)
    # Show that the ASE behaviour described in the docstring is the installed one.
    src = inspect.getsource(read_cube)
    splits_on_line3 = "int(line[4]) if len(line) == 5 else 1" in src
    print(f"info: installed ase.io.cube.read_cube takes values-per-point from line 3 "
          f"field 5: {splits_on_line3}", flush=True)

    rep = Report()
    cases = [
        ("sigma.cube", ["orbital:1", "orbital:2"], 0.1, [1, 2]),
        ("bonding.cube", ["orbital:1"], 0.2, [1]),
    ]
    for fname, fields, spacing, ids in cases:
        out = args.workdir / fname
        if out.exists():
            out.unlink()
        if not run_lobecast(rep, args.lobecast, args.model, fields, spacing, out):
            continue
        check_layout(rep, out, len(fields), ids)
        dct = ase_read(rep, out, len(fields))
        if dct is None:
            continue
        dev_tag = " [diagnostic]" if dct.get("_diagnostic") else ""
        check_atoms(rep, f"{fname}{dev_tag}", dct["atoms"])
        pts, axes, datas = check_grid(rep, fname, dct, spacing, len(fields), ids)
        if datas.shape[0] != len(ids):
            rep.check(False, f"{fname} values{dev_tag}",
                      f"{datas.shape[0]} field(s) read, expected {len(ids)}; not compared")
        else:
            check_values(rep, fname, pts, axes, datas, ids, dev_tag)
        check_read_cube_data(rep, out, None if dct.get("_diagnostic") else datas[0])
        del dct, pts, datas

    print(f"interop: {rep.passed} passed, {rep.failed} failed, "
          f"{rep.skipped} skipped", flush=True)
    return 1 if rep.failed else 0


if __name__ == "__main__":
    sys.exit(main())
