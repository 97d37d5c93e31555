"""Interop check: lobecast's Hartree-Fock (RHF/UHF, named basis sets) against PySCF.

PySCF (a general-purpose reference library from PyPI) is used only for its
integrals, basis parsing, SCF, Mulliken populations, <S^2> and atomic-orbital
values; nothing of it writes or reads a file here.

For each molecule below, `lobecast solve MOL.xyz --method rhf|uhf --basis NAME
--json OUT.json` runs, and PySCF solves the same molecule in the same basis:
the basis data come from the basis-set-exchange package in NWChem format,
parsed by `pyscf.gto.basis.parse`, so both programs start from the same digits.
Compared (tolerances, see TOL): total energy, nuclear repulsion, orbital
energies (occupied and the lowest virtuals, per spin), Mulliken charges, the
dipole about the origin the file states, UHF <S^2>, and the electron density
at 2000 points, evaluated from the orbital file's own basis entries and
coefficients by a small numpy/scipy evaluator (hf_orbital_file.py, a second
implementation of the file's documented conventions) against PySCF's density
from its own SCF. Also: the file's basis functions span exactly PySCF's basis
(a least-squares map between the two sets of function values), and under
PySCF's overlap integrals carried over by that map every file function has norm
1 and the orbitals, virtuals included, are orthonormal.

Prints one line per molecule with the worst deviations; exits 1 on any failure.

    check_hf_pyscf.py --lobecast PATH --workdir DIR
"""
import argparse
import json
import math
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

import numpy as np

import basis_set_exchange as bse
import pyscf

from hf_orbital_file import file_density, file_orbital_sets
from hf_pyscf_reference import (BOHR_ANGSTROM, file_to_pyscf_map, pyscf_density, pyscf_dipole,
                                pyscf_reference)

# Tolerances (absolute, atomic units).
TOL = {
    # Energies are second order in the density error, so an SCF
    # stopped at an RMS commutator of 1e-7 (lobecast's documented default) is far
    # inside 1e-8 hartree; the nuclear repulsion is closed-form from the positions.
    "energy": 1e-8,
    "nuclear_repulsion": 1e-10,
    # Orbital energies, Mulliken charges and the dipole are first order in the
    # density error (~1e-7 at that commutator), hence 1e-6 and 1e-5.
    "orbital_energy": 1e-6,
    "mulliken": 1e-5,
    "dipole": 1e-5,
    "s_squared": 1e-6,
    # The file's basis functions as a linear map of PySCF's AOs: worst residual
    # relative to each function's size. Both come from the same printed digits, so
    # only rounding separates them; a changed digit in a coefficient (1e-7) shows.
    "basis_fit": 1e-9,
    # Each file function normalised to 1 (the file's convention) and the orbitals
    # orthonormal, under PySCF's overlap integrals carried over by that map.
    "orthonormal": 1e-8,
    # Positions in the file vs the XYZ converted with BOHR_ANGSTROM (bohr).
    "position": 1e-10,
}
# Density: |lobecast - PySCF| <= DENSITY_ATOL + DENSITY_RTOL * rho_PySCF.
# 1e-8 absolute where the density is small (tails and bonds, rho < ~0.01); near
# nuclei the density reaches ~300 au (O 1s) and 1e-8 absolute would ask for 3e-11
# relative, more than any SCF converged to a commutator of 1e-7 can give: the
# density matrix itself is only good to ~1e-7 relative there. 1e-6 relative is
# ten times that, and still 1e4 times smaller than what a wrong normalisation or
# sign of one d or p function would do to the density (>1e-2 relative where that
# function matters). Both programs' own floors are below this.
DENSITY_ATOL = 1e-8
DENSITY_RTOL = 1e-6
# How many virtual orbitals per spin are compared besides the occupied ones.
VIRTUALS = 5
# Points for the density comparison (seeded: the same points every run).
POINTS = 2000

SYMBOLS = "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar".split()

