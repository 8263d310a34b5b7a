"""The fuelsys command: demo tables, function listing, cautions."""

import subprocess
import sys

from fuelsys.cli import main


def test_properties_prints_kerosene_and_canister_tables_with_cautions(capsys):
    assert main(["properties"]) == 0
    out = capsys.readouterr().out
    assert "Built-in fuel 'kerosene'" in out
    assert "Gas canister pressure" in out
    assert "SAFETY" in out and "bench tests" in out
    # the row at 15 °C is not printed (10 °C steps); read the 20 °C row of the kerosene table
    row20 = next(line for line in out.splitlines() if line.strip().startswith("20 "))
    density = float(row20.split()[1])
    # ASTM D1655 Table 1: Jet A-1 density 775-840 kg/m³ at 15 °C; 5 K warmer is a few kg/m³ lighter
    assert 765 < density < 840


def test_functions_lists_catalogue(capsys):
    assert main(["functions"]) == 0
    out = capsys.readouterr().out
    assert "FS_VERSION()" in out and "FS_HELP([name])" in out
    assert main(["functions", "FS_HELP"]) == 0
    assert "returns" in capsys.readouterr().out


def test_no_command_prints_help_and_fails(capsys):
    assert main([]) == 2


def test_module_entry_point_runs():
    out = subprocess.run([sys.executable, "-m", "fuelsys", "--version"], capture_output=True, text=True)
    assert out.returncode == 0 and out.stdout.startswith("fuelsys ")


# ---------------------------------------------------------------------------
# manners: help texts, functions NAME, properties notes, demo never overwrites silently

def _subparsers(parser):
    import argparse

    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            for name, sub in action.choices.items():
                yield name, sub
                yield from ((f"{name} {n}", s) for n, s in _subparsers(sub))


def test_every_subcommand_has_a_help_text():
    from fuelsys.cli import build_parser

    parser = build_parser()
    seen = dict(_subparsers(parser))
    for name in ("demo", "new", "diff", "properties", "functions", "eval", "recalc", "check", "excel-setup"):
        assert name in seen, name
    for name, sub in seen.items():
        # a description of a sentence or more, shown by 'fuelsys NAME --help'
        assert sub.description and len(sub.description) > 40, f"'fuelsys {name}' has no help text"
        assert sub.description in " ".join(sub.format_help().split()) or sub.description[:30] in sub.format_help()


def test_functions_name_shows_method_validity_and_a_computed_example(capsys):
    from fuelsys.sheet import call

    assert main(["functions", "needle_flow"]) == 0
    out = capsys.readouterr().out
    assert "method: " in out and "Shah (1978)" in out  # the declaration's published source
    assert "validity: inputs" in out
    line = next(x for x in out.splitlines() if x.strip().startswith("fuelsys eval 'FS_NEEDLE_FLOW("))
    formula = line.split("'", 2)[1]
    # the printed result is what the function gives for the printed formula (the catalogue's own call)
    from fuelsys.sheet import evaluate as ev

    expected = ev.evaluate_formula(formula)
    shown = float(out.splitlines()[out.splitlines().index(line) + 1])
    assert abs(shown - expected) <= 1e-5 * abs(expected)
    args = [ev.evaluate_formula(a) for a in formula[len("FS_NEEDLE_FLOW("):-1].split(", ")]
    assert expected == call("FS_NEEDLE_FLOW", *args)


def test_properties_note_is_in_the_tables_units(capsys):
    from fuelsys.cli import in_table_units

    assert main(["properties"]) == 0
    out = capsys.readouterr().out
    notes = out.split("fitted range", 1)[1].split("SAFETY")[0] if "fitted range" in out else ""
    assert "[K]" not in notes and "[Pa]" not in notes
    # 233.15 K is -40 °C, 255.4 K is -17.75 °C (definition of the Celsius scale)
    assert in_table_units("x: temperature 233.1 outside its range 255.4..422 [K] (4 of 20 points)") == \
        "x: temperature -40 outside its range -17.7..149 [°C] (4 of 20 points)"
    assert "2 outside its range 0.01..1 [bar abs]" in in_table_units("p 2e+05 outside its range 1000..1e+05 [Pa]")


def test_demo_says_when_it_replaces_and_keeps_an_edited_book(tmp_path, capsys, monkeypatch):
    from fuelsys.sheet import book

    calls = []

    def fake_build(path, compute=True, title_note="", reports=None):
        import shutil

        from fuelsys.sheet.starter import EXAMPLE_PATH

        calls.append(path)
        shutil.copyfile(EXAMPLE_PATH, path)

    import fuelsys.sheet.starter as starter

    monkeypatch.setattr(starter, "build", fake_build)
    first = book.write_demo(tmp_path)
    replaced = []
    again = book.write_demo(tmp_path, replaced=replaced)
    assert again == first and replaced == [first]  # an unedited demo book: replaced, and reported
    assert main(["demo", "--folder", str(tmp_path)]) == 0
    assert "replaced the earlier demo book" in capsys.readouterr().out
    # an edited demo book is kept; the new one gets its own name, and the command says so
    import zipfile

    from fuelsys.sheet.xlsx import read_book

    engine_part = read_book(first).sheet("Engine").part
    with zipfile.ZipFile(first) as zf:
        items = [(i, zf.read(i)) for i in zf.infolist()]
    with zipfile.ZipFile(first, "w", zipfile.ZIP_DEFLATED) as zf:
        for i, d in items:
            if i.filename == engine_part:
                d = d.replace(b"<v>38000</v>", b"<v>39000</v>", 1)
            zf.writestr(i, d)
    edited = first.read_bytes()
    assert main(["demo", "--folder", str(tmp_path)]) == 0
    out = capsys.readouterr().out
    assert "kept the edited fuelsys-demo.xlsx" in out and first.read_bytes() == edited
    assert (tmp_path / "fuelsys-demo-1.xlsx").exists()
