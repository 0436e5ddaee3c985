"""State and StateArray: the quality is a float (NaN when single-phase), masks, phase words.

References
----------
* IAPWS-IF97 through the independent `iapws` package (J. Rodriguez Romero).
"""

import math

import iapws
import numpy as np
import pytest

import workbench as wb
from workbench.properties.state import PHASE_WORDS, phase_words


def test_single_phase_state_has_nan_quality(water_if97):
    # Source: IAPWS-IF97 via iapws.IAPWS97: liquid water at 1 bar, 300 K is region 1 (no
    # quality), wet steam at 0.1 bar with x = 0.9 is region 4.
    liquid = water_if97.state(P=1e5, T=300.0)
    assert iapws.IAPWS97(P=0.1, T=300.0).region == 1
    assert isinstance(liquid.x, float) and math.isnan(liquid.x)
    assert not liquid.two_phase and math.isnan(liquid.quality)
    assert liquid.as_dict()["x"] != liquid.as_dict()["x"]  # NaN in the flat dict too
    assert "x=" not in repr(liquid)
    wet = water_if97.state(P=1e4, x=0.9)
    assert iapws.IAPWS97(P=0.01, x=0.9).region == 4
    assert wet.two_phase and wet.quality == pytest.approx(0.9) and wet.x == wet.quality
    assert "x=0.9000" in repr(wet)


def test_specific_volume_and_compressibility(water):
    # Closed forms: v = 1/rho; Z = P v / (R T) with R = R_universal / M (CODATA 2018).
    st = water.state(P=1e5, T=500.0)
    assert st.v == pytest.approx(1.0 / st.rho, rel=1e-15)
    assert st.Z == pytest.approx(1e5 / (st.rho * wb.properties.R_UNIVERSAL / water.molar_mass
                                        * 500.0), rel=1e-12)


def test_state_array_entries_and_masks(water_if97):
    # Source: the single-state API of the same fluid (state_PT) for each entry.
    states = water_if97.states_PT([1e5, 1e5, -1.0], [300.0, 500.0, 300.0])
    assert states.valid.tolist() == [True, True, False]
    assert not states.two_phase.any()
    first = states.state(0)
    single = water_if97.state_PT(1e5, 300.0)
    assert first.h == pytest.approx(single.h, rel=1e-12) and math.isnan(first.x)
    with pytest.raises(wb.PropertyError, match="entry 2"):
        states.state(2)
    cut = states.masked(np.array([True, False, True]))
    assert cut.valid.tolist() == [True, False, False]
    assert np.isnan(cut.h[1]) and cut.phase[1] == "" and cut.h[0] == states.h[0]
    assert "2 of 3 valid" in repr(states)


def test_phase_words_of_codes():
    # Source: the property library's phase codes (CoolProp constants), words of our own.
    codes = np.array([float(c) for c in PHASE_WORDS] + [np.nan, 99.0])
    assert phase_words(codes).tolist() == list(PHASE_WORDS.values()) + ["", ""]