@dataclass
class Case:
    name: str
    method: str  # "rhf" or "uhf"
    basis: str
    charge: int
    multiplicity: int
    atoms: list  # [(symbol, x, y, z)] in ångström
    source: str
    functions: str = None  # None: the set's default; "pure" or "cartesian" to override
    published_energy: tuple = None  # (value, tolerance, source) for an outside anchor


def bent(sym_c, sym_h, r, angle_deg):
    """A-H2 in the xz plane, A at the origin, bisector along +z."""
    h = math.radians(angle_deg) / 2
    return [(sym_c, 0.0, 0.0, 0.0), (sym_h, r * math.sin(h), 0.0, r * math.cos(h)),
            (sym_h, -r * math.sin(h), 0.0, r * math.cos(h))]


def pyramid(sym_c, sym_h, r, angle_deg):
    """A-H3 of C3v symmetry with H-A-H angle `angle_deg`, A at the origin, axis z."""
    # H.H' = r^2 (1 - 1.5 sin^2 b) for the polar angle b of each bond.
    sb = math.sqrt((1 - math.cos(math.radians(angle_deg))) / 1.5)
    cb = math.sqrt(1 - sb * sb)
    return [(sym_c, 0.0, 0.0, 0.0)] + [
        (sym_h, r * sb * math.cos(2 * math.pi * k / 3), r * sb * math.sin(2 * math.pi * k / 3), -r * cb)
        for k in range(3)]


def tetrahedron(sym_c, sym_h, r):
    s = r / math.sqrt(3)
    return [(sym_c, 0.0, 0.0, 0.0)] + [(sym_h, s * a, s * b, s * c) for a, b, c in
                                       ((1, 1, 1), (1, -1, -1), (-1, 1, -1), (-1, -1, 1))]


def diatomic(a, b, r):
    return [(a, 0.0, 0.0, 0.0), (b, 0.0, 0.0, r)]


# Geometries: experimental equilibrium structures as tabulated in NIST CCCBDB
# (experimental geometries; values "from memory", rounded as shown) or "common
# practice" rounded values. They need only be the same for both programs.
CASES = [
    Case("H2", "rhf", "sto-3g", 0, 1, diatomic("H", "H", 1.4 * BOHR_ANGSTROM),
         "R = 1.4 bohr, Szabo & Ostlund, Modern Quantum Chemistry, ch. 3",
         published_energy=(-1.1167, 1e-4, "Szabo & Ostlund ch. 3, STO-3G H2 at 1.4 bohr (from memory)")),
    Case("H2O", "rhf", "6-31g*", 0, 1, bent("O", "H", 0.9572, 104.52),
         "CCCBDB experimental r(OH) 0.9572 A, HOH 104.52 deg (from memory)"),
    Case("H2O pure d", "rhf", "6-31g*", 0, 1, bent("O", "H", 0.9572, 104.52),
         "as H2O", functions="pure"),
    Case("NH3", "rhf", "cc-pvdz", 0, 1, pyramid("N", "H", 1.012, 106.7),
         "CCCBDB experimental r(NH) 1.012 A, HNH 106.7 deg (from memory)"),
    Case("NH3 cartesian d", "rhf", "cc-pvdz", 0, 1, pyramid("N", "H", 1.012, 106.7),
         "as NH3", functions="cartesian"),
    Case("CH4", "rhf", "6-31g**", 0, 1, tetrahedron("C", "H", 1.087),
         "CCCBDB experimental r(CH) 1.087 A, Td (from memory)"),
    Case("HF", "rhf", "3-21g", 0, 1, diatomic("F", "H", 0.9168),
         "CCCBDB experimental r 0.9168 A (from memory)"),
    Case("N2", "rhf", "6-31g", 0, 1, diatomic("N", "N", 1.0977),
         "CCCBDB experimental r 1.0977 A (from memory)"),
    Case("H3O+", "rhf", "sto-3g", 1, 1, pyramid("O", "H", 0.98, 112.0),
         "common practice: r(OH) 0.98 A, HOH 112 deg, C3v"),
    Case("NH4+", "rhf", "6-31g", 1, 1, tetrahedron("N", "H", 1.02),
         "common practice: r(NH) 1.02 A, Td"),
    Case("H2O+ doublet", "uhf", "6-31g*", 1, 2, bent("O", "H", 0.9572, 104.52),
         "neutral H2O geometry (vertical ion, common practice)"),
    Case("CH2 triplet", "uhf", "cc-pvdz", 0, 3, bent("C", "H", 1.0753, 133.93),
         "triplet methylene r(CH) 1.0753 A, HCH 133.93 deg (Jensen & Bunker 1988, from memory)"),
    Case("O2 triplet", "uhf", "6-31g", 0, 3, diatomic("O", "O", 1.2075),
         "CCCBDB experimental r 1.2075 A (from memory)"),
]


