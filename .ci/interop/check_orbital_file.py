"""Interop check: an orbital file written by a small Python script, as a user of
another program would, evaluates in lobecast to the same values that an independent
numpy/scipy evaluation of the README's conventions gives.

Conventions checked (README, "The orbital file"): Cartesian Gaussians x^a y^b z^c
exp(-alpha r^2) are each normalised as they stand; pure Gaussians use real solid
harmonics without the Condon-Shortley phase (m < 0 sine type, m > 0 cosine type),
normalised; contraction coefficients multiply normalised primitives and the
contracted function is renormalised to 1; Slater functions are
N r^(n-1) exp(-zeta r) Y_lm.  The real harmonics here are built from scipy's complex
spherical harmonics (a general-purpose reference library), not from lobecast's table.

Usage: check_orbital_file.py --lobecast PATH --workdir DIR
"""
import argparse
import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
from scipy import special

from ase.io.cube import read_cube


def complex_ylm(l, m, theta, phi):
    """Y_l^m(theta = polar, phi = azimuth) with the Condon-Shortley phase (scipy)."""
    if hasattr(special, "sph_harm_y"):
        return special.sph_harm_y(l, m, theta, phi)
    return special.sph_harm(m, l, phi, theta)


def real_ylm(l, m, x, y, z):
    r = np.sqrt(x * x + y * y + z * z)
    r = np.where(r == 0.0, 1e-300, r)
    theta = np.arccos(np.clip(z / r, -1.0, 1.0))
    phi = np.arctan2(y, x)
    if m == 0:
        return complex_ylm(l, 0, theta, phi).real
    # Removing the Condon-Shortley phase (-1)^m gives the cosine (m > 0) and sine
    # (m < 0) types with positive leading coefficients.
    c = complex_ylm(l, abs(m), theta, phi)
    sign = (-1) ** abs(m)
    return math.sqrt(2.0) * sign * (c.real if m > 0 else c.imag)


def dfact_odd(n):  # (2n-1)!!
    out = 1.0
    for k in range(1, n + 1):
        out *= 2 * k - 1
    return out


def gaussian_values(entry, center, pts):
    x, y, z = (pts[:, i] - center[i] for i in range(3))
    r2 = x * x + y * y + z * z
    prims = entry["primitives"]
    if "powers" in entry:
        a, b, c = entry["powers"]
        l = a + b + c
        ang = x**a * y**b * z**c / math.sqrt(dfact_odd(a) * dfact_odd(b) * dfact_odd(c))
        radial_norm = lambda al: (2 * al / math.pi) ** 0.75 * (4 * al) ** (l / 2)
    else:
        l, m = entry["l"], entry["m"]
        r = np.sqrt(r2)
        ang = r**l * real_ylm(l, m, x, y, z)
        # Normalised radial part r^l exp(-alpha r^2): sqrt(2 (2 alpha)^(l+3/2) / Gamma(l+3/2)).
        radial_norm = lambda al: math.sqrt(2 * (2 * al) ** (l + 1.5) / math.gamma(l + 1.5))
    # Self-overlap of the contraction of normalised primitives.
    s = sum(ci * cj * (2 * math.sqrt(ai * aj) / (ai + aj)) ** (l + 1.5) for ai, ci in prims for aj, cj in prims)
    radial = sum(ci * radial_norm(ai) * np.exp(-ai * r2) for ai, ci in prims) / math.sqrt(s)
    return radial * ang


