"""Start-up cost: ``import fuelsys`` plus one kerosene formula in a fresh interpreter.

Aim (issue 2): under 1 s, with CoolProp and scipy imported only when needed.
Baseline: a fresh interpreter that only imports numpy.
"""

import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def _fresh(code: str) -> float:
    best = float("inf")
    for _ in range(3):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-c", code], check=True, cwd=ROOT)
        best = min(best, time.perf_counter() - t0)
    return best


def run(report):
    base = _fresh("import numpy")
    code = ("import fuelsys.sheet, sys; v = fuelsys.sheet.call('FS_DENSITY', 'kerosene', 15);"
            " assert isinstance(v, float), v;"
            " assert 'CoolProp' not in sys.modules and 'scipy' not in sys.modules, 'heavy import'")
    cand = _fresh(code)
    report("start-up: import + one FS_DENSITY (fresh interpreter)", None, cand,
           f"aim < 1 s; bare 'import numpy' interpreter {base:.3f} s")
