"""The safety cautions every face of fuelsys repeats (ground floor: no imports).

The command line prints them, and the shared copy and the printed report of a
book carry them, so a reader meets them wherever the numbers go.
"""

CAUTIONS = """\
SAFETY: fuel under pressure, flame and fast-rotating parts can hurt people.
- Run engines only where local rules and your club's safety code allow it;
  keep a suitable extinguisher at hand, and store and handle fuel and gas away
  from ignition sources.
- Pressure-test the fuel system before running; wear eye and hearing
  protection; keep people out of the plane of the rotor.
- These figures are estimates from published correlations. Confirm them by
  bench tests, and defer to local codes, club safety rules and licensed practice."""