def slater_values(entry, center, pts):
    x, y, z = (pts[:, i] - center[i] for i in range(3))
    r = np.sqrt(x * x + y * y + z * z)
    n, l, m, zeta = entry["n"], entry["l"], entry["m"], entry["zeta"]
    norm = (2 * zeta) ** (n + 0.5) / math.sqrt(math.factorial(2 * n))
    return norm * r ** (n - 1) * np.exp(-zeta * r) * real_ylm(l, m, x, y, z)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True)
    args = ap.parse_args()
    work = Path(args.workdir)
    work.mkdir(parents=True, exist_ok=True)

    # The kind of file a user's script writes: one function of every kind on two
    # centres (coefficients are arbitrary inputs; the reference is the formula).
    basis = [{"atom": 0, "type": "slater", "n": 1, "l": 0, "m": 0, "zeta": 1.1},
             {"atom": 1, "type": "slater", "n": 3, "l": 2, "m": 1, "zeta": 0.9},
             {"atom": 0, "type": "gaussian", "powers": [1, 0, 1], "primitives": [[1.5, 0.6], [0.4, 0.5]]},
             {"atom": 1, "type": "gaussian", "powers": [0, 0, 0], "primitives": [[0.7, 1.0]]}]
    for l in range(4):
        for m in range(-l, l + 1):
            basis.append({"atom": 1, "type": "gaussian", "l": l, "m": m, "primitives": [[0.9, 0.7], [0.3, 0.4]]})
    coeffs = [0.3 + 0.1 * ((7 * k) % 5) - 0.05 * k for k in range(len(basis))]
    doc = {"format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
           "atoms": [{"element": "H", "atomic_number": 1, "position": [0.0, 0.2, -0.9]},
                     {"element": "He", "atomic_number": 2, "position": [0.1, 0.0, 1.0]}],
           "basis": basis,
           "orbitals": [{"energy": -0.5, "occupation": 1.0, "coefficients": coeffs}]}
    orb = work / "python-orbitals.json"
    orb.write_text(json.dumps(doc, indent=1))
    cube = work / "python-orbital.cube"
    subprocess.run([args.lobecast, "volume", str(orb), "--field", "orbital:1", "--spacing", "0.25",
                    "--padding", "3", "--units", "bohr", "--out", str(cube)], check=True)

    with open(cube) as f:
        c = read_cube(f)
    # ASE converts the file's bohr to ångström with its own Bohr constant; dividing by
    # the same constant recovers the file's numbers exactly.
    from ase.units import Bohr as bohr
    data = c["data"]
    origin = np.asarray(c["origin"]) / bohr
    spacing = np.asarray(c["spacing"]) / bohr
    n1, n2, n3 = data.shape
    i, j, k = np.meshgrid(np.arange(n1), np.arange(n2), np.arange(n3), indexing="ij")
    pts = (origin + i[..., None] * spacing[0] + j[..., None] * spacing[1] + k[..., None] * spacing[2]).reshape(-1, 3)
    centers = [np.asarray(a["position"]) for a in doc["atoms"]]
    ref = np.zeros(len(pts))
    for cf, e in zip(coeffs, basis):
        f = slater_values if e["type"] == "slater" else gaussian_values
        ref += cf * f(e, centers[e["atom"]], pts)
    got = data.reshape(-1)
    scale = np.abs(ref).max()
    # Printed precision of %13.5E: 5e-6 relative per value; the absolute floor covers
    # values near zero (common practice).
    dev = np.abs(got - ref) - (5.0000001e-6 * np.abs(ref) + 1e-12 * scale)
    big = np.abs(ref) > 1e-3 * scale
    worst = np.max(np.abs(got - ref)[big] / np.abs(ref)[big])
    ok = bool(np.all(dev <= 0.0))
    print(f"orbital file from Python -> lobecast volume -> ASE: {len(got)} values, "
          f"max relative |lobecast - numpy/scipy| where |ref| > 1e-3 max: {worst:.2e}; "
          f"all within 5e-6 relative + 1e-12 max ({'ok' if ok else 'FAIL'})")
    if not ok:
        bad = int(np.argmax(dev))
        print(f"  worst point {pts[bad]}: lobecast {got[bad]:.6e}, reference {ref[bad]:.6e}")
        sys.exit(1)


if __name__ == "__main__":
    main()
