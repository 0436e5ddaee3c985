"""Unit handling against published conversion factors.

Reference: NIST Special Publication 811 (2008), Guide for the Use of the SI, appendix B.
"""

import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.units import UNIT_SYSTEMS, to_si


def test_to_si_quantities():
    Q = wb.Q_
    assert to_si(Q(1, "psi"), "pressure", "p") == pytest.approx(6894.757, rel=1e-6)  # SP 811
    assert to_si(Q(1, "Btu/lb"), "specific_enthalpy", "h") == pytest.approx(2326.0, rel=1e-6)
    assert to_si(Q(1, "hp"), "power", "P") == pytest.approx(745.6999, rel=1e-6)  # mechanical hp
    assert to_si(Q(32, "degF"), "temperature", "T") == pytest.approx(273.15)
    assert to_si(Q(3600, "kg/h"), "mass_flow", "m") == pytest.approx(1.0)


def test_wrong_dimension_names_input():
    with pytest.raises(InputError, match="inlet pressure"):
        to_si(wb.Q_(3, "kg"), "pressure", "inlet pressure")


@pytest.mark.parametrize("bad", ["1e5", None, float("inf"), True])
def test_non_numbers_refused(bad):
    with pytest.raises(InputError, match="mass flow"):
        to_si(bad, "mass_flow", "mass flow")


def test_gauge_pressure_round_trip():
    system = UNIT_SYSTEMS["bar(g), degC"]
    # 5 bar absolute with ambient 1.01325 bar is 3.98675 bar(g)
    assert system.from_si(5e5, "pressure", ambient_pressure=101325.0) == pytest.approx(3.98675)
    assert system.to_si(3.98675, "pressure", ambient_pressure=101325.0) == pytest.approx(5e5)


def test_us_customary_display():
    us = UNIT_SYSTEMS["US customary"]
    assert us.from_si(1e5, "pressure") == pytest.approx(14.50377, rel=1e-6)  # SP 811
    assert us.from_si(373.15, "temperature") == pytest.approx(212.0)
    assert us.to_si(212.0, "temperature") == pytest.approx(373.15)


def test_one_rpm_in_radians_per_second():
    from workbench.units import RPM

    # SP 811 appendix B: 1 r/min = 2 pi / 60 rad/s = 0.104 719 755 rad/s; pint agrees
    assert RPM == pytest.approx(0.10471975512, rel=1e-11)
    assert wb.Q_(1, "rpm").to("rad/s").magnitude == pytest.approx(RPM, rel=1e-12)


@pytest.mark.parametrize("text,ok", [
    ("12", True), ("-0.5", True), ("+.5", True), ("3.2e5", True), ("1E-3", True),
    ("7.", True), ("", False), ("1,5", False), ("1e", False), ("abc", False),
    ("nan", False), ("inf", False), ("1.2.3", False), ("--1", False), (" 1", False),
])
def test_number_text_accepts_plain_decimal_numbers_only(text, ok):
    from workbench.units import NUMBER_TEXT

    assert bool(NUMBER_TEXT.fullmatch(text)) is ok
    if ok:
        float(text)  # everything accepted converts
