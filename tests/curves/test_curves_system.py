"""SystemCurve and operating_point against hand computations: Darcy-Weisbach with Colebrook
solved here by fixed-point iteration, water properties from IAPWS-95 (iapws package)."""

import math

import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.curves import PipeSection, SystemCurve, operating_point

G = 9.80665  # standard gravity [m/s2] (CGPM 1901)
WATER = wb.Fluid("Water")
T, P = 293.15, 101325.0
STATE = WATER.state(P=P, T=T)
REF = iapws.IAPWS95(T=T, P=P / 1e6)  # independent density and viscosity (IAPWS-95, IAPWS 2008)
RHO, MU = REF.rho, REF.mu

D, L, EPS, K = 0.15, 250.0, 4.5e-5, 6.0
Q_PTS = np.linspace(0.0, 0.08, 7)


def colebrook(Re, eD):
    """Darcy friction factor: 64/Re when laminar (Re < 2040, the switch the pipe model
    documents), else Colebrook (1939) by fixed-point iteration on 1/sqrt(f)."""
    if Re < 2040:
        return 64.0 / Re
    x = 8.0  # 1/sqrt(f) start
    for _ in range(200):
        x_new = -2.0 * math.log10(eD / 3.7 + 2.51 * x / Re)
        if abs(x_new - x) < 1e-14:
            break
        x = x_new
    return 1.0 / x_new ** 2


def hand_system_head(q, static=15.0, extra_k=0.0):
    if q == 0:
        return static
    V = q / (math.pi * D ** 2 / 4)
    f = colebrook(RHO * V * D / MU, EPS / D)
    return static + (f * L / D + K + extra_k) * V ** 2 / (2 * G)


def pump_head(q, r=1.0):
    """Invented pump curve H = 60 r^2 - 4000 q^2 [m] (affinity: H ~ N^2 at Q ~ N)."""
    return 60.0 * r ** 2 - 4000.0 * q ** 2


def bisect(f, a, b):
    for _ in range(200):
        m = 0.5 * (a + b)
        if f(a) * f(m) <= 0:
            b = m
        else:
            a = m
    return 0.5 * (a + b)


@pytest.fixture(scope="module")
def system():
    return SystemCurve(STATE, static_head=15.0,
                       sections=[PipeSection(D, length=L, roughness=EPS, loss_coefficient=K)])


@pytest.fixture(scope="module")
def curve():
    return wb.PerformanceCurve(Q_PTS, pump_head(Q_PTS), speed=150.0, degree=2,
                               efficiency=0.3 + 10 * Q_PTS - 60 * Q_PTS ** 2,
                               npsh_required=1.5 + 400 * Q_PTS ** 2)


def test_system_head_against_darcy_weisbach_colebrook(system):
    for q in (0.0, 0.01, 0.05, 0.08):
        # Darcy-Weisbach with Colebrook solved by hand (fixed-point iteration)
        assert system.head(q) == pytest.approx(hand_system_head(q), rel=1e-6)


def test_system_head_matches_the_pipe_model():
    # consistency with workbench.pipe_segment (same friction factor and loss formula); a
    # pressurised state so the pipe outlet stays above zero pressure
    state = WATER.state(P=20e5, T=T)
    system = SystemCurve(state, sections=[PipeSection(D, length=L, roughness=EPS,
                                                      loss_coefficient=K)])
    q = 0.05
    res = wb.pipe_segment(state, q * state.rho, D, length=L, roughness=EPS,
                          viscosity=WATER.viscosity(state), minor_loss_coefficient=K)
    assert system.head(q) - system.static_head == pytest.approx(res.head_loss, rel=1e-10)


def test_operating_point_against_hand_intersection(system, curve):
    point = operating_point(curve, system)
    q_hand = bisect(lambda q: pump_head(q) - hand_system_head(q), 1e-6, 0.08)
    assert point.volume_flow == pytest.approx(q_hand, rel=1e-5)
    assert point.total_head == pytest.approx(pump_head(q_hand), rel=1e-5)
    assert point.system_head == pytest.approx(point.total_head, rel=1e-9)
    # pressure rise rho g H (hydrostatics)
    assert point.pressure_rise == pytest.approx(RHO * G * pump_head(q_hand), rel=1e-5)
    # hydraulic power rho g Q H / eta (definition of pump efficiency)
    eta = 0.3 + 10 * q_hand - 60 * q_hand ** 2
    assert point.efficiency == pytest.approx(eta, rel=1e-5)
    assert point.power == pytest.approx(RHO * G * q_hand * pump_head(q_hand) / eta, rel=1e-4)
    assert set(point.to_dict()) >= {"volume_flow", "total_head", "efficiency", "npsh_margin"}


