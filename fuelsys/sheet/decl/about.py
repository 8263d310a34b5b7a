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


#: FS_NOTES forwards up to this many arguments (the most any catalogue function takes; a test checks)
NOTES_MAX_ARGS = 16


def _one(v):
    """A 1x1 range as the single value a direct call would get."""
    if isinstance(v, list) and len(v) == 1 and isinstance(v[0], list) and len(v[0]) == 1:
        return v[0][0]
    return v


@spreadsheet_function(
    name="FS_NOTES", category="about",
    summary="Validity notes of a call of any fuelsys function: ok, or each correlation used outside its "
            "fitted range with the quantity, its range and the value",
    args=[Arg("function_name", "text", "-", "the function, such as FS_NEEDLE_FLOW")]
    + [Arg(f"arg{k}", "cells", "-", f"argument {k} of that function, as in its own call", default=None)
       for k in range(1, NOTES_MAX_ARGS + 1)],
    returns=Returns("text", "-", '"ok", or one line per note; the call\'s own FS error text when it fails'),
    source="the validity ranges kept beside each correlation (fuelsys.errors.warn_validity), collected as "
           "fuelsys recalc --notes collects them",
    si=True,
    example=("FS_CONDUCTIVITY", "kerosene", 20),
)
def fs_notes(function_name, *cells):
    from fuelsys.errors import FuelsysInputError
    from fuelsys.sheet import adapt, catalogue

    key = str(function_name).strip().upper()
    if not key.startswith("FS_"):
        key = "FS_" + key
    try:
        spec = catalogue.get(key)
    except KeyError:
        raise FuelsysInputError(f"function_name: no function {function_name!r}; FS_HELP() lists them") from None
    if spec.name == "FS_NOTES":
        raise FuelsysInputError("function_name: FS_NOTES gives the notes of another function")
    args = [_one(v) for v in cells]
    while args and args[-1] is None:
        args.pop()
    return adapt.notes_text(spec, *args)
