"""A second implementation of lobecast's orbital file (version 2) conventions, in
numpy/scipy only: basis function values, the orbitals per spin, and the density.

Conventions (README, "The orbital file"): primitive coefficients multiply
normalised primitives and each contracted function is normalised to 1 as it
stands; a Cartesian component x^a y^b z^c is normalised on its own; pure
functions are real solid harmonics without the Condon-Shortley phase, m < 0
sine type, m > 0 cosine type. The harmonics come from scipy's complex ones, not
from lobecast's tables. Used by check_hf_pyscf.py.
"""
import math

import numpy as np
from scipy import special


def complex_ylm(l, m, theta, phi):
    """Y_l^m (theta polar, phi azimuth) with the Condon-Shortley phase, from scipy."""
    if hasattr(special, "sph_harm_y"):
        return special.sph_harm_y(l, m, theta, phi)
    return special.sph_harm(m, l, phi, theta)


def real_ylm(l, m, x, y, z):
    """Real spherical harmonic normalised on the sphere, without the Condon-Shortley
    phase: m > 0 cosine type, m < 0 sine type, both with a positive leading term
    (p: m = -1, 0, 1 is y, z, x; d: m = -2..2 is xy, yz, 3z^2-r^2, xz, x^2-y^2)."""
    r = np.sqrt(x * x + y * y + z * z)
    r = np.where(r == 0.0, 1e-300, r)
    theta = np.arccos(np.clip(z / r, -1.0, 1.0))
    phi = np.arctan2(y, x)
    if m == 0:
        return complex_ylm(l, 0, theta, phi).real
    c = complex_ylm(l, abs(m), theta, phi) * (-1) ** abs(m)  # remove (-1)^m
    return math.sqrt(2.0) * (c.real if m > 0 else c.imag)


def odd_double_factorial(k):
    """(2k-1)!! with (-1)!! = 1."""
    return math.prod(range(1, 2 * k, 2))


def basis_function_values(entry, centre, pts):
    """One basis entry of the orbital file at points (bohr), normalised to 1 as the
    file's conventions say: normalised primitives, contraction renormalised."""
    if entry.get("type") != "gaussian":
        raise ValueError(f"unexpected basis entry type {entry.get('type')!r}")
    d = pts - np.asarray(centre, dtype=float)
    x, y, z = d[:, 0], d[:, 1], d[:, 2]
    r2 = x * x + y * y + z * z
    prims = [(float(a), float(c)) for a, c in entry["primitives"]]
    if "powers" in entry:
        a, b, c = entry["powers"]
        l = a + b + c
        # Each Cartesian component x^a y^b z^c exp(-al r^2) normalised on its own.
        angular = x**a * y**b * z**c / math.sqrt(
            odd_double_factorial(a) * odd_double_factorial(b) * odd_double_factorial(c))

        def norm(al):
            return (2 * al / math.pi) ** 0.75 * (4 * al) ** (l / 2)
    else:
        l, m = entry["l"], entry["m"]
        angular = np.sqrt(r2) ** l * real_ylm(l, m, x, y, z)

        def norm(al):  # r^l exp(-al r^2) normalised on the radial measure r^2 dr
            return math.sqrt(2 * (2 * al) ** (l + 1.5) / math.gamma(l + 1.5))
    # Overlap of two normalised primitives of the same angular part.
    self_overlap = sum(ci * cj * (2 * math.sqrt(ai * aj) / (ai + aj)) ** (l + 1.5)
                       for ai, ci in prims for aj, cj in prims)
    radial = sum(ci * norm(ai) * np.exp(-ai * r2) for ai, ci in prims)
    return radial * angular / math.sqrt(self_overlap)


def file_basis_values(doc, pts):
    centres = [a["position"] for a in doc["atoms"]]
    return np.stack([basis_function_values(e, centres[e["atom"]], pts) for e in doc["basis"]], axis=1)


def file_orbital_sets(doc):
    """[(energies, occupations, coefficient matrix)] per spin (one set for RHF)."""
    keys = ["orbitals"] if "orbitals" in doc else ["orbitals_alpha", "orbitals_beta"]
    out = []
    for k in keys:
        orbs = doc[k]
        out.append((np.array([o["energy"] for o in orbs], dtype=float),
                    np.array([o["occupation"] for o in orbs], dtype=float),
                    np.array([o["coefficients"] for o in orbs], dtype=float)))
    return out


def file_density(doc, pts):
    """Density per spin set from the file's basis and coefficients (numpy/scipy only)."""
    phi = file_basis_values(doc, pts)
    out = []
    for _, occ, coef in file_orbital_sets(doc):
        psi = phi @ coef.T
        out.append(psi**2 @ occ)
    return out
