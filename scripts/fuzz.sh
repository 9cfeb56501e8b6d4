#!/usr/bin/env bash
# Run the libFuzzer targets of fuzz/ on the stable toolchain (RUSTC_BOOTSTRAP=1 lets stable accept
# the sanitizer flags cargo-fuzz passes), at the lowest priority so shared machines stay usable.
#
#   scripts/fuzz.sh [SECONDS_PER_TARGET] [TARGET...]
#   FUZZ_RUNS=10000000 scripts/fuzz.sh 3600 bed_table   # stop at 10^7 executions or 1 h
#
# Default: 300 s for each of project_text, bed_table, project_load, las, import_text,
# import_mapping, import_workbook, curve_table. The seed corpora in
# fuzz/corpus/<target>/ are read-only inputs; what a run discovers goes to
# target/fuzz-corpus/<target>/ (not committed). Crashes land in fuzz/artifacts/<target>/; turn
# each into a test in tests/tests/trust_regressions.rs named after what it pins.
# Needs: cargo install cargo-fuzz (0.13).
set -euo pipefail
cd "$(dirname "$0")/.."
secs="${1:-300}"
runs="${FUZZ_RUNS:--1}"
shift || true
targets=("$@")
[ ${#targets[@]} -eq 0 ] && targets=(project_text bed_table project_load las import_text import_mapping import_workbook curve_table)
export RUSTC_BOOTSTRAP=1
for t in "${targets[@]}"; do
    work="target/fuzz-corpus/$t"
    mkdir -p "$work"
    echo "== $t: ${secs}s" >&2
    # -jobs=1: one core; -rss_limit_mb: the readers must stay well inside this on any input.
    nice -n 19 cargo fuzz run --sanitizer none "$t" "$work" "fuzz/corpus/$t" -- \
        -max_total_time="$secs" -runs="$runs" -rss_limit_mb=1024 -max_len=65536 -timeout=10 -print_final_stats=1 \
        2>&1 | tee "target/fuzz-$t.log" | grep -E "^#[0-9]+[[:space:]]+(INITED|DONE)|ERROR|panicked|stat::" || true
done
