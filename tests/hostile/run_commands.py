"""Run every fuelsys command on one book, in this process, and print what happened as JSON.

Used by test_hostile_corpus.py, one fresh interpreter per book, so that the
peak memory (``resource.getrusage``) is that book's own.  For each command:
its exit status, whether anything escaped as an exception or printed a
traceback, its wall and CPU time, the peak resident memory so far, and every
file under the sandbox folder that changed although it was not the command's
output.

    python3 run_commands.py SANDBOX BOOK
"""

from __future__ import annotations

import contextlib
import hashlib
import io
import json
import os
import resource
import sys
import time
import traceback


def snapshot(folder: str) -> dict:
    out = {}
    for base, dirs, files in os.walk(folder):
        for name in dirs + files:
            p = os.path.join(base, name)
            st = os.lstat(p)
            digest = ""
            if os.path.isfile(p) and not os.path.islink(p):
                with open(p, "rb") as fh:
                    digest = hashlib.sha1(fh.read()).hexdigest()
            out[os.path.relpath(p, folder)] = (st.st_mode, digest)
    return out


def commands(book: str, out: str) -> dict:
    return {
        "recalc": ["recalc", book, "-o", out],
        "check": ["check", book],
        "diff": ["diff", book, book],
        "eval": ["eval", "=SUM(A1:C3)", "--book", book],
        "notes": ["recalc", book, "--notes"],
    }


def main(sandbox: str, book: str) -> dict:
    from fuelsys.cli import main as fuelsys_main

    out = os.path.join(os.path.dirname(book), "out.xlsx")
    results = {}
    for name, argv in commands(book, out).items():
        before = snapshot(sandbox)
        stdout, stderr = io.StringIO(), io.StringIO()
        t0, c0 = time.perf_counter(), time.process_time()
        escaped = None
        rc = None
        with contextlib.redirect_stdout(stdout), contextlib.redirect_stderr(stderr):
            try:
                rc = fuelsys_main(argv)
            except SystemExit as exc:  # argparse
                rc = exc.code
            except BaseException:  # noqa: BLE001 -- recorded, and the test fails on it
                escaped = traceback.format_exc()
        wall, cpu = time.perf_counter() - t0, time.process_time() - c0
        after = snapshot(sandbox)
        allowed = set()
        if rc == 0 and name == "recalc":
            allowed.add(os.path.relpath(out, sandbox))
        if rc == 0 and name == "notes":
            allowed.add(os.path.relpath(book, sandbox))
        changed = sorted(k for k in set(before) | set(after) if before.get(k) != after.get(k) and k not in allowed)
        text = stdout.getvalue() + stderr.getvalue()
        results[name] = {
            "rc": rc, "escaped": escaped, "traceback": "Traceback" in text, "wall_s": wall, "cpu_s": cpu,
            "peak_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0,
            "changed": changed, "message": text[-600:],
        }
        if os.path.exists(out):
            os.unlink(out)
    return results


if __name__ == "__main__":
    print(json.dumps(main(sys.argv[1], sys.argv[2])))
