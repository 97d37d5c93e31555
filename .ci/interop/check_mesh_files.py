#!/usr/bin/env python3
"""Interop check: read lobecast's mesh files (glTF 2.0 binary, PLY, OBJ) with
trimesh and pygltflib, independent readers, and check what the writers promise.

Usage:
    python check_mesh_files.py --lobecast target/release/lobecast --workdir DIR
        runs, for each of .glb, .ply and .obj,
            lobecast surface examples/h2-cation.toml --field orbital:1 \
                --png DIR/s-EXT.png --mesh DIR/s.EXT
        and the same with --mesh-molecule into DIR/m.EXT, then checks the files.
    python check_mesh_files.py --files A.glb B.ply C.obj [D.glb E.ply F.obj]
        checks given files; files sharing a name stem form one set, which must
        hold one file of each format.

Checks, per set:
  * every file loads with trimesh 5.2.0 and declares its length unit (bohr);
  * every surface part (from the GLB's root nodes, the PLY's "comment part"
    lines, the OBJ's "o" names outside "molecule/") is watertight, consistently
    wound and encloses a positive volume, in each format;
  * each surface part's volume agrees across the three formats to 1e-6 relative
    (all store the same f32 coordinates; the tolerance is for summation order);
  * the molecule parts (under the GLB node "molecule") are the same in number in
    every format (shown, not required, to be watertight: their caps have vertices
    of their own, which trimesh does not weld when normals differ);
  * with pygltflib 1.16.5: every POSITION accessor has min and max, equal to the
    min and max of its data decoded with numpy; NORMALs are unit length; indices
    are UNSIGNED_INT within range; one material per surface part.
Prints one PASS/FAIL line per check and exits 1 if any failed.
"""

import argparse
import re
import subprocess
import sys
from collections import defaultdict
from importlib.metadata import version
from pathlib import Path

import numpy as np
import pygltflib
import trimesh

# Volumes across formats. GLB and PLY hold the same f32 coordinates; OBJ holds their
# shortest decimals, which trimesh parses as doubles, off by up to half an f32 ulp
# (6e-8 relative). Measured spread on the sample set: 2.4e-8. Tolerance as briefed.
REL_TOL = 1e-6
FAILURES = []


def check(ok, what):
    print(f"{'PASS' if ok else 'FAIL'} {what}")
    if not ok:
        FAILURES.append(what)
    return ok


def bad(names):
    return f"; wrong in {names}" if names else ""


def part_report(name, mesh):
    return {"name": name, "watertight": bool(mesh.is_watertight),
            "winding": bool(mesh.is_winding_consistent), "volume": float(mesh.volume)}


# --- GLB ---------------------------------------------------------------------

def glb_structure(path):
    """(surface mesh indices, molecule mesh indices, GLTF2) from the node tree."""
    g = pygltflib.GLTF2().load_binary(str(path))
    roots = g.scenes[g.scene or 0].nodes
    surfaces, molecule = [], []
    for r in roots:
        node = g.nodes[r]
        if node.mesh is not None:
            surfaces.append(node.mesh)
        elif node.name == "molecule":
            molecule += [g.nodes[c].mesh for c in node.children]
    return surfaces, molecule, g


def accessor_data(g, blob, index):
    a = g.accessors[index]
    view = g.bufferViews[a.bufferView]
    width = {"SCALAR": 1, "VEC3": 3}[a.type]
    dtype = {pygltflib.FLOAT: "<f4", pygltflib.UNSIGNED_INT: "<u4"}[a.componentType]
    stride = view.byteStride or 4 * width
    start = (view.byteOffset or 0) + (a.byteOffset or 0)
    rows = [np.frombuffer(blob, dtype=dtype, count=width, offset=start + i * stride)
            for i in range(a.count)]
    return np.array(rows).reshape(a.count, width)


