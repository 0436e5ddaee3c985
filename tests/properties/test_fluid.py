"""Single-state flashes against independent references; range checks; pickling; threads.

References
----------
* IAPWS-95 and IAPWS-IF97 through the independent `iapws` package (J. Rodriguez Romero).
"""

import math
import pickle
from decimal import Decimal

import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.errors import InputError, PropertyError


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


def test_wet_steam_from_temperature_and_quality(water_if97):
    # Source: IAPWS-IF97 via iapws.IAPWS97(T, x).
    st = water_if97.state(T=400.0, x=0.25)
    ref = iapws.IAPWS97(T=400.0, x=0.25)
    assert st.P == pytest.approx(ref.P * 1e6, rel=1e-8)
    assert st.h == pytest.approx(ref.h * 1e3, rel=1e-8)


def test_ps_and_ph_flashes_invert(water, water_if97, natural_gas):
    # Consistency: P-h and P-s flashes return the state they came from (closes to 1e-6 K).
    for fluid, P, T in ((water, 5e5, 250 + 273.15), (water_if97, 5e5, 250 + 273.15),
                        (water_if97, 30e6, 700.0), (natural_gas, 60e5, 320.0)):
        st = fluid.state(P=P, T=T)
        assert fluid.state(P=P, h=st.h).T == pytest.approx(T, abs=1e-6)
        assert fluid.state(P=P, s=st.s).T == pytest.approx(T, abs=1e-6)


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
    assert water.state(P=Decimal("1e6"), T=np.float64(473.15)).h == pytest.approx(st.h)
    assert water.state(P=10 ** 6, T=473).P == pytest.approx(1e6, rel=1e-9)  # integers


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
    (dict(T=700.0, x=0.5), InputError, "critical"),
    (dict(P=1e5), InputError, "pairs"),
    (dict(P=1e5, T=300, h=1e5), InputError, "pairs"),
    (dict(P=wb.Q_(1, "m"), T=300), InputError, "pressure"),
    (dict(P=10 ** 400, T=300.0), InputError, "pressure"),
    (dict(P=1e5, T=10 ** 400), InputError, "temperature"),
    (dict(P=1e5, h=10 ** 400), InputError, "enthalpy"),
    (dict(P=1e5, s="7000"), InputError, "entropy"),
    (dict(P=True, T=300.0), InputError, "pressure"),
    (dict(P=[1e5], T=300.0), InputError, "pressure"),
    (dict(P=1e5, x=math.nan), InputError, "quality"),
])
def test_bad_states_refused(water, kwargs, error, word):
    # Source: the input boundary's rules (workbench.units) and the model's published range.
    with pytest.raises(error, match=word):
        water.state(**kwargs)


def test_huge_pressure_refused_by_name_for_air():
    # The example: Fluid("Air").state(P=10**400, T=300.0) must name the pressure.
    with pytest.raises(InputError, match="pressure"):
        wb.Fluid("Air").state(P=10 ** 400, T=300.0)


def test_public_range_checks_name_the_input(water):
    # Source: IAPWS-95's published range (the model's P_max, T_min, T_max from the library).
    assert water.check_pressure(2e5, "outlet pressure") == 2e5
    assert water.check_pressure(200000, "outlet pressure") == 2e5
    for value, error in ((-1.0, InputError), (math.nan, InputError), (10 ** 400, InputError),
                         ("2 bar", InputError), (2e10, PropertyError)):
        with pytest.raises(error, match="outlet pressure"):
            water.check_pressure(value, "outlet pressure")
    assert water.check_temperature(300.0) == 300.0
    with pytest.raises(PropertyError, match="the resulting outlet temperature"):
        water.check_temperature(5000.0, "outlet temperature", derived=True)
    with pytest.raises(InputError, match="suction temperature"):
        water.check_temperature(-3.0, "suction temperature")


def test_saturation_point_needs_quality(water):
    T_sat = water.saturation_temperature(1e5)
    with pytest.raises(InputError, match="quality"):
        water.state(P=1e5, T=T_sat)


def test_mixture_below_dew_point_refused(natural_gas):
    with pytest.raises(PropertyError, match="dew point"):
        natural_gas.state(P=50e5, T=200.0)
    with pytest.raises(InputError, match="quality"):
        natural_gas.state(P=50e5, x=0.5)
    with pytest.raises(PropertyError, match="dew point"):
        natural_gas.state_Ph(50e5, natural_gas.state_PT(50e5, 300.0).h - 5e5)


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


def test_flash_count_counts_flashes():
    # Source: the definition of the counter (one per single flash, one per array entry).
    fluid = wb.Fluid("Nitrogen")
    fluid.state_PT(1e5, 300.0)  # the saturation states at 1 bar are flashed once and kept
    before = fluid.flash_count
    fluid.state_PT(1e5, 300.0)
    assert fluid.flash_count == before + 1
    before = fluid.flash_count
    fluid.array_property("H", "P", np.array([1e5, 2e5]), "T", 300.0)
    assert fluid.flash_count == before + 2


def test_stagnation_state_from_enthalpy_and_entropy(water_if97):
    # Consistency: the h-s state returns the pressure of the state it came from.
    st = water_if97.state_PT(20e5, 600.0)
    found = water_if97.state_hs(st.h, st.s, 15e5)
    assert found.P == pytest.approx(20e5, rel=1e-7)
    assert found.h == pytest.approx(st.h, rel=1e-9)


def test_one_fluid_serves_several_threads():
    # Source: the same fluid's results computed serially in one thread.  A property-library
    # state object holds its last flash, so each thread must get its own (a threaded dask
    # scheduler or a dashboard server shares one Fluid between threads).
    import threading

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
