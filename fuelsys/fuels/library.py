"""Built-in fuels and oils, and a user's own fuel from a small table.

Built-ins
---------
``kerosene``
    A generic Jet A-1-type kerosene.  Every value carries its source in
    :data:`KEROSENE`: the specification limits of ASTM D1655 / DEF STAN
    91-091 bound them, the typical values are of the kind tabulated in the
    CRC *Handbook of Aviation Fuel Properties* (CRC report 663, 2004) --
    recalled, not checked against the book, and marked "from memory".
``turbine-oil``
    A typical synthetic polyol-ester turbine oil of the MIL-PRF-23699 class
    (:data:`TURBINE_OIL`), the oil builders mix into the fuel by a few per cent.

A user's fuel
-------------
Name/value rows, in the units fixed in :data:`FUEL_TABLE_ROWS` (°C, kg/m³,
mm²/s, MJ/kg): a Python dict, a CSV/JSON file, or the two-column range of a
spreadsheet (a list of ``[label, value]`` rows).  Labels are matched without
regard to case, spaces, punctuation and a trailing unit in brackets, so
"Density at 15 °C [kg/m³]", "density at 15 C" and "density_15c" are the same
row.  Viscosity points are either the four rows "viscosity 1 temperature",
"viscosity 1", "viscosity 2 temperature", "viscosity 2" or two rows that carry
their temperature in the label, "viscosity at -20 °C" and "viscosity at 40 °C".
"""

from __future__ import annotations

import csv
import json
import os
import re

from fuelsys.errors import FuelsysInputError
from fuelsys.fuels.base import T0_C

#: rows of a fuel table: (key, label, unit, required, meaning)
FUEL_TABLE_ROWS = (
    ("name", "name", "-", True, "name of the fuel"),
    ("density_15c", "density at 15 °C", "kg/m³", True, "liquid density at 15 °C"),
    ("d86_ibp", "D86 IBP", "°C", False, "ASTM D86 initial boiling point"),
    ("d86_10", "D86 10 %", "°C", True, "ASTM D86 temperature at 10 % recovered"),
    ("d86_30", "D86 30 %", "°C", False, "ASTM D86 temperature at 30 % recovered"),
    ("d86_50", "D86 50 %", "°C", True, "ASTM D86 temperature at 50 % recovered"),
    ("d86_70", "D86 70 %", "°C", False, "ASTM D86 temperature at 70 % recovered"),
    ("d86_90", "D86 90 %", "°C", True, "ASTM D86 temperature at 90 % recovered"),
    ("d86_95", "D86 95 %", "°C", False, "ASTM D86 temperature at 95 % recovered"),
    ("d86_fbp", "D86 FBP", "°C", False, "ASTM D86 final boiling point"),
    ("visc_1_temp", "viscosity 1 temperature", "°C", True, "temperature of the first viscosity point"),
    ("visc_1", "viscosity 1", "mm²/s", True, "kinematic viscosity at the first temperature"),
    ("visc_2_temp", "viscosity 2 temperature", "°C", True, "temperature of the second viscosity point"),
    ("visc_2", "viscosity 2", "mm²/s", True, "kinematic viscosity at the second temperature"),
    ("lhv", "lower heating value", "MJ/kg", False, "lower (net) heating value; from the density if absent"),
    ("freezing_point", "freezing point", "°C", False, "freezing point; lower limit of the model"),
    ("flash_point", "flash point", "°C", False, "flash point (for information)"),
    ("hydrogen", "hydrogen content", "% mass", False, "hydrogen content; from the boiling curve if absent"),
)

_D86_PCT = {"d86_ibp": 0, "d86_10": 10, "d86_30": 30, "d86_50": 50, "d86_70": 70,
            "d86_90": 90, "d86_95": 95, "d86_fbp": 100}

#: extra spellings of row labels (normalised form -> key)
_ALIASES = {
    "d860": "d86_ibp", "d86initialboilingpoint": "d86_ibp", "ibp": "d86_ibp",
    "d86100": "d86_fbp", "d86ep": "d86_fbp", "d86endpoint": "d86_fbp", "d86finalboilingpoint": "d86_fbp",
    "fbp": "d86_fbp",
    "density": "density_15c", "densityat15degc": "density_15c",
    "lhv": "lhv", "heatingvalue": "lhv", "netheatingvalue": "lhv", "netheatofcombustion": "lhv",
    "fuel": "name", "fuelname": "name",
    "freezepoint": "freezing_point", "hydrogen": "hydrogen",
}

