#!/usr/bin/env python3
"""Interop check (hardening issue, item 1): every value lobecast writes reads back in
ASE's cube reader, over the whole double range.

ASE (ase.io.cube.write_cube) writes a cube of values drawn from every class of finite
double: random bit patterns (normal, subnormal, zero, both signs), magnitudes spread
log-uniformly from 1e-330 to 1e308, and the edges of the written range. `lobecast
combine` scales it by weights that drive values far below 1e-99 and to both signs;
ASE's reader (ase.io.cube.read_cube) must read every output, and each value must agree
with weight × input within the layout's documented rules (README, "The cube layout
written"): magnitudes below 1e-99 are written as zero; %13.5E rounding (5e-6 relative)
up to 1e100; four decimals (5e-5) from 1e100; the largest doubles rounded toward zero.
Our own reader (`lobecast inspect`) must read every output too.

Exit status 0 when every check passes; the first failure raises and prints why.
"""

import argparse
import subprocess
from pathlib import Path

import numpy as np
from ase import Atoms
from ase.io.cube import read_cube, write_cube

SEED = 20261203
SHAPE = (8, 10, 25)
WEIGHTS = ["1", "-1", "1e-200", "-3.7e-150", "2.5e-7"]


def values(rng, n):
    bits = rng.integers(0, 2**63, size=n, dtype=np.uint64) * np.uint64(2) + rng.integers(
        0, 2, size=n, dtype=np.uint64
    )
    raw = bits.view(np.float64)
    raw = raw[np.isfinite(raw)]
    mant = rng.uniform(1.0, 10.0, size=n)
    expo = rng.integers(-330, 309, size=n)
    with np.errstate(over="ignore", under="ignore"):
        logu = mant * 10.0 ** expo.astype(np.float64)
    logu = np.where(np.isfinite(logu), logu, np.finfo(np.float64).max)
    logu *= np.where(rng.integers(0, 2, size=n) == 1, -1.0, 1.0)
    edges = np.array(
        [0.0, -0.0, 9.999995e-100, -9.999994e-100, 1e-99, -1e-99, 1.000005e-99,
         9.999994e99, -9.999996e99, 1e100, np.finfo(np.float64).max,
         -np.finfo(np.float64).max, np.finfo(np.float64).tiny, -5e-324,
         -7.27096e-122, -9.87842e-117, -9.34575e-112]
    )
    pool = np.concatenate([raw, logu, edges])
    out = rng.choice(pool, size=int(np.prod(SHAPE)), replace=True)
    out[: len(edges)] = edges
    return out.reshape(SHAPE)


def tolerance(a):
    if a >= 1.79765e308:
        return 2 * 5e-5
    if a >= 9.999995e99:
        return 5e-5
    return 5e-6


def check(expected, got, label):
    assert got.shape == expected.shape, f"{label}: shape {got.shape} vs {expected.shape}"
    for e, g in zip(expected.ravel(), got.ravel()):
        a = abs(e)
        if a < 9.999995e-100:
            assert g == 0.0, f"{label}: {e!r} is below 1e-99 and must read as 0, got {g!r}"
        elif a < 1e-99:
            assert g == 0.0 or abs(g - e) <= 5e-6 * a, f"{label}: {e!r} read as {g!r}"
        else:
            assert abs(g - e) <= tolerance(a) * a * (1 + 1e-12), f"{label}: {e!r} read as {g!r}"
            assert np.signbit(g) == np.signbit(e), f"{label}: sign of {e!r} read as {g!r}"


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True)
    args = ap.parse_args()
    work = Path(args.workdir)
    work.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(SEED)
    data = values(rng, 4000)
    atoms = Atoms("H2", positions=[[0.0, 0.0, -0.37], [0.0, 0.0, 0.37]], cell=np.eye(3) * 4.0)
    src = work / "extremes-in.cube"
    with open(src, "w") as f:
        write_cube(f, atoms, data=data)
    with open(src) as f:
        given = read_cube(f)["data"]
    checked = 0
    for w in WEIGHTS:
        out = work / f"extremes-{w}.cube"
        subprocess.run(
            [args.lobecast, "combine", "--out", str(out), f"{src}:{w}"],
            check=True, capture_output=True, text=True,
        )
        with open(out) as f:
            got = read_cube(f)["data"]
        with np.errstate(over="raise", under="ignore"):
            expected = float(w) * given
        check(expected, got, f"weight {w}")
        subprocess.run([args.lobecast, "inspect", str(out)], check=True, capture_output=True)
        checked += got.size
    tiny = int(np.sum(np.abs(given) < 1e-99))
    print(f"ASE read {len(WEIGHTS)} lobecast cubes of extreme values: {checked} values "
          f"within the layout's rules ({tiny} inputs below 1e-99)")


if __name__ == "__main__":
    main()
