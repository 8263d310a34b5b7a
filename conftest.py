"""Collection set-up for the whole checkout (tests/ and the docstring examples in fuelsys/).

``python3 -m pytest`` collects tests/ and, with ``--doctest-modules`` (pyproject.toml),
every example in the docstrings of fuelsys/.  A few modules run only inside a
spreadsheet program; they are left out of the doctest collection where they cannot be
imported, each with its reason below.
"""

import importlib.util

#: module file -> (the module it needs, why)
NEEDS = {
    "fuelsys/sheet/calc_addin/component.py": (
        "org.fuelsys.calc", "the add-in component; its UNO types exist only inside LibreOffice with the extension"),
    "fuelsys/sheet/calc_addin/lo_driver.py": (
        "uno", "drives LibreOffice headless; needs LibreOffice's Python bridge (python3-uno)"),
}


def _importable(name: str) -> bool:
    try:
        return importlib.util.find_spec(name) is not None
    except (ImportError, ValueError):
        return False


collect_ignore = [path for path, (needs, _why) in NEEDS.items() if not _importable(needs)]
