"""Speed and memory of the data-cleaning paths (a benchmark, not a test).

1. The CLI normalizing a generated CSV of 1,000,000 and 3,000,000 rows holding about 20,000
   distinct configurations: rows per second and peak resident memory (RSS) of the process.
   Target: peak RSS under 200 MB at both sizes (memory must not grow with the file).
2. The pandas path (``confspec.pandas.normalize``) on the same column against a baseline
   measured in the same run: ``Series.map`` over a plain Python function applying one regex
   to each value. Target: ratio baseline / confspec >= 1.

Run: ``python benchmarks/bench_cli.py [--rows 1000000,3000000] [--distinct 20000]``.
Each measurement runs in a fresh process, so no cache is warm.
"""

from __future__ import annotations

import argparse
import csv
import os
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

SUPERSCRIPT = str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹")
CORES = [(None, []), ("He", ["1s"]), ("Ne", ["1s", "2s", "2p"]),
         ("Ar", ["1s", "2s", "2p", "3s", "3p"]),
         ("Kr", ["1s", "2s", "2p", "3s", "3p", "3d", "4s", "4p"]),
         ("Xe", ["1s", "2s", "2p", "3s", "3p", "3d", "4s", "4p", "4d", "5s", "5p"])]
VALENCE = ["2s", "2p", "3s", "3p", "3d", "4s", "4p", "4d", "4f", "5s", "5p", "5d", "5f", "6s",
           "6p", "6d", "7s"]
CAPACITY = {"s": 2, "p": 6, "d": 10, "f": 14}


def distinct_values(count: int, seed: int = 7) -> list[str]:
    """About ``count`` distinct configuration strings: several spellings, ~3% invalid."""
    rng = random.Random(seed)
    seen: set[str] = set()
    out: list[str] = []
    while len(out) < count:
        core, inside = rng.choice(CORES)
        free = [s for s in VALENCE if s not in inside]
        subs = sorted(rng.sample(free, rng.randint(1, 3)), key=lambda s: (int(s[0]), s[1]))
        occ = [(s, rng.randint(1, CAPACITY[s[1]])) for s in subs]
        if rng.random() < 0.03:
            label, _ = occ[-1]
            occ[-1] = (label, CAPACITY[label[1]] + 1)  # a Pauli violation
        style = rng.random()
        if style < 0.55:
            body = " ".join(f"{s}{n}" for s, n in occ)
        elif style < 0.7:
            body = " ".join(f"{s}^{n}" for s, n in occ)
        elif style < 0.85:
            body = " ".join(f"{s}{str(n).translate(SUPERSCRIPT)}" for s, n in occ)
        else:
            body = "".join(f"{s}{n}" for s, n in occ)
        text = f"[{core}] {body}" if core else body
        if text not in seen:
            seen.add(text)
            out.append(text)
    return out


