"""pump_acceptance after ISO 9906:2012 against hand computations on invented test points.

Tolerance factors of ISO 9906:2012 Table 8, recalled from memory (written out here
independently of the module): grade: (t_Q-, t_Q+, t_H-, t_H+, t_P, t_eta)."""

import math

import numpy as np
import pytest

import workbench as wb
from workbench.curves import GRADES

G = 9.80665  # standard gravity [m/s2]
RHO = 998.0
TABLE_8 = {  # ISO 9906:2012 Table 8, from memory
    "1U": (0.0, 0.10, 0.0, 0.06, 0.10, 0.0),
    "1E": (-0.05, 0.05, -0.03, 0.03, 0.04, 0.0),
    "1B": (-0.05, 0.05, -0.03, 0.03, 0.04, -0.03),
    "2B": (-0.08, 0.08, -0.05, 0.05, 0.08, -0.05),
    "2U": (0.0, 0.16, 0.0, 0.10, 0.16, -0.05),
    "3B": (-0.09, 0.09, -0.07, 0.07, 0.09, -0.07),
}
N_RATED = 1480 * 2 * math.pi / 60
N_TEST = 1450 * 2 * math.pi / 60
QG, HG, ETA_G = 0.05, 40.0, 0.78


def translated_curve(dH):
    """Invented test result at rated speed: H = a - b Q^2 passing (QG, HG (1 + dH)),
    efficiency a parabola peaking at 0.80 at Q = 0.055 m3/s."""
    b = 5000.0
    a = HG * (1 + dH) + b * QG ** 2
    return (lambda q: a - b * q ** 2), (lambda q: 0.80 - 40.0 * (q - 0.055) ** 2), a, b


def run(dH, grade="2B", **kw):
    head, eta, a, b = translated_curve(dH)
    QT = np.linspace(0.02, 0.08, 7)
    r = N_RATED / N_TEST
    Q, H = QT / r, head(QT) / r ** 2  # the points as measured at the test speed
    P = RHO * G * Q * H / eta(QT)    # power input at the test speed (efficiency kept)
    result = wb.pump_acceptance(Q, H, test_speed=N_TEST, rated_speed=N_RATED, guarantee_flow=QG,
                                guarantee_head=HG, guarantee_efficiency=ETA_G, test_power=P,
                                grade=grade, density=RHO, **kw)
    return result, head, eta, a, b


@pytest.mark.parametrize("grade", sorted(TABLE_8))
def test_tolerance_cross_by_hand(grade):
    tq_lo, tq_hi, th_lo, th_hi, t_p, t_eta = TABLE_8[grade]
    g = GRADES[grade]
    assert (g.flow, g.head, g.power, g.efficiency) == ((tq_lo, tq_hi), (th_lo, th_hi), t_p,
                                                       t_eta)
    result = run(0.0, grade)[0]
    # the cross around the guarantee point: QG (1 + t_Q), HG (1 + t_H)
    expected = (QG * (1 + tq_lo), QG * (1 + tq_hi), HG * (1 + th_lo), HG * (1 + th_hi))
    np.testing.assert_allclose(result.cross, expected, rtol=1e-12)


def test_translation_to_rated_speed():
    # ISO 9906 translation: Q (n_sp/n), H (n_sp/n)^2, P (n_sp/n)^3, efficiency kept
    result, head, eta, *_ = run(0.0)
    r = N_RATED / N_TEST
    QT = np.linspace(0.02, 0.08, 7)
    np.testing.assert_allclose(result.flow, QT, rtol=1e-12)
    np.testing.assert_allclose(result.head, head(QT), rtol=1e-12)
    np.testing.assert_allclose(result.efficiency, eta(QT), rtol=1e-12)
    P_test = RHO * G * (QT / r) * (head(QT) / r ** 2) / eta(QT)
    np.testing.assert_allclose(result.power, P_test * r ** 3, rtol=1e-12)


@pytest.mark.parametrize("dH, grade, verdict", [
    (0.0, "1B", "pass"), (0.02, "1B", "pass"), (-0.04, "1B", "fail"), (-0.04, "2B", "pass"),
    (-0.06, "2B", "fail"), (-0.06, "3B", "pass"), (-0.01, "1U", "fail"), (0.05, "1U", "pass"),
    (0.09, "2U", "pass"), (0.12, "2U", "fail"),
])
def test_flow_head_verdict_and_margin_by_hand(dH, grade, verdict):
    result, head, eta, a, b = run(dH, grade)
    tq_lo, tq_hi, th_lo, th_hi, *_ = TABLE_8[grade]
    # head at QG is HG (1 + dH) by construction; the flow at HG solves a - b Q^2 = HG
    q_at_hg = math.sqrt((a - HG) / b)
    dQ = q_at_hg / QG - 1
    assert result.head_deviation == pytest.approx(dH, abs=1e-9)
    assert result.flow_deviation == pytest.approx(dQ, rel=1e-7)
    head_ok = th_lo <= dH <= th_hi
    flow_ok = tq_lo <= dQ <= tq_hi
    assert result.flow_head_passes == (head_ok or flow_ok)
    margin = max(min(dH - th_lo, th_hi - dH), min(dQ - tq_lo, tq_hi - dQ))
    assert result.flow_head_margin == pytest.approx(margin, abs=1e-7)
    assert result.verdict == verdict


