"""Fluid states against independent references.

References
----------
* IAPWS-95 and IAPWS-IF97 through the independent `iapws` package (J. Rodriguez Romero).
* Ideal-gas law at low pressure (closed form).
"""

import math
import pickle

import iapws
import pytest

import workbench as wb
from workbench.errors import InputError, PropertyError


@pytest.fixture(scope="module")
def water():
    return wb.Fluid("Water")


@pytest.fixture(scope="module")
def water_if97():
    return wb.Fluid("Water", backend="IF97")


@pytest.fixture(scope="module")
def natural_gas():
    return wb.Fluid({"Methane": 0.85, "Ethane": 0.08, "Propane": 0.04, "Nitrogen": 0.03})


@pytest.mark.parametrize("P_MPa, T_K", [(0.1, 300.0), (10.0, 773.15), (1.0, 453.15), (25.0, 873.15)])
def test_water_heos_matches_iapws95(water, P_MPa, T_K):
    # Source: IAPWS-95 via iapws.IAPWS95 evaluated at the same (T, rho): no iteration in the
    # reference, so the comparison is tight.
    st = water.state(P=P_MPa * 1e6, T=T_K)
    ref = iapws.IAPWS95(T=st.T, rho=st.rho)
    assert ref.P * 1e6 == pytest.approx(st.P, rel=1e-7)
    assert ref.h * 1e3 == pytest.approx(st.h, rel=1e-7, abs=1e-3)
    assert ref.s * 1e3 == pytest.approx(st.s, rel=1e-7, abs=1e-6)


@pytest.mark.parametrize("P_MPa, T_K", [(0.1, 300.0), (10.0, 773.15), (1.0, 453.15), (25.0, 873.15)])
def test_water_if97_matches_iapws97(water_if97, P_MPa, T_K):
    # Source: IAPWS-IF97 via iapws.IAPWS97.
    st = water_if97.state(P=P_MPa * 1e6, T=T_K)
    ref = iapws.IAPWS97(P=P_MPa, T=T_K)
    assert st.h == pytest.approx(ref.h * 1e3, rel=1e-8)
    assert st.s == pytest.approx(ref.s * 1e3, rel=1e-8)
    assert st.rho == pytest.approx(ref.rho, rel=1e-8)


def test_wet_steam_from_pressure_and_quality(water_if97):
    # Source: IAPWS-IF97 via iapws.IAPWS97(P, x).
    st = water_if97.state(P=0.01e6, x=0.9)
    ref = iapws.IAPWS97(P=0.01, x=0.9)
    assert st.x == pytest.approx(0.9)
    assert st.T == pytest.approx(ref.T, rel=1e-8)
    assert st.h == pytest.approx(ref.h * 1e3, rel=1e-8)
    assert st.phase == "two-phase"


def test_ps_and_ph_flashes_invert(water, natural_gas):
    # Consistency: P-h and P-s flashes return the state they came from (closes to 1e-6 K).
    for fluid, P, T in ((water, 5e5, 250 + 273.15), (natural_gas, 60e5, 320.0)):
        st = fluid.state(P=P, T=T)
        assert fluid.state(P=P, h=st.h).T == pytest.approx(T, abs=1e-6)
        assert fluid.state(P=P, s=st.s).T == pytest.approx(T, abs=1e-6)


def test_mixture_low_pressure_ideal_gas():
    # Closed form: ideal-gas law rho = P M / (R T) at 1 kPa, where Z - 1 < 1e-4.
    gas = wb.Fluid({"Methane": 0.9, "Ethane": 0.1})
    st = gas.state(P=1e3, T=300.0)
    M = 0.9 * 16.0425e-3 + 0.1 * 30.069e-3  # molar masses [kg/mol], from memory (CIAAW values)
    assert st.rho == pytest.approx(1e3 * M / (8.314462618 * 300.0), rel=2e-4)


def test_mass_fraction_basis():
    gas = wb.Fluid({"Methane": 0.5, "Nitrogen": 0.5}, basis="mass")
    # mole fraction of methane = (0.5/16.04)/(0.5/16.04 + 0.5/28.01), molar masses from memory
    expected = (0.5 / 16.0425) / (0.5 / 16.0425 + 0.5 / 28.0134)
    assert dict(zip(gas.components, gas.fractions))["Methane"] == pytest.approx(expected, rel=1e-4)


def test_fluid_pickles(natural_gas):
    again = pickle.loads(pickle.dumps(natural_gas))
    assert again == natural_gas
    assert again.state(P=5e6, T=300).h == pytest.approx(natural_gas.state(P=5e6, T=300).h)
    # a worker receiving the fluid with every partition keeps one object and its caches
    assert pickle.loads(pickle.dumps(natural_gas)) is again


def test_quantities_accepted(water):
    st = water.state(P=wb.Q_(10, "bar"), T=wb.Q_(200, "degC"))
    assert st.P == pytest.approx(1e6)
    assert st.T == pytest.approx(473.15)


