"""``fuelsys libreoffice build`` and ``fuelsys libreoffice install``."""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path


def _warn_python() -> None:
    from fuelsys.sheet.calc_addin import runner

    warning = runner.python_mismatch()
    if warning:
        print(f"warning: {warning}", file=sys.stderr)


def _cmd_build(args) -> int:
    from fuelsys.sheet.calc_addin import generate

    try:
        path = generate.build_oxt(Path(args.output))
    except (FileNotFoundError, RuntimeError) as exc:
        print(f"fuelsys libreoffice build: {exc}", file=sys.stderr)
        return 1
    _warn_python()
    info = generate.build_info()
    print(f"wrote {path} ({len(info['functions'])} functions)")
    print(f"LibreOffice's Python will import fuelsys from {info['source_dir']} and its dependencies from:")
    for p in info["paths"]:
        print(f"  {p}")
    print(f"(built with Python {info['python_version']}; LibreOffice must run the same minor version, "
          f"or set FUELSYS_PYTHONPATH)")
    return 0


def _cmd_install(args) -> int:
    from fuelsys.sheet.calc_addin import generate, runner

    _warn_python()
    try:
        with tempfile.TemporaryDirectory(prefix="fuelsys-oxt-") as tmp:
            oxt = Path(args.oxt) if args.oxt else generate.build_oxt(Path(tmp))
            info = runner.install_extension(oxt, args.profile)
    except (FileNotFoundError, RuntimeError) as exc:  # LibreOfficeError is a RuntimeError
        print(f"fuelsys libreoffice install: {exc}", file=sys.stderr)
        return 1
    print(f"installed {info['identifier']} {info['version']} into the LibreOffice profile {info['profile']} "
          f"(LibreOffice {info['libreoffice']})")
    print("Restart LibreOffice; the FS_ functions are in the Add-In category of the function wizard.")
    return 0


def add_commands(subparsers) -> None:
    """Add ``libreoffice build`` and ``libreoffice install`` to the ``fuelsys`` command."""
    p = subparsers.add_parser("libreoffice", help="the LibreOffice Calc extension (fuelsys.oxt)",
                              description="Build the LibreOffice Calc extension with the FS_ functions, "
                                          "or install it into a LibreOffice profile.")
    sub = p.add_subparsers(dest="libreoffice_command", metavar="ACTION")
    sub.required = True
    b = sub.add_parser("build", help="write fuelsys.oxt, generated from the catalogue",
                       description="Write fuelsys.oxt. It records this Python environment, from which "
                                   "LibreOffice's own Python will import fuelsys, numpy, scipy and CoolProp.")
    b.add_argument("-o", "--output", default="fuelsys.oxt", metavar="PATH",
                   help="file or directory to write (default: fuelsys.oxt)")
    b.set_defaults(func=_cmd_build)
    i = sub.add_parser("install", help="build fuelsys.oxt and install it into a LibreOffice profile",
                       description="Build fuelsys.oxt and install it through a headless LibreOffice into the "
                                   "user's profile (or --profile DIR). Close LibreOffice first.")
    i.add_argument("--profile", metavar="DIR",
                   help="LibreOffice user installation directory (the one holding user/); "
                        "default: your own profile")
    i.add_argument("--oxt", metavar="PATH", help="install this fuelsys.oxt instead of building one")
    i.set_defaults(func=_cmd_install)
