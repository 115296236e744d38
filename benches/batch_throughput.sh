#!/usr/bin/env bash
# End-to-end throughput of `nonet count --json --batch` on one core.
# Usage: benches/batch_throughput.sh [N]   (default 500000 formulas)
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-500000}
cargo build --release --quiet
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
formulas=(
  'CpFe(CO)2Me' '[Co(NH3)6]3+' 'RhCl(PPh3)3' 'IrCl(CO)(PPh3)2' 'Mn2(CO)10' 'Os3(CO)12'
  'Cp2ZrCl2' '[Fe(CN)6]4-' 'Pd(PtBu3)2' 'Rh2(μ-Cl)2(CO)4' '[PtCl3(C2H4)]-'
  'W(CO)3(PCy3)2(η2-H2)' 'Cr(acac)3' '[Ru(bpy)3]2+' '(η6-C6H6)Cr(CO)3' '[ReH9]2-'
)
k=${#formulas[@]}
for ((i = 0; i < n; i++)); do echo "${formulas[i % k]}"; done > "$work/list.txt"
export NONET_CONFIG_DIR="$work/config"
start=$(date +%s.%N)
taskset -c 0 target/release/nonet count --json --batch "$work/list.txt" > "$work/out.jsonl"
end=$(date +%s.%N)
lines=$(wc -l < "$work/out.jsonl")
python3 - "$start" "$end" "$lines" <<'PY'
import sys
start, end, lines = float(sys.argv[1]), float(sys.argv[2]), int(sys.argv[3])
secs = end - start
print(f"{lines} formulas in {secs:.3f} s on one core: {lines / secs:,.0f} formulas/s")
PY
