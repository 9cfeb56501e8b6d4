#!/usr/bin/env bash
# How the command line scales with section size: generates one-section projects of 1,000 /
# 10,000 / 100,000 beds (bed patterns cycled from the invented demo sections, thicknesses jittered
# with a fixed seed), then times `aggrade check`, `aggrade interpret --json` and `aggrade export`
# on a release build (and `check` on the same files with one bad bed), and measures the peak memory
# (maximum resident set size) of each.
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
    nice -n 19 cargo build --release --workspace --bins
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

# The same files with one bad bed near the end (an id written as text): the reader's slower path
# that names every problem, bed by bed.
python3 - "$out" <<'PY'
import sys
out = sys.argv[1]
for n in (1_000, 10_000, 100_000):
    text = open(f"{out}/beds_{n}.aggrade").read()
    key = f'"id":{n - 10},'
    assert key in text
    open(f"{out}/bad_{n}.aggrade", "w").write(text.replace(key, f'"id":"{n - 10}",', 1))
PY

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
        # A bad file makes `check` exit 1: -i lets hyperfine time it anyway.
        nice -n 19 hyperfine --warmup 1 --runs "$([ "$n" -eq 100000 ] && echo 2 || echo 3)" -N -i \
            --export-json "$out/hf_$n.json" --output=null "${cmds[@]}" "$bin check $out/bad_$n.aggrade"
        # Mean wall and user CPU time per command (hyperfine's JSON has both).
        python3 - "$out/hf_$n.json" "$n" >> "$res" <<'PY'
import json, os, sys
runs = json.load(open(sys.argv[1]))["results"]
print(f"| command ({sys.argv[2]} beds) | wall mean ± σ | user mean | runs |")
print("|---|---|---|---|")
for r in runs:
    cmd = " ".join(os.path.basename(w) for w in r["command"].split())
    print(f"| `{cmd}` | {r['mean']:.3f} s ± {r['stddev'] or 0:.3f} | {r['user']:.3f} s | {len(r['times'])} |")
PY
    else
        for c in "${cmds[@]}"; do
            for _ in 1 2 3; do /usr/bin/time -f "$n beds: %e s wall, %U s user, %M KB max RSS: $c" $c >/dev/null 2>>"$res"; done
        done
    fi
    echo >> "$res"
done
# Peak memory (maximum resident set size, GNU time) of each command; target for interpret on the
# largest section: < 200 MB.
echo "| command | beds | max RSS (MB) |" >> "$res"
echo "|---|---|---|" >> "$res"
for n in 1000 10000 100000; do
    for c in "check $out/beds_$n.aggrade" "check $out/bad_$n.aggrade" "interpret --json $out/beds_$n.aggrade" \
        "export $out/beds_$n.aggrade --pdf $out/beds_$n.pdf"; do
        [ "$export_works" = no ] && [ "${c#export}" != "$c" ] && continue
        /usr/bin/time -v "$bin" $c >/dev/null 2>"$out/time.txt" || true
        kb=$(grep 'Maximum resident set size' "$out/time.txt" | awk '{print $NF}')
        echo "| \`${c%% *} ${c#* }\` | $n | $(awk -v k="$kb" 'BEGIN{printf "%.1f", k/1000}') |" | sed "s|$out/||g" >> "$res"
    done
done
cat "$res"
