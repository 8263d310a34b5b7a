"""``docs/functions.md``, generated from the catalogue.

``python -m fuelsys.sheet.docs`` rewrites the file; a test fails when the
committed file differs from what the catalogue gives.
"""

from __future__ import annotations

import sys
from pathlib import Path

from fuelsys.sheet import catalogue

DOC_PATH = Path(__file__).resolve().parents[2] / "docs" / "functions.md"


def _cell(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def render_markdown() -> str:
    """The reference page of every spreadsheet function, in catalogue order."""
    funcs = catalogue.functions()
    lines = [
        "# fuelsys spreadsheet functions",
        "",
        "Generated from the catalogue (`fuelsys/sheet/catalogue.py` and `fuelsys/sheet/decl/`) by",
        "`python -m fuelsys.sheet.docs`; do not edit by hand.",
        "",
        "Every argument may be a range: results broadcast like the spreadsheet's own array formulas.",
        "Bad input gives a text that starts with `FS error:` in the cell that failed.",
        "",
    ]
    category = None
    for spec in funcs.values():
        if spec.category != category:
            category = spec.category
            lines += [f"## {category.capitalize()}", ""]
        unit = "" if spec.returns.unit == "-" else f" [{spec.returns.unit}]"
        lines += [f"### {spec.name}", "", f"`{spec.signature()}`", "", f"{spec.summary}.", "",
                  "| argument | unit | meaning | allowed | default |", "|---|---|---|---|---|"]
        for a in spec.args:
            default = "required" if a.required else ("(none)" if a.default is None else f"`{a.default!r}`")
            lines.append(f"| `{a.name}` | {_cell(a.unit)} | {_cell(a.doc)} | {_cell(a.range_text())} | {default} |")
        example = [f"Example: `{spec.example_formula()}`", ""] if spec.example or not spec.args else []
        lines += ["", f"Returns ({spec.returns.kind}){unit}: {_cell(spec.returns.doc)}.", "", *example,
                  f"Method: {_cell(spec.source)}.", ""]
    return "\n".join(lines)


def main() -> int:
    DOC_PATH.parent.mkdir(parents=True, exist_ok=True)
    DOC_PATH.write_text(render_markdown(), encoding="utf-8")
    print(f"wrote {DOC_PATH} ({len(catalogue.functions())} functions)")
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
