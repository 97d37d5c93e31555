"""Compares every named basis set lobecast embeds with the basis-set-exchange package.

Why: the tables in src/basis/data/ that src/basis/named.rs embeds (sto-3g,
sto-6g, 3-21g, 6-31g, 6-31g*, 6-31g**, cc-pvdz) were imported from
basis-set-exchange by tools/import_bse.py; this check proves, in CI, that every
exponent and coefficient for H-Ar still equals the package's printed digits
(parsed to the same double), with the same shells and l in the same order (sp
shells split into s and p, each column of a general contraction its own shell),
and that each file's d-function convention ("functions") is the one the package
gives. It prints one line per element and set and exits 1 on any difference.

Uses only the installed package (its data ship inside it): no network access.

    python .ci/interop/check_bse.py [--data src/basis/data] [--named src/basis/named.rs]
"""

import argparse
import json
import pathlib
import re
import sys

import basis_set_exchange as bse

SYMBOLS = "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar".split()
BSE_TYPES = {"gto_cartesian": "cartesian", "gto_spherical": "pure"}


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


def package_convention(name):
    """"cartesian" | "pure" | None: the function type of the package's l >= 2 shells of
    H-Ar, or, if it has none there, the one its metadata lists for the whole set."""
    basis = bse.get_basis(name, elements=list(range(1, 19)), header=False)
    types = {
        sh["function_type"]
        for el in basis["elements"].values()
        for sh in el["electron_shells"]
        if max(sh["angular_momentum"]) >= 2
    }
    if not types:
        types = set(bse.get_metadata()[bse.misc.transform_basis_name(name)]["function_types"])
    known = {BSE_TYPES[t] for t in types if t in BSE_TYPES}
    return known.pop() if len(known) == 1 else None


def check_convention(name, data):
    """One line about the file's "functions" against the package; (ok, line)."""
    has_high_l = any(sh["l"] >= 2 for el in data["elements"].values() for sh in el["shells"])
    ours = data.get("functions")
    if ours is None:
        return not has_high_l, f"{name}: no functions recorded, " + (
            "shells with l >= 2 present: FAILS" if has_high_l else "none needed (s and p shells only)")
    theirs = package_convention(name)
    ok = ours == theirs
    return ok, f"{name}: functions = {ours!r}, package {theirs!r}: " + ("ok" if ok else "DIFFERS")


def embedded_files(named_rs):
    """The data files src/basis/named.rs embeds, so that none goes unchecked."""
    return re.findall(r'include_str!\("data/([^"]+)"\)', named_rs.read_text())


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
    parser.add_argument("--named", type=pathlib.Path, default=root / "src" / "basis" / "named.rs")
    args = parser.parse_args()
    print(f"basis-set-exchange {bse.version()}")
    failures = 0
    files = embedded_files(args.named)
    if len(files) < 7:
        print(f"FAILED: found only {files} embedded in {args.named}")
        return 1
    names = []
    for file in files:
        data = json.loads((args.data / file).read_text())
        name = data["name"]
        names.append(name)
        ok, line = check_convention(name, data)
        print(line)
        failures += not ok
        table = data["elements"]
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
        print(f"FAILED: {failures} element tables or conventions differ from basis-set-exchange")
        return 1
    print(f"all {', '.join(names)} tables H-Ar equal basis-set-exchange")
    return 0


if __name__ == "__main__":
    sys.exit(main())