def sample_points(doc, rng):
    """Half uniform in the molecule's box padded by 3 bohr, half within ~0.8 bohr of
    the nuclei (where core and polarisation functions matter)."""
    pos = np.array([a["position"] for a in doc["atoms"]], dtype=float)
    lo, hi = pos.min(axis=0) - 3.0, pos.max(axis=0) + 3.0
    n_box = POINTS // 2
    box = lo + (hi - lo) * rng.random((n_box, 3))
    near = pos[rng.integers(0, len(pos), POINTS - n_box)] + 0.8 * rng.standard_normal((POINTS - n_box, 3))
    return np.vstack([box, near])


# ---------------------------------------------------------------------------
# The comparison


def write_xyz(case, path):
    lines = [str(len(case.atoms)), f"{case.name}: {case.source}"]
    lines += [f"{s} {x:.12f} {y:.12f} {z:.12f}" for s, x, y, z in case.atoms]
    path.write_text("\n".join(lines) + "\n")


def run_lobecast(exe, case, work):
    stem = case.name.replace(" ", "_").replace("+", "plus")
    xyz, out = work / f"{stem}.xyz", work / f"{stem}.json"
    write_xyz(case, xyz)
    cmd = [exe, "solve", str(xyz), "--method", case.method, "--basis", case.basis,
           "--charge", str(case.charge), "--multiplicity", str(case.multiplicity), "--json", str(out)]
    if case.functions:
        cmd += ["--functions", case.functions]
    proc = subprocess.run(cmd, capture_output=True, text=True)
    if proc.returncode != 0:
        err = "\n".join(proc.stderr.strip().splitlines()[:6])
        raise RuntimeError(f"{' '.join(cmd)} exited {proc.returncode}:\n{err}")
    return json.loads(out.read_text())


class Checker:
    """Collects worst deviations per quantity and failures for one molecule."""

    def __init__(self):
        self.worst = {}
        self.failures = []

    def close(self, key, got, want, tol):
        got, want = np.atleast_1d(np.asarray(got, float)), np.atleast_1d(np.asarray(want, float))
        if got.shape != want.shape:
            self.failures.append(f"{key}: {got.shape[0]} values, PySCF has {want.shape[0]}")
            return
        got, want = got.ravel(), want.ravel()
        dev = float(np.max(np.abs(got - want))) if got.size else 0.0
        self.worst[key] = max(self.worst.get(key, 0.0), dev)
        if not dev <= tol:
            i = int(np.argmax(np.abs(got - want)))
            self.failures.append(f"{key}: |lobecast - reference| = {dev:.2e} > {tol:.0e} "
                                 f"(index {i}: {got[i]:.12g} vs {want[i]:.12g})")

    def require(self, cond, message):
        if not cond:
            self.failures.append(message)


def centre_of_nuclear_charge(doc):
    z = np.array([a["atomic_number"] for a in doc["atoms"]], dtype=float)
    pos = np.array([a["position"] for a in doc["atoms"]], dtype=float)
    return z @ pos / z.sum()


