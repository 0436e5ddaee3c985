"""Measurement uncertainty of test results: sensitivity propagation and Monte Carlo.

Each reading x_i carries a systematic standard uncertainty b_i and a random standard
uncertainty s_i (of the mean of the readings), both in the reading's SI unit.  Following ASME
PTC 19.1, the uncertainty of a result R(x_1 ... x_n) is propagated with the sensitivity
coefficients theta_i = dR/dx_i (here by numerical central differences through the same
evaluation as the batch)::

    b_R = sqrt(sum (theta_i b_i)^2),   s_R = sqrt(sum (theta_i s_i)^2)
    u_R = sqrt(b_R^2 + s_R^2),         U95 = 2 u_R

Assumptions (stated): the systematic errors of different readings are uncorrelated (no
shared calibration standard), the errors are small enough for a first-order expansion, and
the large-sample assumption holds (effective degrees of freedom large enough that the 95 %
coverage factor is 2).  The share of each reading in the result's variance is
theta_i^2 (b_i^2 + s_i^2) / u_R^2; the reading with the largest share dominates.

The Monte Carlo check draws every reading as x_i + b_i z + s_i z' (independent standard
normal z, z'), evaluates all draws in one batch, and reports the sample standard deviation;
its own relative sampling error is about 1 / sqrt(2 (N - 1)) for N draws.

References
----------
ASME PTC 19.1-2013, Test Uncertainty.
JCGM 101:2008, Evaluation of measurement data - Supplement 1 to the "Guide to the expression
of uncertainty in measurement" - Propagation of distributions using a Monte Carlo method.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError
from ..units import count, text, to_si
from .batch import evaluate
from .inputs import any_si, reading_value

#: Most readings or results an uncertainty study takes (a test has tens).
MAX_ITEMS = 1000


@dataclass(frozen=True)
class InstrumentUncertainty:
    """Standard uncertainties of one reading, in the reading's SI unit.

    Attributes
    ----------
    systematic : float
        Systematic standard uncertainty b (e.g. from calibration).
    random : float
        Random standard uncertainty s of the mean reading.
    """

    systematic: float = 0.0
    random: float = 0.0

    def __post_init__(self):
        # numbers or Quantities (in SI base units; temperatures as differences), not negative
        for name in ("systematic", "random"):
            object.__setattr__(self, name, any_si(getattr(self, name),
                                                  f"{name} uncertainty", low=0.0))

    @property
    def combined(self) -> float:
        """sqrt(b^2 + s^2), in the reading's unit."""
        return math.hypot(self.systematic, self.random)

    def to_dict(self) -> dict:
        """Fields as a dict."""
        return {"systematic": self.systematic, "random": self.random}


def _as_uncertainty(name, value) -> InstrumentUncertainty:
    """(systematic, random) of reading ``name`` in its SI unit, each not negative."""
    if isinstance(value, InstrumentUncertainty):
        return value
    if isinstance(value, (str, bytes, dict)) or not hasattr(value, "__len__") or len(value) != 2:
        raise InputError(f"uncertainty of {name} must be (systematic, random) or an "
                         f"InstrumentUncertainty, not {value!r:.60}")
    b, s = (reading_value(v, name, f"{what} uncertainty of {name}", difference=True, low=0.0)
            for v, what in zip(value, ("systematic", "random")))
    return InstrumentUncertainty(b, s)


@dataclass(frozen=True)
class UncertaintyReport:
    """Propagated uncertainty of each result (ASME PTC 19.1, large-sample assumption).

    All dicts are keyed by result name; inner dicts by reading name.  Units are those of each
    result (SI), shares are fractions.

    Attributes
    ----------
    value : dict
        Result at the nominal readings.
    sensitivity : dict
        dR/dx_i [result unit per reading unit].
    systematic : dict
        b_R, systematic standard uncertainty of the result.
    random : dict
        s_R, random standard uncertainty of the result.
    combined : dict
        u_R = sqrt(b_R^2 + s_R^2).
    expanded : dict
        U95 = 2 u_R.
    share : dict
        Share of the variance u_R^2 per reading [-].
    dominant : dict
        Reading with the largest share.
    """

    value: dict
    sensitivity: dict
    systematic: dict
    random: dict
    combined: dict
    expanded: dict
    share: dict
    dominant: dict

    def to_dict(self) -> dict:
        """Fields as nested dicts."""
        return {k: getattr(self, k) for k in ("value", "sensitivity", "systematic", "random",
                                              "combined", "expanded", "share", "dominant")}

    def to_frame(self) -> pd.DataFrame:
        """One row per result: value, b, s, u, U95 and the dominant reading."""
        return pd.DataFrame({
            "value": self.value, "systematic": self.systematic, "random": self.random,
            "combined": self.combined, "U95": self.expanded, "dominant_reading": self.dominant,
        })


