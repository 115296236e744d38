#!/usr/bin/env bash
# Peak memory of a two-site pair screen with a 10,000-ligand catalogue (target: under 100 MB).
# The extra ligands are a synthetic user set: the bundled ones repeated under new keys.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
mkdir -p "$work/config/ligand_sets"
export NONET_CONFIG_DIR="$work/config" NONET_DATA_DIR="$work/data"
target/release/nonet ligands --json | python3 -c '
import json, sys
base = [json.loads(l) for l in sys.stdin]
out = []
for i in range(10000 - len(base)):
    l = base[i % len(base)]
    m = l["modes"][0]
    out.append("[[ligand]]\nkey = %s\nname = %s\nformula = %s\nfamily = %s\n[[ligand.mode]]\nlabel = %s\nclass = %s\n" % (
        json.dumps(l["key"] + "v%d" % i), json.dumps(l["name"] + " variant"), json.dumps(l["key"] + "v%df" % i),
        json.dumps(l["family"]), json.dumps(m["label"]), json.dumps(m["class"])))
open(sys.argv[1], "w").write("\n".join(out))
' "$work/config/ligand_sets/synthetic.toml"
n=$(target/release/nonet ligands --json | wc -l)
/usr/bin/time -f "%M" -o "$work/rss" target/release/nonet screen 'IrH3(PPh3)3' --site PPh3 --site PPh3 \
  --electrons 18 --top 50 --json > "$work/out.jsonl"
start=$(date +%s.%N)
target/release/nonet screen 'IrH3(PPh3)3' --site PPh3 --site PPh3 --electrons 18 --top 50 --json > /dev/null
end=$(date +%s.%N)
echo "catalogue: $n ligands; candidates written: $(wc -l < "$work/out.jsonl")"
echo "pair screen wall time (whole process): $(python3 -c "print(round($end - $start, 3))") s"
echo "peak memory: $(( $(cat "$work/rss") / 1024 )) MB"
