"""PerformanceCurve: fits against independent least squares and closed forms, affinity laws,
extrapolation refused, inputs refused by name."""

import numpy as np
import pytest

import workbench as wb
from workbench.curves import PerformanceCurve

Q = np.array([0.0, 0.02, 0.04, 0.06, 0.08, 0.10])


def parabola(q):
    """A pump head curve H = 52 - 1500 Q^2 [m] (invented)."""
    return 52.0 - 1500.0 * q ** 2


def efficiency(q):
    """A parabolic efficiency with its best point at 0.07 m3/s (invented)."""
    return 0.82 - 60.0 * (q - 0.07) ** 2


def make(fit="polynomial", degree=2, **kw):
    return PerformanceCurve(Q, parabola(Q), speed=150.0, efficiency=efficiency(Q),
                            power=1000.0 + 2e5 * Q, npsh_required=2.0 + 300 * Q ** 2,
                            fit=fit, degree=degree, **kw)


def test_quadratic_fit_reproduces_a_quadratic_exactly():
    # a least-squares polynomial of degree 2 through points of a parabola is that parabola
    # (closed form): residuals at rounding level and values between the points exact
    curve = make()
    assert curve.max_residual("head") < 1e-10
    q = np.linspace(0.0, 0.1, 17)
    np.testing.assert_allclose(curve.head(q), parabola(q), rtol=1e-12, atol=1e-10)
    np.testing.assert_allclose(curve.efficiency(q), efficiency(q), rtol=1e-12)


def test_polynomial_residuals_match_numpy_polyfit():
    # independent least squares: numpy.polyfit (Vandermonde lstsq) on scattered points
    rng = np.random.default_rng(4)
    head = parabola(Q) + rng.normal(0.0, 0.3, Q.size)
    curve = PerformanceCurve(Q, head, speed=150.0, degree=2)
    coeffs = np.polyfit(Q, head, 2)
    expected = np.polyval(coeffs, Q) - head
    np.testing.assert_allclose(curve.residuals["head"], expected, atol=1e-9)
    assert curve.rms_residual() == pytest.approx(np.sqrt(np.mean(expected ** 2)), rel=1e-9)
    # the fit reproduces each datasheet point within its stated largest residual
    assert np.all(np.abs(curve.head(Q) - head) <= curve.max_residual() + 1e-12)


def test_pchip_passes_through_points_and_is_monotone():
    # PCHIP interpolates (Fritsch and Carlson 1980): zero residuals, and a monotone data set
    # gives a monotone curve between the points
    head = np.array([50.0, 49.5, 47.0, 41.0, 33.0, 22.0])
    curve = PerformanceCurve(Q, head, speed=150.0, fit="pchip")
    assert curve.max_residual() < 1e-12
    values = curve.head(np.linspace(0.0, 0.1, 401))
    assert np.all(np.diff(values) <= 1e-12)


@pytest.mark.parametrize("fit", ["polynomial", "pchip"])
def test_affinity_laws_closed_form(fit):
    # affinity laws (common practice): Q ~ N, H ~ N^2, P ~ N^3, efficiency kept, NPSHr ~ N^2
    curve = make(fit=fit, degree=2, min_flow=0.03)
    r = 1200.0 / 1480.0
    new = curve.at_speed(150.0 * r)
    np.testing.assert_allclose(new.flow, Q * r)
    np.testing.assert_allclose(new.points("head"), parabola(Q) * r ** 2)
    np.testing.assert_allclose(new.points("power"), (1000.0 + 2e5 * Q) * r ** 3)
    np.testing.assert_allclose(new.points("efficiency"), efficiency(Q))
    np.testing.assert_allclose(new.points("npsh_required"), (2.0 + 300 * Q ** 2) * r ** 2)
    q = np.linspace(0.0, 0.1, 9)
    np.testing.assert_allclose(new.head(q * r), curve.head(q) * r ** 2, rtol=1e-9)
    np.testing.assert_allclose(new.efficiency(q * r), curve.efficiency(q), rtol=1e-9)
    assert new.min_flow == pytest.approx(0.03 * r)
    assert new.speed == pytest.approx(150.0 * r)


