"""IAPWS-IF97 regions 1, 2 and 4 over arrays (workbench.properties.if97_vec).

Checked against the verification values printed in the release (IAPWS R7-97(2012), tables
5, 15 and 35), against the ``iapws`` package (an independent implementation of IAPWS-IF97)
and against the single-state API (``Fluid.state_PT/Ph/Ps`` on the IF97 backend), entry by
entry, including states next to the region boundaries.
"""

import math

import numpy as np
import pytest
from iapws import IAPWS97

import workbench as wb
from workbench.errors import InputError, WorkbenchError
from workbench.properties import if97_vec as v

# IAPWS R7-97(2012) table 5 (region 1): T [K], p [MPa], v [m3/kg], h [kJ/kg], s [kJ/(kg K)],
# cp [kJ/(kg K)]
TABLE_5 = [(300.0, 3.0, 0.100215168e-2, 0.115331273e3, 0.392294792, 0.417301218e1),
           (300.0, 80.0, 0.971180894e-3, 0.184142828e3, 0.368563852, 0.401008987e1),
           (500.0, 3.0, 0.120241800e-2, 0.975542239e3, 0.258041912e1, 0.465580682e1)]
# IAPWS R7-97(2012) table 15 (region 2), same columns
TABLE_15 = [(300.0, 0.0035, 0.394913866e2, 0.254991145e4, 0.852238967e1, 0.191300162e1),
            (700.0, 0.0035, 0.923015898e2, 0.333568375e4, 0.101749996e2, 0.208141274e1),
            (700.0, 30.0, 0.542946619e-2, 0.263149474e4, 0.517540298e1, 0.103505092e2)]
# IAPWS R7-97(2012) table 35 (region 4): T [K] -> p_sat [MPa]; p [MPa] -> T_sat [K]
TABLE_35_P = [(300.0, 0.353658941e-2), (500.0, 0.263889776e1), (600.0, 0.123443146e2)]
TABLE_35_T = [(0.1, 0.372755919e3), (1.0, 0.453035632e3), (10.0, 0.584149488e3)]

STEAM = wb.Fluid("Water", backend="IF97")


@pytest.mark.parametrize("table, equation", [(TABLE_5, v.region1), (TABLE_15, v.region2)])
def test_regions_reproduce_the_release_tables(table, equation):
    # IAPWS R7-97(2012) tables 5 and 15, nine significant digits (rounding: 5e-9 relative)
    T = np.array([row[0] for row in table])
    P = np.array([row[1] for row in table]) * 1e6
    h, s, rho, cp = equation(P, T)
    for k, row in enumerate(table):
        assert 1.0 / rho[k] == pytest.approx(row[2], rel=5e-9)
        assert h[k] / 1e3 == pytest.approx(row[3], rel=5e-9)
        assert s[k] / 1e3 == pytest.approx(row[4], rel=5e-9)
        assert cp[k] / 1e3 == pytest.approx(row[5], rel=5e-9)


def test_saturation_line_reproduces_the_release_table():
    # IAPWS R7-97(2012) table 35
    p_sat = v.saturation_pressure([row[0] for row in TABLE_35_P])
    t_sat = v.saturation_temperature([row[0] * 1e6 for row in TABLE_35_T])
    for k, (_, expected) in enumerate(TABLE_35_P):
        assert p_sat[k] / 1e6 == pytest.approx(expected, rel=5e-9)
    for k, (_, expected) in enumerate(TABLE_35_T):
        assert t_sat[k] == pytest.approx(expected, rel=5e-9)


def test_regions_agree_with_the_iapws_package():
    # the iapws package (IAPWS97 class) over random states of regions 1 and 2
    rng = np.random.default_rng(3)
    P = np.exp(rng.uniform(math.log(1e3), math.log(90e6), 300))
    T = rng.uniform(280.0, 1070.0, 300)
    region = v.region_of(P, T)
    checked = 0
    for number, equation in ((1, v.region1), (2, v.region2)):
        rows = np.flatnonzero(region == number)
        h, s, rho, cp = equation(P[rows], T[rows])
        for k, i in enumerate(rows):
            ref = IAPWS97(P=P[i] / 1e6, T=T[i])
            assert ref.region == number
            assert h[k] / 1e3 == pytest.approx(ref.h, rel=1e-9)
            assert s[k] / 1e3 == pytest.approx(ref.s, rel=1e-9)
            assert 1.0 / rho[k] == pytest.approx(ref.v, rel=1e-9)
            assert cp[k] / 1e3 == pytest.approx(ref.cp, rel=1e-9)
            checked += 1
    assert checked > 200


