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
