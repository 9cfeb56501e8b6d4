#!/usr/bin/env bash
# How the command line scales with section size: generates one-section projects of 1,000 /
# 10,000 / 100,000 beds (bed patterns cycled from the invented demo sections, thicknesses jittered
# with a fixed seed), then times `aggrade check`, `aggrade interpret --json` and `aggrade export`
# on a release build, and measures the peak memory of `aggrade interpret` on the largest.
#
#   scripts/bench-scaling.sh [--no-build]        (AGGRADE_BIN=target/debug/aggrade to time a debug build)
#
# Needs python3, /usr/bin/time (GNU time) and, for wall times, hyperfine (apt install hyperfine;
# without it each command is timed three times with /usr/bin/time). Runs under nice: the figures
# are wall times on whatever else the machine is doing, so note the load beside them.
# Results: target/bench-scaling/results.md (figures to copy into BENCHMARKS.md).
set -euo pipefail
cd "$(dirname "$0")/.."
out=target/bench-scaling
mkdir -p "$out"
if [ "${1:-}" != "--no-build" ]; then
    nice -n 19 cargo build --release -p aggrade
fi
# AGGRADE_BIN=path measures another build (e.g. target/debug/aggrade while the release build runs).
bin="${AGGRADE_BIN:-$PWD/target/release/aggrade}"
[ -x "$bin" ] || { echo "no release binary at $bin; run without --no-build" >&2; exit 1; }

# The generator: each size is the demo's beds in order, repeated, with ids renumbered and surface
# names made unique; thickness jittered ±20 % so no two repeats are identical.
python3 - "$out" <<'PY'
import json, random, sys
out = sys.argv[1]
demo = json.load(open("sample_sections/demo.aggrade"))
pattern = [b for s in demo["sections"] for b in s["beds"]]
for n in (1_000, 10_000, 100_000):
    rng = random.Random(20261201)
    beds = []
    for i in range(n):
        b = dict(pattern[i % len(pattern)])
        b["id"] = i + 1
        b["thickness_m"] = round(max(0.01, b["thickness_m"] * rng.uniform(0.8, 1.2)), 3)
        if "base_surface" in b:
            b["base_surface"] = dict(b["base_surface"], name=f'{b["base_surface"]["name"]}-{i}')
        beds.append(b)
    section = {"name": f"Scaling {n}", "locality": "Tamsin Ridge badlands (invented)", "beds": beds}
    with open(f"{out}/beds_{n}.aggrade", "w") as f:
        # Compact: the 100,000-bed file is 29.6 MB so, under the 32 MiB read limit (pretty: 52.6 MB).
        json.dump({"format_version": 1, "sections": [section]}, f, separators=(",", ":"))
        f.write("\n")
PY
ls -l "$out"/beds_*.aggrade

res="$out/results.md"
{
    echo "# scaling run $(date -u +%Y-%m-%dT%H:%MZ), $bin, $(nproc) cores, load average $(cut -d' ' -f1-3 /proc/loadavg)"
    echo
} > "$res"
export_works=yes
if ! "$bin" export "$out/beds_1000.aggrade" --pdf "$out/probe.pdf" >/dev/null 2>&1; then
    export_works=no
    echo "aggrade export --pdf does not run on this build; skipped" | tee -a "$res"
fi
for n in 1000 10000 100000; do
    f="$out/beds_$n.aggrade"
    cmds=("$bin check $f" "$bin interpret --json $f")
    [ "$export_works" = yes ] && cmds+=("$bin export $f --pdf $out/beds_$n.pdf")
    if command -v hyperfine >/dev/null; then
        nice -n 19 hyperfine --warmup 1 --runs "$([ "$n" -eq 100000 ] && echo 2 || echo 3)" -N \
            --export-markdown "$out/hf_$n.md" --output=null "${cmds[@]}"
        cat "$out/hf_$n.md" >> "$res"
    else
        for c in "${cmds[@]}"; do
            for _ in 1 2 3; do /usr/bin/time -f "$n beds: %e s wall, %M KB max RSS: $c" $c >/dev/null 2>>"$res"; done
        done
    fi
    echo >> "$res"
done
# Peak memory (max resident set size) of interpret on the largest section; target < 200 MB.
for n in 1000 10000 100000; do
    /usr/bin/time -v "$bin" interpret --json "$out/beds_$n.aggrade" >/dev/null 2>"$out/time_$n.txt"
    echo "interpret --json, $n beds: $(grep 'Maximum resident set size' "$out/time_$n.txt")" | tee -a "$res"
done
cat "$res"
