"""The demo engine: a scenario of our own invention.

The *Moorhen* is a fictional 80 N-class turbojet built by the members of the
fictional *Kettlebeck Model Engineering Club*.  Every number here is
invented for the demo (plausible for the engine class, but no real engine's
data): it fills the starter workbook and ``examples/``, and ``fuelsys demo``
sizes its fuel system.  Replace them with your own engine's figures.
"""

from __future__ import annotations

ENGINE_NAME = "Moorhen (fictional 80 N-class demo turbojet)"
CLUB_NAME = "Kettlebeck Model Engineering Club (fictional)"

#: engine, invented: design point and operating points from idle to full power
ENGINE = {
    "rpm_max": 118000.0,          # full speed [rpm]
    "pr_max": 2.6,                # compressor pressure ratio at full speed [-]
    "ambient_bar_abs": 1.01325,   # ambient pressure where the figures below were taken [bar abs]
    "ambient_c": 15.0,            # ambient temperature where the figures below were taken [°C]
    "compressor_eff": 0.72,       # compressor isentropic efficiency [-]
    "combustion_eff": 0.95,       # combustion efficiency [-]
    # operating points at that ambient: speed [rpm], air flow [g/s], turbine inlet [°C], thrust [N]
    "points": (
        (38000.0, 52.0, 640.0, 4.0),
        (60000.0, 85.0, 620.0, 14.0),
        (80000.0, 120.0, 660.0, 30.0),
        (100000.0, 158.0, 740.0, 54.0),
        (118000.0, 190.0, 850.0, 80.0),
    ),
}

#: the operating envelope, invented: a cold and a hot flying day at the club's field
ENVELOPE = {
    "cold": {
        "ambient_c": -5.0,          # air temperature [°C]
        "elevation_m": 150.0,       # field elevation [m]
        "ambient_bar_abs": None,    # measured ambient pressure [bar abs]; None: the ISA pressure at the elevation
        "pump_fuel_c": -5.0,        # fuel at the pump (the tank's temperature) [°C]
        "ring_fuel_c": 5.0,         # fuel at the ring and needles (warmed by the case) [°C]
        "canister_c": -5.0,         # gas canister at the start [°C]
    },
    "hot": {
        "ambient_c": 35.0,
        "elevation_m": 150.0,
        "ambient_bar_abs": None,
        "pump_fuel_c": 40.0,        # a tank in the sun
        "ring_fuel_c": 55.0,
        "canister_c": 35.0,
    },
}

#: fuel, invented choices
FUEL = {
    "name": "kerosene",
    "oil_pct": 5.0,               # turbine oil in the fuel [% vol]
}

#: needles and manifold, invented
NEEDLES = {
    "gauge": 23,
    "wall": "normal",
    "count": 6,
    "length_mm": 30.0,
    "ring_bore_mm": 3.0,          # ring tube inside diameter [mm]
    "ring_dia_mm": 80.0,          # ring centre-line diameter [mm]
    "bore_tol_mm": 0.02,          # bore tolerance (half band) [mm]: typical bore = ISO 9626 minimum + this
    "length_tol_mm": 0.5,         # length tolerance (half band) [mm]
    # bench test with water: mL collected in 60 s at 1.0 bar, 20 °C; needle 4 runs low
    "bench": ((60.0, 1.0, 20.0), (33.1, 32.8, 33.4, 29.0, 33.0, 32.6)),
}

#: vaporiser tubes, invented
VAPORISER = {
    "tube_bore_mm": 6.0,
    "heated_length_mm": 90.0,
    "wall_c": 650.0,              # tube wall temperature [°C]
    "cd": 0.7,                    # tube inlet discharge coefficient [-]
}

#: fuel lines and pump, invented; the test points were made with fuelsys.pump.GearPump.physical(
#: 1.0e-6, 0.8, 0.5, 1.75e-15) on kerosene with 5 % oil, plus 0.4 % random scatter, then rounded
PUMP = {
    "line_bore_mm": 2.5,
    "line_length_m": 0.8,
    "k_total": 8.0,               # filter, valve and fittings loss coefficients [-]
    "head_m": 0.1,                # injectors above the tank [m]
    "g_load": 3.0,                # manoeuvre load factor [-]
    "margin_pct": 15.0,           # margin on the pressure needed [%]
    "battery_v": 7.0,             # battery at its cut-off, under load [V] (2 cells at 3.5 V)
    "battery_full_v": 8.2,        # battery fully charged, under load [V]
    "motor_start_v": 0.8,         # lowest voltage at which the motor starts turning the pump [V]
    "winding_ohm": 0.8,           # motor winding resistance measured across its terminals [Ω]
    "kv_rpm_per_v": None,         # motor speed constant [rpm/V]; None: not known
    # bench test points: flow [g/min], outlet pressure [bar gauge], volts [V], fuel temperature [°C]
    "tests": (
        (118.2, 1.0, 3.0, 12.0),
        (247.6, 3.0, 6.0, 12.0),
        (375.9, 5.0, 9.0, 12.0),
        (263.4, 1.0, 6.0, 12.0),
        (104.9, 2.0, 3.0, 28.0),
        (228.5, 4.0, 6.0, 28.0),
        (393.4, 2.0, 9.0, 28.0),
        (365.6, 5.0, 9.0, 28.0),
        (49.3, 0.5, 1.5, 12.0),
        (43.2, 1.0, 1.5, 28.0),
    ),
}

#: gas start, invented
GAS = {
    "gas": "propane",
    "liquid_g": 180.0,            # liquid in the canister [g]
    "shell_g": 110.0,             # empty canister [g]
    "jet_bore_mm": 0.35,
    "jet_length_mm": 12.0,
    "line_bar_abs": 2.5,          # regulated pressure before the jet [bar abs]
    "flow_minutes": 3.0,          # length of a start run [min]
}

#: combustor liner openings, invented: zone, hole count, diameter [mm] (None: the vaporiser tube bore)
COMBUSTOR = {
    "openings": (
        ("tubes", 6, None),
        ("primary", 12, 4.0),
        ("secondary", 12, 4.5),
        ("dilution", 20, 8.0),
    ),
}
