"""Ring manifold network: symmetry, ring losses, mass conservation, batches and errors.

Expected behaviour follows from the network equations themselves (node and loop balances, Jeppson 1976)
and is checked independently: node pressures from the solution are fed back through the needle and ring
models one element at a time.
"""

import numpy as np
import pytest

from fuelsys.errors import FuelsysInputError
from fuelsys.flow.lines import line_dp
from fuelsys.flow.manifold import ring_manifold, ring_manifold_fuel
from fuelsys.flow.needle import needle_flow

pytestmark = pytest.mark.filterwarnings("ignore::fuelsys.errors.ValidityWarning")

RHO, MU = 800.0, 1.6e-3          # kerosene-like liquid (illustrative values)
P_S, P_C = 3.0e5, 1.2e5          # supply and case pressure [Pa gauge]


def test_equal_needles_on_a_generous_ring_get_equal_flows():
    r = ring_manifold([0.3e-3] * 8, 25e-3, P_S, P_C, 4e-3, 60e-3, RHO, MU)
    assert np.max(np.abs(r.flows / r.flows.mean() - 1)) < 1e-4
    # and each is the flow of one needle at the full supply-to-case difference (ring loss negligible)
    single = needle_flow(P_S - P_C, 0.3e-3, 25e-3, RHO, MU)
    assert r.flows.mean() == pytest.approx(single, rel=1e-3)


def test_a_narrow_ring_starves_the_far_needles():
    r = ring_manifold([0.5e-3] * 8, 25e-3, P_S, P_C, 0.8e-3, 60e-3, RHO, MU)
    q = r.flows
    # feed midway between needle 7 and needle 0: flow falls towards the far side (needles 3 and 4)
    assert np.all(np.diff(q[:4]) < 0) and np.all(np.diff(q[4:]) > 0)
    assert q[3] < 0.8 * q[0]
    # symmetric about the feed
    assert np.allclose(q, q[::-1], rtol=1e-9)
    # node pressures fall away from the feed
    assert np.all(np.diff(r.node_pressure[:4]) < 0)


def test_mass_is_conserved_and_the_solution_satisfies_every_element():
    bores = np.array([0.30, 0.32, 0.28, 0.35, 0.30, 0.31]) * 1e-3
    lengths = np.array([25, 24, 26, 25, 27, 25]) * 1e-3
    Dr, Dring = 1.2e-3, 50e-3
    r = ring_manifold(bores, lengths, P_S, P_C, Dr, Dring, RHO, MU, feed_position=0.3)
    assert r.supply_flow == pytest.approx(r.flows.sum(), rel=1e-12)
    # needle by needle: the flow at its node pressure is the flow found
    q_check = needle_flow(r.node_pressure - P_C, bores, lengths, RHO, MU)
    assert np.allclose(q_check, r.flows, rtol=1e-8)
    # segment by segment: the ring loss of each segment flow is the drop between its nodes
    N = bores.size
    s = np.pi * Dring / N
    seg_len = s * np.array([0.3] + [1.0] * (N - 1) + [0.7])
    p = np.concatenate([[P_S], r.node_pressure, [P_S]])
    m = r.ring_flows
    drop = np.sign(m) * line_dp(np.abs(m), Dr, seg_len, RHO, MU)
    assert np.allclose(p[:-1] - p[1:], drop, rtol=1e-7, atol=1e-6 * (P_S - P_C))
    # node balances: inflow - outflow - needle = 0
    assert np.allclose(m[:-1] - m[1:], r.flows, rtol=1e-12)


def test_bigger_needle_gets_more_flow_and_feed_side_matters():
    bores = np.array([0.3, 0.3, 0.4, 0.3]) * 1e-3
    r = ring_manifold(bores, 25e-3, P_S, P_C, 3e-3, 50e-3, RHO, MU)
    assert r.flows[2] > 1.5 * r.flows[0]
    r = ring_manifold([0.5e-3] * 6, 25e-3, P_S, P_C, 1.0e-3, 60e-3, RHO, MU, feed_position=0.1)
    assert np.argmax(r.flows) == 0


def test_batch_of_manifolds_matches_single_solves():
    rng = np.random.default_rng(5)
    bores = 0.3e-3 + rng.uniform(-0.02e-3, 0.02e-3, (4, 6))
    ring = np.array([0.8e-3, 1.0e-3, 2e-3, 4e-3])
    r = ring_manifold(bores, 25e-3, P_S, P_C, ring, 60e-3, RHO, MU)
    assert r.flows.shape == (4, 6) and r.supply_flow.shape == (4,)
    for i in range(4):
        one = ring_manifold(bores[i], 25e-3, P_S, P_C, ring[i], 60e-3, RHO, MU)
        assert np.allclose(one.flows, r.flows[i], rtol=1e-9)


def test_fuel_wrapper():
    from fuelsys.fuels import get_fuel

    k = get_fuel("kerosene")
    r = ring_manifold_fuel([0.3e-3] * 4, 25e-3, P_S, P_C, 3e-3, 60e-3, k, 288.15)
    rho, mu = k.density(288.15), k.dynamic_viscosity(288.15)
    assert np.allclose(r.flows, ring_manifold([0.3e-3] * 4, 25e-3, P_S, P_C, 3e-3, 60e-3, rho, mu).flows)


@pytest.mark.parametrize("kwargs, match", [
    (dict(p_supply=1e5), "supply pressure must be above case pressure"),
    (dict(p_supply=30e5), "above the model's limit of 20 bar"),
    (dict(feed_position=1.0), "feed_position must be between 0 and 1"),
    (dict(ring_bore=70e-3), "ring bore must be smaller than the ring diameter"),
    (dict(lengths=-1e-3), "length must be > 0"),
    (dict(bores=[0.3e-3, 0.0]), "bore must be > 0"),
])
def test_bad_input(kwargs, match):
    args = dict(bores=[0.3e-3] * 4, lengths=25e-3, p_supply=P_S, p_case=P_C, ring_bore=2e-3, ring_diameter=60e-3,
                rho=RHO, mu=MU)
    args.update(kwargs)
    with pytest.raises(FuelsysInputError, match=match):
        ring_manifold(**args)
