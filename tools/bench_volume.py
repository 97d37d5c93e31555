#!/usr/bin/env python3
"""Whole-process figures of `lobecast volume` for issue 14, side by side for one or
more builds, with a plain write of the same bytes as the machine's limit.

    python3 tools/bench_volume.py --bin before=/tmp/base-bin/lobecast \\
        --bin after=target/release/lobecast --runs 5 --out-dir /dev/shm

Cases (each command is printed):
  h2     the two-centre Slater model (examples/h2-cation.toml), orbital 1, 400 points
         along the longest edge;
  h2-gz  the same into a .cube.gz (parallel gzip members);
  bz     the STO-3G RHF benzene HOMO (examples/benzene.xyz, 36 functions, solved once
         into an orbital file by the first build), 400 points;
  bz-3   three fields of it (HOMO, LUMO, density), 200 points.
For each: median wall time, median CPU time (user + system; steadier than wall time
on a shared machine), MB/s of the file, the largest peak resident set (wait4's
ru_maxrss) and the ratio to the plain write. The plain write is this script writing
the same number of bytes from memory in 1 MiB blocks to the same folder (median).
Only the standard library is used.
"""

import argparse
import os
import pathlib
import statistics
import subprocess
import sys
import time

ROOT = pathlib.Path(__file__).resolve().parent.parent


def run(cmd):
    """Wall seconds, CPU seconds and peak RSS (MB) of one child process."""
    start = time.perf_counter()
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    _, status, usage = os.wait4(proc.pid, 0)
    wall = time.perf_counter() - start
    err = proc.stderr.read().decode()
    proc.stderr.close()
    proc.returncode = os.waitstatus_to_exitcode(status)
    if proc.returncode != 0:
        sys.exit(f"failed ({proc.returncode}): {' '.join(cmd)}\n{err}")
    return wall, usage.ru_utime + usage.ru_stime, usage.ru_maxrss / 1024


def plain_write(path, size, runs):
    """Median seconds to write `size` bytes from memory in 1 MiB blocks."""
    block = b"7" * (1 << 20)
    times = []
    for _ in range(runs):
        path.unlink(missing_ok=True)
        start = time.perf_counter()
        with open(path, "wb", buffering=0) as f:
            left = size
            while left > 0:
                k = min(left, len(block))
                f.write(block[:k] if k < len(block) else block)
                left -= k
        times.append(time.perf_counter() - start)
    path.unlink(missing_ok=True)
    return statistics.median(times)


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--bin", action="append", required=True, help="NAME=PATH, repeatable")
    ap.add_argument("--runs", type=int, default=5)
    ap.add_argument("--out-dir", default="/tmp")
    ap.add_argument("--cases", default="h2,h2-gz,bz,bz-3")
    args = ap.parse_args()
    bins = [b.split("=", 1) for b in args.bin]
    out = pathlib.Path(args.out_dir)
    orbitals = out / "bench_volume_benzene.json"
    subprocess.run([bins[0][1], "solve", str(ROOT / "examples/benzene.xyz"), "--method", "rhf",
                    "--basis", "sto-3g", "--json", str(orbitals)], check=True,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    h2 = [str(ROOT / "examples/h2-cation.toml"), "--field", "orbital:1", "--points", "400"]
    bz = [str(orbitals), "--field", "orbital:homo", "--points", "400"]
    bz3 = [str(orbitals), "--field", "orbital:homo", "--field", "orbital:lumo",
           "--field", "density", "--points", "200"]
    cases = {
        "h2": (h2, "h2.cube"),
        "h2-gz": (h2, "h2.cube.gz"),
        "bz": (bz, "bz.cube"),
        "bz-3": (bz3, "bz3.cube"),
    }
    plain_cache = {}
    for case in args.cases.split(","):
        argv, name = cases[case]
        target = out / name
        print(f"\n{case}: lobecast volume {' '.join(argv)} --out {target}")
        size = None
        for label, path in bins:
            walls, cpus, peaks = [], [], []
            for _ in range(args.runs):
                target.unlink(missing_ok=True)
                w, c, m = run([path, "volume", *argv, "--out", str(target)])
                walls.append(w)
                cpus.append(c)
                peaks.append(m)
            size = target.stat().st_size
            plain_size = size
            if name.endswith(".gz"):
                # Compared with the plain write of the uncompressed text.
                plain_target = out / name.removesuffix(".gz")
                run([path, "volume", *argv, "--out", str(plain_target)])
                plain_size = plain_target.stat().st_size
                plain_target.unlink()
            if plain_size not in plain_cache:
                plain_cache[plain_size] = plain_write(out / "bench_plain.bin", plain_size, args.runs)
            plain = plain_cache[plain_size]
            wall = statistics.median(walls)
            print(f"  {label:>8}: wall {wall:6.3f} s  cpu {statistics.median(cpus):6.3f} s  "
                  f"{plain_size / wall / 1e6:6.0f} MB/s (text)  peak {max(peaks):5.0f} MB  "
                  f"{wall / plain:5.2f}× the plain write of {plain_size / 1e6:.0f} MB "
                  f"({plain:.3f} s, {plain_size / plain / 1e6:.0f} MB/s)")
            target.unlink(missing_ok=True)
    orbitals.unlink(missing_ok=True)


if __name__ == "__main__":
    main()
