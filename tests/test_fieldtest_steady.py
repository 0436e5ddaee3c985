"""Tests of workbench.fieldtest.steady: maximum deviation from the window mean (the
permissible-fluctuation rule of performance-test codes, common practice), by hand."""

import numpy as np
import pandas as pd
import pytest

from workbench.errors import InputError
from workbench.fieldtest import steady_state_flags


def test_max_deviation_from_window_mean_by_hand():
    frame = pd.DataFrame({"p": [10.0, 10.0, 10.0, 11.0, 11.0, 11.0, 11.0, 11.0],
                          "t": [300.0] * 8})
    flags = steady_state_flags(frame, ["p", "t"], window=4, tolerance={"p": 0.5, "t": 0.1})
    # window ending at row 3: [10, 10, 10, 11], mean 10.25, max deviation 0.75 (by hand)
    assert flags.loc[3, "p_max_deviation"] == pytest.approx(0.75)
    # window ending at row 4: [10, 10, 11, 11], mean 10.5, max deviation 0.5 -> within 0.5
    assert flags.loc[4, "p_max_deviation"] == pytest.approx(0.5)
    # row 5: [10, 11, 11, 11], mean 10.75, max deviation 0.75 -> not steady
    assert list(flags["steady"]) == [False, False, False, False, True, False, True, True]
    assert np.isnan(flags.loc[0, "p_max_deviation"])


def test_relative_tolerance_and_missing_reading():
    frame = pd.DataFrame({"q": [100.0, 100.5, 99.5, 100.0, np.nan, 100.0, 100.0, 100.0]})
    flags = steady_state_flags(frame, ["q"], window=3, tolerance=0.01, relative=True)
    # rows 2-3 within 1 %; windows holding the missing reading (rows 4-6) are not steady
    assert list(flags["steady"]) == [False, False, True, True, False, False, False, True]
    with pytest.raises(InputError, match="window"):
        steady_state_flags(frame, ["q"], window=1, tolerance=0.01)
    with pytest.raises(InputError, match="not in the readings"):
        steady_state_flags(frame, ["x"], window=3, tolerance=0.01)


def test_bad_arguments_are_refused_by_name():
    # Every argument goes through the input boundary: whole numbers, True/False, tolerances
    # not below zero, columns that exist.
    from workbench.units import Q_

    frame = pd.DataFrame({"p": [1.0, 1.0, 1.0], "t": [300.0, 300.2, 300.1]})
    for kwargs, message in [
        (dict(window=True), "window must be a whole number"),
        (dict(window=1), "window 1 is outside the allowed range"),
        (dict(window=2.5), "window must be a whole number"),
        (dict(tolerance=-1.0), "tolerance for column 'p' .* outside the allowed range"),
        (dict(tolerance=float("nan")), "tolerance for column 'p' must be a finite number"),
        (dict(tolerance={"p": 1.0}), "no tolerance given for column 't'"),
        (dict(relative="yes"), "relative must be True or False"),
        (dict(columns="p"), "columns must be a list"),
        (dict(columns=["x"]), "'x' are not in the readings"),
        (dict(tolerance=Q_(0.5, "degC")), "unit with an offset"),
    ]:
        args = dict(columns=["p", "t"], window=2, tolerance=0.5)
        args.update(kwargs)
        with pytest.raises(InputError, match=message):
            steady_state_flags(frame, **args)
    # A temperature tolerance as a Quantity difference: 0.5 delta_degC = 0.5 K (SI).
    out = steady_state_flags(frame, ["t"], 2, Q_(0.5, "delta_degC"))
    assert out["steady"].tolist() == [False, True, True]
