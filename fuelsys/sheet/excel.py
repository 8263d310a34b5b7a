"""The xlwings module: every catalogue function as an Excel user-defined function.

Built from the catalogue when imported: one plain Python function per
declaration, with the declaration's argument names (so Excel's function
wizard shows them), decorated with ``xlwings.func`` / ``xlwings.arg``.  Each
argument is read as a 2-D range (``ndim=2``) so a row stays a row; the
function body is :func:`fuelsys.sheet.adapt.call_spec`, the same code every
other face runs, so a cell shows the same number or ``FS error:`` text here
as in LibreOffice and the headless engine.

On Windows point xlwings' UDF module setting at ``fuelsys.sheet.excel``
(``fuelsys excel-setup`` prints the steps).  On Linux and macOS xlwings'
decorators do nothing and the functions are ordinary Python functions, which
is how the tests call them.
"""

from __future__ import annotations

from fuelsys.sheet import adapt, catalogue

try:  # xlwings is the optional extra "excel"
    import xlwings as _xw
except ImportError:  # pragma: no cover - exercised only without the extra
    _xw = None


def _unwrap(value):
    """A 1x1 result becomes a single value (what a single cell wants)."""
    if isinstance(value, list) and len(value) == 1 and isinstance(value[0], list) and len(value[0]) == 1:
        return value[0][0]
    return value


def _make(spec: catalogue.Spec):
    params = ", ".join(a.name if a.required else f"{a.name}=None" for a in spec.args)
    names = ", ".join(a.name for a in spec.args)
    src = (f"def {spec.name}({params}):\n"
           f"    return _unwrap(_call(_spec, {names}))\n")
    scope = {"_unwrap": _unwrap, "_call": adapt.call_spec, "_spec": spec}
    exec(compile(src, f"<fuelsys.sheet.excel {spec.name}>", "exec"), scope)  # noqa: S102 - names come from the catalogue
    fn = scope[spec.name]
    fn.__module__ = __name__
    fn.__doc__ = spec.wizard_text()  # the function wizard shows at most 255 characters
    fn.spec = spec
    if _xw is not None:
        for a in reversed(spec.args):
            fn = _xw.arg(a.name, ndim=2, doc=a.wizard_text())(fn)
        fn = _xw.func(category="fuelsys")(fn)
    return fn


#: the generated functions by spreadsheet name
UDFS: dict = {}
for _spec_ in catalogue.functions().values():
    UDFS[_spec_.name] = globals()[_spec_.name] = _make(_spec_)
del _spec_

__all__ = sorted(UDFS)