def write_csv(path: Path, rows: int, values: list[str], seed: int = 11) -> None:
    rng = random.Random(seed)
    pick = rng.choices(values, k=min(rows, 1_000_000))
    with open(path, "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(["id", "configuration", "source"])
        for start in range(0, rows, len(pick)):
            size = min(len(pick), rows - start)
            writer.writerows((start + i, pick[i], "bench") for i in range(size))


_MEASURE = """
import resource, subprocess, sys, time
start = time.perf_counter()
done = subprocess.run(sys.argv[1:], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
elapsed = time.perf_counter() - start
peak_kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
print(done.returncode, elapsed, peak_kb)
sys.stderr.write(done.stderr.decode())
"""


def run_cli(source: Path, output: Path, jobs: int) -> tuple[int, float, float]:
    """Exit status, seconds and peak RSS (MB) of one CLI run in a fresh process."""
    command = [sys.executable, "-m", "confspec.cli", "normalize", str(source), "--column",
               "configuration", "--output", str(output), "--jobs", str(jobs)]
    done = subprocess.run([sys.executable, "-c", _MEASURE, *command], capture_output=True,
                          text=True, check=True)
    status, seconds, peak_kb = done.stdout.split()
    return int(status), float(seconds), int(peak_kb) / 1024


_PANDAS = """
import re, sys, time
import pandas as pd
values = pd.read_csv(sys.argv[1], usecols=["configuration"], dtype=object)["configuration"]
ONE = re.compile(r"(?:\\[[A-Z][a-z]\\] ?)?(?:[1-7][spdf](?:\\^?[0-9]+|[⁰¹²³⁴⁵⁶⁷⁸⁹]+) ?)+")

def baseline(value):
    return value.strip() if ONE.fullmatch(value) else None

start = time.perf_counter()
base = values.map(baseline)
base_s = time.perf_counter() - start

import confspec.pandas as cp
start = time.perf_counter()
ours = cp.normalize(values)
ours_s = time.perf_counter() - start
start = time.perf_counter()
cp.normalize(values)
warm_s = time.perf_counter() - start
assert len(ours) == len(values) == len(base)
print(len(values), values.nunique(), base_s, ours_s, warm_s)
"""


def run_pandas(source: Path) -> tuple[int, int, float, float, float]:
    done = subprocess.run([sys.executable, "-c", _PANDAS, str(source)], capture_output=True,
                          text=True, check=True)
    rows, distinct, base, ours, warm = done.stdout.split()
    return int(rows), int(distinct), float(base), float(ours), float(warm)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", default="1000000,3000000",
                        help="comma-separated CSV sizes for the CLI (default 1M and 3M)")
    parser.add_argument("--distinct", type=int, default=20_000)
    parser.add_argument("--jobs", type=int, default=1, help="--jobs for the CLI runs")
    parser.add_argument("--keep", metavar="DIR", help="keep the generated files in DIR")
    args = parser.parse_args()
    sizes = [int(n) for n in args.rows.split(",") if n]
    values = distinct_values(args.distinct)
    workdir = Path(args.keep) if args.keep else Path(tempfile.mkdtemp(prefix="confspec-bench-"))
    workdir.mkdir(parents=True, exist_ok=True)
    print(f"confspec CLI benchmark: {args.distinct:,} distinct configurations, "
          f"files in {workdir}")
    failures = []
    first: Path | None = None
    for rows in sizes:
        source = workdir / f"rows_{rows}.csv"
        if not source.exists():
            started = time.perf_counter()
            write_csv(source, rows, values)
            print(f"  generated {rows:>10,} rows ({source.stat().st_size / 1e6:,.0f} MB) in "
                  f"{time.perf_counter() - started:.1f} s")
        first = first or source
        status, seconds, peak = run_cli(source, workdir / "out.csv", args.jobs)
        ok = peak < 200
        failures += [] if ok else [f"peak RSS {peak:.0f} MB at {rows:,} rows"]
        print(f"  confspec normalize {rows:>10,} rows: {seconds:6.1f} s, "
              f"{rows / seconds:>9,.0f} rows/s, peak RSS {peak:5.0f} MB "
              f"(target < 200 MB: {'met' if ok else 'MISSED'}; exit {status})")
        os.unlink(workdir / "out.csv")
    if first is not None:
        rows, distinct, base, ours, warm = run_pandas(first)
        ratio = base / ours
        ok = ratio >= 1
        failures += [] if ok else [f"pandas ratio {ratio:.2f}"]
        print(f"  pandas, {rows:,} rows ({distinct:,} distinct): Series.map(one regex) "
              f"{base:.2f} s; confspec.pandas.normalize {ours:.2f} s cold, {warm:.2f} s warm")
        print(f"    ratio baseline/confspec: {ratio:.2f} cold, {base / warm:.2f} warm "
              f"(target >= 1: {'met' if ok else 'MISSED'})")
    if not args.keep:
        for path in workdir.iterdir():
            path.unlink()
        workdir.rmdir()
    if failures:
        print("targets missed: " + "; ".join(failures))
    return 0


if __name__ == "__main__":
    sys.exit(main())