@dataclass(frozen=True)
class MonteCarloReport:
    """Monte Carlo uncertainty of each result.

    Attributes
    ----------
    mean, standard_deviation : dict
        Sample mean and standard deviation of each result (result units).
    expanded : dict
        2 x standard deviation (comparable with the propagated U95).
    interval : dict
        (2.5 %, 97.5 %) percentiles of each result.
    samples : int
        Number of draws that evaluated.
    failed : int
        Number of draws whose row did not evaluate (status not ok).
    relative_standard_error : float
        Approximate relative sampling error of a standard deviation, 1/sqrt(2 (N - 1)).
    """

    mean: dict
    standard_deviation: dict
    expanded: dict
    interval: dict
    samples: int
    failed: int
    relative_standard_error: float

    def to_dict(self) -> dict:
        """Fields as a dict."""
        return {k: getattr(self, k) for k in ("mean", "standard_deviation", "expanded",
                                              "interval", "samples", "failed",
                                              "relative_standard_error")}


def _results(results) -> tuple:
    """Result names as a tuple of text (one name may be given alone)."""
    if isinstance(results, str):
        results = (results,)
    if not hasattr(results, "__iter__") or isinstance(results, (bytes, dict)):
        raise InputError(f"results must be a list of result names, not {results!r:.60}")
    results = tuple(results)
    if not results or len(results) > MAX_ITEMS:
        raise InputError(f"results must name 1 to {MAX_ITEMS} results, not {len(results)}")
    return tuple(text(r, "result name") for r in results)


def _model(model, results, evaluate_options):
    if model is not None:
        if not callable(model):
            raise InputError(f"model must be a function of a readings frame, not "
                             f"{type(model).__name__}")
        return model

    def run(frame):
        return evaluate(frame, results=results, keep_inputs=False, **evaluate_options)

    return run


def _checked(readings, uncertainties):
    """Readings in SI units (rev/min for the speed) and their uncertainties, by name."""
    for label, given in (("readings", readings), ("uncertainties", uncertainties)):
        if not isinstance(given, dict):
            raise InputError(f"{label} must be a dict of reading name -> value, not "
                             f"{type(given).__name__}")
        if len(given) > MAX_ITEMS:
            raise InputError(f"{label} has {len(given)} entries, at most {MAX_ITEMS}")
    if not readings:
        raise InputError("readings is empty: give the nominal value of each reading")
    readings = {text(k, "reading name"): reading_value(v, k, f"reading {k}")
                for k, v in readings.items()}
    unknown = [str(k) for k in uncertainties if k not in readings]
    if unknown:
        raise InputError(f"uncertainty given for {', '.join(unknown)[:80]}, which are not "
                         "readings")
    u = {k: _as_uncertainty(k, uncertainties.get(k, (0.0, 0.0))) for k in readings}
    return readings, u


def _column(out, r, rows) -> np.ndarray:
    """Result column ``r`` of the model's output, finite on the rows used."""
    if not hasattr(out, "columns") or r not in out.columns:
        raise InputError(f"the model's output has no column for result {r!r}")
    try:
        col = pd.to_numeric(out[r], errors="coerce").to_numpy(dtype=float)
    except (TypeError, ValueError):
        raise InputError(f"result {r!r} is not numeric") from None
    if len(col) != rows:
        raise InputError(f"the model returned {len(col)} rows for {rows} readings rows")
    return col


def _finite(report: dict, what: str) -> dict:
    for r, value in report.items():
        if not math.isfinite(value):
            raise InputError(f"the {what} of result {r!r} is not finite ({value}): the result "
                             "is not defined at these readings")
    return report


