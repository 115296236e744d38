#!/usr/bin/env python3
"""Turn a terminal capture (tmux capture-pane -e) into a standalone HTML page.

Handles the SGR codes nonet's 16-colour theme produces: bold, dim, underline, reverse, and the
16 named foreground/background colours. Usage: ansi2html.py CAPTURE.ansi > PAGE.html
"""
import html
import re
import sys

PALETTE = [
    "#1e1e1e", "#cd3131", "#0dbc79", "#e5e510", "#2472c8", "#bc3fbc", "#11a8cd", "#e5e5e5",
    "#666666", "#f14c4c", "#23d18b", "#f5f543", "#3b8eea", "#d670d6", "#29b8db", "#ffffff",
]
FG, BG = "#d4d4d4", "#1e1e1e"
SGR = re.compile(r"\x1b\[([0-9;]*)m")


def style(state):
    fg, bg = state["fg"] or FG, state["bg"] or BG
    if state["reverse"]:
        fg, bg = bg, fg
    css = [f"color:{fg}", f"background:{bg}"]
    if state["bold"]:
        css.append("font-weight:bold")
    if state["dim"]:
        css.append("opacity:0.7")
    if state["underline"]:
        css.append("text-decoration:underline")
    return ";".join(css)


def apply(codes, state):
    nums = [int(c) if c else 0 for c in codes.split(";")] if codes else [0]
    i = 0
    while i < len(nums):
        n = nums[i]
        if n == 0:
            state.update(fg=None, bg=None, bold=False, dim=False, underline=False, reverse=False)
        elif n == 1:
            state["bold"] = True
        elif n == 2:
            state["dim"] = True
        elif n == 4:
            state["underline"] = True
        elif n == 7:
            state["reverse"] = True
        elif n == 22:
            state["bold"] = state["dim"] = False
        elif n == 24:
            state["underline"] = False
        elif n == 27:
            state["reverse"] = False
        elif 30 <= n <= 37:
            state["fg"] = PALETTE[n - 30]
        elif 90 <= n <= 97:
            state["fg"] = PALETTE[n - 90 + 8]
        elif n == 39:
            state["fg"] = None
        elif 40 <= n <= 47:
            state["bg"] = PALETTE[n - 40]
        elif 100 <= n <= 107:
            state["bg"] = PALETTE[n - 100 + 8]
        elif n == 49:
            state["bg"] = None
        elif n in (38, 48) and i + 2 < len(nums) and nums[i + 1] == 5:
            color = nums[i + 2]
            value = PALETTE[color] if color < 16 else FG
            state["fg" if n == 38 else "bg"] = value
            i += 2
        i += 1


def convert(text):
    state = dict(fg=None, bg=None, bold=False, dim=False, underline=False, reverse=False)
    out = []
    for line in text.rstrip("\n").split("\n"):
        pos = 0
        for m in SGR.finditer(line):
            if m.start() > pos:
                out.append(f'<span style="{style(state)}">{html.escape(line[pos:m.start()])}</span>')
            apply(m.group(1), state)
            pos = m.end()
        if pos < len(line):
            out.append(f'<span style="{style(state)}">{html.escape(line[pos:])}</span>')
        out.append("\n")
    body = "".join(out)
    return (
        "<!doctype html><meta charset=utf-8><style>"
        f"body{{margin:0;background:{BG}}}"
        "pre{margin:8px;font:15px/1.25 'DejaVu Sans Mono',monospace}"
        f"</style><pre style=\"color:{FG}\">{body}</pre>"
    )


if __name__ == "__main__":
    with open(sys.argv[1], encoding="utf-8", errors="replace") as f:
        sys.stdout.write(convert(f.read()))
