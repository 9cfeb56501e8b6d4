#!/usr/bin/env bash
# Opens Aggrade on the demo sections. On a machine with no display it does the main job headless:
# writes the demo's interpreted column to a PDF and says where.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/setup.sh
cargo build --workspace --bins   # --workspace: the same dependency build the tests use
exec target/debug/aggrade "${1:-sample_sections/demo.aggrade}"
