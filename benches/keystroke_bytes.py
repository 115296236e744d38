#!/usr/bin/env python3
"""Bytes written to the terminal per keystroke while typing a catalogue search.

Runs the real planner under a pseudo-terminal (120x40, 16-colour TERM), records the size of the
first full frame, then types a query one key at a time and records what each key makes nonet
write. Target: the median keystroke costs under 40% of the first frame.

Usage: benches/keystroke_bytes.py [path/to/nonet]   (default target/release/nonet)
"""
import fcntl
import os
import pty
import select
import statistics
import struct
import sys
import tempfile
import termios
import time

BINARY = sys.argv[1] if len(sys.argv) > 1 else "target/release/nonet"
ROWS, COLS = 40, 120
QUERY = "phosphine"


def drain(fd, quiet=0.3, limit=5.0):
    """Read until the program has been silent for `quiet` seconds."""
    data = b""
    start = time.time()
    while time.time() - start < limit:
        ready, _, _ = select.select([fd], [], [], quiet)
        if not ready:
            break
        try:
            chunk = os.read(fd, 65536)
        except OSError:
            break
        if not chunk:
            break
        data += chunk
    return data


def main():
    config = tempfile.mkdtemp(prefix="nonet-bytes-")
    pid, fd = pty.fork()
    if pid == 0:
        os.environ.update(
            {"TERM": "xterm", "LANG": "C.UTF-8", "NONET_CONFIG_DIR": config, "NO_COLOR": ""}
        )
        os.execv(BINARY, [BINARY])
    fcntl.ioctl(fd, termios.TIOCSWINSZ, struct.pack("HHHH", ROWS, COLS, 0, 0))
    first = drain(fd, quiet=0.8)
    per_key = []
    for key in "/" + QUERY:
        os.write(fd, key.encode())
        per_key.append(len(drain(fd)))
    os.write(fd, b"\x1b")
    drain(fd)
    os.write(fd, b"q")
    drain(fd)
    os.waitpid(pid, 0)
    median = statistics.median(per_key)
    print(f"first full frame: {len(first)} bytes at {COLS}x{ROWS}")
    print(f"bytes per keystroke typing '/{QUERY}': {per_key}")
    print(f"median {median:.0f} bytes = {100 * median / max(len(first), 1):.1f}% of the first frame")
    return 0 if median < 0.4 * len(first) else 1


if __name__ == "__main__":
    sys.exit(main())
