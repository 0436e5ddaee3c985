"""compressor_similarity after ASME PTC 10-1997 against hand formulas: the groups of a perfect
gas (argon at low pressure), the conversion at equal flow coefficient in closed form, the
departure verdicts and the PTC 19.1 propagation of a reading's uncertainty."""

import math

import pytest

import workbench as wb
from workbench.curves.similarity import CompressorCondition, reynolds_factor

R_U = 8.314462618  # molar gas constant [J/(mol K)] (CODATA 2018)
ARGON, N2 = wb.Fluid("Argon"), wb.Fluid("Nitrogen")
D, B = 0.40, 0.022


def argon_condition(speed=1000.0, flow=0.9, n=1.8, P1=1.0e5, T1=300.0, P2=1.8e5):
    """Argon compressed along a polytropic path of exponent n (perfect gas, closed form)."""
    T2 = T1 * (P2 / P1) ** ((n - 1) / n)
    return CompressorCondition(ARGON, P1, T1, P2, T2, flow, speed), T2


def test_groups_of_a_perfect_gas_against_hand_formulas():
    n, P1, T1, P2, omega, q = 1.8, 1.0e5, 300.0, 1.8e5, 1000.0, 0.9
    cond, T2 = argon_condition(omega, q, n, P1, T1, P2)
    result = wb.compressor_similarity(cond, cond, diameter=D, width=B)
    g = result.test
    R, kappa = R_U / 0.039948, 5.0 / 3.0  # argon: molar mass 39.948 g/mol, monatomic
    U = omega * D / 2
    head = n / (n - 1) * R * (T2 - T1)  # polytropic head of a perfect gas
    eta = (n / (n - 1)) / (kappa / (kappa - 1))  # polytropic efficiency of a perfect gas
    mu_visc = 22.7e-6  # argon viscosity at 300 K, 1 bar [Pa s] (NIST webbook, from memory)
    rho1 = P1 / (R * T1)
    # tolerances: argon departs from the perfect gas by about 0.1 % at these pressures
    assert g.tip_speed == pytest.approx(U, rel=1e-12)
    assert g.flow_coefficient == pytest.approx(q / (omega * (D / 2) ** 3), rel=1e-12)
    assert g.polytropic_head == pytest.approx(head, rel=2e-3)
    assert g.polytropic_efficiency == pytest.approx(eta, rel=2e-3)
    assert g.work_coefficient == pytest.approx(head / U ** 2, rel=2e-3)
    assert g.machine_mach_number == pytest.approx(U / math.sqrt(kappa * R * T1), rel=2e-3)
    assert g.machine_reynolds_number == pytest.approx(U * B * rho1 / mu_visc, rel=2e-2)
    assert g.specific_volume_ratio == pytest.approx(P2 * T1 / (P1 * T2), rel=2e-3)
    assert g.power == pytest.approx(rho1 * q * head / eta, rel=4e-3)
    assert result.within_limits
    # a section of three such impellers: mu_p = W_p / (3 U^2) (PTC 10: sum of U^2)
    three = wb.compressor_similarity(cond, cond, diameter=D, width=B, impellers=3)
    assert three.test.work_coefficient == pytest.approx(g.work_coefficient / 3, rel=1e-12)
    assert three.converted.polytropic_head == pytest.approx(result.converted.polytropic_head)


def test_conversion_at_equal_flow_coefficient_closed_form():
    # test on nitrogen at 1000 rad/s; specified on methane at 1150 rad/s and another inlet
    test = CompressorCondition(N2, 1.0e5, 295.0, 2.0e5, 380.0, 0.85, 1000.0)
    spec = CompressorCondition(wb.Fluid("Methane"), 1.2e5, 290.0, 2.3e5, 350.0, 0.98, 1150.0)
    result = wb.compressor_similarity(test, spec, diameter=D, width=B)
    t, c = result.test, result.converted
    ratio = 1150.0 / 1000.0
    # PTC 10 section 5: q ~ N, W_p ~ N^2 (equal flow and work coefficients), efficiency kept
    assert c.volume_flow == pytest.approx(0.85 * ratio, rel=1e-12)
    assert c.flow_coefficient == pytest.approx(t.flow_coefficient, rel=1e-12)
    assert c.polytropic_head == pytest.approx(t.polytropic_head * ratio ** 2, rel=1e-12)
    assert c.polytropic_efficiency == t.polytropic_efficiency
    # gas power = rho_i q W_p / eta; methane density at 1.2 bar, 290 K by the ideal-gas law
    # (compressibility factor about 0.997 there: tolerance 0.5 %)
    rho_sp = 1.2e5 / (R_U / 0.016043 * 290.0)
    power = rho_sp * 0.85 * ratio * t.polytropic_head * ratio ** 2 / t.polytropic_efficiency
    assert c.power == pytest.approx(power, rel=5e-3)
    # the predicted discharge reaches the converted head along the polytropic path
    assert c.outlet_pressure > 1.2e5 and c.specific_volume_ratio > 1


