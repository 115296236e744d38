#!/usr/bin/env bash
# The fuzz campaign, run before an issue is closed: NONET_FUZZ_N generated inputs per CLI verb
# (default 1,000,000; screen a hundredth of that, each one ranks the whole catalogue), built
# with optimizations. Reports panics with their inputs, the slowest input per verb, the peak
# memory, and runs `nonet count --batch` whole on the generated formulas.
# Usage: benches/fuzz_campaign.sh [N]
set -euo pipefail
cd "$(dirname "$0")/.."
export NONET_FUZZ_N=${1:-1000000}
cargo test --release --test fuzz -- --ignored --nocapture fuzz_campaign
