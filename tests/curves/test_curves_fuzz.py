"""Fuzz the curves entry points with random and hostile values (hypothesis, fixed seed).

Every call returns finite results or raises a WorkbenchError with a message; nothing raw
(TypeError, ZeroDivisionError, a CoolProp or scipy error), no NaN or inf escapes.
"""

import math

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import workbench as wb
from workbench.curves import PipeSection, SystemCurve
from workbench.curves.fan import compressibility_coefficient, fan_test, mach_factor
from workbench.curves.similarity import CompressorCondition

SETTINGS = dict(derandomize=True, deadline=None, database=None,
                suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])

hostile = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.floats(-1e3, 1e3),
    st.integers(min_value=-10 ** 30, max_value=10 ** 400),
    st.booleans(), st.none(), st.text(max_size=4),
    st.lists(st.floats(-10, 10), max_size=3),
    st.sampled_from([wb.Q_(1.0, "kg"), wb.Q_(2.0, "bar"), wb.Q_(3.0, "m**3/h"),
                     wb.Q_(1480, "rpm"), np.float32(0.5), np.int64(3), {"a": 1}, b"x"]),
)
arrays = st.one_of(
    st.lists(st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.floats(-1, 100)),
             min_size=0, max_size=8),
    hostile,
)

WATER = wb.Fluid("Water").state(P=101325.0, T=293.15)
AIR = wb.Fluid("Air").state(P=100000.0, T=293.15)
ARGON = wb.Fluid("Argon")
Q = [0.0, 0.02, 0.04, 0.06, 0.08]
H = [60.0, 58.4, 53.6, 45.6, 34.4]
CURVE = wb.PerformanceCurve(Q, H, speed=150.0, efficiency=[0.3, 0.6, 0.75, 0.78, 0.7],
                            npsh_required=[1.5, 1.7, 2.1, 2.9, 4.0])
SYSTEM = SystemCurve(WATER, static_head=15.0, suction_head=2.0,
                     sections=[PipeSection(0.15, length=200.0, loss_coefficient=5.0,
                                           suction=True)])
COND = CompressorCondition(ARGON, 1.0e5, 300.0, 1.8e5, 386.0, 0.9, 1000.0)


def _finite(value):
    if isinstance(value, dict):
        for v in value.values():
            _finite(v)
    elif isinstance(value, (float, np.floating)):
        assert math.isfinite(value), value
    elif isinstance(value, np.ndarray):
        assert np.all(np.isfinite(value))


def _call(fn, *args, **kwargs):
    try:
        out = fn(*args, **kwargs)
    except wb.WorkbenchError as exc:
        assert str(exc).strip()
        return None
    if hasattr(out, "to_dict"):
        _finite(out.to_dict())
    else:
        _finite(out)
    return out


CURVE_ARGS = dict(flow=Q, head=H, speed=150.0, machine="pump", efficiency=None, fit="pchip",
                  degree=2, min_flow=None, max_flow=None, name="c")


@settings(max_examples=400, **SETTINGS)
@given(key=st.sampled_from(sorted(CURVE_ARGS)), value=st.one_of(hostile, arrays))
def test_performance_curve(key, value):
    kwargs = dict(CURVE_ARGS, **{key: value})
    flow, head = kwargs.pop("flow"), kwargs.pop("head")
    curve = _call(wb.PerformanceCurve, flow, head, **kwargs)
    if curve is not None:
        _call(curve.head, 0.03)


@settings(max_examples=300, **SETTINGS)
@given(method=st.sampled_from(["head", "efficiency", "power", "surge_margin", "at_speed",
                               "npsh_required"]), value=st.one_of(hostile, arrays),
       extrapolate=st.one_of(st.booleans(), hostile))
def test_curve_readings(method, value, extrapolate):
    if method in ("surge_margin", "at_speed"):
        _call(getattr(CURVE, method), value)
    else:
        _call(getattr(CURVE, method), value, extrapolate=extrapolate)


SYSTEM_ARGS = dict(static_head=15.0, pressure_difference=0.0, suction_head=None,
                   diameter=0.15, length=100.0, roughness=4.5e-5, loss_coefficient=3.0)


