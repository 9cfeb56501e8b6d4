#!/usr/bin/env bash
# How every command scales with section size: generates one-section projects of 1,000 / 10,000 /
# 100,000 beds (bed patterns cycled from the invented demo sections, thicknesses jittered with a
# fixed seed) and projects of 10 sections of 1,000 and of 10,000 beds for the correlation panel,
# then runs each command on a release build and records its wall time, user CPU time and peak
# memory (maximum resident set size), with the growth per tenfold.
#
#   scripts/bench-scaling.sh [--no-build] [RUNS]      (RUNS per command and size, default 3;
#                                                      the 100,000-bed runs are at most 2)
#   AGGRADE_BIN=target/debug/aggrade scripts/bench-scaling.sh --no-build   (another build)
#
# Needs python3 and /usr/bin/time (GNU time). Each figure is the median of the runs, taken with
# GNU time (%e wall, %U user, %M max RSS). Wall times are on whatever else the machine is doing:
# the load average is written beside each command. Results: target/bench-scaling/results.md.
set -euo pipefail
cd "$(dirname "$0")/.."
out=target/bench-scaling
mkdir -p "$out"
if [ "${1:-}" = "--no-build" ]; then
    shift
else
    nice -n 19 cargo build --release -p aggrade
fi
runs="${1:-3}"
# AGGRADE_BIN=path measures another build (e.g. target/debug/aggrade while the release build runs).
bin="${AGGRADE_BIN:-$PWD/target/release/aggrade}"
[ -x "$bin" ] || { echo "no release binary at $bin; run without --no-build" >&2; exit 1; }

# The sections (scripts/bench-sections.py): the demo's beds in order, repeated, thickness jittered
# ±20 % with a fixed seed, in the demo file's format version; a panel project's sections start 7
# beds apart in the pattern and stand 1.5 km apart.
for n in 1000 10000 100000; do
    python3 scripts/bench-sections.py "$out/beds_$n.aggrade" "$n"
done
for n in 1000 10000; do
    python3 scripts/bench-sections.py "$out/panel_10x$n.aggrade" "$n" 10
done
# The same sections with one bad bed near the end (an id written as text): the reader's slower
# path that names every problem, bed by bed; and as bed-table CSV, the import door's input.
python3 - "$out" <<'PY'
import sys
out = sys.argv[1]
for n in (1_000, 10_000, 100_000):
    text = open(f"{out}/beds_{n}.aggrade").read()
    key = f'"id":{n - 10},'
    assert key in text
    open(f"{out}/bad_{n}.aggrade", "w").write(text.replace(key, f'"id":"{n - 10}",', 1))
PY
for n in 1000 10000 100000; do
    rm -f "$out/beds_$n.csv"
    "$bin" convert "$out/beds_$n.aggrade" "$out/beds_$n.csv" >/dev/null 2>"$out/stderr.txt" ||
        { cat "$out/stderr.txt" >&2; exit 1; }
done
ls -l "$out"/beds_*.aggrade "$out"/panel_*.aggrade "$out"/beds_*.csv

res="$out/results.md"
raw="$out/runs.tsv"
: > "$raw"
{
    echo "# scaling run $(date -u +%Y-%m-%dT%H:%MZ), $bin, $(nproc) cores, load average at start $(cut -d' ' -f1-3 /proc/loadavg)"
    echo
} > "$res"

# One command at one size: RUNS runs under GNU time (a file the command writes is removed before
# each run, so `import` always makes a new project); one line per run in runs.tsv.
measure() {
    local label="$1" n="$2" k
    shift 2
    local r="$runs"
    [ "$n" -ge 100000 ] && [ "$r" -gt 2 ] && r=2
    for ((k = 0; k < r; k++)); do
        rm -f "$out/import_$n.aggrade" "$out/import_$n.aggrade.bak"
        local load
        load=$(cut -d' ' -f1 /proc/loadavg)
        # A bad file makes `check` exit 1; that is the case being measured.
        /usr/bin/time -f "%e %U %M" -o "$out/time.txt" "$@" >/dev/null 2>"$out/stderr.txt" || true
        printf '%s\t%s\t%s\t%s\n' "$label" "$n" "$(cat "$out/time.txt" | tail -1 | tr ' ' '\t')" "$load" >> "$raw"
    done
}

for n in 1000 10000 100000; do
    f="$out/beds_$n.aggrade"
    measure "check" "$n" "$bin" check "$f"
    measure "check, one bad bed" "$n" "$bin" check "$out/bad_$n.aggrade"
    measure "interpret" "$n" "$bin" interpret "$f"
    measure "interpret --json" "$n" "$bin" interpret --json "$f"
    measure "export --pdf (A4)" "$n" "$bin" export "$f" --pdf "$out/beds_$n.pdf"
    measure "export --svg (one tall page)" "$n" "$bin" export "$f" --svg "$out/beds_$n.svg"
    measure "stats" "$n" "$bin" stats "$f"
    measure "bodies --csv" "$n" "$bin" bodies "$f" --csv "$out/bodies_$n.csv"
    measure "panel --pdf (one section)" "$n" "$bin" panel "$f" --pdf "$out/panel_$n.pdf"
    measure "import (bed-table CSV)" "$n" "$bin" import "$out/beds_$n.csv" --out "$out/import_$n.aggrade"
done
for n in 1000 10000; do
    f="$out/panel_10x$n.aggrade"
    measure "panel --pdf, 10 sections of N beds" "$n" "$bin" panel "$f" --pdf "$out/panel_10x$n.pdf"
    measure "panel --svg, 10 sections of N beds" "$n" "$bin" panel "$f" --svg "$out/panel_10x$n.svg"
    measure "interpret --json, 10 sections of N beds (reading + rules)" "$n" "$bin" interpret --json --section "Panel 1" "$f"
done

# The table: median wall (user) time and peak memory per size, and the growth of each per tenfold.
python3 - "$raw" >> "$res" <<'PY'
import statistics, sys
rows = [l.rstrip("\n").split("\t") for l in open(sys.argv[1]) if l.strip()]
data, order = {}, []
for label, n, wall, user, kb, load in rows:
    if label not in data:
        order.append(label)
    data.setdefault(label, {}).setdefault(int(n), []).append((float(wall), float(user), int(kb), float(load)))
sizes = [1000, 10000, 100000]
print("| command | " + " | ".join(f"{n:,} beds: wall (user), max RSS" for n in sizes) + " | growth per tenfold: wall; RSS | load |")
print("|---|" + "---|" * (len(sizes) + 2))
for label in order:
    cells, walls, rss, loads = [], [], [], []
    for n in sizes:
        runs = data[label].get(n)
        if not runs:
            cells.append("–")
            continue
        w = statistics.median(r[0] for r in runs)
        u = statistics.median(r[1] for r in runs)
        m = max(r[2] for r in runs) / 1000
        walls.append(w)
        rss.append(m)
        loads += [r[3] for r in runs]
        cells.append(f"{w:.2f} s ({u:.2f} s), {m:.1f} MB")
    growth = lambda v: ", ".join(f"×{b / a:.1f}" if a > 0 else "–" for a, b in zip(v, v[1:]))
    print(f"| `{label}` | " + " | ".join(cells) + f" | {growth(walls)}; {growth(rss)} | {min(loads):.1f}–{max(loads):.1f} |")
PY
cat "$res"
