"""The environment the LibreOffice engine gives its children (driver and soffice).

soffice's embedded Python (on Debian the system's libpython) finds its home
the way a plain ``python3`` started without a path does: it looks for
``python3`` on PATH, and a virtual environment's ``bin`` there (with the
``pyvenv.cfg`` beside it) makes it start inside that environment, without the
system's dist-packages, where ``uno`` lives.  LibreOffice's Python loader then
fails and Calc opens no document once a Python add-in is installed.  The
expected behaviour is fuelsys's own rule (no outside source): every
directory that holds a Python other than the one that imports ``uno`` goes
from the children's PATH, and so do the variables that steer a Python.

The live tests run the real engine from an environment as an activated
virtual environment leaves it (its ``bin`` first on PATH, VIRTUAL_ENV set).
"""

import os
import subprocess
import sys
from pathlib import Path

import openpyxl
import pytest

from fuelsys.sheet import adapt
from fuelsys.sheet.calc_addin import runner

ROOT = Path(__file__).resolve().parent.parent


def _fake_venv(base: Path, target: str) -> Path:
    """A directory laid out as ``python3 -m venv`` lays one out: bin/python3 -> target, pyvenv.cfg."""
    (base / "bin").mkdir(parents=True)
    (base / "bin" / "python3").symlink_to(target)
    (base / "bin" / "python").symlink_to("python3")
    (base / "pyvenv.cfg").write_text(f"home = {os.path.dirname(target)}\ninclude-system-site-packages = false\n")
    return base / "bin"


def _fake_python(path: Path) -> str:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text("#!/bin/sh\n")
    path.chmod(0o755)
    return str(path)


def test_a_venv_of_the_uno_python_leaves_the_children_path(tmp_path, monkeypatch):
    # the case of the issue: the venv's python3 is a link to the very Python that imports uno
    uno_python = _fake_python(tmp_path / "sys" / "bin" / "python3")
    venv_bin = _fake_venv(tmp_path / "venv", uno_python)
    monkeypatch.setenv("PATH", os.pathsep.join([str(venv_bin), "/usr/local/bin", "/usr/bin", "/bin"]))
    monkeypatch.setenv("VIRTUAL_ENV", str(venv_bin.parent))
    env = runner._child_env(uno_python)
    dirs = env["PATH"].split(os.pathsep)
    assert str(venv_bin) not in dirs
    assert "/usr/bin" in dirs and "/bin" in dirs
    assert "VIRTUAL_ENV" not in env


def test_other_pythons_leave_the_path_and_the_uno_pythons_own_directory_stays(tmp_path, monkeypatch):
    uno_python = _fake_python(tmp_path / "lo" / "program" / "python3")
    other = Path(_fake_python(tmp_path / "pyenv" / "shims" / "python3")).parent
    plain_link = tmp_path / "links"
    plain_link.mkdir()
    (plain_link / "python3").symlink_to(uno_python)  # not a venv, but a python3 all the same
    only_python = Path(_fake_python(tmp_path / "conda" / "bin" / "python")).parent
    tools = tmp_path / "tools"
    tools.mkdir()
    monkeypatch.setenv("PATH", os.pathsep.join(map(str, [other, plain_link, only_python, tools,
                                                         Path(uno_python).parent, "/usr/bin"])))
    dirs = runner._child_env(uno_python)["PATH"].split(os.pathsep)
    assert dirs == [str(tools), str(Path(uno_python).parent), "/usr/bin"]


def test_variables_that_steer_a_python_are_dropped(monkeypatch):
    for var in ("PYTHONHOME", "PYTHONPATH", "PYTHONSTARTUP", "PYTHONEXECUTABLE", "PYTHONNOUSERSITE",
                "PYTHONPLATLIBDIR", "VIRTUAL_ENV", "VIRTUAL_ENV_PROMPT", "PYENV_VERSION", "CONDA_PREFIX",
                "__PYVENV_LAUNCHER__"):
        monkeypatch.setenv(var, "/somewhere")
    monkeypatch.setenv("FUELSYS_PYTHONPATH", "/kept")  # the add-in's own way to find packages
    monkeypatch.setenv("FUELSYS_ADDIN_LOG", "/kept.log")
    env = runner._child_env("/usr/bin/python3")
    assert not [k for k in env if k.startswith("PYTHON") or k in ("VIRTUAL_ENV", "VIRTUAL_ENV_PROMPT",
                                                                   "PYENV_VERSION", "CONDA_PREFIX",
                                                                   "__PYVENV_LAUNCHER__")]
    assert env["FUELSYS_PYTHONPATH"] == "/kept" and env["FUELSYS_ADDIN_LOG"] == "/kept.log"


# ---------------------------------------------------------------------------
# live: the real engine from an activated virtual environment

REASON = runner.unavailable_reason()


def _live():
    if REASON and os.environ.get("CI"):
        pytest.fail(f"CI must run the LibreOffice tests (.ci/install-libreoffice installs it): {REASON}")
    if REASON:
        pytest.skip(f"LibreOffice not usable here: {REASON}")


def small_book(path: Path) -> Path:
    """Two FS_ cells and a plain one."""
    wb = openpyxl.Workbook()
    ws = wb.active
    ws["A1"] = 15
    ws["B1"] = '=FS_DENSITY("kerosene",A1)'
    ws["B2"] = '=FS_DENSITY("kerosene",A1,5)'
    ws["B3"] = "=A1*2"
    wb.save(path)
    return path


@pytest.mark.live
def test_recalc_from_an_activated_venv_of_the_uno_python(tmp_path):
    _live()
    uno_python = runner.find_uno_python()
    venv = tmp_path / "venv"
    subprocess.run([uno_python, "-m", "venv", "--without-pip", str(venv)], check=True, timeout=120)
    # what `. venv/bin/activate` does to the environment
    env = dict(os.environ, VIRTUAL_ENV=str(venv), VIRTUAL_ENV_PROMPT="(venv) ",
               PATH=os.pathsep.join([str(venv / "bin"), os.environ.get("PATH", "")]),
               PYTHONPATH=os.pathsep.join([str(ROOT), os.environ.get("PYTHONPATH", "")]))
    env.pop("PYTHONHOME", None)
    book = small_book(tmp_path / "book.xlsx")
    out = tmp_path / "out.xlsx"
    res = subprocess.run([sys.executable, "-m", "fuelsys", "recalc", "--engine", "libreoffice", str(book),
                          "--output", str(out)], env=env, capture_output=True, text=True, timeout=600)
    assert res.returncode == 0, res.stderr
    assert "3 formula cells, 0 error values, 0 FS error texts" in res.stdout
    ws = openpyxl.load_workbook(out, data_only=True).active
    # what fuelsys's own cell-level call gives (no outside source: the property is that both agree)
    assert ws["B1"].value == pytest.approx(adapt.call("FS_DENSITY", "kerosene", 15.0), rel=1e-12)
    assert ws["B3"].value == 30