@pytest.mark.parametrize("spec, word", [
    ("Unobtainium", "unknown fluid"),
    ({"Methane": 0.5, "Ethane": 0.4}, "sum"),
    ({"Methane": 1.5}, "fraction of Methane"),
    ({}, "empty"),
])
def test_bad_fluids_refused(spec, word):
    with pytest.raises(InputError, match=word):
        wb.Fluid(spec)


def test_if97_only_for_water():
    with pytest.raises(InputError, match="IF97"):
        wb.Fluid("Air", backend="IF97")


@pytest.mark.parametrize("kwargs, error, word", [
    (dict(P=-1e5, T=300), InputError, "pressure"),
    (dict(P=0.0, T=300), InputError, "pressure"),
    (dict(P=1e5, T=-5), InputError, "temperature"),
    (dict(P=float("nan"), T=300), InputError, "pressure"),
    (dict(P=1e5, T=float("inf")), InputError, "temperature"),
    (dict(P=1e5, T=5000.0), PropertyError, "range"),
    (dict(P=2e10, T=500.0), PropertyError, "limit"),
    (dict(P=1e5, x=1.2), InputError, "quality"),
    (dict(P=1e5, x=-0.1), InputError, "quality"),
    (dict(P=300e5, x=0.5), InputError, "critical"),
    (dict(P=1e5), InputError, "pairs"),
    (dict(P=1e5, T=300, h=1e5), InputError, "pairs"),
    (dict(P=wb.Q_(1, "m"), T=300), InputError, "pressure"),
])
def test_bad_states_refused(water, kwargs, error, word):
    with pytest.raises(error, match=word):
        water.state(**kwargs)


def test_saturation_point_needs_quality(water):
    T_sat = water.saturation_temperature(1e5)
    with pytest.raises(InputError, match="quality"):
        water.state(P=1e5, T=T_sat)


def test_mixture_below_dew_point_refused(natural_gas):
    with pytest.raises(PropertyError, match="dew point"):
        natural_gas.state(P=50e5, T=200.0)
    with pytest.raises(InputError, match="quality"):
        natural_gas.state(P=50e5, x=0.5)


def test_errors_are_value_errors():
    assert issubclass(wb.WorkbenchError, ValueError)
    with pytest.raises(ValueError):
        wb.Fluid("Unobtainium")


def test_no_raw_library_text(water):
    with pytest.raises(wb.WorkbenchError) as info:
        water.state(P=1e5, h=-1e9)
    message = str(info.value)
    assert "CoolProp" not in message
    assert "Water" in message and "h=" in message
    # the fluid object still works after a failed flash
    assert math.isfinite(water.state(P=1e5, T=300).h)


def test_viscosity_of_water(water):
    # Reference: IAPWS 2008 viscosity release via iapws.IAPWS95 (mu in Pa s).
    st = water.state(P=1e5, T=293.15)
    assert water.viscosity(st) == pytest.approx(iapws.IAPWS95(T=293.15, P=0.1).mu, rel=1e-4)


def test_saturation_curve_matches_iapws97(water_if97):
    # Reference: IAPWS-IF97 saturation states via iapws.IAPWS97(P, x).
    curve = water_if97.saturation_curve(points=8)
    assert len(curve) == 16
    # Compared below 16.5 MPa (regions 1 and 2, T_sat < 623.15 K): near the critical point, in
    # region 3, the property library's IF97 and `iapws` differ by up to ~0.3 % in h.
    for st, x in [(st, 0) for st in curve[:8]] + [(st, 1) for st in curve[8:]]:
        if st.P < 16.5e6:
            assert st.h == pytest.approx(iapws.IAPWS97(P=st.P / 1e6, x=x).h * 1e3, rel=1e-6)
    isobar = water_if97.isobar(1e5, curve[0].s, curve[-1].s, points=5)
    assert all(st is None or st.P == pytest.approx(1e5) for st in isobar)


def _spread_of_water_states(count=120, seed=11):
    """Pressures and temperatures over liquid, wet, superheated and supercritical water."""
    import numpy as np

    rng = np.random.default_rng(seed)
    P = 10 ** rng.uniform(3.0, 7.6, count)  # 1 kPa .. 40 MPa
    T = rng.uniform(280.0, 1050.0, count)
    return P, T


@pytest.mark.parametrize("backend", ["IF97", "HEOS"])
def test_state_arrays_equal_single_states(backend):
    # Source: the single-state API of the same fluid (state_PT, state_Ph, state_Ps), entry by
    # entry; entries it refuses must be marked not valid.
    import numpy as np

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
    import numpy as np

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
    import numpy as np

    states = natural_gas.states_PT(np.array([50e5, 50e5]), np.array([320.0, 150.0]))
    assert states.valid.tolist() == [True, False]
    assert states.h[0] == pytest.approx(natural_gas.state_PT(50e5, 320.0).h, rel=1e-12)
    with pytest.raises(PropertyError):
        states.state(1)