_VISC_AT = re.compile(r"^viscosityat(-?\d+(?:\.\d+)?)(?:degc|c)?$")


def _norm_key(label: str) -> str:
    """Normalised label: lower case, no units in brackets, no spaces or punctuation (keeps '-' and '.' in numbers)."""
    text = re.sub(r"[\[(].*?[\])]", "", str(label)).lower().replace("°", "")
    text = re.sub(r"(?<!\d)\.|\.(?!\d)|-(?!\d)", "", text)
    return re.sub(r"[^a-z0-9.\-]", "", text)


_LOOKUP = {}
for _key, _label, *_ in FUEL_TABLE_ROWS:
    _LOOKUP[_norm_key(_key)] = _key
    _LOOKUP[_norm_key(_label)] = _key
_LOOKUP.update(_ALIASES)


def expected_rows_text() -> str:
    """The rows a fuel table takes, for error messages."""
    parts = []
    for key, label, unit, required, _ in FUEL_TABLE_ROWS:
        u = "" if unit == "-" else f" [{unit}]"
        parts.append(f"{label}{u}{'' if required else ' (optional)'}")
    return "; ".join(parts)


def _number(label, value, unit):
    if value is None or (isinstance(value, str) and not value.strip()):
        raise FuelsysInputError(f"fuel table row '{label}' is empty; a number in {unit} is required")
    if isinstance(value, bool):
        raise FuelsysInputError(f"fuel table row '{label}' must be a number in {unit} (got {value})")
    try:
        x = float(str(value).strip().replace(",", ".")) if isinstance(value, str) else float(value)
    except (TypeError, ValueError):
        raise FuelsysInputError(f"fuel table row '{label}' must be a number in {unit} (got {value!r})") from None
    if x != x or x in (float("inf"), float("-inf")):
        raise FuelsysInputError(f"fuel table row '{label}' must be a finite number in {unit} (got {value!r})")
    return x


