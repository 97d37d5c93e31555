"""Gzip cube files are written as several independent gzip members (compressed in
parallel). RFC 1952 allows a file to be any number of members, decompressed as one
stream; this checks that the files really have several members and that common
readers take them: Python's `gzip` module and ASE's cube reader. The decompressed
text must equal the plain cube of the same run, byte for byte.
"""

import argparse
import gzip
import pathlib
import subprocess
import sys
import zlib

import numpy as np
from ase.io.cube import read_cube_data


def members(data: bytes) -> list[bytes]:
    """Decompresses member by member: each decompressobj in gzip mode (16 + MAX_WBITS)
    stops at its member's end and leaves the rest in `unused_data`."""
    out = []
    rest = data
    while rest:
        if rest[:2] != b"\x1f\x8b":
            raise SystemExit(f"bytes after member {len(out)} are not a gzip member header")
        d = zlib.decompressobj(16 + zlib.MAX_WBITS)
        out.append(d.decompress(rest) + d.flush())
        if not d.eof:
            raise SystemExit(f"member {len(out)} is truncated")
        rest = d.unused_data
    return out


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--lobecast", required=True)
    ap.add_argument("--workdir", required=True)
    args = ap.parse_args()
    work = pathlib.Path(args.workdir)
    work.mkdir(parents=True, exist_ok=True)
    base = [args.lobecast, "volume", "examples/h2-cation.toml",
            "--field", "orbital:1", "--field", "orbital:2", "--points", "60"]
    gz_path, plain_path = work / "x.cube.gz", work / "x.cube"
    for out in (gz_path, plain_path):
        subprocess.run(base + ["--out", str(out)], check=True, capture_output=True)

    raw = gz_path.read_bytes()
    plain = plain_path.read_bytes()
    parts = members(raw)
    print(f"{gz_path.name}: {len(raw)} bytes, {len(parts)} gzip members, "
          f"{len(plain)} bytes uncompressed")
    if len(parts) < 2:
        raise SystemExit("expected several gzip members (parallel compression)")
    if b"".join(parts) != plain:
        raise SystemExit("the members, concatenated, differ from the plain cube")
    if gzip.decompress(raw) != plain:
        raise SystemExit("Python's gzip module reads different bytes")
    with gzip.open(gz_path, "rb") as f:
        if f.read() != plain:
            raise SystemExit("gzip.open reads different bytes")

    # ASE reads the .gz name directly (it opens compressed files by extension); the
    # values must equal those it reads from the plain file.
    data_gz, atoms_gz = read_cube_data(str(gz_path))
    data_plain, atoms_plain = read_cube_data(str(plain_path))
    if data_gz.shape != data_plain.shape or not np.array_equal(data_gz, data_plain):
        raise SystemExit(f"ASE reads different values: {data_gz.shape} vs {data_plain.shape}")
    if not np.array_equal(atoms_gz.positions, atoms_plain.positions):
        raise SystemExit("ASE reads different atoms")
    print(f"ASE read {data_gz.shape} values from both files alike; gzip members OK")
    return 0


if __name__ == "__main__":
    sys.exit(main())
