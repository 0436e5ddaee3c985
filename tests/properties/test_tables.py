"""Property tables, the phase envelope and the fast array path of mixtures.

The tables are checked against exact flashes of the property library at points off their grid
(not the points their own error control used); a table made too coarse must be caught by its
error measurement; the envelope is checked against the library's own dew-point flash
(``PQ_INPUTS`` with quality 1, a different algorithm from the envelope tracing).
"""

import math

import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.properties import envelope, fast, tables

GAS = wb.Fluid({"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
                "CarbonDioxide": 0.015})
BOX = ((17e5, 48e5), (285.0, 410.0))


@pytest.fixture(scope="module")
def table():
    return tables.build_table(tables.GasFlasher(GAS), *BOX)


def test_table_holds_its_tolerance_at_random_off_grid_points(table):
    # exact flashes (the property library, phase-specified gas) at 300 random points
    assert table.usable
    rng = np.random.default_rng(11)
    P = np.exp(rng.uniform(math.log(BOX[0][0]), math.log(BOX[0][1]), 300))
    T = rng.uniform(*BOX[1], 300)
    found = tables.measure_error(table, tables.GasFlasher(GAS), P, T)
    for name, tol in table.tolerance.items():
        assert found[name] <= tol, name
        assert table.max_error[name] <= tables.SAFETY * tol, name


def test_too_coarse_a_table_is_caught_by_its_error_measurement():
    # three nodes a side over 30 bar and 125 K cannot hold 0.2 J/kg: the exact flashes at the
    # cell centres must show it and the table must not be usable
    coarse = tables.build_table(tables.GasFlasher(GAS), *BOX, start=(3, 3), refine=False)
    assert not coarse.usable
    assert coarse.max_error["h"] > coarse.tolerance["h"]
    rng = np.random.default_rng(12)
    P = np.exp(rng.uniform(math.log(BOX[0][0]), math.log(BOX[0][1]), 50))
    T = rng.uniform(*BOX[1], 50)
    truth = tables.measure_error(coarse, tables.GasFlasher(GAS), P, T)
    assert truth["h"] > coarse.tolerance["h"]  # the table really is off


def test_a_table_that_cannot_reach_its_tolerance_is_not_used(monkeypatch):
    # refinement capped below what the tolerance needs: prepare() gives no table and every
    # row of the batch is exact
    monkeypatch.setattr(tables, "MAX_NODES", 5)
    fast.forget()
    rng = np.random.default_rng(13)
    assert fast.prepare(GAS, rng.uniform(18e5, 46e5, 400), rng.uniform(290.0, 400.0, 400)) \
        is None
    frame = _gas_frame(250, seed=14)
    out = wb.evaluate(frame, "compressor", GAS, results=("power", "isentropic_efficiency"))
    assert set(out["path"]) == {"exact"}
    fast.forget()


@pytest.mark.parametrize("prop", ["h", "s"])
def test_table_temperature_inverts_the_table(table, prop):
    rng = np.random.default_rng(15)
    P = np.exp(rng.uniform(math.log(18e5), math.log(46e5), 100))
    T = rng.uniform(290.0, 400.0, 100)
    h, s, _, _ = table.properties_PT(P, T)
    found = table.temperature(P, h if prop == "h" else s, prop)
    assert np.max(np.abs(found - T)) < 1e-7


def test_envelope_agrees_with_the_dew_point_flash():
    # the library's PQ dew-point flash at three pressures below the cricondenbar
    env = envelope.phase_envelope(GAS)
    assert env.traced
    for P in (10e5, 20e5, 40e5):
        assert env.edge_temperature([P])[0] == pytest.approx(GAS.dew_temperature(P), abs=0.5)
    limit = env.limit([30e5, 45e5], GAS.dew_temperature)
    assert limit >= GAS.dew_temperature(45e5) + envelope.DEW_MARGIN
    clear = env.clear([40e5, 40e5], [GAS.dew_temperature(40e5) + 1.0, 300.0])
    assert clear.tolist() == [False, True]