def test_speed_as_rpm_quantity():
    # 1480 rpm = 1480 * 2 pi / 60 rad/s (definition of the revolution)
    curve = PerformanceCurve(Q, parabola(Q), speed=wb.Q_(1480, "rpm"))
    assert curve.speed == pytest.approx(1480 * 2 * np.pi / 60)


def test_extrapolation_refused_unless_asked():
    curve = make()
    with pytest.raises(wb.InputError, match="outside the flow range"):
        curve.head(0.11)
    with pytest.raises(wb.InputError, match="outside the flow range"):
        curve.efficiency([0.05, 0.2])
    # asked for: the fitted parabola continued (closed form)
    assert curve.head(0.12, extrapolate=True) == pytest.approx(parabola(0.12), rel=1e-9)
    with pytest.raises(wb.InputError, match="extrapolate"):
        curve.head(0.05, extrapolate="yes")


def test_surge_margin_definition():
    # (Q - Q_surge) / Q at the same speed (common practice)
    curve = make(min_flow=0.03)
    assert curve.surge_margin(0.06) == pytest.approx((0.06 - 0.03) / 0.06)
    assert curve.surge_margin(0.02) < 0


def test_best_efficiency_flow():
    # the parabola's vertex at 0.07 m3/s (closed form)
    assert make().best_efficiency_flow() == pytest.approx(0.07, abs=1e-6)


def test_quantities_in_other_units():
    # 1 m3/h = 1/3600 m3/s; 1 ft = 0.3048 m (NIST SP 811)
    curve = PerformanceCurve(wb.Q_(Q * 3600, "m**3/h"), wb.Q_(parabola(Q) / 0.3048, "ft"),
                             speed=150.0, degree=2)
    assert curve.head(0.05) == pytest.approx(parabola(0.05), rel=1e-9)


def test_case_round_trip():
    curve = make(min_flow=0.02)
    again = PerformanceCurve.from_dict(curve.to_dict())
    assert again.head(0.05) == pytest.approx(curve.head(0.05))
    assert again.min_flow == curve.min_flow
    with pytest.raises(wb.CaseFileError, match="unknown curve keys"):
        PerformanceCurve.from_dict({**curve.to_dict(), "colour": "red"})
    with pytest.raises(wb.CaseFileError):
        PerformanceCurve.from_dict([1, 2])


@pytest.mark.parametrize("kwargs, match", [
    (dict(flow=[0.0, 0.02, 0.02], head=[3, 2, 1]), "increase"),
    (dict(flow=[0.0, 0.02], head=[3, 2]), "at least 3"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2]), "one value per flow"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, -1]), "positive"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], degree=3), "fit degree"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], degree=True), "fit degree"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], fit="spline"), "curve fit"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], machine="turbine"), "machine kind"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], speed=0.0), "curve speed"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], speed=True), "curve speed"),
    (dict(flow=[0.0, 0.02, float("nan")], head=[3, 2, 1]), "curve flow"),
    (dict(flow="0.1 0.2", head=[3, 2, 1]), "curve flow"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], efficiency=[0.5, 1.2, 0.6]),
     "efficiency"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], min_flow=0.05), "minimum flow limit"),
    (dict(flow=[0.0, 0.02, 0.04], head=[3, 2, 1], min_flow=0.03, max_flow=0.02),
     "below the maximum"),
    (dict(flow=[0.0, 0.02, 0.04], head=wb.Q_([3, 2, 1], "bar")), "pump total head"),
])
def test_refusals_name_the_input(kwargs, match):
    kwargs.setdefault("speed", 150.0)
    flow, head = kwargs.pop("flow"), kwargs.pop("head")
    with pytest.raises(wb.InputError, match=match):
        PerformanceCurve(flow, head, **kwargs)


def test_missing_quantity_and_bad_speed_ratio():
    curve = PerformanceCurve(Q, parabola(Q), speed=150.0)
    with pytest.raises(wb.InputError, match="no efficiency"):
        curve.efficiency(0.05)
    with pytest.raises(wb.InputError, match="curve quantity"):
        curve.value("torque", 0.05)
    with pytest.raises(wb.InputError, match="new speed"):
        curve.at_speed(1e4)
