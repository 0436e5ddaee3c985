"""Tests of workbench.fieldtest.uncertainty against the ideal-gas closed form.

Closed form (ideal gas, constant heat-capacity ratio k): eta = (T2s - T1) / (T2 - T1) with
T2s = T1 (P2/P1)^((k-1)/k).  Partial derivatives derived by hand below.  Air at about 1 bar
and 293 K is close to an ideal gas with k = 1.400 (handbook value, from memory), so the
real-fluid machine path must agree with the closed form to a fraction of a percent.
"""

import math

import pandas as pd
import pytest

import workbench as wb
from workbench.errors import InputError
from workbench.fieldtest import (
    InstrumentUncertainty,
    monte_carlo_uncertainty,
    propagate_uncertainty,
)

K = 1.4  # heat-capacity ratio of air near 300 K, from memory (handbook value)
A = (K - 1) / K
P1, T1, P2 = 1.0e5, 293.15, 1.25e5
T2 = T1 + (T1 * (P2 / P1) ** A - T1) / 0.8  # outlet temperature for eta = 0.8 (closed form)
READINGS = dict(inlet_pressure=P1, inlet_temperature=T1, outlet_pressure=P2,
                outlet_temperature=T2, mass_flow=2.0)
# (systematic b, random s) standard uncertainties in SI units (invented instruments)
UNCERTAINTIES = dict(inlet_pressure=(100.0, 50.0), outlet_pressure=(100.0, 50.0),
                     inlet_temperature=(0.10, 0.05), outlet_temperature=(0.10, 0.05),
                     mass_flow=(0.01, 0.005))


def closed_form_eta(p1, t1, p2, t2):
    """Ideal-gas isentropic efficiency of compression (closed form)."""
    return (t1 * (p2 / p1) ** A - t1) / (t2 - t1)


def closed_form_model(frame):
    eta = closed_form_eta(frame["inlet_pressure"], frame["inlet_temperature"],
                          frame["outlet_pressure"], frame["outlet_temperature"])
    return pd.DataFrame({"status": "ok", "isentropic_efficiency": eta})


def analytic_sensitivities():
    """Hand-derived partial derivatives of eta (ideal gas)."""
    r = P2 / P1
    num = T1 * (r ** A - 1)
    den = T2 - T1
    return {
        "inlet_temperature": (r ** A - 1) / den + num / den ** 2,
        "outlet_temperature": -num / den ** 2,
        "outlet_pressure": T1 * A * r ** (A - 1) / P1 / den,
        "inlet_pressure": -T1 * A * r ** (A - 1) * P2 / P1 ** 2 / den,
        "mass_flow": 0.0,
    }


def analytic_u95(theta):
    # ASME PTC 19.1: U95 = 2 sqrt(b_R^2 + s_R^2), large-sample assumption
    b2 = sum((theta[n] * UNCERTAINTIES[n][0]) ** 2 for n in theta)
    s2 = sum((theta[n] * UNCERTAINTIES[n][1]) ** 2 for n in theta)
    return 2 * math.sqrt(b2 + s2), b2, s2


def test_central_differences_match_hand_derivatives_exactly():
    # Source: ideal-gas closed form, derivatives by hand
    rep = propagate_uncertainty(READINGS, UNCERTAINTIES, results=("isentropic_efficiency",),
                                model=closed_form_model)
    theta = analytic_sensitivities()
    for name, value in theta.items():
        assert rep.sensitivity["isentropic_efficiency"][name] == pytest.approx(
            value, rel=1e-6, abs=1e-12)
    u95, b2, s2 = analytic_u95(theta)
    assert rep.expanded["isentropic_efficiency"] == pytest.approx(u95, rel=1e-6)
    assert rep.systematic["isentropic_efficiency"] == pytest.approx(math.sqrt(b2), rel=1e-6)
    assert rep.random["isentropic_efficiency"] == pytest.approx(math.sqrt(s2), rel=1e-6)


