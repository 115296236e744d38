#!/usr/bin/env bash
# End-to-end throughput of `nonet count --json --batch` on one core (target: 500,000
# formulas per second). Output goes to /dev/null so the figure is nonet's own work, not the
# disk's; a second run through a pipe checks that every line was written.
# Usage: benches/batch_throughput.sh [N]   (default 500000 formulas)
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-500000}
cargo build --release --quiet
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
# the shapes a literature list holds, shared with benches/count.rs and tests/fuzz.rs
mapfile -t formulas < benches/sample_formulas.txt
k=${#formulas[@]}
for ((i = 0; i < n; i++)); do echo "${formulas[i % k]}"; done > "$work/list.txt"
export NONET_CONFIG_DIR="$work/config"
lines=$(taskset -c 0 target/release/nonet count --json --batch "$work/list.txt" | wc -l)
[[ $lines -eq $n ]] || { echo "expected $n lines, got $lines" >&2; exit 1; }
best=""
for run in 1 2 3; do
  start=$(date +%s.%N)
  taskset -c 0 target/release/nonet count --json --batch "$work/list.txt" > /dev/null
  end=$(date +%s.%N)
  t=$(python3 -c "print($end - $start)")
  best=$(python3 -c "print(min(float('$t'), float('${best:-1e9}')))")
done
python3 -c "
n, t = $n, $best
print(f'{n} formulas in {t:.3f} s (best of 3) on one core: {n / t:,.0f} formulas/s')"
