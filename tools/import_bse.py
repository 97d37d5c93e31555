"""Writes src/basis/data/*.json (the named sets and sto-ng), so their provenance is reproducible.

Why: lobecast embeds its basis data as plain JSON in its own simple format; this
script is the one place that data comes from.

* sto-3g.json, sto-6g.json: H-Ar, copied digit for digit from the
  basis-set-exchange package (pinned in .ci/interop/requirements-bse.txt).
  They reproduce W. J. Hehre, R. F. Stewart, J. A. Pople, J. Chem. Phys. 51,
  2657 (1969) for H-Ne and W. J. Hehre, R. Ditchfield, R. F. Stewart,
  J. A. Pople, J. Chem. Phys. 52, 2769 (1970) for Na-Ar (the references the
  package gives per element). Each sp shell becomes an s and a p shell with
  the same exponents.
* 3-21g.json, 6-31g.json, 6-31g_st.json (6-31G*), 6-31g_st_st.json (6-31G**),
  cc-pvdz.json: H-Ar, copied digit for digit from the same package, with the
  references it gives per element. sp shells are split as above; each column
  of a general contraction (several coefficient lists on one exponent list, as
  in cc-pVDZ) becomes a shell of its own with every primitive kept, zero
  coefficients included, exactly as the package gives them. Each file records
  its d-function convention ("functions": "cartesian" or "pure") and where it
  comes from: the package's function_type of the l >= 2 shells of H-Ar where
  there are any, otherwise the package's metadata for the whole set (which
  lists the function types of its heavier elements); either must agree with
  the set's published convention (Pople sets Cartesian 6d, Dunning sets pure
  5d), or the import stops.
* sto-ng.json: zeta = 1 expansions of 1s, 2s, 2p, 3s, 3p, 3d with 1-6
  Gaussians, computed by tools/fit_sto_ng.py, and checked here against every
  published expansion the package carries (STO-2G ... STO-6G, 1s/2sp/3sp, H-Ar):
  the coefficients must agree, and each shell's exponents must be our zeta = 1
  exponents times one common factor zeta^2. The worst agreement is written
  beside every expansion.

Run (needs network only for pip):
    python3 -m venv /tmp/bse && /tmp/bse/bin/pip install -r .ci/interop/requirements-bse.txt -r tools/requirements-fit.txt
    /tmp/bse/bin/python tools/import_bse.py
"""

import json
import math
import pathlib
import re
import sys

import basis_set_exchange as bse

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent))
import fit_sto_ng  # noqa: E402

ROOT = pathlib.Path(__file__).resolve().parent.parent
DATA = ROOT / "src" / "basis" / "data"
ELEMENTS = range(1, 19)
SYMBOLS = "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar".split()


def reference_text(key):
    r = bse.get_reference_data()[key]
    authors = ", ".join(r["authors"])
    if r["_entry_type"] != "article":
        # e.g. a program's manual, cited by the package for data no paper printed
        authors = r["authors"][0] + (" et al." if len(r["authors"]) > 1 else "")
        return f"{authors}, {r['title']}, {r.get('note', '')}".rstrip(", ")
    return f"{authors}, {r['journal']} {r['volume']}, {r['pages']} ({r['year']}), doi:{r['doi']}"


def split_shells(element):
    """The element's shells in our format: one entry per l, sp split into s and p."""
    out = []
    for sh in element["electron_shells"]:
        assert sh["function_type"] in ("gto", "gto_spherical", "gto_cartesian"), sh["function_type"]
        ls = sh["angular_momentum"]
        if len(ls) == 1:
            ls = ls * len(sh["coefficients"])
        for l, coefs in zip(ls, sh["coefficients"]):
            prims = [[float(a), float(c)] for a, c in zip(sh["exponents"], coefs)]
            out.append({"l": l, "primitives": prims})
    return out


# The extended sets: our file name, the d-function convention the set was published
# with (Pople sets: six Cartesian d; Dunning sets: five pure d; from memory, and
# checked against what the package says), and a one-line description of ours.
EXTENDED = {
    "3-21g": ("3-21g", "cartesian", "split valence; core shells of 3 Gaussians, valence split 2 + 1"),
    "6-31g": ("6-31g", "cartesian", "split valence; core shells of 6 Gaussians, valence split 3 + 1"),
    "6-31g*": ("6-31g_st", "cartesian", "6-31G with one set of d functions on Li-Ar"),
    "6-31g**": ("6-31g_st_st", "cartesian", "6-31G* with one set of p functions on H and He as well"),
    "cc-pvdz": ("cc-pvdz", "pure", "correlation-consistent polarised valence double zeta, general contractions; p on H and He, d on Li-Ar"),
}
BSE_TYPES = {"gto_cartesian": "cartesian", "gto_spherical": "pure"}