def _single(method, a, b):
    try:
        return method(float(a), float(b))
    except WorkbenchError:
        return None


def _assert_same_as_single(states, singles, rel=1e-9):
    for i, single in enumerate(singles):
        assert bool(states.valid[i]) == (single is not None), i
        if single is None:
            continue
        assert states.phase[i] == single.phase, i
        assert states.T[i] == pytest.approx(single.T, rel=rel), i
        assert states.h[i] == pytest.approx(single.h, rel=rel, abs=1e-6), i
        assert states.s[i] == pytest.approx(single.s, rel=rel, abs=1e-9), i
        assert states.rho[i] == pytest.approx(single.rho, rel=1e-8), i
        if single.two_phase:
            assert states.x[i] == pytest.approx(single.x, abs=1e-10), i
        else:
            assert math.isnan(states.x[i]), i


@pytest.mark.parametrize("prop", ["s", "h"])
def test_pressure_entropy_and_enthalpy_states_equal_the_single_state_api(prop):
    # wet, superheated and compressed-liquid states from 1 kPa to 200 bar, and past the
    # range of the fast path (region 3, above 16.5 MPa): every entry as the single-state API
    rng = np.random.default_rng(5)
    P = np.exp(rng.uniform(math.log(1e3), math.log(20e6), 200))
    value = rng.uniform(300.0, 9500.0, 200) if prop == "s" else rng.uniform(5e4, 3.9e6, 200)
    states = STEAM.states_Ps(P, value) if prop == "s" else STEAM.states_Ph(P, value)
    method = STEAM.state_Ps if prop == "s" else STEAM.state_Ph
    singles = [_single(method, p, x) for p, x in zip(P, value)]
    assert sum(st is not None and st.two_phase for st in singles) > 20
    _assert_same_as_single(states, singles)


def test_pressure_temperature_states_next_to_region_boundaries():
    # states on and next to the saturation line (the single-state API refuses T = T_sat),
    # the 623.15 K and B23 boundaries, the critical point, the range ends: as the single-state
    # API, entry by entry (the fast path leaves the doubtful ones to it)
    P_sat = 10e6
    T_sat = float(v.saturation_temperature([P_sat])[0])
    p_b23 = float(v.boundary_23_pressure([700.0])[0])
    cases = [(P_sat, T_sat), (P_sat, T_sat * (1 + 1e-7)), (P_sat, T_sat * (1 - 1e-7)),
             (P_sat, T_sat * (1 + 3e-6)), (P_sat, T_sat * (1 - 3e-6)),
             (P_sat, T_sat * (1 + 2e-4)), (P_sat, T_sat * (1 - 2e-4)), (20e6, 623.15),
             (20e6, 623.15 + 1e-6), (p_b23, 700.0), (p_b23 * (1 - 1e-9), 700.0),
             (p_b23 * 0.99, 700.0), (22.064e6, 647.096), (25e6, 650.0), (40e6, 900.0),
             (100e6, 300.0), (100.0001e6, 300.0), (1e5, 273.15), (1e5, 273.14),
             (1e5, 1073.15), (1e5, 1073.2), (611.0, 300.0), (700.0, 300.0), (5e5, np.nan),
             (-1e5, 300.0)]
    P = np.array([c[0] for c in cases])
    T = np.array([c[1] for c in cases])
    states = STEAM.states_PT(P, T)
    singles = [_single(STEAM.state_PT, p, t) for p, t in zip(P, T)]
    _assert_same_as_single(states, singles, rel=1e-12)
    with pytest.raises(InputError, match="pressure"):  # the array boundary refuses infinity
        STEAM.states_PT([np.inf], [300.0])


def test_fast_path_refuses_bad_arrays_by_name():
    # the public entry points pass the input boundary (workbench.units.to_si_array)
    with pytest.raises(InputError, match="pressure"):
        v.flash_PT(["a lot"], [300.0])
    with pytest.raises(InputError, match="temperature"):
        v.region1([1e5], [np.inf])
    with pytest.raises(InputError, match="equal lengths"):
        v.flash_Ps([1e5, 2e5], [7000.0, 7000.0, 7000.0])
    with pytest.raises(InputError, match="pressure"):
        v.saturation_temperature([[1e5]])
    assert v.flash_PT([1e5], [np.nan]).ok.tolist() == [False]
