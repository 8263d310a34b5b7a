"""How liquid moves: injector needles, the ring manifold, fuel lines and bench tests.

Floor: flow and heat (uses fuels and the ground floor).

Core API (SI units, numpy broadcasting, fluid properties passed as arrays so
the flow models do not depend on the fuel model):

* :mod:`~fuelsys.flow.tubing` -- ISO 9626 needle tubing: bore and OD by gauge
  and wall class;
* :mod:`~fuelsys.flow.friction` -- friction factors (Shah 1978 developing
  laminar flow, Churchill 1977, Colebrook 1939);
* :mod:`~fuelsys.flow.fittings` -- entrance and exit loss coefficients;
* :mod:`~fuelsys.flow.needle` -- flow from dp and dp from flow for a needle;
* :mod:`~fuelsys.flow.manifold` -- flow split between the needles of a ring;
* :mod:`~fuelsys.flow.lines` -- fuel-line pressure drop;
* :mod:`~fuelsys.flow.tolerance` -- needle-to-needle spread from tolerances;
* :mod:`~fuelsys.flow.bench` -- effective bore from a bench test, odd needles.

Each has convenience wrappers taking a :class:`fuelsys.fuels.base.Fuel` and a
temperature.  This package never imports :mod:`fuelsys.sheet`.
"""

from fuelsys.flow.bench import bench_mass_flow, effective_bore, effective_bore_from_test, odd_needles
from fuelsys.flow.lines import line_dp, line_dp_fuel
from fuelsys.flow.manifold import ManifoldResult, ring_manifold, ring_manifold_fuel
from fuelsys.flow.needle import (P_MAX, needle_dp, needle_dp_fuel, needle_flow, needle_flow_fuel,
                                 needle_losses, needle_reynolds, needle_velocity)
from fuelsys.flow.tolerance import tolerance_study, tolerance_study_fuel
from fuelsys.flow.tubing import needle_bore, needle_od, od_range, resolve_bore

__all__ = ["P_MAX", "needle_dp", "needle_dp_fuel", "needle_flow", "needle_flow_fuel", "needle_losses",
           "needle_reynolds", "needle_velocity", "needle_bore", "needle_od", "od_range", "resolve_bore",
           "line_dp", "line_dp_fuel", "ManifoldResult", "ring_manifold", "ring_manifold_fuel",
           "tolerance_study", "tolerance_study_fuel", "bench_mass_flow", "effective_bore",
           "effective_bore_from_test", "odd_needles"]
