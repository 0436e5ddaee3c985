"""Array flashes: the same states and refusals as the single-state API, entry by entry.

References
----------
* IAPWS-IF97 through the independent `iapws` package (J. Rodriguez Romero).
"""

import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError, PropertyError
from workbench.properties.arrays import pair_arrays


def _spread_of_water_states(count=120, seed=11):
    """Pressures and temperatures over liquid, wet, superheated and supercritical water."""
    rng = np.random.default_rng(seed)
    P = 10 ** rng.uniform(3.0, 7.6, count)  # 1 kPa .. 40 MPa
    T = rng.uniform(280.0, 1050.0, count)
    return P, T


@pytest.mark.parametrize("backend", ["IF97", "HEOS"])
def test_state_arrays_equal_single_states(backend):
    # Source: the single-state API of the same fluid (state_PT, state_Ph, state_Ps), entry by
    # entry; entries it refuses must be marked not valid.
    fluid = wb.Fluid("Water", backend=backend)
    P, T = _spread_of_water_states(60 if backend == "HEOS" else 150)
    P = np.append(P, [-1.0, np.nan, 2e9, 101325.0])
    T = np.append(T, [400.0, 400.0, 400.0, fluid.saturation_temperature(101325.0)])
    # targets on both sides of the dome and inside it: h and s of states at other temperatures
    h = np.array([fluid.state_PT(float(p), float(t)).h if p > 0 and np.isfinite(p) and p < 1e8
                  and abs(t - 373.124) > 1 else 1e5 for p, t in zip(P, T)])
    h[::3] *= 0.7  # some of these fall inside the dome or into the liquid
    s = np.linspace(400.0, 9000.0, len(P))
    cases = [(fluid.states_PT, fluid.state_PT, P, T), (fluid.states_Ph, fluid.state_Ph, P, h),
             (fluid.states_Ps, fluid.state_Ps, P, s)]
    for many, one, a, b in cases:
        states = many(a, b)
        assert len(states) == len(a)
        refused = 0
        for i in range(len(a)):
            try:
                single = one(float(a[i]), float(b[i]))
            except wb.errors.WorkbenchError:
                refused += 1
                assert not states.valid[i], (many.__name__, a[i], b[i])
                continue
            assert states.valid[i], (many.__name__, a[i], b[i])
            got = states.state(i)
            for name in ("T", "h", "s", "rho"):
                assert getattr(got, name) == pytest.approx(getattr(single, name), rel=1e-9), name
            assert got.phase == single.phase
            assert got.two_phase == single.two_phase
            if single.two_phase:
                assert got.x == pytest.approx(single.x, abs=1e-9)
        assert 0 < refused < len(a)  # the spread has both kinds


def test_state_arrays_match_iapws97(water_if97):
    # Source: IAPWS-IF97 via the iapws package (IAPWS97 with P, h and P, s given).
    P = np.array([0.05e6, 0.5e6, 5e6, 15e6, 30e6])
    h = np.array([2400e3, 2900e3, 1200e3, 3300e3, 3000e3])  # wet, superheated, liquid, ...
    s = np.array([7000.0, 7200.0, 3000.0, 6300.0, 5500.0])
    by_h = water_if97.states_Ph(P, h)
    by_s = water_if97.states_Ps(P, s)
    assert by_h.valid.all() and by_s.valid.all()
    for i in range(len(P)):
        ref_h = iapws.IAPWS97(P=P[i] / 1e6, h=h[i] / 1e3)
        ref_s = iapws.IAPWS97(P=P[i] / 1e6, s=s[i] / 1e3)
        # the reference solves the backward equations: agreement to their consistency, ~25 mK
        assert by_h.T[i] == pytest.approx(ref_h.T, abs=0.03)
        assert by_s.T[i] == pytest.approx(ref_s.T, abs=0.03)
        assert by_s.h[i] / 1e3 == pytest.approx(ref_s.h, rel=2e-5)
        if ref_h.region == 4:
            assert by_h.x[i] == pytest.approx(ref_h.x, abs=2e-5)
        else:
            assert np.isnan(by_h.x[i])


def test_state_arrays_of_a_mixture_entry_by_entry(natural_gas):
    # Source: the single-state API (mixtures are flashed entry by entry); a state below the
    # dew point is not valid.
    states = natural_gas.states_PT(np.array([50e5, 50e5]), np.array([320.0, 150.0]))
    assert states.valid.tolist() == [True, False]
    assert states.h[0] == pytest.approx(natural_gas.state_PT(50e5, 320.0).h, rel=1e-12)
    with pytest.raises(PropertyError):
        states.state(1)
    by_h = natural_gas.states_Ph([50e5, 50e5], [states.h[0], -1e7])
    assert by_h.valid.tolist() == [True, False]
    assert by_h.T[0] == pytest.approx(320.0, rel=1e-9)


def test_range_masks_agree_with_the_single_checks(water):
    # Source: the single-state range checks (check_pressure, check_temperature) entry by entry.
    P = np.array([1e5, 0.0, -1.0, np.nan, np.inf, 2e10, water.P_max])
    T = np.array([300.0, 0.0, -1.0, np.nan, np.inf, 5000.0, water.T_min])
    for values, mask, check in ((P, water.pressure_ok(P), water.check_pressure),
                                (T, water.temperature_ok(T), water.check_temperature)):
        for value, ok in zip(values, mask):
            try:
                check(float(value))
                accepted = True
            except wb.WorkbenchError:
                accepted = False
            assert accepted == ok, value


def test_pair_arrays_repeat_scalars_and_refuse_by_name():
    kinds = names = ("pressure", "temperature")
    a, b = pair_arrays(1e5, [300.0, 310.0], kinds, names)
    assert a.tolist() == [1e5, 1e5] and b.tolist() == [300.0, 310.0]
    # Quantities are converted to SI (1 bar = 1e5 Pa, 0 degC = 273.15 K: SI definitions)
    a, b = pair_arrays(wb.Q_([1.0], "bar"), wb.Q_([0.0], "degC"), kinds, names)
    assert a.tolist() == [1e5] and b.tolist() == [273.15]
    for bad, named in ((([1.0, 2.0], [1.0, 2.0, 3.0]), "pressure and temperature"),
                       (([[1.0]], [1.0]), "pressure"), ((["a"], [1.0]), "pressure"),
                       (([1.0], [np.inf]), "temperature"), (([1.0], [1e300]), "temperature"),
                       ((None, [1.0]), "pressure"), (([1.0], {"a": 1.0}), "temperature"),
                       (([1.0], wb.Q_([300.0], "m**2")), "temperature")):
        with pytest.raises(InputError, match=named):
            pair_arrays(*bad, kinds, names)


def test_states_PT_refuses_non_numbers_by_name_and_marks_nan_not_valid():
    air = wb.Fluid("Air")
    with pytest.raises(InputError, match="pressure"):
        air.states_PT([np.inf, 1e5], [300.0, 300.0])
    with pytest.raises(InputError, match="temperature"):
        air.states_PT([1e5, 1e5], "300")
    with pytest.raises(InputError, match="specific enthalpy"):
        air.states_Ph([1e5], [1e300])
    # NaN marks a missing reading: that entry is not valid, the others are
    assert air.states_PT([1e5, np.nan], [300.0, 300.0]).valid.tolist() == [True, False]