def parse_fuel_table(rows) -> dict:
    """Read a user's fuel table into keyword arguments of :class:`PetroleumFuel` (SI units).

    Parameters
    ----------
    rows : dict or sequence
        ``{label: value}`` or ``[[label, value], ...]``; values in the units of
        :data:`FUEL_TABLE_ROWS` (°C, kg/m³, mm²/s, MJ/kg, % mass) [-].

    Returns
    -------
    dict
        Keyword arguments for :class:`fuelsys.fuels.petroleum.PetroleumFuel`
        in SI units (K, kg/m³, m²/s, J/kg).

    Raises
    ------
    FuelsysInputError
        On a missing, repeated, unknown or non-numeric row; the message lists
        the rows expected.

    References
    ----------
    Table layout of this project; units as in :data:`FUEL_TABLE_ROWS`.

    Examples
    --------
    >>> kw = parse_fuel_table([["name", "my fuel"], ["density at 15 °C [kg/m³]", 805],
    ...     ["D86 10 %", 170], ["D86 50 %", 200], ["D86 90 %", 245],
    ...     ["viscosity at -20 °C", 4.2], ["viscosity at 40 °C", 1.3]])
    >>> kw["name"], round(kw["d86"][50] - 273.15, 1)
    ('my fuel', 200.0)
    """
    if isinstance(rows, dict):
        items = list(rows.items())
    else:
        try:
            items = []
            for r in rows:
                r = list(r) if not isinstance(r, str) else [r]
                if all(c is None or (isinstance(c, str) and not c.strip()) for c in r):
                    continue  # blank row of a range
                if len(r) < 2:
                    raise FuelsysInputError(f"fuel table row {r!r} needs a label and a value")
                items.append((r[0], r[1]))
        except TypeError:
            raise FuelsysInputError("a fuel table is a list of (label, value) rows or a dict") from None
    found: dict[str, object] = {}
    visc_at: list[tuple[float, object, str]] = []
    labels: dict[str, str] = {}
    for label, value in items:
        if label is None or (isinstance(label, str) and not label.strip()):
            raise FuelsysInputError(f"fuel table row with value {value!r} has no label; rows expected: "
                                    f"{expected_rows_text()}")
        n = _norm_key(label)
        m = _VISC_AT.match(n)
        if m:
            visc_at.append((float(m.group(1)), value, str(label)))
            continue
        key = _LOOKUP.get(n)
        if key is None:
            raise FuelsysInputError(f"fuel table: unknown row '{label}'; rows expected: {expected_rows_text()}")
        if key in found:
            raise FuelsysInputError(f"fuel table: row '{label}' is given twice")
        found[key] = value
        labels[key] = str(label)
    if visc_at:
        if len(visc_at) != 2 or any(k in found for k in ("visc_1", "visc_2", "visc_1_temp", "visc_2_temp")):
            raise FuelsysInputError("fuel table: give exactly two viscosity points, either as "
                                    "'viscosity at <T> °C' rows or as 'viscosity 1/2' and "
                                    "'viscosity 1/2 temperature' rows")
        for i, (t, v, lab) in enumerate(visc_at, start=1):
            found[f"visc_{i}_temp"] = t
            found[f"visc_{i}"] = v
            labels[f"visc_{i}_temp"] = labels[f"visc_{i}"] = lab
    missing = [label for key, label, unit, req, _ in FUEL_TABLE_ROWS if req and key not in found]
    if missing:
        raise FuelsysInputError(f"fuel table: missing row(s) {', '.join(repr(m) for m in missing)}; "
                                f"rows expected: {expected_rows_text()}")
    units = {key: unit for key, _, unit, *_ in FUEL_TABLE_ROWS}
    num = {k: _number(labels[k], v, units[k]) for k, v in found.items() if k != "name"}
    name = found["name"]
    if not isinstance(name, str) or not name.strip():
        raise FuelsysInputError(f"fuel table row 'name' must be a text (got {name!r})")
    d86 = {pct: num[k] + T0_C for k, pct in _D86_PCT.items() if k in num}
    for k, v in ((k, v) for k, v in num.items() if k.startswith("d86") or k.endswith("_temp")
                 or k in ("freezing_point", "flash_point")):
        if v < -100 or v > 500:
            raise FuelsysInputError(f"fuel table row '{labels[k]}' must be -100..500 °C (got {v:g})")
    for k in ("visc_1", "visc_2"):
        if not 0.1 <= num[k] <= 1e5:
            raise FuelsysInputError(f"fuel table row '{labels[k]}' must be 0.1..100000 mm²/s (got {num[k]:g})")
    if "hydrogen" in num and not 5 <= num["hydrogen"] <= 20:
        raise FuelsysInputError(f"fuel table row '{labels['hydrogen']}' must be 5..20 % mass (got {num['hydrogen']:g})")
    return {
        "name": name.strip(),
        "density_15c": num["density_15c"],
        "d86": d86,
        "viscosity_points": ((num["visc_1_temp"] + T0_C, num["visc_1"] * 1e-6),
                             (num["visc_2_temp"] + T0_C, num["visc_2"] * 1e-6)),
        "lhv": num["lhv"] * 1e6 if "lhv" in num else None,
        "freezing_point": num["freezing_point"] + T0_C if "freezing_point" in num else None,
        "flash_point": num["flash_point"] + T0_C if "flash_point" in num else None,
        "hydrogen_mass_fraction": num["hydrogen"] / 100 if "hydrogen" in num else None,
    }


def read_fuel_file(path: str) -> list:
    """Rows of a fuel table from a CSV (two columns: label, value) or JSON file.

    Parameters
    ----------
    path : str
        File name ending in .csv or .json [-].

    Returns
    -------
    list
        ``[[label, value], ...]`` rows, ready for :func:`parse_fuel_table`.

    References
    ----------
    RFC 4180 (CSV), RFC 8259 (JSON).

    Examples
    --------
    >>> read_fuel_file("missing.csv")
    Traceback (most recent call last):
    ...
    fuelsys.errors.FuelsysInputError: fuel file missing.csv not found
    """
    if not os.path.isfile(path):
        raise FuelsysInputError(f"fuel file {path} not found")
    ext = os.path.splitext(path)[1].lower()
    if ext == ".csv":
        with open(path, newline="", encoding="utf-8-sig") as fh:
            return [row[:2] for row in csv.reader(fh) if row and any(c.strip() for c in row)]
    if ext == ".json":
        with open(path, encoding="utf-8") as fh:
            data = json.load(fh)
        return list(data.items()) if isinstance(data, dict) else data
    raise FuelsysInputError(f"fuel file {path}: use a .csv or .json file")