def test_dew_probes_bracket_the_range_on_a_fixed_grid():
    # the probes of envelope.limit: pressures 1 % apart on a fixed grid, the first at or below
    # the least pressure and the last at or above the greatest, so that two batches of one
    # machine probe the same pressures (the fluid's dew-point cache answers the second)
    probes = envelope._probe_pressures(18.35e5, 45.1e5, 5)
    assert len(probes) == 5 and probes[0] <= 18.35e5 and probes[-1] >= 45.1e5
    assert probes[0] > 18.35e5 / 1.0101 and probes[-1] < 45.1e5 * 1.0101
    steps = np.log(probes) / 0.01
    assert np.allclose(steps, np.round(steps))
    # another batch of the machine, inside the same grid interval at both ends
    assert envelope._probe_pressures(18.45e5, 45.05e5, 5) == probes
    calls = []

    def counted(P):
        calls.append(P)
        return GAS.dew_temperature(P)

    env = envelope.phase_envelope(GAS)
    first = env.limit([18.35e5, 45.1e5], counted)
    assert first >= max(GAS.dew_temperature(p) for p in (18.35e5, 45.1e5)) + envelope.DEW_MARGIN
    assert first - 0.5 < env.limit([18.45e5, 45.05e5], counted) <= first
    assert sorted(set(calls)) == probes and len(calls) == 10


def test_envelope_edge_of_a_closed_polyline():
    # closed form: linear in (ln P, T) along each segment (the highest crossing counts)
    env = envelope.PhaseEnvelope(np.array([200.0, 250.0, 240.0, 180.0]),
                                 np.array([1e5, 40e5, 60e5, 20e5]))
    w = math.log(20.0) / math.log(40.0)
    assert env.edge_temperature([20e5])[0] == pytest.approx(200.0 + 50.0 * w)
    assert env.edge_temperature([70e5])[0] == -math.inf  # above the cricondenbar
    assert math.isnan(env.edge_temperature([0.5e5])[0])  # below the traced range


def test_new_entry_points_refuse_bad_inputs_by_name():
    with pytest.raises(InputError, match="mixture"):
        envelope.phase_envelope(wb.Fluid("Water"))
    with pytest.raises(InputError, match="Fluid"):
        fast.prepare("Methane", [1e5], [300.0])
    with pytest.raises(InputError, match="pressures"):
        fast.prepare(GAS, ["x"], [300.0])
    with pytest.raises(InputError, match="temperatures"):
        fast.prepare(GAS, [1e5], [np.inf])
    with pytest.raises(InputError, match="tolerance"):
        fast.prepare(GAS, [1e5], [300.0], tolerance={"q": 1.0})
    with pytest.raises(InputError, match="tolerance of h"):
        fast.prepare(GAS, [1e5], [300.0], tolerance={"h": -1.0})
    with pytest.raises(InputError, match="box"):
        tables.build_table(tables.GasFlasher(GAS), (2e5, 1e5), (300.0, 310.0))
    with pytest.raises(InputError, match="start nodes"):
        tables.build_table(tables.GasFlasher(GAS), (1e5, 2e5), (300.0, 310.0), start=(2, 5))
    with pytest.raises(InputError, match="refine"):
        tables.build_table(tables.GasFlasher(GAS), (1e5, 2e5), (300.0, 310.0), refine="yes")
    with pytest.raises(InputError, match="HEOS"):
        tables.GasFlasher(wb.Fluid("Water", backend="IF97"))


def _gas_frame(n, seed, p1=(18e5, 20e5), t1=(293.15, 303.15)):
    """Invented booster-compressor readings (test data only)."""
    rng = np.random.default_rng(seed)
    P1 = rng.uniform(*p1, n)
    T1 = rng.uniform(*t1, n)
    ratio = rng.uniform(1.5, 2.0, n)
    import pandas as pd

    return pd.DataFrame({"inlet_pressure": P1, "inlet_temperature": T1,
                         "outlet_pressure": P1 * ratio,
                         "outlet_temperature": T1 * ratio ** 0.27 + rng.uniform(3.0, 12.0, n),
                         "mass_flow": rng.uniform(8.0, 12.0, n)})
