"""Every public function of fuelsys.flow documents a unit for each parameter, its source and an example.

House rule (STYLE.md "Do" 1, 7 and the References rule of the project brief); no outside values.
"""

import inspect
import re

import pytest

from fuelsys.flow import bench, fittings, friction, lines, manifold, needle, tolerance, tubing

MODULES = [bench, fittings, friction, lines, manifold, needle, tolerance, tubing]
PUBLIC = [(m.__name__, name, obj) for m in MODULES for name, obj in vars(m).items()
          if inspect.isfunction(obj) and not name.startswith("_") and obj.__module__ == m.__name__]


def _sections(doc):
    out, current = {}, None
    lines_ = inspect.cleandoc(doc).splitlines()
    for i, line in enumerate(lines_):
        if i + 1 < len(lines_) and set(lines_[i + 1].strip()) == {"-"} and line.strip():
            current = line.strip()
            out[current] = []
            continue
        if current and not set(line.strip()) == {"-"}:
            out[current].append(line)
    return out


def _param_blocks(text_lines):
    blocks, name = {}, None
    for line in text_lines:
        if line and not line.startswith(" "):
            name = line.split(":")[0].strip()
            blocks[name] = []
        elif name:
            blocks[name].append(line.strip())
    return blocks


@pytest.mark.parametrize("mod, name, fn", PUBLIC, ids=[f"{m}.{n}" for m, n, _ in PUBLIC])
def test_docstring_units_source_and_example(mod, name, fn):
    doc = fn.__doc__ or ""
    sec = _sections(doc)
    assert "References" in sec, f"{mod}.{name}: no References section"
    assert "Examples" in sec and any(">>>" in line for line in sec["Examples"]), f"{mod}.{name}: no example"
    params = [p for p in inspect.signature(fn).parameters.values()]
    if params:
        assert "Parameters" in sec, f"{mod}.{name}: no Parameters section"
        blocks = _param_blocks(sec["Parameters"])
        for p in params:
            key = ("**" + p.name) if p.kind is p.VAR_KEYWORD else p.name
            assert key in blocks, f"{mod}.{name}: parameter {key} undocumented"
            text = " ".join(blocks[key]).strip()
            assert re.search(r"\[[^\]]+\]$", text), f"{mod}.{name}: {key} description does not end with [unit]"
