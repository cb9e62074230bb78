#!/usr/bin/env python3
"""Runs one command with stdout to a file and prints {"wall": s, "cpu": s} for it: wall-clock time
and the child's user + system CPU time (getrusage of children), so the benchmark can report a
CPU ratio that is steadier than wall time on a shared machine.

usage: python3 bench/_timed.py OUT_FILE COMMAND [ARGS...]
"""
import json
import resource
import subprocess
import sys
import time

out_path, cmd = sys.argv[1], sys.argv[2:]
with open(out_path, "wb") as out:
    t0 = time.perf_counter()
    proc = subprocess.run(cmd, stdout=out, stderr=subprocess.PIPE)
    wall = time.perf_counter() - t0
if proc.returncode != 0:
    sys.stderr.write(proc.stderr.decode("utf-8", "replace"))
    sys.exit(proc.returncode)
r = resource.getrusage(resource.RUSAGE_CHILDREN)
json.dump({"wall": wall, "cpu": r.ru_utime + r.ru_stime}, sys.stdout)
