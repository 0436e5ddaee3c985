"""Tests of workbench.fieldtest.design: affinity laws against their closed form
(Q ~ N, H ~ N^2, P ~ N^3, common practice; ISO 9906) and deviations from a design point."""

import numpy as np
import pandas as pd
import pytest

from workbench.errors import InputError
from workbench.fieldtest import DesignPoint, affinity_correction, compare_with_design


def test_affinity_laws_closed_form():
    # Source: affinity laws (common practice, ISO 9906 translation to specified speed)
    speed = np.array([2800.0, 2950.0, 3100.0])
    q = np.array([0.050, 0.052, 0.055])
    h = np.array([900.0, 1000.0, 1100.0])
    p = np.array([60e3, 66e3, 74e3])
    corr = affinity_correction(speed, 2950.0, q, h, p)
    r = 2950.0 / speed
    np.testing.assert_allclose(corr.volume_flow, q * r, rtol=1e-15)
    np.testing.assert_allclose(corr.head, h * r * r, rtol=1e-15)
    np.testing.assert_allclose(corr.power, p * r * r * r, rtol=1e-15)
    # hydraulic efficiency rho g Q H / P is unchanged by the affinity laws
    np.testing.assert_allclose(corr.volume_flow * corr.head / corr.power, q * h / p, rtol=1e-12)
    # at rated speed nothing changes
    same = affinity_correction(2950.0, 2950.0, 0.05, 900.0, 60e3)
    assert float(same.power) == 60e3 and float(same.head) == 900.0
    with pytest.raises(InputError, match="rated speed"):
        affinity_correction(speed, -1.0, q)


def test_compare_with_design_points_and_percent():
    # Source: definitions: deviation in points = 100 (eta - eta_d); percent = 100 (x/x_d - 1)
    results = pd.DataFrame({"isentropic_efficiency": [0.80, 0.78], "power": [1.0e6, 1.1e6],
                            "inlet_volume_flow": [2.0, 2.1], "isentropic_head": [5e4, 5.2e4]})
    design = DesignPoint(isentropic_efficiency=0.79, power=1.05e6, volume_flow=2.0, head=5e4)
    out = compare_with_design(results, design)
    np.testing.assert_allclose(out["efficiency_deviation_points"], [1.0, -1.0], atol=1e-12)
    np.testing.assert_allclose(out["power_deviation_percent"],
                               [100 * (1.0 / 1.05 - 1), 100 * (1.1 / 1.05 - 1)], rtol=1e-12)
    np.testing.assert_allclose(out["flow_deviation_percent"], [0.0, 5.0], atol=1e-12)
    assert "corrected_power" not in out


def test_compare_with_design_corrects_speed_first():
    # Source: affinity laws (common practice): a pump run at 10 % over speed on its design
    # curve scales back exactly onto the design point
    rated = 1480.0
    design = DesignPoint(isentropic_efficiency=0.82, power=200e3, volume_flow=0.30, head=600.0,
                         speed=rated)
    k = 1.1
    results = pd.DataFrame({"speed": [rated * k], "inlet_volume_flow": [0.30 * k],
                            "isentropic_head": [600.0 * k ** 2], "power": [200e3 * k ** 3],
                            "isentropic_efficiency": [0.82]})
    out = compare_with_design(results, design)
    for col in ("power_deviation_percent", "flow_deviation_percent", "head_deviation_percent",
                "efficiency_deviation_points"):
        assert out.loc[0, col] == pytest.approx(0.0, abs=1e-9)
    assert out.loc[0, "corrected_power"] == pytest.approx(200e3, rel=1e-12)


