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