def test_efficiency_read_on_the_line_through_the_origin():
    # ISO 9906: efficiency read where H = (HG/QG) Q meets the test curve; with a - b Q^2:
    # Q = (-s + sqrt(s^2 + 4 a b)) / (2 b), s = HG/QG (quadratic formula)
    result, head, eta, a, b = run(0.03, "1B")
    s = HG / QG
    q = (-s + math.sqrt(s * s + 4 * a * b)) / (2 * b)
    assert result.check_flow == pytest.approx(q, rel=1e-9)
    assert result.test_efficiency == pytest.approx(eta(q), rel=1e-9)
    t_eta = TABLE_8["1B"][5]
    assert result.efficiency_margin == pytest.approx((eta(q) - ETA_G * (1 + t_eta)) / ETA_G,
                                                     rel=1e-7)
    assert result.efficiency_passes


def test_efficiency_guarantee_failed():
    # grade 2B: the lowest acceptable efficiency 0.86 (1 - 0.05) = 0.817 exceeds the test
    # curve's peak of 0.80, so the efficiency guarantee fails wherever it is read
    head, eta, *_ = translated_curve(0.0)
    QT = np.linspace(0.02, 0.08, 7)
    result = wb.pump_acceptance(QT, head(QT), test_speed=N_RATED, rated_speed=N_RATED,
                                guarantee_flow=QG, guarantee_head=HG, guarantee_efficiency=0.86,
                                test_efficiency=eta(QT), grade="2B")
    assert result.flow_head_passes and not result.efficiency_passes
    assert result.verdict == "fail"


def test_power_guarantee():
    result, head, eta, a, b = run(0.0, "2B", guarantee_power=30e3)
    q = result.check_flow
    power = RHO * G * q * head(q) / eta(q)  # hydraulic power over efficiency at rated speed
    # the fitted power curve is a least-squares quadratic of rho g Q H / eta: close, not exact
    assert result.test_power == pytest.approx(power, rel=2e-3)
    assert result.power_margin == pytest.approx((30e3 * 1.08 - result.test_power) / 30e3,
                                                rel=1e-9)


def test_refusals():
    QT = np.linspace(0.02, 0.08, 7)
    head, eta, *_ = translated_curve(0.0)
    base = dict(test_speed=N_TEST, rated_speed=N_RATED, guarantee_flow=QG, guarantee_head=HG)
    with pytest.raises(wb.InputError, match="acceptance grade"):
        wb.pump_acceptance(QT, head(QT), grade="2C", **base)
    with pytest.raises(wb.SpecificationError, match="outside the translated test flows"):
        wb.pump_acceptance(QT, head(QT), **{**base, "guarantee_flow": 0.2})
    with pytest.raises(wb.SpecificationError, match="not both"):
        wb.pump_acceptance(QT, head(QT), test_power=QT * 1e6, test_efficiency=eta(QT), **base)
    with pytest.raises(wb.SpecificationError, match="power guarantee"):
        wb.pump_acceptance(QT, head(QT), guarantee_power=1e4, **base)
    with pytest.raises(wb.InputError, match="test head"):
        wb.pump_acceptance(QT, head(QT)[:3], **base)
    with pytest.raises(wb.InputError, match="guarantee head"):
        wb.pump_acceptance(QT, head(QT), **{**base, "guarantee_head": float("nan")})
    with pytest.raises(wb.InputError, match="efficiency would exceed 1"):
        wb.pump_acceptance(QT, head(QT), test_power=QT * 10.0, **base)


def test_speed_outside_translation_range_cautions():
    head, eta, *_ = translated_curve(0.0)
    QT = np.linspace(0.02, 0.08, 7)
    result = wb.pump_acceptance(QT * 0.4, head(QT) * 0.16, test_speed=0.4 * N_RATED,
                                rated_speed=N_RATED, guarantee_flow=QG, guarantee_head=HG)
    assert any("50 % to 120 %" in c for c in result.cautions)
    assert "verdict" in result.to_dict()
