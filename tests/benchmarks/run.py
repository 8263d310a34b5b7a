"""Run every benchmark in this folder and print the ratios measured in this run.

Usage: ``python tests/benchmarks/run.py [NAME_FILTER]``

Each ``bench_*.py`` module defines ``run(report)`` and calls
``report(name, baseline_seconds, candidate_seconds, note)`` for each
measurement; the ratio printed is baseline / candidate (how many times faster
the candidate is than the baseline measured in the same run).  A measurement
without a baseline (``baseline_seconds=None``) prints its absolute time only.
Benchmarks are not part of the test run.
"""

from __future__ import annotations

import importlib.util
import sys
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))


def best_of(fn, repeat: int = 3, number: int = 1) -> float:
    """Best wall time of ``repeat`` runs of ``number`` calls of ``fn``, per call [s]."""
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        for _ in range(number):
            fn()
        best = min(best, (time.perf_counter() - t0) / number)
    return best


def main(argv=None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    pattern = argv[0] if argv else ""
    rows = []

    def report(name, baseline, candidate, note=""):
        rows.append((name, baseline, candidate, note))
        ratio = f"{baseline / candidate:10.1f}x" if baseline else " " * 11
        base = f"{baseline:10.4g}s" if baseline else " " * 11
        print(f"{name:58s} {base} {candidate:10.4g}s {ratio}  {note}", flush=True)

    print(f"{'benchmark':58s} {'baseline':>11s} {'candidate':>11s} {'ratio':>11s}  note")
    failed = 0
    for path in sorted(HERE.glob("bench_*.py")):
        if pattern and pattern not in path.stem:
            continue
        spec = importlib.util.spec_from_file_location(path.stem, path)
        mod = importlib.util.module_from_spec(spec)
        try:
            spec.loader.exec_module(mod)
            mod.run(report)
        except Exception:  # keep going: one broken benchmark must not hide the others
            failed += 1
            print(f"{path.stem}: FAILED", file=sys.stderr)
            traceback.print_exc()
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