def test_throttle_moves_the_point_to_lower_flow(system, curve):
    point = operating_point(curve, system, throttle=40.0)
    q_hand = bisect(lambda q: pump_head(q) - hand_system_head(q, extra_k=40.0), 1e-6, 0.08)
    assert point.volume_flow == pytest.approx(q_hand, rel=1e-5)
    assert point.volume_flow < operating_point(curve, system).volume_flow
    assert point.throttle_coefficient == 40.0


def test_speed_change_by_affinity(system, curve):
    r = 0.9
    point = operating_point(curve, system, speed=150.0 * r)
    # the scaled curve is H = 60 r^2 - 4000 Q^2 (affinity laws, closed form)
    q_hand = bisect(lambda q: pump_head(q, r) - hand_system_head(q), 1e-6, 0.08 * r)
    assert point.volume_flow == pytest.approx(q_hand, rel=1e-5)
    assert point.speed == pytest.approx(150.0 * r)


def test_npsh_available_and_margin(curve):
    # NPSHa = (P_source - P_vapour)/(rho g) + z_source - h_suction (ANSI/HI 9.6.1 definition);
    # vapour pressure from IAPWS-95 saturation (iapws package)
    p_vap = iapws.IAPWS95(T=T, x=0).P * 1e6
    suction = PipeSection(0.2, length=10.0, roughness=EPS, loss_coefficient=1.5, suction=True)
    system = SystemCurve(STATE, static_head=15.0, suction_head=-2.0,
                         sections=[suction, PipeSection(D, length=L, roughness=EPS,
                                                        loss_coefficient=K)])
    point = operating_point(curve, system)
    q = point.volume_flow
    V = q / (math.pi * 0.2 ** 2 / 4)
    h_s = (colebrook(RHO * V * 0.2 / MU, EPS / 0.2) * 10.0 / 0.2 + 1.5) * V ** 2 / (2 * G)
    npsha = (P - p_vap) / (RHO * G) - 2.0 - h_s
    assert point.npsh_available == pytest.approx(npsha, rel=1e-4)
    assert point.npsh_required == pytest.approx(1.5 + 400 * q ** 2, rel=1e-6)
    assert point.npsh_margin == pytest.approx(npsha - (1.5 + 400 * q ** 2), rel=1e-3)


def test_cavitation_caution_and_below_vapour_pressure(curve):
    hot = WATER.state(P=101325.0, T=363.15)
    system = SystemCurve(hot, static_head=15.0, suction_head=-6.0,
                         sections=[PipeSection(D, length=L, loss_coefficient=K)])
    point = operating_point(curve, system)
    assert point.npsh_margin < 0
    assert any("cavitate" in c for c in point.cautions)


def test_fan_in_a_duct():
    # fan pressure compared with rho g H_sys of the duct (incompressible, low Mach)
    air = wb.Fluid("Air").state(P=101325.0, T=293.15)
    duct = SystemCurve(air, sections=[PipeSection(0.5, length=40.0, loss_coefficient=3.0)])
    flows = np.linspace(0.0, 6.0, 7)
    fan = wb.PerformanceCurve(flows, 1200.0 - 20.0 * flows ** 2, speed=150.0, machine="fan",
                              degree=2)
    point = operating_point(fan, duct)
    assert point.pressure_rise == pytest.approx(duct.pressure(point.volume_flow), rel=1e-9)
    assert point.pressure_rise == pytest.approx(1200.0 - 20.0 * point.volume_flow ** 2,
                                                rel=1e-9)


def test_no_intersection_and_refusals(system, curve):
    high = SystemCurve(STATE, static_head=80.0,
                       sections=[PipeSection(D, length=L, loss_coefficient=K)])
    with pytest.raises(wb.SpecificationError, match="more head"):
        operating_point(curve, high)
    low = SystemCurve(STATE, static_head=1.0, sections=[PipeSection(1.0, length=1.0)])
    with pytest.raises(wb.SpecificationError, match="beyond its last"):
        operating_point(curve, low)
    comp = wb.PerformanceCurve([1.0, 2.0, 3.0], [9e4, 8e4, 6e4], speed=1000.0,
                               machine="compressor")
    with pytest.raises(wb.SpecificationError, match="compressor"):
        operating_point(comp, system)
    with pytest.raises(wb.InputError, match="throttle loss coefficient"):
        operating_point(curve, system, throttle=-1.0)
    with pytest.raises(wb.InputError, match="curve must be"):
        operating_point("curve", system)
    with pytest.raises(wb.InputError, match="section diameter"):
        PipeSection(0.0)
    with pytest.raises(wb.InputError, match="section roughness"):
        PipeSection(0.1, roughness=0.01)
    with pytest.raises(wb.InputError, match="unknown keys"):
        SystemCurve(STATE, sections=[{"diameter": 0.1, "colour": "red"}])
    with pytest.raises(wb.InputError, match="system state"):
        SystemCurve(101325.0)
    with pytest.raises(wb.SpecificationError, match="suction_head"):
        system.npsh_available(0.01)
    with pytest.raises(wb.InputError, match="system flow"):
        system.head(-0.1)
