#!/usr/bin/env python3
"""The one-way chain of lobecast's rooms (DEVELOPERS.md, "Architecture"): a module may
use the modules before it in LAYERS, never one after it. Reads every `crate::NAME`
(also inside `use crate::{a, b}`) under src/ and fails, naming file and line, on a
back-edge. The binary's cli/ may use everything; the library may not use cli.

Usage: python3 .ci/check_layers.py [SRC_DIR]   (exit 0 clean, 1 with back-edges)
"""

import re
import sys
from pathlib import Path

LAYERS = [
    "error", "budget", "numerics", "chem", "basis", "integrals", "solve", "grid",
    "field", "surface", "io", "source", "output", "render", "plot", "cli",
]


def module_of(path, src):
    rel = path.relative_to(src).parts
    name = rel[0].removesuffix(".rs")
    return name


def targets(line):
    found = set(re.findall(r"crate::([a-z_]+)", line))
    for group in re.findall(r"crate::\{([^}]*)\}", line):
        found.update(re.findall(r"(?:^|[{,\s])([a-z_]+)(?=::|\s*[,}]|\s*$)", group))
    return found


def main():
    src = Path(sys.argv[1] if len(sys.argv) > 1 else "src")
    rank = {m: i for i, m in enumerate(LAYERS)}
    bad = []
    for path in sorted(src.rglob("*.rs")):
        mod = module_of(path, src)
        if mod in ("lib", "main"):
            continue
        if mod not in rank:
            bad.append(f"{path}: module '{mod}' is not in the layer list of {__file__}")
            continue
        text = path.read_text()
        # `use crate::{...}` groups may span lines: join each group onto one line.
        text = re.sub(r"crate::\{[^}]*\}", lambda m: m.group(0).replace("\n", " "), text)
        for n, line in enumerate(text.splitlines(), 1):
            if line.lstrip().startswith("//"):
                continue
            for t in targets(line):
                if t == mod or t not in rank:
                    continue
                if rank[t] > rank[mod]:
                    bad.append(f"{path}:{n}: {mod} uses {t}, which sits above it")
    for b in bad:
        print(b)
    if bad:
        print(f"{len(bad)} back-edge(s) against the layer order: {' → '.join(LAYERS)}")
        return 1
    print(f"layers: no back-edges ({' → '.join(LAYERS)})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
