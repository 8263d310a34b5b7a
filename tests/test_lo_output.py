"""The LibreOffice engine's output file and its own temporary files (no LibreOffice needed).

The expected behaviour is fuelsys's own output rules (README, "LibreOffice
engine"): a clear refusal for an output folder that is not there, new files
with the permissions the umask gives (as any program's new file), an existing
output keeping its mode, and temporary files named with the host and pid of
the run that made them, removed by a later run only when that pid is gone.
"""

import os
import socket
import subprocess
import sys
import time

import openpyxl
import pytest

from fuelsys.cli import main
from fuelsys.sheet import xlsx
from fuelsys.sheet.calc_addin import runner


def small_book(path):
    wb = openpyxl.Workbook()
    wb.active["A1"] = 15.0
    wb.active["B1"] = "=A1*2"
    wb.save(path)
    return str(path)


def dead_pid() -> int:
    """The pid of a process that has ended (and been reaped)."""
    proc = subprocess.Popen([sys.executable, "-c", "pass"])
    proc.wait()
    return proc.pid


def test_output_in_a_missing_folder_is_a_clear_refusal(tmp_path, capsys):
    book = small_book(tmp_path / "b.xlsx")
    code = main(["recalc", book, "--engine", "libreoffice", "--output", str(tmp_path / "missing" / "x.xlsx")])
    err = capsys.readouterr().err
    assert code == 2
    assert "Traceback" not in err and "FileNotFoundError" not in err
    assert "missing" in err and "does not exist" in err and "nothing written" in err
    assert not (tmp_path / "missing").exists()


def test_recalc_book_refuses_a_missing_folder_and_a_folder_as_output(tmp_path):
    book = small_book(tmp_path / "b.xlsx")
    with pytest.raises(runner.OutputRefused, match="does not exist"):
        runner.recalc_book(book, tmp_path / "missing" / "x.xlsx")
    with pytest.raises(runner.OutputRefused, match="is a folder"):
        runner.recalc_book(book, tmp_path)


def test_a_new_output_gets_the_umasks_permissions(tmp_path):
    made = tmp_path / "made-by-libreoffice.xlsx"
    made.write_bytes(b"PK fake workbook")
    made.chmod(0o600)  # as LibreOffice's own temporary output may be
    old = os.umask(0o022)
    try:
        runner.store_output(made, tmp_path / "new.xlsx")
        os.umask(0o002)
        runner.store_output(made, tmp_path / "new2.xlsx")
    finally:
        os.umask(old)
    assert (tmp_path / "new.xlsx").stat().st_mode & 0o777 == 0o644
    assert (tmp_path / "new2.xlsx").stat().st_mode & 0o777 == 0o664
    assert (tmp_path / "new.xlsx").read_bytes() == b"PK fake workbook"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["made-by-libreoffice.xlsx", "new.xlsx", "new2.xlsx"]


def test_an_existing_output_keeps_its_mode(tmp_path):
    made = tmp_path / "made.xlsx"
    made.write_bytes(b"PK new")
    out = tmp_path / "out.xlsx"
    out.write_bytes(b"PK old")
    out.chmod(0o640)
    runner.store_output(made, out)
    assert out.read_bytes() == b"PK new" and out.stat().st_mode & 0o777 == 0o640


def test_an_empty_result_leaves_the_output_as_it_was(tmp_path):
    made = tmp_path / "made.xlsx"
    made.write_bytes(b"")
    out = tmp_path / "out.xlsx"
    out.write_bytes(b"PK old")
    with pytest.raises(runner.LibreOfficeError, match="no workbook"):
        runner.store_output(made, out)
    assert out.read_bytes() == b"PK old"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["made.xlsx", "out.xlsx"]


def test_temporary_names_carry_host_and_pid(tmp_path):
    name = runner.temp_output_name("/x/out.xlsx")
    m = runner.STALE_OUTPUT.match(name)
    assert m and m["host"] == runner._host() and int(m["pid"]) == os.getpid() and name.endswith(".xlsx")
    scratch = runner.make_scratch("lo", dir=tmp_path)
    m = runner.STALE_SCRATCH.match(os.path.basename(scratch))
    assert m and int(m["pid"]) == os.getpid()