@settings(max_examples=200, **SETTINGS)
@given(key=st.sampled_from(sorted(SYSTEM_ARGS)), value=hostile,
       throttle=st.one_of(st.none(), st.floats(0.1, 1e3), hostile),
       speed=st.one_of(st.none(), st.floats(50.0, 300.0), hostile))
def test_system_and_operating_point(key, value, throttle, speed):
    kwargs = dict(SYSTEM_ARGS, **{key: value})
    section = {k: kwargs.pop(k) for k in ("diameter", "length", "roughness",
                                          "loss_coefficient")}
    system = _call(SystemCurve, WATER, sections=[section], **kwargs)
    if system is not None:
        _call(wb.operating_point, CURVE, system, throttle=throttle, speed=speed)


PUMP_ARGS = dict(test_flow=[0.02, 0.03, 0.04, 0.05, 0.06], test_head=[58, 55, 51, 46, 40],
                 test_speed=150.0, rated_speed=152.0, guarantee_flow=0.04, guarantee_head=52.0,
                 guarantee_efficiency=0.7, guarantee_power=None,
                 test_power=[2e4, 2.3e4, 2.7e4, 3.0e4, 3.3e4], grade="2B", density=998.0,
                 fit="polynomial", degree=2)


@settings(max_examples=300, **SETTINGS)
@given(key=st.sampled_from(sorted(PUMP_ARGS)), value=st.one_of(hostile, arrays))
def test_pump_acceptance(key, value):
    kwargs = dict(PUMP_ARGS, **{key: value})
    _call(wb.pump_acceptance, kwargs.pop("test_flow"), kwargs.pop("test_head"), **kwargs)


FAN_ARGS = dict(outlet_pressure=101500.0, volume_flow=4.0, inlet_area=0.8, outlet_area=0.4,
                power=9000.0, isentropic_exponent=None)


@settings(max_examples=150, **SETTINGS)
@given(key=st.sampled_from(sorted(FAN_ARGS)), value=hostile)
def test_fan(key, value):
    _call(fan_test, AIR, **dict(FAN_ARGS, **{key: value}))


@settings(max_examples=200, **SETTINGS)
@given(args=st.lists(st.one_of(hostile, st.floats(0.01, 2e5)), min_size=5, max_size=5))
def test_compressibility_and_mach_factor(args):
    _call(compressibility_coefficient, *args)
    _call(mach_factor, args[0])


SIM_ARGS = dict(diameter=0.4, width=0.022, test_type="2", method="schultz",
                reynolds_correction=False, roughness=3.2e-6, limits=None, uncertainties=None,
                impellers=1)
COND_FIELDS = ("inlet_pressure", "inlet_temperature", "discharge_pressure",
               "discharge_temperature", "volume_flow", "speed")


@settings(max_examples=120, **SETTINGS)
@given(key=st.sampled_from(sorted(SIM_ARGS) + list(COND_FIELDS)), value=hostile)
def test_compressor_similarity(key, value):
    if key in COND_FIELDS:
        readings = dict(COND.readings(), **{key: value})
        test = _call(CompressorCondition, ARGON, **readings)
        if test is not None:
            _call(wb.compressor_similarity, test, COND, diameter=0.4, width=0.022)
        return
    _call(wb.compressor_similarity, COND, COND, **dict(SIM_ARGS, **{key: value}))


@settings(max_examples=60, **SETTINGS)
@given(reading=st.sampled_from(COND_FIELDS + ("torque",)), b=hostile,
       s=st.one_of(st.floats(0.0, 1.0), hostile))
def test_similarity_uncertainties(reading, b, s):
    _call(wb.compressor_similarity, COND, COND, diameter=0.4, width=0.022,
          uncertainties={reading: (b, s)})


def _paths(obj, prefix=()):
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield prefix + (k,)
            yield from _paths(v, prefix + (k,))
    elif isinstance(obj, list):
        for i, v in enumerate(obj[:3]):
            yield prefix + (i,)
            yield from _paths(v, prefix + (i,))