def test_machine_path_matches_ideal_gas_sensitivities_for_air():
    # Source: ideal-gas closed form; air at 1 bar is ideal to ~0.1 %, k = 1.400 from memory
    rep = propagate_uncertainty(READINGS, UNCERTAINTIES,
                                results=("isentropic_efficiency", "power"),
                                machine="compressor", fluid=wb.Fluid("Air"))
    theta = analytic_sensitivities()
    assert rep.value["isentropic_efficiency"] == pytest.approx(0.8, abs=2e-3)
    for name in ("inlet_temperature", "outlet_temperature", "inlet_pressure", "outlet_pressure"):
        assert rep.sensitivity["isentropic_efficiency"][name] == pytest.approx(
            theta[name], rel=0.01)
    u95, _, _ = analytic_u95(theta)
    assert rep.expanded["isentropic_efficiency"] == pytest.approx(u95, rel=0.01)
    # Power of an ideal gas: W = m cp (T2 - T1); dW/dT2 = m cp, cp(air, 300 K) = 1005 J/(kg K)
    # (handbook value, from memory)
    assert rep.sensitivity["power"]["outlet_temperature"] == pytest.approx(2.0 * 1005, rel=0.01)
    # Shares add up to one; the dominant reading has the largest share
    for r in ("isentropic_efficiency", "power"):
        assert sum(rep.share[r].values()) == pytest.approx(1.0, rel=1e-9)
        assert rep.share[r][rep.dominant[r]] == max(rep.share[r].values())
    # Mass flow does not enter the efficiency but dominates nothing there
    assert rep.share["isentropic_efficiency"]["mass_flow"] == pytest.approx(0.0, abs=1e-12)


def test_dominant_reading_follows_the_largest_instrument_term():
    # Source: ideal-gas closed form; with a poor outlet thermometer it must dominate
    poor = dict(UNCERTAINTIES, outlet_temperature=InstrumentUncertainty(1.0, 0.2))
    rep = propagate_uncertainty(READINGS, poor, results=("isentropic_efficiency",),
                                model=closed_form_model)
    assert rep.dominant["isentropic_efficiency"] == "outlet_temperature"
    theta = analytic_sensitivities()
    term = theta["outlet_temperature"] ** 2 * (1.0 ** 2 + 0.2 ** 2)
    assert rep.share["isentropic_efficiency"]["outlet_temperature"] == pytest.approx(
        term / (rep.combined["isentropic_efficiency"] ** 2), rel=1e-4)


def test_monte_carlo_agrees_with_propagation_closed_form():
    # N = 4000 draws, seed 1: the relative sampling error of a standard deviation is
    # 1/sqrt(2 (N-1)) = 1.1 %; allow 3 of them plus 0.5 % for the nonlinearity.
    mc = monte_carlo_uncertainty(READINGS, UNCERTAINTIES, results=("isentropic_efficiency",),
                                 samples=4000, seed=1, model=closed_form_model)
    rep = propagate_uncertainty(READINGS, UNCERTAINTIES, results=("isentropic_efficiency",),
                                model=closed_form_model)
    tol = 3 * mc.relative_standard_error + 0.005
    assert mc.expanded["isentropic_efficiency"] == pytest.approx(
        rep.expanded["isentropic_efficiency"], rel=tol)
    assert mc.samples == 4000 and mc.failed == 0


def test_monte_carlo_agrees_with_propagation_machine_path():
    # N = 1500 draws of a real-air compressor, seed 7; tolerance 3 relative standard errors
    # (3/sqrt(2 (N-1)) = 5.5 %) plus 0.5 %.
    fluid = wb.Fluid("Air")
    results = ("isentropic_efficiency", "power")
    mc = monte_carlo_uncertainty(READINGS, UNCERTAINTIES, results=results, samples=1500,
                                 seed=7, machine="compressor", fluid=fluid)
    rep = propagate_uncertainty(READINGS, UNCERTAINTIES, results=results,
                                machine="compressor", fluid=fluid)
    tol = 3 * mc.relative_standard_error + 0.005
    for r in results:
        assert mc.expanded[r] == pytest.approx(rep.expanded[r], rel=tol)
        # the mean of the draws sits on the nominal value within its own sampling error
        assert abs(mc.mean[r] - rep.value[r]) < 4 * mc.standard_deviation[r] / math.sqrt(
            mc.samples) + 1e-3 * mc.standard_deviation[r]


