#!/usr/bin/env python3
"""Cap a fuzz corpus at N files, keeping the most coverage (greedy set cover).

Usage, from fuzz/ after a run (TARGET is model, table or expr):
    ./target/x86_64-unknown-linux-gnu/release/TARGET -merge=1 -use_counters=0 \
        -use_value_profile=0 -merge_control_file=/tmp/ctl /tmp/empty corpus/TARGET
    python3 cap-corpus.py /tmp/ctl 300      # deletes the files not kept

Files whose names end in .toml (the seeds: examples and shipped tables) are always kept.
"""
import os
import sys

ctl, cap = sys.argv[1], int(sys.argv[2])
lines = open(ctl).read().split("\n")
n = int(lines[0])
files = lines[2 : 2 + n]
cov = {}
for line in lines[2 + n :]:
    parts = line.split()
    if parts and parts[0] == "FT":
        cov[int(parts[1])] = set(parts[2:])
got, chosen = set(), []
for i, f in enumerate(files):
    if f.endswith(".toml") or os.path.basename(f).startswith("seed"):
        chosen.append(i)
        got |= cov.get(i, set())
while len(chosen) < cap and cov:
    best = max(cov, key=lambda i: (len(cov[i] - got), -os.path.getsize(files[i])))
    if not cov[best] - got:
        break
    chosen.append(best)
    got |= cov[best]
total = len(set().union(*cov.values())) if cov else 0
keep = {files[i] for i in chosen}
for f in files:
    if f not in keep:
        os.remove(f)
print(f"kept {len(keep)} of {n} files, {len(got)} of {total} features")
