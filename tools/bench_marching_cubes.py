"""scikit-image's marching cubes on the values of benches/surface_extract.rs.

The same 2p-like field z·e^(−r) on a 200³ cube from −10 to 10 bohr, the same level;
prints the median time and voxels per second (voxels = 199³ cubes, as the Rust bench
counts). Run with a Python that has numpy and scikit-image.
"""

import statistics
import time

import numpy as np
from skimage import measure

N, HALF, LEVEL, RUNS = 200, 10.0, 0.02, 10

axis = -HALF + np.arange(N) * (2.0 * HALF / (N - 1))
x, y, z = np.meshgrid(axis, axis, axis, indexing="ij")  # i slowest, k fastest
values = z * np.exp(-np.sqrt(x * x + y * y + z * z))
spacing = (axis[1] - axis[0],) * 3

times = []
for _ in range(RUNS):
    start = time.perf_counter()
    verts, faces, normals, _ = measure.marching_cubes(values, LEVEL, spacing=spacing)
    times.append(time.perf_counter() - start)
median = statistics.median(times)
print(f"{N}³ voxels, level {LEVEL}: {len(verts)} vertices, {len(faces)} triangles")
print(f"marching_cubes median {median * 1e3:.1f} ms, {(N - 1) ** 3 / median / 1e6:.1f} M voxels/s")