def test_one_fluid_serves_several_threads():
    # Source: the same fluid's results computed serially in one thread.  A property-library
    # state object holds its last flash, so each thread must get its own (a threaded dask
    # scheduler or a dashboard server shares one Fluid between threads).
    import threading

    import numpy as np

    fluid = wb.Fluid("Air")
    pressures = np.linspace(1e5, 50e5, 400)
    entropy = fluid.state_PT(1e5, 300.0).s
    serial = [fluid.state_Ps(p, entropy).T for p in pressures]
    seen, results = [], {}

    def work(name, order):
        seen.append(fluid._as)
        results[name] = [fluid.state_Ps(p, entropy).T for p in pressures[order]]

    threads = [threading.Thread(target=work, args=("up", slice(None))),
               threading.Thread(target=work, args=("down", slice(None, None, -1)))]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join()
    assert seen[0] is not seen[1]
    assert results["up"] == serial
    assert results["down"] == serial[::-1]


def test_dense_natural_gas_above_the_cricondenbar_is_accepted():
    # Common practice (value from memory): the phase envelope of a lean natural gas
    # (~89 % methane) closes near 50 bar and 225 K, so gas at 200 bar and 400 K - an export
    # or injection compressor's discharge - is single-phase.  The property library's dew-point
    # solver returns a trivial solution there (about 1394 K), which must not refuse the state.
    gas = wb.Fluid({"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
                    "CarbonDioxide": 0.015})
    for pressure in (150e5, 200e5, 250e5):
        assert gas.state_PT(pressure, 400.0).phase == "gas"
        assert gas.dew_temperature(pressure) is None
    t_dew = gas.dew_temperature(45e5)
    assert 195.0 < t_dew < 230.0  # below the critical temperature of ethane, above methane's
    with pytest.raises(PropertyError, match="dew point"):
        gas.state_PT(45e5, t_dew - 1.0)


def test_dew_line_table_gives_the_exact_verdicts():
    # Source: the exact dew-point flash of the same mixture (a fluid that never tabulates).
    # After many distinct pressures a fluid tabulates its dew line; its bounds must hold the
    # exact dew point, and states either side of the line get the same verdict as before.
    import numpy as np

    spec = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.03, "Nitrogen": 0.02}
    gas, exact = wb.Fluid(spec), wb.Fluid(spec)
    exact.DEW_TABLE_AFTER = 10 ** 9
    pressures = np.geomspace(2e5, 40e5, 40)
    for pressure in pressures:
        gas.dew_temperature(float(pressure))
    checked = 0
    for pressure in pressures[::4] * 1.013:
        pressure = float(pressure)
        t_dew = exact.dew_temperature(pressure)
        bounds = gas.dew_bounds(pressure)
        if t_dew is None or bounds is None:
            continue
        checked += 1
        assert bounds[0] < t_dew < bounds[1]
        for T in (t_dew - 0.05, t_dew + 0.05, t_dew + 3.0, t_dew + 150.0):
            if T < gas.T_min:
                continue
            verdicts = []
            for fluid in (gas, exact):
                try:
                    verdicts.append(fluid.state_PT(pressure, T).h)
                except PropertyError:
                    verdicts.append("refused")
            assert verdicts[0] == verdicts[1] or verdicts[0] == pytest.approx(verdicts[1])
        s = exact.state_PT(pressure, t_dew + 40.0).s
        assert gas.state_Ps(pressure * 1.5, s).T == pytest.approx(
            exact.state_Ps(pressure * 1.5, s).T, rel=1e-9)
    assert checked >= 5


def test_dew_line_of_a_mixture_against_raoults_law():
    # Raoult's law (ideal gas, ideal solution), common practice at low pressure:
    # 1 = sum(y_i P / Psat_i(T)) at the dew point; pure-component vapour pressures from each
    # component's own equation of state.  Agreement within 1 K at 0.2-0.5 bar.
    import CoolProp.CoolProp as CP
    from scipy.optimize import brentq

    spec = {"Methane": 0.90, "Ethane": 0.07, "Propane": 0.03}
    gas = wb.Fluid(spec)

    def raoult(P):
        def residual(T):
            total = 0.0
            for name, y in spec.items():
                if T < CP.PropsSI("Tcrit", name):
                    total += y * P / CP.PropsSI("P", "T", T, "Q", 0, name)
            return total - 1.0
        return brentq(residual, 100.0, 300.0)

    for P in (0.2e5, 0.5e5):
        assert gas.dew_temperature(P) == pytest.approx(raoult(P), abs=1.0)
    line = gas.dew_line(30)
    assert len(line) > 10 and wb.Fluid("Water").dew_line() == []
    assert gas.saturation_curve(30) == line
    temperatures = [st.T for st in line]
    assert temperatures[:10] == sorted(temperatures[:10])  # rises with pressure at first
    for st in line[::6]:
        assert st.T == pytest.approx(gas.dew_temperature(st.P), rel=1e-12)
        assert st.phase == "gas"
        gas.state_PT(st.P, st.T + 0.5)  # just above the line: accepted
        with pytest.raises(PropertyError, match="dew point"):
            gas.state_PT(st.P, st.T - 0.5)