def convention(name, basis, published):
    """("cartesian" | "pure", sentence saying where it comes from) for set `name`."""
    types = {
        sh["function_type"]
        for el in basis["elements"].values()
        for sh in el["electron_shells"]
        if max(sh["angular_momentum"]) >= 2
    }
    if types:
        assert len(types) == 1 and types <= set(BSE_TYPES), (name, types)
        (t,) = types
        found = BSE_TYPES[t]
        where = f"basis-set-exchange marks every shell with l >= 2 of H-Ar {t!r}"
    else:
        meta = bse.get_metadata()[bse.misc.transform_basis_name(name)]["function_types"]
        known = [BSE_TYPES[t] for t in meta if t in BSE_TYPES]
        assert len(known) == 1, (name, meta)
        found = known[0]
        where = (
            "this set has no shells with l >= 2 for H-Ar, so the choice changes nothing here; "
            f"taken from basis-set-exchange's metadata for the whole set, function types {meta} "
            "(from the d shells of its elements beyond Ar)"
        )
    assert found == published, (name, found, published)
    return found, f"{where}; this agrees with the convention the set was published with"


def named_set(name):
    basis = bse.get_basis(name, elements=list(ELEMENTS), header=False)
    if name in EXTENDED:
        return extended_set(name, basis)
    keys = sorted({k for el in basis["elements"].values() for r in el["references"] for k in r["reference_keys"]})
    elements = {}
    for z in ELEMENTS:
        el = basis["elements"][str(z)]
        refs = [k for r in el["references"] for k in r["reference_keys"]]
        elements[str(z)] = {"symbol": SYMBOLS[z - 1], "reference": refs, "shells": split_shells(el)}
    return {
        "name": name,
        "description": f"{basis['name']}: least-squares Gaussian expansions of Slater functions with the standard molecular exponents, H-Ar.",
        "source": (
            f"basis-set-exchange {bse.version()} (PyPI), basis {basis['name']!r} version {basis['version']}; "
            f"imported by tools/import_bse.py; numbers equal to the printed digits."
        ),
        "conventions": "exponents in bohr^-2; coefficients multiply normalised primitives; each sp shell is split into an s and a p shell with the same exponents.",
        "references": {k: reference_text(k) for k in keys},
        "elements": elements,
    }


def extended_set(name, basis):
    missing = [z for z in ELEMENTS if str(z) not in basis["elements"]]
    assert not missing, (name, missing)
    keys = sorted({k for el in basis["elements"].values() for r in el["references"] for k in r["reference_keys"]})
    functions, where = convention(name, basis, EXTENDED[name][1])
    elements = {}
    for z in ELEMENTS:
        el = basis["elements"][str(z)]
        refs = [k for r in el["references"] for k in r["reference_keys"]]
        elements[str(z)] = {"symbol": SYMBOLS[z - 1], "reference": refs, "shells": split_shells(el)}
        counts = {"pure": 0, "cartesian": 0}
        for sh in elements[str(z)]["shells"]:
            counts["pure"] += 2 * sh["l"] + 1
            counts["cartesian"] += (sh["l"] + 1) * (sh["l"] + 2) // 2
        print(f"{name} {SYMBOLS[z - 1]:>2}: {len(elements[str(z)]['shells'])} shells, "
              f"{counts['pure']} pure / {counts['cartesian']} Cartesian functions")
    return {
        "name": name,
        "description": f"{basis['name']}, H-Ar: {EXTENDED[name][2]}.",
        "source": (
            f"basis-set-exchange {bse.version()} (PyPI), basis {basis['name']!r} version {basis['version']}; "
            f"imported by tools/import_bse.py; numbers equal to the printed digits."
        ),
        "conventions": (
            "exponents in bohr^-2; coefficients multiply normalised primitives; each sp shell is split into an s "
            "and a p shell with the same exponents; each column of a general contraction is a shell of its own, "
            "with every primitive as given (zero coefficients kept). "
            f"Functions with l >= 2 are {functions} by default: {where}."
        ),
        "functions": functions,
        "references": {k: reference_text(k) for k in keys},
        "elements": elements,
    }