def compare(case, doc, ref, rng):
    c = Checker()
    mol = ref["mol"]
    # Header and geometry.
    c.require(doc.get("format") == "lobecast-orbitals" and doc.get("version") == 2,
              f"format/version {doc.get('format')!r}/{doc.get('version')!r}")
    # "method" is free text (e.g. "rhf, sto-3g"): it must name the method.
    c.require(case.method in str(doc.get("method", "")).lower().replace(",", " ").split(),
              f"method {doc.get('method')!r} does not name {case.method}")
    c.require(doc.get("charge") == case.charge and doc.get("multiplicity") == case.multiplicity,
              f"charge/multiplicity {doc.get('charge')}/{doc.get('multiplicity')}")
    c.require([a["element"] for a in doc["atoms"]] == [a[0] for a in case.atoms], "atom elements differ")
    c.require([a["atomic_number"] for a in doc["atoms"]] == [SYMBOLS.index(a[0]) + 1 for a in case.atoms],
              "atomic numbers differ")
    want_pos = np.array([a[1:] for a in case.atoms]) / BOHR_ANGSTROM
    c.close("position", [a["position"] for a in doc["atoms"]], want_pos, TOL["position"])
    c.require(len(doc["basis"]) == ref["nao"],
              f"{len(doc['basis'])} basis functions, PySCF has {ref['nao']}")
    if c.failures:
        return c

    # Energies.
    c.close("E_nuc", doc["nuclear_repulsion"], ref["e_nuc"], TOL["nuclear_repulsion"])
    c.close("E_tot", doc["total_energy"], ref["e_tot"], TOL["energy"])

    # Orbital levels per spin: occupied ones, then the lowest virtuals.
    sets = file_orbital_sets(doc)
    if len(sets) != len(ref["levels"]):
        c.failures.append(f"{len(sets)} orbital set(s) in the file, {case.method.upper()} has {len(ref['levels'])}")
        return c
    n_elec = mol.nelectron
    c.close("electrons", sum(float(occ.sum()) for _, occ, _ in sets), n_elec, 1e-12)
    full = 2.0 if case.method == "rhf" else 1.0
    for s, ((energy, occ, coef), (ref_occ, ref_vir)) in enumerate(zip(sets, ref["levels"])):
        if coef.shape != (len(energy), ref["nao"]):
            c.failures.append(f"spin set {s}: coefficient matrix {coef.shape}, want ({len(energy)}, {ref['nao']})")
            return c
        c.require(np.all((occ == 0.0) | (occ == full)), f"spin set {s}: occupations not 0/{full:g}")
        occupied, virtual = np.sort(energy[occ > 0]), np.sort(energy[occ == 0])
        c.close("eps_occ", occupied, ref_occ, TOL["orbital_energy"])
        k = min(VIRTUALS, len(ref_vir))
        c.close("eps_vir", virtual[:k], ref_vir[:k], TOL["orbital_energy"])

    # The file's basis is PySCF's basis (span), each function normalised to 1 under
    # PySCF's overlap integrals, and the orbitals (virtuals too) orthonormal.
    t, residual = file_to_pyscf_map(doc, mol)
    c.close("basis_fit", residual, 0.0, TOL["basis_fit"])
    s_file = t.T @ mol.intor_symmetric("int1e_ovlp") @ t
    c.close("norm", np.diag(s_file), np.ones(len(s_file)), TOL["orthonormal"])
    for _, _, coef in sets:
        c.close("orthonormal", coef @ s_file @ coef.T, np.eye(len(coef)), TOL["orthonormal"])

    # Properties.
    props = doc["properties"]
    c.close("mulliken", props["mulliken_charges"], ref["mulliken"], TOL["mulliken"])
    origin = np.asarray(props["dipole"]["origin"], dtype=float)
    # An ion's dipole depends on the origin: the documented one is the centre of
    # nuclear charge. A neutral molecule's does not, so any stated origin will do.
    if case.charge != 0:
        c.close("dipole_origin", origin, centre_of_nuclear_charge(doc), 1e-10)
    c.close("dipole", props["dipole"]["au"], pyscf_dipole(ref, origin), TOL["dipole"])
    s2 = props.get("s_squared")
    if case.method == "uhf":
        c.require(s2 is not None, "UHF file has no s_squared")
        if s2 is not None:
            c.close("S2", s2, ref["s2"], TOL["s_squared"])
    elif s2 is not None:  # closed-shell RHF: exactly 0 when given
        c.close("S2", s2, 0.0, TOL["s_squared"])

    # Density at points: the file's conventions (second implementation) vs PySCF's SCF.
    pts = sample_points(doc, rng)
    mine, theirs = file_density(doc, pts), pyscf_density(ref, pts)
    for s, (got, want) in enumerate(zip(mine, theirs)):
        # Worst |difference| and worst fraction of the tolerance used (fails above 1).
        frac = np.abs(got - want) / (DENSITY_ATOL + DENSITY_RTOL * np.abs(want))
        c.worst["rho_abs"] = max(c.worst.get("rho_abs", 0.0), float(np.max(np.abs(got - want))))
        c.worst["rho/tol"] = max(c.worst.get("rho/tol", 0.0), float(np.max(frac)))
        if not np.all(frac <= 1.0):
            i = int(np.argmax(frac))
            c.failures.append(f"density (spin set {s}) at {pts[i].round(4).tolist()} bohr: "
                              f"file {got[i]:.10e}, PySCF {want[i]:.10e} "
                              f"(tolerance {DENSITY_ATOL:.0e} + {DENSITY_RTOL:.0e} rho)")
    return c


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True, type=Path)
    ap.add_argument("--only", action="append", default=[],
                    help="run only the named molecule(s), e.g. --only H2O (repeatable)")
    args = ap.parse_args()
    cases = [c for c in CASES if not args.only or c.name in args.only]
    if not cases:
        ap.error(f"no molecule named {args.only}; known: {[c.name for c in CASES]}")
    args.workdir.mkdir(parents=True, exist_ok=True)
    print(f"PySCF {pyscf.__version__}, basis-set-exchange {bse.version()}")
    rng = np.random.default_rng(20261204)
    failed = []
    for case in cases:
        label = f"{case.name} {case.method.upper()}/{case.basis}"
        try:
            ref = pyscf_reference(case)
            if case.published_energy:
                value, tol, source = case.published_energy
                if abs(ref["e_tot"] - value) > tol:
                    raise RuntimeError(f"PySCF setup: E = {ref['e_tot']:.6f}, {source} gives {value}")
            doc = run_lobecast(args.lobecast, case, args.workdir)
            c = compare(case, doc, ref, rng)
        except Exception as e:  # noqa: BLE001 - any failure is reported per molecule
            print(f"{label:32} FAIL: {e}")
            failed.append(case.name)
            continue
        worst = "  ".join(f"{k} {v:.1e}" for k, v in c.worst.items() if k not in ("electrons",))
        print(f"{label:32} {'ok  ' if not c.failures else 'FAIL'} E={ref['e_tot']:.10f}  {worst}")
        for e in ref["unstable"]:
            print(f"    note: PySCF's first solution, E = {e:.10f}, was internally unstable; "
                  "the reference is the stable one below it")
        for f in c.failures:
            print(f"    {f}")
        if c.failures:
            failed.append(case.name)
    if failed:
        print(f"FAILED: lobecast's Hartree-Fock differs from PySCF for {len(failed)} of "
              f"{len(cases)} molecules: {', '.join(failed)}")
        return 1
    print(f"all {len(cases)} molecules: lobecast's RHF/UHF equals PySCF within the tolerances")
    return 0


if __name__ == "__main__":
    sys.exit(main())
