"""Spreadsheet functions about fuelsys itself: version and help."""

from __future__ import annotations

from fuelsys.sheet.catalogue import Arg, Returns, spreadsheet_function


@spreadsheet_function(
    name="FS_VERSION", category="about",
    summary="The fuelsys version that computes this workbook",
    args=[],
    returns=Returns("text", "-", 'the text "fuelsys X.Y.Z"'),
    source="fuelsys package metadata",
    si=True,
    example=(),
)
def fs_version():
    import fuelsys

    return f"fuelsys {fuelsys.__version__}"


@spreadsheet_function(
    name="FS_HELP", category="about",
    summary="What a fuelsys function does, its arguments with units, and what it returns",
    args=[Arg("name", "text", "-", "function name such as FS_NEEDLE_FLOW; empty for the list of all",
              default="")],
    returns=Returns("text", "-", "the function's summary and arguments with units"),
    source="the fuelsys catalogue",
    si=True,
    example=("FS_DENSITY",),
)
def fs_help(name):
    from fuelsys.sheet import catalogue
    from fuelsys.errors import FuelsysInputError

    funcs = catalogue.functions()
    if not name:
        return "fuelsys functions: " + ", ".join(funcs)
    key = str(name).strip().upper()
    if not key.startswith("FS_"):
        key = "FS_" + key
    if key not in funcs:
        raise FuelsysInputError(f"name: no function {name!r}; known: {', '.join(funcs)}")
    return funcs[key].help_text()
