#!/usr/bin/env python3
"""Surface area of lobecast's isosurfaces against scikit-image's marching cubes.

On one cube file (the antibonding orbital of the built-in ion model, written by
`lobecast volume`), lobecast extracts the surfaces at +t and -t (`lobecast surface
FILE.cube --iso t --mesh out.ply`, trilinear on the file's own grid), and
scikit-image's `measure.marching_cubes` + `measure.mesh_surface_area` extract them
from the same values (read with ASE's cube reader) on the same grid. The two meshes
are different triangulations of the same trilinear field, so their areas agree to
well under 1 % at this spacing; the issue asks for 1 %. The area of lobecast's mesh
is taken from the PLY file through trimesh, and must equal the area lobecast reports.

Usage: check_surface_area.py --lobecast BIN --workdir DIR
"""

import argparse
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import trimesh
from ase.io.cube import read_cube_data
from skimage import measure

TOLERANCE = 0.01  # the bound for the two extractions


def run(cmd):
    out = subprocess.run(cmd, capture_output=True, text=True)
    if out.returncode != 0:
        sys.exit(f"FAIL: {' '.join(map(str, cmd))}\n{out.stderr}")
    return out.stdout


def header_steps(path):
    """The three step vectors (bohr) from the cube header, lines 4-6."""
    lines = Path(path).read_text().splitlines()
    steps = []
    for line in lines[3:6]:
        parts = line.split()
        steps.append([float(x) for x in parts[1:4]])
    return np.array(steps)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True)
    a = ap.parse_args()
    work = Path(a.workdir)
    work.mkdir(parents=True, exist_ok=True)
    cube = work / "antibonding.cube"
    run([a.lobecast, "volume", "examples/h2-cation.toml", "--field", "orbital:2",
         "--spacing", "0.2", "--padding", "6", "--units", "bohr", "--out", cube])
    data, _ = read_cube_data(str(cube))
    steps = header_steps(cube)
    assert np.allclose(steps, np.diag(np.diag(steps))), "the check expects an axis-aligned grid"
    spacing = tuple(np.diag(steps))
    t = 0.05  # bohr^-3/2; inside the orbital's range (common practice for figures)
    ply = work / "antibonding.ply"
    report = run([a.lobecast, "surface", cube, "--field", "stored:1", "--iso", str(t), "--mesh", ply])
    ours_reported = [float(x) for x in re.findall(r"area ([0-9.]+) bohr", report)]
    theirs = 0.0
    for level in (t, -t):
        if data.min() < level < data.max():
            verts, faces, _, _ = measure.marching_cubes(data, level=level, spacing=spacing)
            theirs += measure.mesh_surface_area(verts, faces)
    mesh = trimesh.load(ply, force="mesh", process=False)
    ours = float(mesh.area)
    rel = abs(ours - theirs) / theirs
    print(f"area at ±{t}: lobecast {ours:.5f} bohr², scikit-image {theirs:.5f} bohr², "
          f"relative difference {rel:.2e} (bound {TOLERANCE})")
    if rel > TOLERANCE:
        sys.exit("FAIL: areas differ beyond the bound")
    if abs(sum(ours_reported) - ours) > 1e-3 * ours:
        sys.exit(f"FAIL: lobecast reported {ours_reported}, its file has {ours}")
    print("surface area check passed")


if __name__ == "__main__":
    main()
