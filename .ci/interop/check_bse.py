"""Compares lobecast's committed sto-3g and sto-6g tables with the basis-set-exchange package.

Why: src/basis/data/sto-{3,6}g.json were imported from basis-set-exchange by
tools/import_bse.py; this check proves, in CI, that every exponent and
coefficient for H-Ar still equals the package's printed digits (parsed to the
same double), with the same shells in the same order (sp shells split into s
and p). It prints one line per element and set and exits 1 on any difference.

Uses only the installed package (its data ship inside it): no network access.

    python .ci/interop/check_bse.py [--data src/basis/data]
"""

import argparse
import json
import pathlib
import sys

import basis_set_exchange as bse

SYMBOLS = "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar".split()


def reference_shells(name, z):
    """The package's shells for element z as [(l, [(exponent, coefficient)])], sp split."""
    el = bse.get_basis(name, elements=[z], header=False)["elements"][str(z)]
    out = []
    for sh in el["electron_shells"]:
        ls = sh["angular_momentum"]
        if len(ls) == 1:
            ls = ls * len(sh["coefficients"])
        for l, coefs in zip(ls, sh["coefficients"]):
            out.append((l, [(float(a), float(c)) for a, c in zip(sh["exponents"], coefs)]))
    return out


def compare(ours, theirs):
    """List of human-readable differences (empty when identical)."""
    diffs = []
    if len(ours) != len(theirs):
        return [f"{len(ours)} shells, package has {len(theirs)}"]
    for i, (o, (l, prims)) in enumerate(zip(ours, theirs)):
        if o["l"] != l:
            diffs.append(f"shell {i}: l = {o['l']}, package l = {l}")
            continue
        if len(o["primitives"]) != len(prims):
            diffs.append(f"shell {i}: {len(o['primitives'])} primitives, package {len(prims)}")
            continue
        for j, ((a, c), (pa, pc)) in enumerate(zip(o["primitives"], prims)):
            if a != pa:
                diffs.append(f"shell {i} primitive {j}: exponent {a!r} != {pa!r}")
            if c != pc:
                diffs.append(f"shell {i} primitive {j}: coefficient {c!r} != {pc!r}")
    return diffs


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    root = pathlib.Path(__file__).resolve().parents[2]
    parser.add_argument("--data", type=pathlib.Path, default=root / "src" / "basis" / "data")
    args = parser.parse_args()
    print(f"basis-set-exchange {bse.version()}")
    failures = 0
    for name in ("sto-3g", "sto-6g"):
        table = json.loads((args.data / f"{name}.json").read_text())["elements"]
        for z in range(1, 19):
            ours = table.get(str(z))
            if ours is None:
                print(f"{name} {SYMBOLS[z - 1]:>2} (Z={z:2}): MISSING from our table")
                failures += 1
                continue
            theirs = reference_shells(name, z)
            diffs = compare(ours["shells"], theirs)
            nprim = sum(len(p) for _, p in theirs)
            if diffs:
                failures += 1
                print(f"{name} {SYMBOLS[z - 1]:>2} (Z={z:2}): DIFFERS: " + "; ".join(diffs))
            else:
                print(f"{name} {SYMBOLS[z - 1]:>2} (Z={z:2}): ok, {len(theirs)} shells, {nprim} exponent/coefficient pairs equal")
        extra = sorted(set(table) - {str(z) for z in range(1, 19)})
        if extra:
            print(f"{name}: unexpected elements {extra}")
            failures += 1
    if failures:
        print(f"FAILED: {failures} element tables differ from basis-set-exchange")
        return 1
    print("all sto-3g and sto-6g tables H-Ar equal basis-set-exchange")
    return 0


if __name__ == "__main__":
    sys.exit(main())