def test_pump_readings_to_rated_speed_end_to_end():
    # Source: incompressible-liquid closed form (common practice): pump head H = dp / (rho g),
    # hydraulic power = rho g Q H = Q dp; rho of water at 1 bar, 20 degC = 998.2 kg/m^3
    # (handbook value, from memory); then the affinity laws to the rated speed.
    import workbench as wb
    from workbench.fieldtest import evaluate

    water = wb.Fluid("Water")
    frame = pd.DataFrame({"inlet_pressure": [1.0e5, 1.0e5], "inlet_temperature": [293.15] * 2,
                          "outlet_pressure": [9.0e5, 10.0e5], "volume_flow": [0.050, 0.053],
                          "power": [55e3, 63e3], "speed": [2900.0, 3050.0]})
    out = evaluate(frame, "pump", water, results=("pump_head", "power", "isentropic_efficiency",
                                                    "inlet_volume_flow", "mass_flow"))
    assert (out["status"] == "ok").all(), out["message"].tolist()
    dp = frame["outlet_pressure"] - frame["inlet_pressure"]
    np.testing.assert_allclose(out["pump_head"], dp / (998.2 * 9.80665), rtol=2e-3)
    np.testing.assert_allclose(out["isentropic_efficiency"],
                               frame["volume_flow"] * dp / frame["power"], rtol=3e-3)
    design = DesignPoint(isentropic_efficiency=0.75, power=60e3, volume_flow=0.052, head=85.0,
                         speed=2950.0)
    dev = compare_with_design(out, design, head_column="pump_head")
    r = 2950.0 / frame["speed"]
    np.testing.assert_allclose(dev["corrected_volume_flow"], frame["volume_flow"] * r,
                               rtol=1e-12)
    np.testing.assert_allclose(dev["corrected_power"], out["power"] * r ** 3, rtol=1e-12)
    np.testing.assert_allclose(dev["head_deviation_percent"],
                               100 * (out["pump_head"] * r ** 2 / 85.0 - 1), rtol=1e-12)


def test_design_point_takes_quantities_and_refuses_bad_values_by_name():
    # Quantities are converted at the input boundary (NIST SP 811: 1 MW = 1e6 W,
    # 1 m^3/h = 1/3600 m^3/s; 1 revolution/second = 60 rev/min by definition).
    from decimal import Decimal

    from workbench.units import Q_

    design = DesignPoint(power=Q_(1.1, "MW"), volume_flow=Q_(360.0, "m**3/h"),
                         head=Q_(85.0, "m"), speed=Q_(50.0, "revolution/second"),
                         isentropic_efficiency=Decimal("0.8"))
    assert design.power == pytest.approx(1.1e6, rel=1e-12)
    assert design.volume_flow == pytest.approx(0.1, rel=1e-12)
    assert design.head == 85.0 and design.speed == pytest.approx(3000.0, rel=1e-12)
    assert design.isentropic_efficiency == 0.8
    assert DesignPoint(head=Q_(50.0, "kJ/kg")).head == pytest.approx(5e4, rel=1e-12)
    for kwargs, message in [
        (dict(power=Q_(1.1, "bar")), "design power was given in bar"),
        (dict(power=0.0), "design power 0 W is outside the allowed range above 0"),
        (dict(power=float("nan")), "design power must be a finite number"),
        (dict(isentropic_efficiency=1.2), "design isentropic efficiency 1.2"),
        (dict(speed=Q_(50.0, "Hz")), "design speed was given in Hz"),
        (dict(volume_flow="2"), "design volume flow must be a number"),
        (dict(head=True), "design head must be a number"),
    ]:
        with pytest.raises(InputError, match=message):
            DesignPoint(**kwargs)


def test_affinity_correction_takes_quantities_and_checks_lengths():
    # Affinity laws (common practice, ISO 9906) with the readings given as Quantities.
    from workbench.units import Q_

    corr = affinity_correction(Q_([2900.0], "rpm"), Q_(2950.0, "rpm"),
                               power=Q_([60.0], "kW"), head=Q_([80.0], "m"))
    r = 2950.0 / 2900.0
    assert corr.power[0] == pytest.approx(60e3 * r ** 3, rel=1e-12)
    assert corr.head[0] == pytest.approx(80.0 * r ** 2, rel=1e-12)
    with pytest.raises(InputError, match="power has 2 values but speed has 1"):
        affinity_correction([2900.0], 2950.0, power=[1.0, 2.0])
    with pytest.raises(InputError, match="rated speed must be a number"):
        affinity_correction([2900.0], "fast")
    with pytest.raises(InputError, match="results must be a pandas DataFrame"):
        compare_with_design([1.0], DesignPoint(power=1.0))