def propagate_uncertainty(readings: dict, uncertainties: dict, results=("isentropic_efficiency",
                          "power"), *, model=None, step_fraction: float = 0.1,
                          **evaluate_options) -> UncertaintyReport:
    """Propagate instrument uncertainties to results by sensitivity coefficients.

    Parameters
    ----------
    readings : dict
        Reading name -> nominal value in SI units (names of
        :data:`workbench.fieldtest.readers.READING_KINDS`; speed in rev/min) or a pint
        Quantity of the reading's kind.
    uncertainties : dict
        Reading name -> ``(systematic b, random s)`` standard uncertainties in the reading's SI
        unit (or Quantities; temperatures as differences, K or delta_degC), not negative, or
        :class:`InstrumentUncertainty`; readings not listed are taken as exact.
    results : sequence of str
        Result names (keys of :data:`workbench.fieldtest.batch.RESULTS`).
    model : callable, optional
        ``model(frame) -> frame`` with one column per result; default: the batch
        :func:`workbench.fieldtest.evaluate` with ``evaluate_options`` (``machine``,
        ``fluid``, ``mode`` ...).
    step_fraction : float
        Central-difference step as a fraction of each reading's combined uncertainty
        (a relative step of 1e-6 of the reading when its uncertainty is zero).

    Returns
    -------
    UncertaintyReport

    Raises
    ------
    InputError
        If the nominal point or a perturbed point does not evaluate.

    References
    ----------
    ASME PTC 19.1-2013, Test Uncertainty, sections 7 and 8 (propagation by sensitivity
    coefficients, large-sample expanded uncertainty U95 = 2 u).
    """
    readings, u = _checked(readings, uncertainties)
    results = _results(results)
    step_fraction = to_si(step_fraction, "dimensionless", "step_fraction", low=0.0, high=10.0,
                          low_open=True)
    run = _model(model, results, evaluate_options)
    names = list(readings)
    rows = [dict(readings)]
    steps = {}
    for name in names:
        step = step_fraction * u[name].combined
        if step == 0:
            step = 1e-6 * max(abs(readings[name]), 1e-12)
        steps[name] = step
        for sign in (+1, -1):
            row = dict(readings)
            row[name] = readings[name] + sign * step
            rows.append(row)
    frame = pd.DataFrame(rows)
    out = run(frame)
    if "status" in out.columns:
        bad = out.index[out["status"] != "ok"]
        if len(bad):
            msg = out.loc[bad[0], "message"]
            where = "the nominal readings" if bad[0] == 0 else "a perturbed reading"
            raise InputError(f"the uncertainty cannot be propagated: {where} did not evaluate "
                             f"({msg})")
    value, sens, sys_, ran, comb, exp_, share, dom = {}, {}, {}, {}, {}, {}, {}, {}
    for r in results:
        col = _column(out, r, len(frame))
        value[r] = float(col[0])
        theta = {n: float((col[1 + 2 * k] - col[2 + 2 * k]) / (2 * steps[n]))
                 for k, n in enumerate(names)}
        sens[r] = theta
        b2 = sum((theta[n] * u[n].systematic) ** 2 for n in names)
        s2 = sum((theta[n] * u[n].random) ** 2 for n in names)
        sys_[r], ran[r] = math.sqrt(b2), math.sqrt(s2)
        comb[r] = math.sqrt(b2 + s2)
        exp_[r] = 2.0 * comb[r]
        total = b2 + s2
        share[r] = {n: (theta[n] ** 2 * u[n].combined ** 2 / total if total > 0 else 0.0)
                    for n in names}
        dom[r] = max(share[r], key=share[r].get) if total > 0 else None
    _finite(value, "value")
    _finite(comb, "propagated uncertainty")
    return UncertaintyReport(value, sens, sys_, ran, comb, exp_, share, dom)


def monte_carlo_uncertainty(readings: dict, uncertainties: dict, results=(
        "isentropic_efficiency", "power"), *, samples: int = 1000, seed: int | None = 0,
        model=None, **evaluate_options) -> MonteCarloReport:
    """Uncertainty of results by Monte Carlo draws of the readings.

    Parameters
    ----------
    readings, uncertainties, results, model
        As in :func:`propagate_uncertainty`.
    samples : int
        Number of draws, 10 to 1,000,000.
    seed : int or None
        Seed of the random generator (``numpy.random.default_rng``), for repeatable runs;
        a whole number from 0 to 1e12.
    **evaluate_options
        Options of :func:`workbench.fieldtest.evaluate` for the default model.

    Returns
    -------
    MonteCarloReport

    References
    ----------
    JCGM 101:2008 (propagation of distributions by Monte Carlo).
    ASME PTC 19.1-2013, Test Uncertainty (Monte Carlo as a check of the Taylor-series method).
    """
    samples = count(samples, "samples", low=10, high=1_000_000)
    seed = None if seed is None else count(seed, "seed", low=0)
    readings, u = _checked(readings, uncertainties)
    results = _results(results)
    run = _model(model, results, evaluate_options)
    rng = np.random.default_rng(seed)
    frame = pd.DataFrame({
        n: x + u[n].systematic * rng.standard_normal(samples)
        + u[n].random * rng.standard_normal(samples) for n, x in readings.items()})
    out = run(frame)
    ok = (out["status"] == "ok").to_numpy() if "status" in out.columns else np.ones(samples, bool)
    n_ok = int(ok.sum())
    if n_ok < 10:
        first = ""
        if "message" in out.columns and (~ok).any():
            first = f"; the first that did not: {out['message'].to_numpy()[~ok][0]}"
        raise InputError(f"only {n_ok} of {samples} Monte Carlo draws of the readings "
                         f"evaluated (at least 10 needed){first}")
    mean, std, exp_, interval = {}, {}, {}, {}
    for r in results:
        col = _column(out, r, samples)[ok]
        if not np.isfinite(col).all():
            raise InputError(f"result {r!r} is not finite in some Monte Carlo draws that "
                             "evaluated")
        mean[r] = float(col.mean())
        std[r] = float(col.std(ddof=1))
        exp_[r] = 2.0 * std[r]
        interval[r] = (float(np.percentile(col, 2.5)), float(np.percentile(col, 97.5)))
    return MonteCarloReport(mean, std, exp_, interval, n_ok, samples - n_ok,
                            1.0 / math.sqrt(2.0 * (n_ok - 1)))


__all__ = ["InstrumentUncertainty", "UncertaintyReport", "MonteCarloReport",
           "propagate_uncertainty", "monte_carlo_uncertainty"]
