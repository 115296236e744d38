#!/usr/bin/env bash
# Drive the real planner in tmux, capture the screens with their colours, and turn them into
# PNG images for the README: ANSI -> HTML (ansi2html.py) -> headless Chromium screenshot.
# The cycle figure comes from `nonet export --format svg`, converted with librsvg's
# rsvg-convert.
# Needs tmux, Debian's chromium and librsvg2-bin (apt-get install tmux chromium
# fonts-dejavu-core librsvg2-bin).
# Usage: screenshots/make.sh [figures]   (figures: only the cycle figure, no browser needed)
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
out=screenshots
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
export NONET_CONFIG_DIR="$work/config"
export NONET_DATA_DIR="$work/data"

# figure NAME START STEPS...: plan a cycle from the command line into a session, export the
# figure and convert it to PNG
figure() {
  local name=$1 start=$2
  shift 2
  target/release/nonet step --session "$name" "$start" "$@" > /dev/null
  target/release/nonet export "$name" --format svg -o "$work/$name.svg"
  cp "$work/$name.svg" "$out/$name.svg"
  rsvg-convert --background-color=white -o "$out/$name.png" "$work/$name.svg"
  echo "wrote $out/$name.png"
}

figure suzuki_cycle 'Pd(PPh3)2' 'oxidative-addition PhBr' 'transmetalation PhB(OH)2' \
  'reductive-elimination Ph Ph'
if [ "${1:-}" = figures ]; then
  exit 0
fi

chrome=$(command -v chromium || command -v chromium-browser)

# scene NAME COLS ROWS KEYS...: start the planner, type the keys, capture the screen
scene() {
  local name=$1 cols=$2 rows=$3
  shift 3
  local sock="nonet-shots-$name"
  tmux -L "$sock" -f /dev/null new-session -d -s shot -x "$cols" -y "$rows" \
    "LANG=C.UTF-8 NONET_CONFIG_DIR=$NONET_CONFIG_DIR NONET_DATA_DIR=$work/data-$name target/release/nonet"
  sleep 1
  for k in "$@"; do
    tmux -L "$sock" send-keys -t shot "$k"
    sleep 0.3
  done
  sleep 0.5
  tmux -L "$sock" capture-pane -e -p -t shot > "$work/$name.ansi"
  tmux -L "$sock" kill-server 2>/dev/null || true
  python3 "$out/ansi2html.py" "$work/$name.ansi" > "$work/$name.html"
  local width=$((cols * 9 + 16)) height=$((rows * 19 + 16))
  "$chrome" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync \
    --user-data-dir="$work/chrome" --hide-scrollbars \
    --window-size="$width,$height" --screenshot="$out/$name.png" "file://$work/$name.html" \
    >/dev/null 2>&1
  echo "wrote $out/$name.png"
}

scene demo_120x40 120 40
scene swap_preview_120x40 120 40 / P M e 3
scene ring_slip_120x40 120 40 e 'CpMn(CO)3' Enter j j j m
scene help_80x24 80 24 '?'
scene narrow_80x24 80 24 j j / P C y 3
scene step_preview_120x40 120 40 e 'IrCl(CO)(PPh3)2' Enter O H 2 Enter
scene session_tree_120x40 120 40 / P M e 3 Enter u / P C y 3 Enter O H 2 Enter Enter t
