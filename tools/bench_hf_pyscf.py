#!/usr/bin/env python3
"""Benchmarks `lobecast solve` against PySCF: benzene RHF/6-31G*, wall time and peak memory.

Not run in CI. Each run is a fresh child process (lobecast, or this script's
PySCF child with OMP_NUM_THREADS=2); its wall time is measured around the
process, its peak resident memory is the child's own ru_maxrss (os.wait4).
Prints the median of N runs of each and the ratios lobecast / PySCF. PySCF's
time includes starting Python and importing PySCF, as a user would see it;
the SCF alone is printed beside it.

Both converge to about the same point: lobecast's default (|dE| < 1e-10 hartree,
RMS commutator < 1e-7); PySCF conv_tol 1e-10, conv_tol_grad 1e-7. Same basis
data (basis-set-exchange, NWChem format, parsed by PySCF; Cartesian d).

    python -m venv /tmp/venv-pyscf
    /tmp/venv-pyscf/bin/pip install -r .ci/interop/requirements-pyscf.txt
    /tmp/venv-pyscf/bin/python tools/bench_hf_pyscf.py --lobecast target/release/lobecast
"""
import argparse
import json
import math
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / ".ci" / "interop"))

# Benzene, D6h: r(CC) 1.397 A, r(CH) 1.084 A, NIST CCCBDB experimental geometry
# (from memory).
R_CC, R_CH = 1.397, 1.084


def benzene_xyz():
    lines = ["12", "benzene D6h, r(CC) 1.397 A, r(CH) 1.084 A (CCCBDB experimental, from memory)"]
    for k in range(6):
        t = math.radians(60 * k)
        lines.append(f"C {R_CC * math.cos(t):.10f} {R_CC * math.sin(t):.10f} 0.0")
    for k in range(6):
        t = math.radians(60 * k)
        r = R_CC + R_CH
        lines.append(f"H {r * math.cos(t):.10f} {r * math.sin(t):.10f} 0.0")
    return "\n".join(lines) + "\n"


def pyscf_child(xyz_path):
    """Runs in the child: RHF/6-31G* on the XYZ; prints {"energy", "scf_seconds"}."""
    from pyscf import gto, scf

    from hf_pyscf_reference import BOHR_ANGSTROM, bse_basis_for_pyscf

    rows = Path(xyz_path).read_text().splitlines()[2:]
    atoms = [(s, (float(x), float(y), float(z))) for s, x, y, z in (r.split() for r in rows if r.strip())]
    mol = gto.Mole()
    mol.atom = atoms
    mol.basis = bse_basis_for_pyscf("6-31g*", [a[0] for a in atoms])
    mol.cart = True  # Pople set: Cartesian d
    mol.verbose = 0
    mol.build(unit=BOHR_ANGSTROM)
    t0 = time.perf_counter()
    mf = scf.RHF(mol)
    mf.conv_tol, mf.conv_tol_grad = 1e-10, 1e-7
    energy = mf.kernel()
    print(json.dumps({"energy": energy, "scf_seconds": time.perf_counter() - t0,
                      "converged": bool(mf.converged)}))


def measure(cmd, env):
    """(wall seconds, peak RSS in MiB, stdout) of one child process, reaped with
    os.wait4 so that the peak is this child's alone."""
    with tempfile.TemporaryFile("w+") as out, tempfile.TemporaryFile("w+") as err:
        t0 = time.perf_counter()
        proc = subprocess.Popen(cmd, env=env, stdout=out, stderr=err, text=True)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.perf_counter() - t0
        proc.returncode = os.waitstatus_to_exitcode(status)
        out.seek(0)
        err.seek(0)
        if proc.returncode != 0:
            raise RuntimeError(f"{' '.join(cmd)} exited {proc.returncode}:\n{err.read()}")
        return wall, usage.ru_maxrss / 1024.0, out.read()


def main():
    if len(sys.argv) == 3 and sys.argv[1] == "--pyscf-child":
        pyscf_child(sys.argv[2])
        return 0
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--repeats", type=int, default=3)
    ap.add_argument("--workdir", type=Path, default=None)
    args = ap.parse_args()
    work = args.workdir or Path(tempfile.mkdtemp(prefix="bench-hf-"))
    work.mkdir(parents=True, exist_ok=True)
    xyz = work / "benzene.xyz"
    xyz.write_text(benzene_xyz())
    env = dict(os.environ, OMP_NUM_THREADS="2")

    runs = {"pyscf": [], "lobecast": []}
    energies = {}
    for _ in range(args.repeats):
        wall, rss, out = measure([sys.executable, __file__, "--pyscf-child", str(xyz)], env)
        res = json.loads(out.strip().splitlines()[-1])
        if not res["converged"]:
            raise RuntimeError("PySCF did not converge")
        runs["pyscf"].append((wall, rss, res["scf_seconds"]))
        energies["pyscf"] = res["energy"]
        out_json = work / "benzene.json"
        wall, rss, _ = measure([args.lobecast, "solve", str(xyz), "--method", "rhf", "--basis", "6-31g*",
                                "--json", str(out_json)], env)
        runs["lobecast"].append((wall, rss, None))
        energies["lobecast"] = json.loads(out_json.read_text())["total_energy"]

    med = {k: (statistics.median(r[0] for r in v), statistics.median(r[1] for r in v)) for k, v in runs.items()}
    scf_only = statistics.median(r[2] for r in runs["pyscf"])
    print(f"benzene RHF/6-31G* (Cartesian d, 102 functions), median of {args.repeats}, OMP_NUM_THREADS=2")
    print(f"  PySCF    {med['pyscf'][0]:8.2f} s  (SCF alone {scf_only:.2f} s)  peak {med['pyscf'][1]:8.1f} MiB"
          f"  E = {energies['pyscf']:.10f}")
    print(f"  lobecast {med['lobecast'][0]:8.2f} s                      peak {med['lobecast'][1]:8.1f} MiB"
          f"  E = {energies['lobecast']:.10f}")
    print(f"  lobecast / PySCF: time {med['lobecast'][0] / med['pyscf'][0]:.2f}x "
          f"(vs SCF alone {med['lobecast'][0] / scf_only:.2f}x), "
          f"peak memory {med['lobecast'][1] / med['pyscf'][1]:.2f}x; "
          f"|dE| = {abs(energies['lobecast'] - energies['pyscf']):.1e} hartree")
    return 0


if __name__ == "__main__":
    sys.exit(main())
