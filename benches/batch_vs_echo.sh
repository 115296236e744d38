#!/usr/bin/env bash
# `nonet count --json --batch` on every core against Python merely echoing the same lines as
# JSON (json.dumps of {"input": line} per line), both writing to a file. Target: nonet in at
# most a third of Python's time for 100,000 formulas, with the output trimmed to what a
# screening script keeps (--fields input,formula,charge: each line is parsed and checked for a
# possible oxidation state and d count, but not counted, since nothing asked needs the count);
# also timed: a field set that needs the whole count (metals), the full 1.3 KB lines, and one
# core.
# Usage: benches/batch_vs_echo.sh [N]   (default 100000 formulas)
set -euo pipefail
cd "$(dirname "$0")/.."
n=${1:-100000}
cargo build --release --quiet
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
# the shapes a literature list holds, shared with benches/count.rs and tests/fuzz.rs
mapfile -t formulas < benches/sample_formulas.txt
k=${#formulas[@]}
for ((i = 0; i < n; i++)); do echo "${formulas[i % k]}"; done > "$work/list.txt"
export NONET_CONFIG_DIR="$work/config"
cat > "$work/echo.py" <<'PY'
import json, sys
with open(sys.argv[1], encoding="utf-8") as f, open(sys.argv[2], "w", encoding="utf-8") as out:
    for line in f:
        out.write(json.dumps({"input": line.strip()}) + "\n")
PY
# best of 3 wall-clock seconds of a command
best() {
  local b=""
  for run in 1 2 3; do
    local s e
    s=$(date +%s.%N)
    "$@"
    e=$(date +%s.%N)
    b=$(python3 -c "print(min($e - $s, float('${b:-1e9}')))")
  done
  echo "$b"
}
py=$(best python3 "$work/echo.py" "$work/list.txt" "$work/py.jsonl")
all=$(best sh -c "target/release/nonet count --json --batch '$work/list.txt' > '$work/nonet.jsonl'")
lines=$(wc -l < "$work/nonet.jsonl")
[[ $lines -eq $n ]] || { echo "expected $n lines, got $lines" >&2; exit 1; }
fields=$(best sh -c "target/release/nonet count --json --fields input,formula,charge --batch '$work/list.txt' > '$work/fields.jsonl'")
metals=$(best sh -c "target/release/nonet count --json --fields input,formula,metals --batch '$work/list.txt' > '$work/metals.jsonl'")
one=$(best sh -c "taskset -c 0 target/release/nonet count --json --batch '$work/list.txt' > '$work/one.jsonl'")
cmp -s "$work/nonet.jsonl" "$work/one.jsonl" || { echo "output differs between one core and all" >&2; exit 1; }
python3 - <<PY
n, py, all_, fields, metals, one = $n, $py, $all, $fields, $metals, $one
print(f"{n} formulas, best of 3, to a file on $(nproc) cores")
print(f"  python echo as JSON                      {py:.3f} s")
print(f"  nonet --fields input,formula,charge      {fields:.3f} s  ({fields / py:.2f} of python; target <= 0.33)")
print(f"  nonet --fields input,formula,metals      {metals:.3f} s  ({metals / py:.2f})")
print(f"  nonet, full lines, every core            {all_:.3f} s  ({all_ / py:.2f})")
print(f"  nonet, full lines, one core              {one:.3f} s")
PY