def test_bad_inputs_are_refused_with_a_message():
    with pytest.raises(InputError, match="systematic uncertainty of inlet_pressure -1 Pa is "
                                         "outside the allowed range at least 0"):
        propagate_uncertainty(READINGS, dict(inlet_pressure=(-1.0, 0.0)),
                              model=closed_form_model, results=("isentropic_efficiency",))
    with pytest.raises(InputError, match="not readings"):
        propagate_uncertainty(READINGS, dict(speed=(1.0, 0.0)), model=closed_form_model,
                              results=("isentropic_efficiency",))
    reversed_readings = dict(READINGS, outlet_pressure=0.9e5)
    with pytest.raises(InputError, match="nominal readings did not evaluate"):
        propagate_uncertainty(reversed_readings, UNCERTAINTIES, machine="compressor",
                              fluid=wb.Fluid("Air"))
    with pytest.raises(InputError,
                       match=r"samples 3 is outside the allowed range \[10, 1e\+06\]"):
        monte_carlo_uncertainty(READINGS, UNCERTAINTIES, samples=3, model=closed_form_model,
                                results=("isentropic_efficiency",))


def test_quantities_are_accepted_and_bad_values_refused_by_name():
    # Readings and uncertainties as Quantities give the same report as SI numbers (NIST
    # SP 811: 1 bar = 1e5 Pa; a temperature uncertainty is a difference, 1 delta_degC = 1 K).
    from workbench.units import Q_

    si = propagate_uncertainty(READINGS, UNCERTAINTIES, model=closed_form_model,
                               results=("isentropic_efficiency",))
    readings = {k: (Q_(v / 1e5, "bar") if k.endswith("pressure") else v)
                for k, v in READINGS.items()}
    uncertainties = {k: ((Q_(b / 1e5, "bar"), Q_(s / 1e5, "bar")) if k.endswith("pressure")
                         else (Q_(b, "delta_degC"), s) if k.endswith("temperature") else (b, s))
                     for k, (b, s) in UNCERTAINTIES.items()}
    q = propagate_uncertainty(readings, uncertainties, model=closed_form_model,
                              results="isentropic_efficiency")
    assert q.combined["isentropic_efficiency"] == pytest.approx(
        si.combined["isentropic_efficiency"], rel=1e-9)
    for readings_, uncertainties_, message in [
        (dict(READINGS, inlet_pressure=Q_(1.0, "m")), UNCERTAINTIES,
         "reading inlet_pressure was given in m"),
        (dict(READINGS, inlet_pressure="1 bar"), UNCERTAINTIES,
         "reading inlet_pressure must be a number"),
        (dict(READINGS, inlet_pressure=float("nan")), UNCERTAINTIES,
         "reading inlet_pressure must be a finite number"),
        (READINGS, dict(UNCERTAINTIES, inlet_temperature=(Q_(0.5, "degC"), 0.0)),
         "unit with an offset"),
        (READINGS, dict(UNCERTAINTIES, inlet_pressure=5.0),
         "uncertainty of inlet_pressure must be"),
        ([1.0], UNCERTAINTIES, "readings must be a dict"),
    ]:
        with pytest.raises(InputError, match=message):
            propagate_uncertainty(readings_, uncertainties_, model=closed_form_model,
                                  results=("isentropic_efficiency",))
    with pytest.raises(InputError, match="step_fraction"):
        propagate_uncertainty(READINGS, UNCERTAINTIES, model=closed_form_model,
                              step_fraction=0.0)
    with pytest.raises(InputError, match="seed must be a whole number"):
        monte_carlo_uncertainty(READINGS, UNCERTAINTIES, model=closed_form_model, seed="x")
