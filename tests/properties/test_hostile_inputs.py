"""Random and hostile entries: every call gives finite numbers or a WorkbenchError.

Source: the project's rule for the input boundary (workbench.units): bool, text, None, NaN,
inf, overflow, wrong dimensions and arrays-for-scalars are refused by name; no raw exception
(TypeError, OverflowError, the property library's ValueError...) and no NaN result escapes.
"""

import math
from decimal import Decimal

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import workbench as wb
from workbench.units import MAX_MAGNITUDE

AIR = wb.Fluid("Air")
STEAM = wb.Fluid("Water", backend="IF97")
GAS = wb.Fluid({"Methane": 0.9, "Ethane": 0.07, "Nitrogen": 0.03})

HOSTILE = st.one_of(
    st.none(), st.booleans(), st.text(max_size=8), st.binary(max_size=4),
    st.integers(min_value=-(10 ** 500), max_value=10 ** 500),
    st.floats(allow_nan=True, allow_infinity=True),
    st.decimals(allow_nan=True, allow_infinity=True),
    st.lists(st.floats(), max_size=2), st.just(wb.Q_(1.0, "m")), st.just(wb.Q_(3.0, "bar")),
)
NUMBERS = st.one_of(st.floats(min_value=-1e13, max_value=1e13),
                    st.floats(min_value=1e3, max_value=1e8), st.sampled_from([0.0, 1e-300]))
SPECS = st.one_of(
    HOSTILE, st.sampled_from(["Water", "Air", "CO2", "water", "Water&Ethanol", "IF97::Water",
                              "", " ", "R134a", "Nitrogen[1]", "\x00", "n-Butane"]),
    st.dictionaries(st.one_of(st.sampled_from(["Methane", "Ethane", "Nitrogen", "Unobtainium"]),
                              st.text(max_size=5), st.integers()),
                    st.one_of(HOSTILE, st.floats(0, 1)), max_size=4),
)

SETTINGS = settings(max_examples=150, deadline=None, derandomize=True,
                    suppress_health_check=[HealthCheck.too_slow])


def _finite_state(state):
    for name in ("P", "T", "h", "s", "rho"):
        assert math.isfinite(getattr(state, name)), name
    assert state.two_phase == (not math.isnan(state.x))


@SETTINGS
@given(spec=SPECS, basis=st.one_of(st.sampled_from(["mole", "mass"]), HOSTILE),
       backend=st.one_of(st.sampled_from(["HEOS", "IF97"]), HOSTILE))
def test_fluid_specifications(spec, basis, backend):
    try:
        fluid = wb.Fluid(spec, basis=basis, backend=backend)
    except wb.WorkbenchError as exc:
        assert str(exc)
        return
    assert fluid.components and math.isclose(sum(fluid.fractions), 1.0, rel_tol=1e-12)


@SETTINGS
@given(fluid=st.sampled_from([AIR, STEAM, GAS]), pair=st.sampled_from(["PT", "Ph", "Ps", "Px"]),
       a=st.one_of(HOSTILE, NUMBERS), b=st.one_of(HOSTILE, NUMBERS))
def test_states_from_hostile_entries(fluid, pair, a, b):
    kwargs = {pair[0]: a, pair[1]: b}
    try:
        state = fluid.state(**kwargs)
    except wb.WorkbenchError as exc:
        assert str(exc)
        return
    _finite_state(state)


@SETTINGS
@given(fluid=st.sampled_from([AIR, STEAM]), method=st.sampled_from(["states_PT", "states_Ph",
                                                                    "states_Ps"]),
       a=st.lists(NUMBERS, min_size=1, max_size=6), b=st.lists(NUMBERS, min_size=1, max_size=6))
def test_state_arrays_from_random_entries(fluid, method, a, b):
    n = max(len(a), len(b))
    a, b = (a * n)[:n], (b * n)[:n]
    try:
        states = getattr(fluid, method)(np.array(a), np.array(b))
    except wb.InputError as exc:
        # the input boundary refuses array entries of magnitude above 1e12 (SI), by name
        assert max(map(abs, a + b)) > MAX_MAGNITUDE
        assert any(word in str(exc) for word in ("pressure", "temperature", "specific"))
        return
    assert len(states) == n
    for i in np.flatnonzero(states.valid):
        _finite_state(states.state(int(i)))
    assert np.isnan(states.h[~states.valid]).all()


def test_decimal_and_numpy_entries_are_numbers():
    # Source: the input boundary accepts Decimal and numpy scalars as plain numbers.
    state = AIR.state(P=Decimal("1e5"), T=np.int64(300))
    assert state.T == 300.0