def test_departures_outside_limits_give_the_verdict():
    cond, _ = argon_condition(flow=0.9)
    low_flow, _ = argon_condition(flow=0.9 * 0.94)  # flow coefficient ratio 1/0.94 > 1.04
    result = wb.compressor_similarity(low_flow, cond, diameter=D, width=B)
    checks = {c.parameter: c for c in result.checks}
    phi = checks["flow_coefficient"]
    assert phi.value == pytest.approx(0.94, rel=1e-12)
    assert not phi.within and phi.verdict == "outside limits"
    assert (phi.low, phi.high) == (0.96, 1.04)  # ASME PTC 10-1997 Table 3.2, from memory
    assert checks["specific_volume_ratio"].within
    assert not result.within_limits
    assert "flow coefficient" in result.verdict
    # the same departure accepted under a limit the user gives
    wide = wb.compressor_similarity(low_flow, cond, diameter=D, width=B,
                                    limits={"flow_coefficient": (0.9, 1.1)})
    assert wide.within_limits
    assert {c.parameter: c for c in wide.checks}["flow_coefficient"].source.startswith("limit")


def test_machine_mach_number_departure():
    # a CO2 test of a methane service at one speed: CO2's speed of sound (about 270 m/s) is
    # far below methane's (about 450 m/s), so the machine Mach number rises far beyond any limit
    spec = CompressorCondition(wb.Fluid("Methane"), 1.0e5, 300.0, 1.6e5, 350.0, 0.9, 1000.0)
    test = CompressorCondition(wb.Fluid("CarbonDioxide"), 1.0e5, 300.0, 2.2e5, 370.0, 0.9,
                               1000.0)
    result = wb.compressor_similarity(test, spec, diameter=D, width=B)
    mach = {c.parameter: c for c in result.checks}["machine_mach_number"]
    assert mach.value > 0.25 and not mach.within


def test_type_1_condition_limits():
    cond, _ = argon_condition(speed=1000.0)
    fast, _ = argon_condition(speed=1030.0, flow=0.9 * 1.03)  # 3 % speed, phi kept
    result = wb.compressor_similarity(fast, cond, diameter=D, width=B, test_type="1")
    checks = {c.parameter: c for c in result.checks}
    # ASME PTC 10-1997 Table 3.1 (from memory): speed within 2 %
    assert checks["speed"].value == pytest.approx(0.03) and not checks["speed"].within
    assert checks["flow_coefficient"].within
    assert checks["molar_mass"].within
    # Type 2 does not check the speed itself
    assert "speed" not in {c.parameter for c in wb.compressor_similarity(
        fast, cond, diameter=D, width=B).checks}