def check_glb_with_pygltflib(path):
    surfaces, molecule, g = glb_structure(path)
    blob = g.binary_blob()
    extras = g.asset.extras or {}
    check(extras.get("length_unit") == "bohr"
          and (g.asset.generator or "").startswith("lobecast "),
          f"{path.name}: asset.extras.length_unit = bohr, generator {g.asset.generator!r}")
    bad_minmax, bad_normals, bad_indices = [], [], []
    for mi, mesh in enumerate(g.meshes):
        for prim in mesh.primitives:
            a = g.accessors[prim.attributes.POSITION]
            data = accessor_data(g, blob, prim.attributes.POSITION)
            if a.min is None or a.max is None or not (
                    np.array_equal(np.asarray(a.min, dtype=np.float64), data.min(0).astype(np.float64))
                    and np.array_equal(np.asarray(a.max, dtype=np.float64), data.max(0).astype(np.float64))):
                bad_minmax.append(mesh.name)
            normals = accessor_data(g, blob, prim.attributes.NORMAL)
            if np.abs(np.linalg.norm(normals, axis=1) - 1.0).max() > 1e-6:
                bad_normals.append(mesh.name)
            ia = g.accessors[prim.indices]
            idx = accessor_data(g, blob, prim.indices)
            if ia.componentType != pygltflib.UNSIGNED_INT or idx.size % 3 or idx.max() >= len(data):
                bad_indices.append(mesh.name)
    n = len(g.meshes)
    check(not bad_minmax, f"{path.name}: POSITION min/max present and equal to the data's "
          f"in {n} accessors (exact, f32 widened){bad(bad_minmax)}")
    check(not bad_normals, f"{path.name}: NORMAL unit length within 1e-6{bad(bad_normals)}")
    check(not bad_indices, f"{path.name}: indices UNSIGNED_INT, triples, in range{bad(bad_indices)}")
    mats = [g.meshes[m].primitives[0].material for m in surfaces]
    check(None not in mats and len(set(mats)) == len(surfaces) and len(g.materials) == n,
          f"{path.name}: one material per part ({len(surfaces)} surface, {len(molecule)} molecule, "
          f"{len(g.materials)} materials)")


def glb_parts(path):
    surfaces, molecule, g = glb_structure(path)
    scene = trimesh.load(str(path), force="scene")
    parts = {"surface": [], "molecule": []}
    for role, indices in (("surface", surfaces), ("molecule", molecule)):
        for m in indices:
            name = g.meshes[m].name
            if name not in scene.geometry:
                check(False, f"{path.name}: trimesh has no geometry named {name!r}")
                continue
            parts[role].append(part_report(name, scene.geometry[name]))
    return parts


# --- PLY and OBJ: one mesh, split by the parts' face ranges ---------------------

def split_faces(path, mesh, ranges):
    """ranges: [(role, name, first_face, last_face)] in file order."""
    total = sum(b - a + 1 for _, _, a, b in ranges)
    parts = {"surface": [], "molecule": []}
    if not check(total == len(mesh.faces), f"{path.name}: trimesh kept all {total} faces "
                 f"(read {len(mesh.faces)})"):
        return parts
    for role, name, a, b in ranges:
        sub = mesh.submesh([np.arange(a, b + 1)], append=True)
        sub.merge_vertices()
        parts[role].append(part_report(name, sub))
    return parts


def ply_parts(path):
    raw = path.read_bytes()
    header = raw[:raw.index(b"end_header\n")].decode("ascii")
    check("comment length unit: bohr" in header.splitlines(), f"{path.name}: header says length unit: bohr")
    ranges = []
    for m in re.finditer(r"^comment (molecule part|part) (.*): vertices \d+-\d+, faces (\d+)-(\d+)$",
                         header, re.M):
        role = "molecule" if m.group(1).startswith("molecule") else "surface"
        ranges.append((role, m.group(2), int(m.group(3)), int(m.group(4))))
    return split_faces(path, trimesh.load(str(path), force="mesh"), ranges)


def obj_parts(path):
    lines = path.read_text().splitlines()
    check("# length unit: bohr" in lines, f"{path.name}: comment says length unit: bohr")
    ranges, faces = [], 0
    for line in lines:
        if line.startswith("o "):
            name = line[2:]
            role = "molecule" if name.startswith("molecule/") else "surface"
            ranges.append([role, name.removeprefix("molecule/"), faces, faces - 1])
        elif line.startswith("f "):
            faces += 1
            ranges[-1][3] = faces - 1
    return split_faces(path, trimesh.load(str(path), force="mesh"), [tuple(r) for r in ranges])


# --- one set of three files -----------------------------------------------------

