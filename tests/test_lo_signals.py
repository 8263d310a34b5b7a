"""Stopping fuelsys during a LibreOffice recalc leaves nothing behind (live, slow).

``fuelsys recalc --engine libreoffice`` runs with its own temporary folder
(TMPDIR) and is stopped by SIGTERM, SIGINT or SIGKILL while LibreOffice is
computing.  The expected behaviour is fuelsys's own rule (issue 16, item 7;
no outside source): within 5 s no process started for the run is left, the
temporary folder is empty (no profile, no LibreOffice temp files, no
dead pipe socket in /tmp), no
``.~fuelsys-lo-*`` file and no output are beside the output, and SIGINT and
SIGTERM end with one line on stderr and the exit code 128 + the signal.
"""

import os
import signal
import socket
import subprocess
import sys
import time
from pathlib import Path

import openpyxl
import pytest

from fuelsys.sheet.calc_addin import runner

pytestmark = [pytest.mark.live, pytest.mark.slow]

ROOT = Path(__file__).resolve().parent.parent
REASON = runner.unavailable_reason()


def _processes_naming(text: str) -> list:
    """Command lines of the running processes that mention ``text`` (zombies have none)."""
    found = []
    for proc in Path("/proc").iterdir():
        if not proc.name.isdigit():
            continue
        try:
            cmdline = (proc / "cmdline").read_bytes().replace(b"\0", b" ").decode("utf-8", "replace")
        except OSError:
            continue
        if text in cmdline:
            found.append(f"{proc.name}: {cmdline}")
    return found


def _soffice_pids(text: str) -> set:
    return {int(line.split(":")[0]) for line in _processes_naming(text) if "soffice.bin" in line}


def _dead_pipes(before: set) -> list:
    """LibreOffice pipe sockets in /tmp made since ``before`` that nothing listens on (a killed soffice's)."""
    dead = []
    for p in Path("/tmp").glob("OSL_PIPE_*"):
        if p.name in before:
            continue
        with socket.socket(socket.AF_UNIX, socket.SOCK_STREAM) as sock:
            sock.settimeout(1.0)
            try:
                sock.connect(str(p))
            except ConnectionRefusedError:
                dead.append(p.name)
            except OSError:
                pass
    return dead


def big_book(path: Path) -> Path:
    """A book that keeps LibreOffice busy for a while: 2,000 FS_ cells."""
    wb = openpyxl.Workbook()
    ws = wb.active
    for r in range(1, 2001):
        ws.cell(r, 1, 10.0 + r * 0.01)
        ws.cell(r, 2, f'=FS_VISCOSITY("kerosene",A{r},5)')
    wb.save(path)
    return path


@pytest.mark.parametrize("sig", [signal.SIGTERM, signal.SIGKILL, signal.SIGINT], ids=lambda s: s.name)
def test_stopping_fuelsys_mid_recalc_leaves_no_soffice_and_no_files(tmp_path, sig):
    if REASON and os.environ.get("CI"):
        pytest.fail(f"CI must run the LibreOffice tests (.ci/install-libreoffice installs it): {REASON}")
    if REASON:
        pytest.skip(f"LibreOffice not usable here: {REASON}")
    tmpdir = tmp_path / "tmp"
    outdir = tmp_path / "out"
    tmpdir.mkdir()
    outdir.mkdir()
    book = big_book(tmp_path / "book.xlsx")
    pipes_before = {p.name for p in Path("/tmp").glob("OSL_PIPE_*")}
    env = dict(os.environ, TMPDIR=str(tmpdir),
               PYTHONPATH=os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")]))
    proc = subprocess.Popen([sys.executable, "-m", "fuelsys", "recalc", "--engine", "libreoffice", str(book),
                             "--output", str(outdir / "x.xlsx")], env=env, stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, text=True, start_new_session=True)
    try:
        # wait until the session copies the book to open it (after the extension's install and restart)
        deadline = time.monotonic() + 300
        while (time.monotonic() < deadline and proc.poll() is None
               and not [p for p in tmpdir.glob("*/book-*")] + [p for p in tmpdir.glob("fuelsys-lo-book-*")]):
            time.sleep(0.05)
        assert proc.poll() is None, f"the recalc ended (exit {proc.poll()}) before it could be stopped"
        assert _soffice_pids(str(tmpdir)), "no soffice runs for the book"
        time.sleep(1.0)  # loading and computing the book
        assert proc.poll() is None, "the recalc ended before it could be stopped"
        os.kill(proc.pid, sig)
        out, err = proc.communicate(timeout=30)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    deadline = time.monotonic() + 5.0
    while time.monotonic() < deadline:
        if not _processes_naming(str(tmpdir)) and not list(tmpdir.iterdir()):
            break
        time.sleep(0.1)
    assert not _processes_naming(str(tmpdir)), "processes of the run are left"
    assert not list(tmpdir.iterdir()), f"files left in TMPDIR: {sorted(p.name for p in tmpdir.iterdir())}"
    assert not list(outdir.iterdir()), f"files left beside the output: {sorted(p.name for p in outdir.iterdir())}"
    assert not _dead_pipes(pipes_before), "a killed soffice's pipe sockets are left in /tmp"
    if sig == signal.SIGKILL:
        assert proc.returncode == -signal.SIGKILL
    else:
        assert proc.returncode == 128 + sig, err
        assert "Traceback" not in err
        lines = [line for line in err.splitlines() if line.strip()]
        assert len(lines) == 1 and "interrupted" in lines[0] and "nothing written" in lines[0], err