def published_expansions():
    """{(kind, m): [(element, exponents, coefficients)]} from STO-2G ... STO-6G, H-Ar."""
    out = {}
    for m in range(2, 7):
        basis = bse.get_basis(f"sto-{m}g", elements=list(ELEMENTS), header=False)
        for z in ELEMENTS:
            shells = split_shells(basis["elements"][str(z)])
            kinds = ["1s"] + (["2s", "2p"] if z > 2 else []) + (["3s", "3p"] if z > 10 else [])
            assert len(shells) == len(kinds), (m, z, len(shells))
            for kind, sh in zip(kinds, shells):
                a = [p[0] for p in sh["primitives"]]
                c = [p[1] for p in sh["primitives"]]
                out.setdefault((kind, m), []).append((SYMBOLS[z - 1], a, c))
    return out


def compare(alphas, coefs, published):
    """Worst relative differences (coefficients, exponents after scaling) and the zeta of each element."""
    worst_c = worst_a = 0.0
    zetas = []
    for symbol, a, c in published:
        ratios = [pa / float(x) for pa, x in zip(a, alphas)]
        scale = sum(ratios) / len(ratios)
        zetas.append((symbol, math.sqrt(scale)))
        worst_a = max(worst_a, max(abs(r / scale - 1) for r in ratios))
        worst_c = max(worst_c, max(abs(pc - float(x)) / abs(pc) for pc, x in zip(c, coefs)))
    return worst_c, worst_a, zetas


def sto_ng():
    fits = fit_sto_ng.all_fits()
    published = published_expansions()
    expansions = []
    for kind in fit_sto_ng.KINDS:
        for m in range(1, 7):
            alphas, overlap, coefs = fits[(kind, m)]
            entry = {
                "kind": kind,
                "n_gaussians": m,
                "overlap_with_slater": float(overlap),
                "primitives": [[float(a), float(c)] for a, c in zip(alphas, coefs)],
            }
            if (kind, m) in published:
                wc, wa, zetas = compare(alphas, coefs, published[(kind, m)])
                entry["published_check"] = (
                    f"sto-{m}g of basis-set-exchange {bse.version()}, H-Ar: coefficients agree to {wc:.1e} relative, "
                    f"exponent ratios published/ours constant to {wa:.1e} relative"
                )
                print(f"{kind} n={m}: coefficients {wc:.1e}, exponent ratios {wa:.1e}; zeta "
                      + " ".join(f"{s}={zv:.6f}" for s, zv in zetas))
            else:
                entry["published_check"] = "none: no published expansion available to us; computed only"
                print(f"{kind} n={m}: computed only, overlap {float(overlap):.12f}")
            expansions.append(entry)
    return {
        "name": "sto-ng",
        "description": "Normalised least-squares STO-nG expansions (n = 1-6) of Slater 1s, 2s, 2p, 3s, 3p, 3d functions with zeta = 1; scale exponents by zeta^2 for other zeta.",
        "source": (
            "computed by tools/fit_sto_ng.py (mpmath 50 digits, converged far beyond 17 digits, rounded to double) with the "
            "criterion of Hehre, Stewart and Pople, J. Chem. Phys. 51, 2657 (1969): minimise the integral of (phi_STO - fit)^2 "
            "with the fit normalised; 2s/2p and 3s/3p share exponents and are fitted jointly, 1s and 3d alone. "
            "published_check says how each agrees with the published expansions carried by basis-set-exchange."
        ),
        "conventions": "exponents in bohr^-2 for zeta = 1; coefficients multiply normalised primitives r^l exp(-a r^2).",
        "expansions": expansions,
    }


def write(name, value):
    """Indented JSON with each [exponent, coefficient] pair on one line, for reading diffs."""
    path = DATA / f"{name}.json"
    text = json.dumps(value, indent=1)
    text = re.sub(r"\[\s+(\S+),\s+(\S+)\s+\]", r"[\1, \2]", text)
    assert json.loads(text) == value
    path.write_text(text + "\n")
    print("wrote", path.relative_to(ROOT))


if __name__ == "__main__":
    DATA.mkdir(parents=True, exist_ok=True)
    write("sto-3g", named_set("sto-3g"))
    write("sto-6g", named_set("sto-6g"))
    for set_name, (file_name, _, _) in EXTENDED.items():
        write(file_name, named_set(set_name))
    write("sto-ng", sto_ng())