def test_reynolds_correction_optional():
    cond, _ = argon_condition()
    high, _ = argon_condition(P1=4.0e5, P2=7.2e5)  # four times the density: Re x 4
    off = wb.compressor_similarity(cond, high, diameter=D, width=B)
    assert off.converted.polytropic_efficiency == off.test.polytropic_efficiency
    on = wb.compressor_similarity(cond, high, diameter=D, width=B, reynolds_correction=True,
                                  roughness=3.2e-6)
    # hand: (1 - eta_sp) = (1 - eta_t) RA_sp RB_sp / (RA_t RB_t), b in ft, e in inches
    # (the correction as recalled from PTC 10-1997, from memory)

    def RARB(Re):
        b, e = B / 0.3048, 3.2e-6 / 0.0254
        C = 0.988 / Re ** 0.243
        RA = 0.066 + 0.934 * (4.8e6 * b / Re) ** C
        RB = math.log10(0.000125 + 13.67 / Re) / math.log10(e + 13.67 / Re)
        return RA * RB

    Re_t, Re_sp = on.test.machine_reynolds_number, on.converted.machine_reynolds_number
    assert Re_sp / Re_t == pytest.approx(4.0, rel=5e-3)
    eta_t = on.test.polytropic_efficiency
    eta_sp = 1 - (1 - eta_t) * RARB(Re_sp) / RARB(Re_t)
    assert on.converted.polytropic_efficiency == pytest.approx(eta_sp, rel=1e-12)
    assert eta_sp > eta_t  # a higher Reynolds number raises the efficiency
    assert on.converted.work_coefficient == pytest.approx(
        on.test.work_coefficient * eta_sp / eta_t, rel=1e-12)
    assert reynolds_factor(Re_t, B, 3.2e-6) == pytest.approx(RARB(Re_t))


def test_uncertainty_of_the_converted_figures():
    cond, _ = argon_condition()
    # closed forms: the converted head W_t (N_sp/N_t)^2 goes as N_t^-2 and the converted
    # power rho_sp q_t (N_sp/N_t) W / eta as q_t N_t^-3, so by ASME PTC 19.1
    # U95 = 2 sqrt(sum (theta b)^2) with theta = P/q (flow), 3 P/N (speed) and 2 W/N (head)
    result = wb.compressor_similarity(cond, cond, diameter=D, width=B,
                                      uncertainties={"volume_flow": (0.009, 0.0),
                                                     "speed": (2.0, 0.0)})
    u = result.uncertainty
    c = result.converted
    assert u.expanded["power"] == pytest.approx(
        2 * math.hypot(c.power / 0.9 * 0.009, 3 * c.power / 1000.0 * 2.0), rel=1e-4)
    assert u.expanded["polytropic_head"] == pytest.approx(
        2 * 2 * c.polytropic_head / 1000.0 * 2.0, rel=1e-4)
    assert u.expanded["polytropic_efficiency"] == pytest.approx(0.0, abs=1e-9)
    assert "converted_power_U95" in result.to_dict()


def test_refusals():
    cond, _ = argon_condition()
    with pytest.raises(wb.InputError, match="test type"):
        wb.compressor_similarity(cond, cond, diameter=D, width=B, test_type="3")
    with pytest.raises(wb.InputError, match="limit name"):
        wb.compressor_similarity(cond, cond, diameter=D, width=B, limits={"speed": (0, 1)})
    with pytest.raises(wb.InputError, match="low limit"):
        wb.compressor_similarity(cond, cond, diameter=D, width=B,
                                 limits={"flow_coefficient": (1.1, 0.9)})
    with pytest.raises(wb.InputError, match="impeller width"):
        wb.compressor_similarity(cond, cond, diameter=D, width=0.3)
    with pytest.raises(wb.InputError, match="uncertainty reading"):
        wb.compressor_similarity(cond, cond, diameter=D, width=B,
                                 uncertainties={"torque": (1, 0)})
    with pytest.raises(wb.InputError, match="discharge pressure"):
        CompressorCondition(ARGON, 2e5, 300.0, 1e5, 300.0, 1.0, 1000.0)
    with pytest.raises(wb.InputError, match="gas must be"):
        CompressorCondition("Argon", 1e5, 300.0, 2e5, 380.0, 1.0, 1000.0)
    with pytest.raises(wb.InputError, match="test condition"):
        wb.compressor_similarity(42, cond, diameter=D, width=B)
    # a discharge temperature too low for the pressure ratio: an impossible rating
    with pytest.raises(wb.ReadingsError, match="above 1"):
        wb.compressor_similarity(CompressorCondition(ARGON, 1e5, 300.0, 2e5, 305.0, 1.0,
                                                     1000.0), cond, diameter=D, width=B)
    # a dict condition with a gas name is accepted
    data = {"gas": "Argon", **cond.readings()}
    assert wb.compressor_similarity(data, cond, diameter=D, width=B).within_limits
