"""Time lasio on the file the las_read benchmark generates (best of N reads).

Usage: .venv/bin/python benches/lasio_read.py [target/bench-data/bench-30mb.las] [N]
"""
import os
import sys
import time

import lasio

path = sys.argv[1] if len(sys.argv) > 1 else "target/bench-data/bench-30mb.las"
n = int(sys.argv[2]) if len(sys.argv) > 2 else 3
size = os.path.getsize(path) / 1e6
best = float("inf")
for _ in range(n):
    t = time.perf_counter()
    las = lasio.read(path)
    best = min(best, time.perf_counter() - t)
print(f"lasio {lasio.__version__}: {size:.1f} MB in {best:.2f} s = {size / best:.1f} MB/s ({las.data.shape[0]} rows)")
