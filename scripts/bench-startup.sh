#!/usr/bin/env bash
# Launch to first frame of the window, release build, software rendering (Xvfb; wgpu falls back
# to the CPU renderer Mesa provides), on the demo project and on a generated section of 50,000
# beds; and the window's peak memory (maximum resident set size) over that start.
#
#   scripts/bench-startup.sh [--no-build] [RUNS]        (RUNS per file, default 5)
#
# How: the window writes the wall clock when the first frame with the column is built and when
# the frame after it starts (the first has then been painted and shown) to $AGGRADE_FRAME_LOG,
# then closes itself ($AGGRADE_EXIT_AFTER_FIRST_FRAME; see `startup_log` in
# app/src/gui/canvas.rs). This script takes the clock just before it starts the binary and
# reports both intervals. Needs Xvfb, python3 and GNU time. The window keeps its backups in
# target/bench-startup/data, not the user's folder. Results: target/bench-startup/results.md.
set -euo pipefail
cd "$(dirname "$0")/.."
out=target/bench-startup
mkdir -p "$out/data"
if [ "${1:-}" = "--no-build" ]; then
    shift
else
    nice -n 19 cargo build --release -p aggrade
fi
runs="${1:-5}"
bin="${AGGRADE_BIN:-$PWD/target/release/aggrade}"
[ -x "$bin" ] || { echo "no release binary at $bin; run without --no-build" >&2; exit 1; }

# 50,000 beds: the demo's beds cycled, thickness jittered ±20 % (scripts/bench-sections.py).
python3 scripts/bench-sections.py "$out/beds_50000.aggrade" 50000

# A free X display number between 90 and 99.
n=90
while [ -e "/tmp/.X$n-lock" ] && [ "$n" -lt 99 ]; do n=$((n + 1)); done
Xvfb ":$n" -screen 0 1400x900x24 >/dev/null 2>&1 &
xvfb=$!
trap 'kill "$xvfb" 2>/dev/null || true' EXIT
sleep 2

res="$out/results.md"
{
    echo "# start-up run $(date -u +%Y-%m-%dT%H:%MZ), $bin, Xvfb :$n 1400x900x24, $(nproc) cores, load average $(cut -d' ' -f1-3 /proc/loadavg)"
    echo
    echo "| file | run | first column frame built (ms) | first frame shown (ms) | process exit (ms) | max RSS (MB) | load |"
    echo "|---|---|---|---|---|---|---|"
} > "$res"
for file in demo "$out/beds_50000.aggrade"; do
    for ((k = 1; k <= runs; k++)); do
        log="$out/frames.log"
        rm -f "$log"
        arg=()
        [ "$file" != demo ] && arg=("$file")
        load=$(cut -d' ' -f1 /proc/loadavg)
        t0=$(date +%s%N)
        AGGRADE_FRAME_LOG="$log" AGGRADE_EXIT_AFTER_FIRST_FRAME=1 AGGRADE_DATA_DIR="$out/data" \
            DISPLAY=":$n" XDG_RUNTIME_DIR="${XDG_RUNTIME_DIR:-/tmp}" \
            timeout 120 /usr/bin/time -f "%M" -o "$out/rss.txt" "$bin" "${arg[@]}" >/dev/null 2>"$out/stderr.txt" || true
        t1=$(date +%s%N)
        built=$(awk '$1 == "first_column_frame_built" {print $2}' "$log" 2>/dev/null || true)
        shown=$(awk '$1 == "second_frame_started" {print $2}' "$log" 2>/dev/null || true)
        if [ -z "$built" ] || [ -z "$shown" ]; then
            echo "| $(basename "$file") | $k | no frame logged (see $out/stderr.txt) | | | | $load |" >> "$res"
            continue
        fi
        rss=$(tail -1 "$out/rss.txt")
        echo "| $(basename "$file") | $k | $(((built - t0) / 1000000)) | $(((shown - t0) / 1000000)) | $(((t1 - t0) / 1000000)) | $(awk -v k="$rss" 'BEGIN{printf "%.1f", k/1000}') | $load |" >> "$res"
    done
done
cat "$res"
