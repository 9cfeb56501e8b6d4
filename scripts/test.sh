#!/usr/bin/env bash
# Runs the whole test suite (unit, reference-check, end-to-end and GUI tests). GUI tests need a
# display, so everything runs under a virtual X server.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/setup.sh
cargo build --workspace --all-targets
xvfb-run -a -s '-screen 0 1400x900x24' cargo test --workspace --no-fail-fast
