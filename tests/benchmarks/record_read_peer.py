#!/usr/bin/python3
"""Peers for record_bench.cpp: read the same water-level CSV (ISO 8601 time, level) into UTC
seconds and floats with Debian's Python, and print the wall-clock and CPU seconds the reading
took (interpreter start-up and imports excluded) and the number of levels read.

usage: record_read_peer.py METHOD FILE   (METHOD: csv | genfromtxt | pandas)
"""
import sys
import time
from datetime import datetime, timezone


def read_csv_module(path):
    import csv
    times, levels = [], []
    with open(path, newline="", encoding="utf-8") as f:
        rows = csv.reader(f)
        header = next(rows)
        ti, li = header.index("time"), header.index("level")
        for row in rows:
            t = datetime.fromisoformat(row[ti])  # Python 3.11 reads "Z" and "+hh:mm"
            if t.tzinfo is None:
                t = t.replace(tzinfo=timezone.utc)
            times.append(int(t.timestamp()))
            levels.append(float(row[li]))
    return len(levels)


def read_genfromtxt(path):
    import numpy as np
    # numpy has no time-zone-aware datetime64: the times are read as text and converted with
    # datetime64 after dropping the "Z" (all times in the generated file are UTC).
    data = np.genfromtxt(path, delimiter=",", names=True, dtype=None, encoding="utf-8")
    t = np.array([s.rstrip("Z") for s in data["time"]], dtype="datetime64[s]").astype("int64")
    levels = data["level"].astype(float)
    assert t.shape == levels.shape
    return levels.size


def read_pandas(path):
    import pandas as pd
    df = pd.read_csv(path)
    t = pd.to_datetime(df["time"], utc=True)
    seconds = t.astype("int64") // 10**9
    assert len(seconds) == len(df["level"])
    return len(df["level"])


def main():
    method, path = sys.argv[1], sys.argv[2]
    reader = {"csv": read_csv_module, "genfromtxt": read_genfromtxt, "pandas": read_pandas}[method]
    if method == "genfromtxt":
        import numpy  # noqa: F401  (imports are not part of the reading)
    elif method == "pandas":
        import pandas  # noqa: F401
    start, start_cpu = time.perf_counter(), time.process_time()
    n = reader(path)
    print(f"{time.perf_counter() - start:.6f} {time.process_time() - start_cpu:.6f} {n}")


if __name__ == "__main__":
    main()
