#!/usr/bin/env bash
# How much faster `aggrade export --pdf` prints a long section than a plotting script would: makes
# bed tables of 1,000 / 10,000 / 100,000 beds (scripts/peer/make_beds.py: the demo section's beds
# cycled, 0.36 m on average), then times the release build's `aggrade export --pdf` and the
# matplotlib peer (scripts/peer/column_pdf.py) on each, runs alternating, and prints the medians
# and their ratio (scripts/peer/compare.py). Also measures the peak memory of each run.
#
#   scripts/bench-export-peer.sh [--no-build] [N:RUNS[:PEER_RUNS] ...]
#
# Default sizes: 1000:5 10000:5 100000:3:1 (the peer takes minutes at 100,000 beds: one run).
# matplotlib comes from PyPI into a virtual environment of its own under target/ (never the test
# suite's). Runs at normal priority: note the load average beside each figure (the results list
# it for every run). Results: target/bench-peer/results.md.
set -euo pipefail
cd "$(dirname "$0")/.."
out=target/bench-peer
mkdir -p "$out"
if [ "${1:-}" = "--no-build" ]; then
    shift
else
    cargo build --release -p aggrade
fi
bin="${AGGRADE_BIN:-$PWD/target/release/aggrade}"
[ -x "$bin" ] || { echo "no release binary at $bin; run without --no-build" >&2; exit 1; }

venv=target/peer-venv
if ! "$venv/bin/python" -c "import matplotlib" 2>/dev/null; then
    python3 -m venv "$venv"
    "$venv/bin/pip" install --quiet "matplotlib==3.11.2"
fi

specs=("$@")
[ ${#specs[@]} -gt 0 ] || specs=(1000:5 10000:5 100000:3:1)
for spec in "${specs[@]}"; do
    n=${spec%%:*}
    [ -f "$out/beds_$n.csv" ] || python3 scripts/peer/make_beds.py "$n" "$out/beds_$n.csv"
done
{
    echo "## export vs peer, $(date -u +%Y-%m-%dT%H:%MZ), $bin, $(nproc) cores, matplotlib $("$venv/bin/python" -c 'import matplotlib; print(matplotlib.__version__)')"
    echo
} >> "$out/results.md"
python3 scripts/peer/compare.py "$bin" "$venv/bin/python" "$out" "$out/results.md" "${specs[@]}"
