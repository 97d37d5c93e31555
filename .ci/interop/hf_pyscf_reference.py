"""PySCF's side of check_hf_pyscf.py (and tools/bench_hf_pyscf.py): the same basis
data from basis-set-exchange, a tightly converged stable SCF, and the reference
quantities (Mulliken charges, dipole about a given origin, <S^2>, density).

PySCF is used only for integrals, basis parsing, SCF and atomic-orbital values.
"""
import numpy as np

import basis_set_exchange as bse
from pyscf import gto, scf
from pyscf.dft import numint

from hf_orbital_file import file_basis_values

# CODATA 2018 Bohr radius in ångström (NIST CODATA 2018: 0.529 177 210 903(80) e-10 m),
# the constant lobecast converts XYZ ångström with. PySCF's own constant is the 2010
# value (0.52917721092), 3e-11 relative away: enough to move the nuclear repulsion of
# O2 by ~1e-9 hartree, beyond the 1e-10 tolerance. So PySCF gets the same ångström
# coordinates with this constant as its unit (PySCF's `unit` accepts a number: the
# Bohr radius in the input's unit), i.e. the same bohr positions as lobecast.
BOHR_ANGSTROM = 0.529177210903

# Pople sets are used with Cartesian d (6d) by default, cc-pVDZ with pure d (5d):
# the contract of `lobecast solve --basis`, and the sets' usual definitions.
CARTESIAN_BY_DEFAULT = {"sto-3g": True, "3-21g": True, "6-31g": True, "6-31g*": True,
                        "6-31g**": True, "cc-pvdz": False}


def bse_basis_for_pyscf(name, symbols):
    """The basis from basis-set-exchange (NWChem format), parsed by PySCF, per element."""
    out = {}
    for sym in sorted(set(symbols)):
        text = bse.get_basis(name, elements=[sym], fmt="nwchem", header=False)
        out[sym] = gto.basis.parse(text, symb=sym, optimize=False)
    return out


def uses_cartesian(case):
    if case.functions is not None:
        return case.functions == "cartesian"
    return CARTESIAN_BY_DEFAULT[case.basis]


def pyscf_solve(case):
    """PySCF's molecule and converged SCF (internal stability checked) for one case."""
    mol = gto.Mole()
    mol.atom = [(s, (x, y, z)) for s, x, y, z in case.atoms]
    mol.basis = bse_basis_for_pyscf(case.basis, [a[0] for a in case.atoms])
    # Pople sets: cart=True (Cartesian d), cc-pVDZ: cart=False (pure), unless the
    # case asks lobecast for the other kind with --functions.
    mol.cart = uses_cartesian(case)
    mol.charge = case.charge
    mol.spin = case.multiplicity - 1
    mol.verbose = 0
    mol.build(unit=BOHR_ANGSTROM)  # ångström input, CODATA 2018 (see BOHR_ANGSTROM)
    mf = scf.RHF(mol) if case.method == "rhf" else scf.UHF(mol)
    mf.conv_tol = 1e-12
    mf.conv_tol_grad = 1e-9
    mf.max_cycle = 200
    mf.kernel()
    # Follow internal instabilities down to a stable solution, so that the reference
    # is a true local minimum, not a saddle point that depends on the first guess
    # (for the molecules here PySCF's first solution is already stable; O2 triplet
    # in STO-3G would be one that is not: 1.3 mhartree above the stable UHF).
    unstable = []
    for _ in range(3):
        mo, _, stable, _ = mf.stability(return_status=True)
        if stable:
            break
        unstable.append(mf.e_tot)
        mf.kernel(mf.make_rdm1(mo, mf.mo_occ))
    if not mf.converged:
        raise RuntimeError(f"{case.name}: PySCF SCF did not converge")
    return mol, mf, unstable


def pyscf_reference(case):
    mol, mf, unstable = pyscf_solve(case)
    ref = {"unstable": unstable, "mol": mol, "mf": mf, "e_tot": mf.e_tot, "e_nuc": mol.energy_nuc(), "nao": mol.nao_nr()}
    if case.method == "rhf":
        occ = [(mf.mo_energy, mf.mo_occ > 0)]
        ref["dm_spin"] = [mf.make_rdm1()]
        ref["s2"] = 0.0
    else:
        occ = [(mf.mo_energy[s], mf.mo_occ[s] > 0) for s in (0, 1)]
        ref["dm_spin"] = list(mf.make_rdm1())
        ref["s2"] = mf.spin_square()[0]
    ref["levels"] = [(np.sort(e[o]), np.sort(e[~o])) for e, o in occ]
    ref["mulliken"] = np.asarray(mf.mulliken_pop(verbose=0)[1])
    return ref


def pyscf_dipole(ref, origin):
    """Dipole (au) about `origin` from PySCF's density: -tr(D r) + sum Z (R - origin)."""
    mol = ref["mol"]
    dm = sum(ref["dm_spin"])
    with mol.with_common_orig(origin):
        r = mol.intor_symmetric("int1e_r", comp=3)
    electronic = -np.einsum("xij,ji->x", r, dm)
    nuclear = np.einsum("a,ax->x", mol.atom_charges(), mol.atom_coords() - np.asarray(origin))
    return electronic + nuclear


def pyscf_density(ref, pts):
    """PySCF's density per spin (one entry, the total, for RHF) at points in bohr."""
    ao = numint.eval_ao(ref["mol"], pts)
    return [numint.eval_rho(ref["mol"], ao, dm) for dm in ref["dm_spin"]]


def file_to_pyscf_map(doc, mol):
    """T with (file's basis functions) = (PySCF's AOs) @ T, fitted by least squares at
    points around each nucleus on three scales (tight, valence, diffuse), and the worst
    residual of the fit relative to each function's largest value. A residual at
    rounding level says the file's functions span exactly PySCF's basis (same
    exponents and contractions); T then carries PySCF's overlap integrals over to the
    file's functions: S_file = T^T S T."""
    rng = np.random.default_rng(7)
    pos = mol.atom_coords()
    pts = np.vstack([p + scale * rng.standard_normal((400, 3)) for p in pos for scale in (0.15, 0.7, 2.5)])
    mine = file_basis_values(doc, pts)
    theirs = numint.eval_ao(mol, pts)
    t = np.linalg.lstsq(theirs, mine, rcond=None)[0]
    residual = np.max(np.abs(theirs @ t - mine), axis=0) / np.max(np.abs(mine), axis=0)
    return t, float(np.max(residual))
