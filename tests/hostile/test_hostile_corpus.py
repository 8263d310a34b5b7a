"""Every command on every book of the hostile corpus (make_corpus.py): no traceback, the exit
status README states ("Where recalc writes, and exit status"), no file changed outside the
command's output, and time and memory within the bounds below.

Bounds (stated here, checked per command in a fresh interpreter per book):
``MAX_SECONDS`` of CPU time per command, and ``MAX_PEAK_MB`` of peak resident
memory for the whole run of one book (``resource.getrusage``, which includes the
interpreter, numpy and openpyxl).  The expected exit statuses come from README;
the books' formats from the sources named in make_corpus.py.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

import make_corpus

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
MAX_SECONDS = 20.0
MAX_PEAK_MB = 400.0

BOOKS = make_corpus.corpus()
COMMANDS = ("recalc", "check", "diff", "eval", "notes")


@pytest.fixture(scope="module", autouse=True)
def _announce(request):
    with request.config.pluginmanager.get_plugin("capturemanager").global_and_fixture_disabled():
        print(f"\nhostile corpus: {len(BOOKS)} books × {len(COMMANDS)} commands = {len(BOOKS) * len(COMMANDS)} runs")
    yield


@pytest.mark.slow
@pytest.mark.parametrize("hb", BOOKS, ids=[b.name for b in BOOKS])
def test_every_command_on_a_hostile_book(hb, tmp_path):
    sandbox = tmp_path / "sandbox"
    folder = sandbox / "books"
    folder.mkdir(parents=True)
    (sandbox / "sentinel.txt").write_text("must stay as it is")
    book = folder / hb.name
    book.write_bytes(hb.data)
    env = dict(os.environ, PYTHONPATH=ROOT + os.pathsep + os.environ.get("PYTHONPATH", ""))
    proc = subprocess.run([sys.executable, os.path.join(HERE, "run_commands.py"), str(sandbox), str(book)],
                          capture_output=True, text=True, env=env, timeout=600, cwd=str(tmp_path))
    assert proc.returncode == 0, proc.stderr[-3000:]
    results = json.loads(proc.stdout.strip().splitlines()[-1])
    assert set(results) == set(COMMANDS)
    problems = []
    for name in COMMANDS:
        r = results[name]
        if r["escaped"] or r["traceback"]:
            problems.append(f"{name}: traceback\n{r['escaped'] or r['message']}")
        if r["rc"] != hb.expect[name]:
            problems.append(f"{name}: exit {r['rc']}, README says {hb.expect[name]} ({hb.what}): {r['message']}")
        if r["changed"]:
            problems.append(f"{name}: changed {r['changed']} outside its output")
        if r["cpu_s"] > MAX_SECONDS:
            problems.append(f"{name}: {r['cpu_s']:.1f} s of CPU (bound {MAX_SECONDS} s)")
        if r["peak_mb"] > MAX_PEAK_MB:
            problems.append(f"{name}: peak memory {r['peak_mb']:.0f} MB (bound {MAX_PEAK_MB} MB)")
    assert not problems, "\n".join(problems)
    if hb.expect["recalc"] == 2:  # a refusal says why, in one line of its own words
        assert "refused" in results["recalc"]["message"] or "nothing written" in results["recalc"]["message"]