#: the built-in Jet A-1-type kerosene: (value, source) per row, units of FUEL_TABLE_ROWS
KEROSENE = {
    "name": ("kerosene", "generic Jet A-1-type kerosene"),
    "density_15c": (800.0, "typical Jet A-1, CRC report 663 (2004) (from memory); "
                           "ASTM D1655 / DEF STAN 91-091 limits 775-840 kg/m³"),
    "d86_ibp": (152.0, "typical Jet A-1 (from memory); not a specification item"),
    "d86_10": (168.0, "typical Jet A-1, CRC report 663 (from memory); ASTM D1655 limit <= 205 °C"),
    "d86_30": (181.0, "typical Jet A-1 (from memory)"),
    "d86_50": (196.0, "typical Jet A-1, CRC report 663 (from memory); D1655: report"),
    "d86_70": (213.0, "typical Jet A-1 (from memory)"),
    "d86_90": (238.0, "typical Jet A-1, CRC report 663 (from memory); D1655: report"),
    "d86_fbp": (258.0, "typical Jet A-1, CRC report 663 (from memory); ASTM D1655 limit <= 300 °C"),
    "visc_1_temp": (-20.0, "test temperature of ASTM D1655 / DEF STAN 91-091"),
    "visc_1": (3.9, "typical Jet A-1 at -20 °C, CRC report 663 (from memory); limit <= 8.0 mm²/s"),
    "visc_2_temp": (40.0, "common practice, no source"),
    "visc_2": (1.3, "typical Jet A/Jet A-1 at 40 °C, CRC report 663 (from memory)"),
    "lhv": (43.2, "typical Jet A-1, CRC report 663 (from memory); ASTM D1655 limit >= 42.8 MJ/kg"),
    "freezing_point": (-51.0, "typical Jet A-1 (from memory); ASTM D1655 / DEF STAN 91-091 limit <= -47 °C"),
    "flash_point": (42.0, "typical Jet A-1 (from memory); ASTM D1655 / DEF STAN 91-091 limit >= 38 °C"),
}

#: the built-in turbine oil: a synthetic polyol-ester oil of the MIL-PRF-23699 class
TURBINE_OIL = {
    "name": ("turbine-oil", "typical synthetic ester turbine oil, MIL-PRF-23699 class"),
    "density_15c": (1000.0, "typical polyol-ester turbine oil (from memory)"),
    "visc_1_temp": (40.0, "test temperature of MIL-PRF-23699"),
    "visc_1": (25.0, "typical, MIL-PRF-23699 limit >= 23 mm²/s at 40 °C (from memory)"),
    "visc_2_temp": (100.0, "test temperature of MIL-PRF-23699"),
    "visc_2": (5.1, "typical, MIL-PRF-23699 limits 4.9-5.4 mm²/s at 100 °C (from memory)"),
    "pour_point": (-54.0, "MIL-PRF-23699 pour point limit <= -54 °C (from memory)"),
    "flash_point": (246.0, "MIL-PRF-23699 flash point limit >= 246 °C (from memory)"),
    # a model compound stands for the ester base stock: pentaerythritol tetraheptanoate C33H60O8
    "model_compound": ("C33H60O8", "pentaerythritol tetraheptanoate as model compound of a "
                                   "polyol-ester base stock (our assumption)"),
}


def kerosene_table() -> dict:
    """The built-in kerosene as a fuel table {key: value} (user units)."""
    return {k: v for k, (v, _) in KEROSENE.items()}


def kerosene_sources() -> dict:
    """Source text of each row of the built-in kerosene."""
    return {k: s for k, (_, s) in KEROSENE.items()}
