#!/usr/bin/env python3
"""Checks the library's layering (README "Architecture"): every file under src/LAYER/ or
include/qftplan/LAYER/ may include headers of its own layer and of the layers below it, never of a layer
above. Prints each arrow that points up and exits 1 when there is one; with --graph, prints the
layer-to-layer include counts. The order is the one CMakeLists.txt builds (QFTPLAN_LAYERS), with the
command line (src/cli) on top."""
import pathlib
import re
import sys

ROOT = pathlib.Path(__file__).resolve().parent.parent


def layer_order():
    text = (ROOT / "CMakeLists.txt").read_text()
    m = re.search(r"set\(QFTPLAN_LAYERS ([a-z ]+)\)", text)
    if not m:
        sys.exit("check_layers: QFTPLAN_LAYERS not found in CMakeLists.txt")
    return m.group(1).split() + ["cli"]


def layer_of(path, order):
    rel = path.relative_to(ROOT).parts
    if rel[0] == "src" and len(rel) > 2 and rel[1] in order:
        return rel[1]
    if rel[:2] == ("include", "qftplan") and len(rel) > 3 and rel[2] in order:
        return rel[2]
    return None


def main():
    order = layer_order()
    rank = {name: i for i, name in enumerate(order)}
    include = re.compile(r'^\s*#\s*include\s+"qftplan/([a-z]+)/[^"]+"', re.M)
    bad, graph, stray = [], {}, []
    files = sorted(p for d in ("src", "include/qftplan") for p in (ROOT / d).rglob("*") if p.suffix in (".cpp", ".hpp"))
    for path in files:
        mine = layer_of(path, order)
        if mine is None:
            stray.append(path.relative_to(ROOT))
            continue
        for target in include.findall(path.read_text()):
            if target not in rank:
                bad.append(f"{path.relative_to(ROOT)}: includes qftplan/{target}/, which is no layer")
                continue
            graph[(mine, target)] = graph.get((mine, target), 0) + 1
            if rank[target] > rank[mine]:
                bad.append(f"{path.relative_to(ROOT)}: layer {mine} includes {target}, a layer above it")
    for p in stray:
        bad.append(f"{p}: not inside a layer folder ({', '.join(order)})")
    if "--graph" in sys.argv:
        for (a, b), n in sorted(graph.items(), key=lambda kv: (rank[kv[0][0]], rank[kv[0][1]])):
            print(f"{a:>9} -> {b:<9} {n}")
    for line in bad:
        print(line)
    print(f"{len(files)} files, {len(order)} layers, {len(bad)} upward or stray includes")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
