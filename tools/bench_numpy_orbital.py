#!/usr/bin/env python3
"""Times the straightforward numpy evaluation of one Gaussian orbital on a cube's grid.

The baseline for lobecast's grid evaluation (benches/gaussian_grid.rs, `volume`):
the way a user would write it, vectorised over the points of one slab at a time,
one exponential per primitive per point, every basis function on its own.

    lobecast solve MODEL --json orb.json
    lobecast volume MODEL --field orbital:N --points 400 --out orb.cube
    python tools/bench_numpy_orbital.py orb.json N orb.cube

Only s and p Gaussian functions (pure, or Cartesian powers of degree ≤ 1) are
handled, which covers STO-3G for H–Ne. The printed time is evaluation only; the
values are checked against the cube's (printed to 5 significant digits there).
"""

import json
import math
import sys
import time

import numpy as np

# Real solid harmonics of l = 1 (lobecast's convention, DESIGN): m = -1, 0, 1 ↔ y, z, x.
P_AXIS = {-1: 1, 0: 2, 1: 0}


def read_cube_grid(path):
    """Origin, axis steps and counts from a cube header (bohr), and the first field's
    values of the first slab for the check."""
    with open(path) as f:
        f.readline()
        f.readline()
        natoms, *origin = f.readline().split()[:4]
        natoms = abs(int(natoms))
        counts, axes = [], []
        for _ in range(3):
            n, *a = f.readline().split()[:4]
            counts.append(int(n))
            axes.append([float(v) for v in a])
        for _ in range(natoms):
            f.readline()
        need = counts[1] * counts[2]
        first = []
        while len(first) < need:
            line = f.readline()
            if not line:
                break
            first.extend(float(v) for v in line.split())
    return np.array([float(v) for v in origin]), np.array(axes), counts, np.array(first[:need])


def functions(doc):
    """(centre, axis or None, [(exponent, coefficient × primitive norm)]) per function,
    the contraction renormalised to 1 (normalised primitives, common practice)."""
    atoms = [np.array(a["position"], dtype=float) for a in doc["atoms"]]
    out = []
    for f in doc["basis"]:
        if f.get("type") != "gaussian":
            sys.exit("only Gaussian functions are handled")
        if "powers" in f:
            p = f["powers"]
            if sum(p) > 1:
                sys.exit("only s and p functions are handled")
            l, axis = sum(p), (p.index(1) if sum(p) else None)
        else:
            l = f["l"]
            if l > 1:
                sys.exit("only s and p functions are handled")
            axis = P_AXIS[f["m"]] if l == 1 else None
        prims = f["primitives"]
        e = l + 1.5
        s = sum(ci * cj * (2 * math.sqrt(ai * aj) / (ai + aj)) ** e for ai, ci in prims for aj, cj in prims)
        renorm = 1 / math.sqrt(s)
        terms = [(a, c * renorm * (2 * a / math.pi) ** 0.75 * (4 * a) ** (l / 2)) for a, c in prims]
        out.append((atoms[f["atom"]], axis, terms))
    return out


def orbital_on_slab(funcs, coeffs, x, ys, zs):
    """ψ on the slab x = const, all (y, z), z fastest, like the cube."""
    y, z = np.meshgrid(ys, zs, indexing="ij")
    y, z = y.ravel(), z.ravel()
    psi = np.zeros_like(y)
    for (c, axis, terms), cm in zip(funcs, coeffs):
        if cm == 0.0:
            continue
        d = (x - c[0], y - c[1], z - c[2])
        r2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2]
        radial = np.zeros_like(r2)
        for a, k in terms:
            radial += k * np.exp(-a * r2)
        if axis is not None:
            radial *= d[axis]
        psi += cm * radial
    return psi


def main():
    if len(sys.argv) != 4:
        sys.exit(__doc__)
    doc = json.load(open(sys.argv[1]))
    n = int(sys.argv[2])
    origin, axes, counts, first = read_cube_grid(sys.argv[3])
    if np.count_nonzero(axes - np.diag(np.diag(axes))):
        sys.exit("only axis-aligned grids are handled")
    funcs = functions(doc)
    coeffs = doc["orbitals"][n - 1]["coefficients"]
    xs = origin[0] + axes[0, 0] * np.arange(counts[0])
    ys = origin[1] + axes[1, 1] * np.arange(counts[1])
    zs = origin[2] + axes[2, 2] * np.arange(counts[2])
    start = time.perf_counter()
    checksum = 0.0
    for i, x in enumerate(xs):
        psi = orbital_on_slab(funcs, coeffs, x, ys, zs)
        if i == 0:
            worst = np.max(np.abs(psi - first) / np.maximum(np.abs(first), 1e-12))
        checksum += psi.sum()
    seconds = time.perf_counter() - start
    points = counts[0] * counts[1] * counts[2]
    print(f"{points} points × {len(funcs)} functions: {seconds:.3f} s evaluation "
          f"({points * len(funcs) / seconds / 1e6:.1f} M point·functions/s); "
          f"first slab against the cube: worst relative difference {worst:.1e}; sum {checksum:.6e}")


if __name__ == "__main__":
    main()