def test_stale_temporary_files_of_a_dead_run_are_removed_and_nothing_else(tmp_path):
    tmpdir, out = tmp_path / "tmp", tmp_path / "out"
    tmpdir.mkdir()
    out.mkdir()
    dead, live, host = dead_pid(), os.getpid(), runner._host()
    stale = [tmpdir / f"fuelsys-lo-{dead}-ab12cd34", tmpdir / f"fuelsys-recalc-{dead}-x_y9",
             out / f".~fuelsys-lo-{host}-{dead}-0a1b2c3d.xlsx"]
    kept = [tmpdir / f"fuelsys-lo-{live}-ab12cd34",              # a running session
            tmpdir / "fuelsys-lo-ab12cd34",                      # no pid in the name: not provably stale
            tmpdir / f"fuelsys-other-{dead}-ab12cd34",           # not a name of this engine
            tmpdir / f"lu{dead}.tmp",                            # somebody else's
            out / f".~fuelsys-lo-{host}-{live}-0a1b2c3d.xlsx",   # a running write
            out / f".~fuelsys-lo-another.host-{dead}-0a1b2c3d.xlsx",  # another machine's (a shared folder)
            out / f".~fuelsys-{dead}.tmp",                        # the built-in engine's
            out / "book.xlsx"]
    for p in stale + kept:
        if p.suffix in (".xlsx", ".tmp") and not p.name.startswith("lu"):
            p.write_bytes(b"x")
        else:
            p.mkdir()
            (p / "profile").mkdir()
            (p / "profile" / "registrymodifications.xcu").write_text("x")
    removed = runner.clean_stale(out, tmpdir=tmpdir)
    assert sorted(removed) == sorted(map(str, stale))
    assert not any(p.exists() for p in stale)
    assert all(p.exists() for p in kept)


def test_a_stale_session_s_soffice_is_ended(tmp_path):
    # a process standing in for a soffice left by a killed run: its command line names the session folder
    dead = dead_pid()
    session = tmp_path / f"fuelsys-lo-{dead}-ab12cd34"
    (session / "profile").mkdir(parents=True)
    proc = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(60)",
                             f"-env:UserInstallation=file://{session}/profile"], start_new_session=True)
    try:
        (session / "soffice.pid").write_text(str(proc.pid))
        deadline = time.monotonic() + 10
        while str(session) not in runner._cmdline(proc.pid) and time.monotonic() < deadline:
            time.sleep(0.05)  # until the child has exec'd
        runner.clean_stale(None, tmpdir=tmp_path)
        assert proc.wait(timeout=10) != 0
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    assert not session.exists()


def test_a_pid_file_naming_an_unrelated_process_is_not_acted_on(tmp_path):
    dead = dead_pid()
    session = tmp_path / f"fuelsys-lo-{dead}-ab12cd34"
    session.mkdir()
    proc = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(60)"], start_new_session=True)
    try:
        (session / "soffice.pid").write_text(str(proc.pid))
        runner.clean_stale(None, tmpdir=tmp_path)
        assert proc.poll() is None  # its command line does not name the session: left alone
    finally:
        proc.kill()
        proc.wait()
    assert not session.exists()


def test_refusal_is_a_write_error_for_the_commands():
    assert issubclass(runner.OutputRefused, xlsx.WriteError)


def test_host_name_in_temporary_names_is_safe():
    assert runner._host() and all(c.isalnum() or c in ".-_" for c in runner._host())
    assert runner._host() == "".join(c if c.isalnum() or c in ".-_" else "_" for c in socket.gethostname())[:64]


def test_dead_session_pipe_sockets_are_removed_and_live_or_foreign_ones_kept():
    import shutil
    import tempfile

    folder = tempfile.mkdtemp(prefix="lo-", dir="/tmp")  # short: a socket path has ~100 characters at most
    socks = []
    try:
        uid = os.getuid()
        names = {"dead": f"OSL_PIPE_{uid}_fuelsys-{'a' * 32}", "live": f"OSL_PIPE_{uid}_fuelsys-{'b' * 32}",
                 "foreign": f"OSL_PIPE_{uid}_{'c' * 40}"}
        for key, name in names.items():
            sock = socket.socket(socket.AF_UNIX, socket.SOCK_STREAM)
            sock.bind(os.path.join(folder, name))
            if key == "live":
                sock.listen(1)
                socks.append(sock)
            else:
                sock.close()  # the file stays, nothing listens: as a killed soffice leaves it
        removed = runner._clean_stale_pipes((folder,))
        assert removed == [os.path.join(folder, names["dead"])]
        assert sorted(os.listdir(folder)) == sorted([names["live"], names["foreign"]])
    finally:
        for sock in socks:
            sock.close()
        shutil.rmtree(folder, ignore_errors=True)