def check_set(stem, files):
    print(f"== set {stem!r}: {', '.join(sorted(p.name for p in files.values()))}")
    if not check(sorted(files) == [".glb", ".obj", ".ply"], f"{stem}: one .glb, .ply and .obj"):
        return None
    check_glb_with_pygltflib(files[".glb"])
    parts = {".glb": glb_parts(files[".glb"]), ".ply": ply_parts(files[".ply"]),
             ".obj": obj_parts(files[".obj"])}
    names = {ext: [p["name"] for p in v["surface"]] for ext, v in parts.items()}
    if not check(len({tuple(n) for n in names.values()}) == 1 and names[".glb"],
                 f"{stem}: the same surface parts in every format {names[('.glb')]}"):
        return None
    for ext, v in parts.items():
        for p in v["surface"]:
            check(p["watertight"] and p["winding"] and p["volume"] > 0,
                  f"{stem}{ext} surface {p['name']!r}: watertight {p['watertight']}, "
                  f"winding consistent {p['winding']}, volume {p['volume']:.9g} bohr^3 > 0")
    for i, name in enumerate(names[".glb"]):
        vols = [parts[ext]["surface"][i]["volume"] for ext in (".glb", ".ply", ".obj")]
        spread = (max(vols) - min(vols)) / abs(vols[0])
        check(spread <= REL_TOL, f"{stem} surface {name!r}: volume equal across glb/ply/obj "
              f"to {spread:.1e} relative (tolerance {REL_TOL:g})")
    counts = {ext: len(v["molecule"]) for ext, v in parts.items()}
    check(len(set(counts.values())) == 1,
          f"{stem}: {counts['.glb']} molecule parts in every format {counts}")
    for p in parts[".glb"]["molecule"]:
        print(f"INFO {stem}.glb molecule {p['name']!r}: watertight {p['watertight']}, "
              f"winding consistent {p['winding']}, volume {p['volume']:.6g}")
    return [p["volume"] for p in parts[".glb"]["surface"]]


def run_lobecast(lobecast, workdir, model):
    """Writes the two sets of files; returns them and the enclosed volumes (bohr³)
    lobecast reports for its surfaces."""
    files = []
    reported = []
    for stem, extra in (("s", []), ("m", ["--mesh-molecule"])):
        for ext in ("glb", "ply", "obj"):
            out = workdir / f"{stem}.{ext}"
            cmd = [str(lobecast), "surface", str(model), "--field", "orbital:2",
                   "--png", str(workdir / f"{stem}-{ext}.png"), "--mesh", str(out), *extra]
            print("RUN", " ".join(cmd))
            r = subprocess.run(cmd, capture_output=True, text=True)
            if r.returncode != 0:
                sys.exit(f"FAIL lobecast exited {r.returncode}: {r.stderr.strip()}")
            files.append(out)
            reported = [float(v) for v in re.findall(r"enclosed volume ([0-9.]+) bohr", r.stdout)]
    return files, reported


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--lobecast", type=Path)
    ap.add_argument("--workdir", type=Path)
    ap.add_argument("--model", type=Path,
                    default=Path(__file__).resolve().parents[2] / "examples" / "h2-cation.toml")
    ap.add_argument("--files", type=Path, nargs="+")
    args = ap.parse_args()
    print(f"trimesh {version('trimesh')}, pygltflib {version('pygltflib')}, numpy {version('numpy')}")
    reported = []
    if args.files:
        files = args.files
    elif args.lobecast and args.workdir:
        args.workdir.mkdir(parents=True, exist_ok=True)
        files, reported = run_lobecast(args.lobecast, args.workdir, args.model)
    else:
        ap.error("give --files, or --lobecast and --workdir")
    sets = defaultdict(dict)
    for f in files:
        if not f.is_file():
            sys.exit(f"FAIL {f}: no such file")
        sets[f.stem][f.suffix.lower()] = f
    volumes = {stem: check_set(stem, fs) for stem, fs in sorted(sets.items())}
    found = [v for v in volumes.values() if v]
    if len(found) > 1:
        a, b = found[0], found[1]
        same = len(a) == len(b) and all(abs(x - y) <= REL_TOL * abs(x) for x, y in zip(a, b))
        check(same, f"surface volumes equal between sets {sorted(volumes)} (with and without molecule)")
    if reported:
        # The report prints four decimals; the files hold f32 positions.
        for stem, vols in volumes.items():
            ours = sorted(reported)
            theirs = sorted(vols or [])
            same = len(ours) == len(theirs) and all(
                abs(x - y) <= 1e-5 * abs(x) + 1e-4 for x, y in zip(ours, theirs))
            check(same, f"{stem}: trimesh volumes {theirs} equal lobecast's reported {ours}")
    if FAILURES:
        print(f"{len(FAILURES)} check(s) failed:", *FAILURES, sep="\n  ")
        sys.exit(1)
    print("all mesh checks passed")


if __name__ == "__main__":
    main()