DEMOS = {name: load for name, load in (
    (n, __import__("workbench.curves", fromlist=["load_curves_demo"]).load_curves_demo(n))
    for n in ("pump-loop-demo", "compressor-co2-shop-test-demo"))}
PATHS = [(name, p) for name, data in DEMOS.items() for p in _paths(data)]
json_values = st.recursive(
    st.one_of(st.none(), st.booleans(), st.integers(-10 ** 20, 10 ** 400), st.text(max_size=5),
              st.floats(allow_nan=False, allow_infinity=False)),
    lambda inner: st.one_of(st.lists(inner, max_size=3),
                            st.dictionaries(st.text(max_size=3), inner, max_size=3)),
    max_leaves=6)


@settings(max_examples=150, **SETTINGS)
@given(where=st.sampled_from(PATHS), value=json_values)
def test_case_files(where, value):
    import copy

    from workbench.curves import curves_report, evaluate_curves_case

    name, path = where
    data = copy.deepcopy(DEMOS[name])
    target = data
    for key in path[:-1]:
        target = target[key]
    target[path[-1]] = value
    result = _call(evaluate_curves_case, data)
    if result is not None:
        assert "<svg" in curves_report(result)


_CELLS = st.one_of(hostile, st.sampled_from(["ok", "True", "1e400", "-0", " 3 ", "nan"]))


@settings(max_examples=150, **SETTINGS)
@given(machine=st.one_of(st.sampled_from(["pump", "compressor"]), hostile),
       columns=st.lists(st.sampled_from(["status", "steady", "inlet_volume_flow", "speed",
                                         "isentropic_head", "shaft_power", "inlet_pressure",
                                         "inlet_temperature", "outlet_pressure",
                                         "reading_outlet_temperature"]),
                        min_size=0, max_size=10, unique=True),
       cells=st.lists(_CELLS, min_size=0, max_size=30), raw=hostile)
def test_points_from_readings(machine, columns, cells, raw):
    import pandas as pd

    from workbench.curves import points_from_readings

    rows = [cells[i:i + len(columns)] for i in range(0, len(cells), max(len(columns), 1))]
    table = pd.DataFrame([r for r in rows if len(r) == len(columns)], columns=columns,
                         dtype=object)
    for out in (_call(points_from_readings, table, machine),
                _call(points_from_readings, raw, "pump")):
        if out is not None:
            assert all(len(np.atleast_1d(v)) for v in out.values())


@settings(max_examples=200, **SETTINGS)
@given(which=st.sampled_from(["reynolds_factor", "mach_limits", "demo", "npsh", "throttle",
                              "from_dict", "best", "write", "groups"]),
       a=hostile, b=st.one_of(hostile, st.floats(0.0, 1e-3)), c=hostile)
def test_helpers(which, a, b, c, tmp_path_factory):
    from workbench.curves import load_curves_demo, write_curves_report
    from workbench.curves.similarity import (
        mach_number_limits,
        reynolds_factor,
        similarity_groups,
    )

    if which == "reynolds_factor":
        _call(reynolds_factor, a, 0.02, b)
    elif which == "mach_limits":
        _call(mach_number_limits, a)
    elif which == "demo":
        _call(load_curves_demo, a)
    elif which == "npsh":
        _call(SYSTEM.npsh_available, a)
    elif which == "throttle":
        system = _call(SYSTEM.with_throttle, a, section=c if c is not None else 0)
        if system is not None:
            _call(system.head, 0.02)
    elif which == "from_dict":
        _call(wb.PerformanceCurve.from_dict, {**CURVE.to_dict(), "degree": a, "min_flow": c}
              if isinstance(c, (int, float)) else a)
    elif which == "groups":
        _call(similarity_groups, COND, a, 0.02, impellers=c if c is not None else 1)
        _call(similarity_groups, a, 0.4, 0.02)
    elif which == "best":
        assert 0 <= CURVE.best_efficiency_flow() <= Q[-1]
    else:
        try:
            write_curves_report(a, tmp_path_factory.mktemp("r") / "r.html")
        except wb.WorkbenchError as exc:
            assert str(exc)
