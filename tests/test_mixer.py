"""Mixers and splitters: mass and energy balances."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError, WorkbenchError
from workbench.machines.mixer import mixer, splitter
from workbench.properties import Fluid
from workbench.units import Q_

WATER = Fluid("Water")
STEAM = Fluid("Water", backend="IF97")


def test_outlet_enthalpy_is_mass_weighted_mean():
    # Adiabatic mixing: h_out = sum(m_i h_i) / sum(m_i) (common practice).
    streams = [(WATER.state_PT(5e5, 293.15), 2.0), (WATER.state_PT(4e5, 353.15), 1.0),
               (WATER.state_PT(6e5, 313.15), Q_(3600.0, "kg/h"))]
    result = mixer(streams)
    flows = [2.0, 1.0, 1.0]
    expected = sum(m * st.h for (st, _), m in zip(streams, flows)) / sum(flows)
    assert result.outlet.h == pytest.approx(expected, rel=1e-9)
    assert result.mass_flow == pytest.approx(4.0)
    assert result.outlet.P == pytest.approx(4e5, rel=1e-9)  # the lowest inlet pressure
    # Liquid water's cp is nearly constant, so the temperature is nearly the weighted mean
    # too (common practice; cp varies by about 0.3 % over 20-80 degC, from memory).
    t_mean = (2 * 293.15 + 353.15 + 313.15) / 4
    assert result.outlet.T == pytest.approx(t_mean, abs=0.2)
    assert result.entropy_generation > 0  # second law


def test_equal_flows_of_saturated_liquid_and_vapour_give_half_quality():
    # Lever rule: equal masses of saturated liquid and vapour at one pressure mix to x = 0.5
    # (common practice), checked against IAPWS-IF97 via iapws at the mixed enthalpy.
    liquid, vapour = STEAM.state(P=10e5, x=0.0), STEAM.state(P=10e5, x=1.0)
    result = mixer([(liquid, 1.5), (vapour, 1.5)])
    assert result.outlet.x == pytest.approx(0.5, abs=1e-9)
    assert IAPWS97(P=1.0, h=result.outlet.h / 1e3).x == pytest.approx(0.5, abs=1e-6)


def test_heat_loss_lowers_outlet_enthalpy():
    # m h_out = sum(m_i h_i) - Q_loss (steady-flow energy equation, common practice).
    streams = [(WATER.state_PT(5e5, 293.15), 2.0), (WATER.state_PT(5e5, 353.15), 2.0)]
    adiabatic = mixer(streams)
    lossy = mixer(streams, heat_loss=4000.0)
    assert lossy.outlet.h == pytest.approx(adiabatic.outlet.h - 1000.0, rel=1e-9)


def test_splitter_mass_balance():
    inlet = STEAM.state_PT(20e5, 573.15)
    result = splitter(inlet, 10.0, branch_mass_flows=[2.5, None])
    assert result.branch_mass_flows == (2.5, 7.5)
    assert math.fsum(result.branch_mass_flows) == pytest.approx(10.0, rel=1e-9)
    assert result.outlets[1] is inlet
    assert splitter(inlet, 10.0, fractions=[0.2, 0.8]).branch_mass_flows[0] == pytest.approx(2.0)


def test_split_fraction_above_one_is_refused():
    inlet = STEAM.state_PT(20e5, 573.15)
    with pytest.raises(InputError, match="split fraction of branch 1") as info:
        splitter(inlet, 10.0, fractions=[1.2, None])
    assert "1.2" in str(info.value) and "[0, 1]" in str(info.value)


def test_branch_flows_that_do_not_add_up_are_refused():
    inlet = STEAM.state_PT(20e5, 573.15)
    with pytest.raises(SpecificationError, match="mass balance must close"):
        splitter(inlet, 10.0, branch_mass_flows=[3.0, 6.0])
    with pytest.raises(SpecificationError, match="more than the inlet flow"):
        splitter(inlet, 10.0, branch_mass_flows=[11.0, None])


def test_mixer_refuses_bad_streams():
    air = Fluid("Air")
    with pytest.raises(InputError, match="mixer stream 2"):
        mixer([(WATER.state_PT(5e5, 300.0), 1.0), (air.state_PT(5e5, 300.0), 1.0)])
    with pytest.raises(WorkbenchError, match="mixer stream 1 mass flow"):
        mixer([(WATER.state_PT(5e5, 300.0), 0.0), (WATER.state_PT(5e5, 300.0), 1.0)])
    with pytest.raises(InputError, match="mixer outlet pressure"):
        mixer([(WATER.state_PT(5e5, 300.0), 1.0), (WATER.state_PT(4e5, 300.0), 1.0)],
              P_out=4.5e5)


def test_splitter_values_that_are_not_a_list_are_refused():
    # A bad input raises the project's own error naming the input, never a raw TypeError
    # (project convention, DEVELOPERS.md).
    inlet = STEAM.state_PT(20e5, 573.15)
    with pytest.raises(InputError, match="splitter split fractions must be a list"):
        splitter(inlet, 10.0, fractions=0.5)
    with pytest.raises(InputError, match="splitter branch mass flows must be a list"):
        splitter(inlet, 10.0, branch_mass_flows=3.0)
    with pytest.raises(InputError, match="mixer streams must be a list"):
        mixer(5.0)


#: Argon as a perfect gas: R = 8.314462618 J/(mol K) (CODATA 2018) over 39.948 g/mol
#: (IUPAC), cp = 5/2 R (monatomic, kinetic theory).  At 1 bar and 300-500 K argon is a
#: perfect gas to about 0.1 % (from memory).
CP_ARGON = 2.5 * 8.314462618 / 0.039948


@pytest.mark.parametrize("heat_loss", [0.0, 2 * CP_ARGON * 20.0])
def test_perfect_gas_mixing_temperature_and_entropy(heat_loss):
    # Constant cp: T_out = (sum m_i T_i - Q/cp) / m_out, and at one pressure
    # S_gen = sum m_i cp ln(T_out / T_i) + Q / T_out, the heat leaving at the outlet
    # temperature as MixerResult documents (closed forms).  A heat loss of 2 cp 20 W
    # lowers T_out by 20 K.
    argon = Fluid("Argon")
    streams = [(argon.state_PT(1e5, 300.0), 1.0), (argon.state_PT(1e5, 500.0), 1.0)]
    result = mixer(streams, heat_loss=heat_loss)
    t_out = 400.0 - heat_loss / (2 * CP_ARGON)
    s_gen = CP_ARGON * (math.log(t_out / 300.0) + math.log(t_out / 500.0)) + heat_loss / t_out
    assert result.outlet.T == pytest.approx(t_out, rel=2e-4)
    assert result.entropy_generation == pytest.approx(s_gen, rel=5e-3)


def test_two_phase_splitter_and_mixer_carry_cautions():
    # A tee does not split a two-phase flow evenly (phase maldistribution, common practice);
    # a mixer whose outlet is wet says so.
    wet = STEAM.state(P=10e5, x=0.5)
    split = splitter(wet, 4.0, fractions=[0.25, None])
    assert "two-phase" in split.cautions[0]
    assert splitter(STEAM.state_PT(20e5, 573.15), 4.0, fractions=[0.5, 0.5]).cautions == ()
    liquid, vapour = STEAM.state(P=10e5, x=0.0), STEAM.state(P=10e5, x=1.0)
    mixed = mixer([(liquid, 1.0), (vapour, 1.0)])
    assert "two-phase" in mixed.cautions[0]
    assert mixed.outlet_quality == pytest.approx(0.5, abs=1e-9)


def test_result_keys_are_fields_with_stream_prefixes():
    # Keys come from workbench.fields.FIELDS; streams and branches carry a stream_<i>_ or
    # branch_<i>_ prefix.
    from workbench.fields import FIELDS
    from workbench.machines.checks import TEXT_KEYS, field_key

    streams = [(WATER.state_PT(5e5, 293.15), 2.0), (WATER.state_PT(4e5, 353.15), 1.0)]
    m = mixer(streams).to_dict()
    s = splitter(STEAM.state_PT(20e5, 573.15), 10.0, branch_mass_flows=[2.5, None]).to_dict()
    for d in (m, s):
        assert all(key in TEXT_KEYS or field_key(key) in FIELDS for key in d)
    assert m["stream_2_mass_flow"] == 1.0 and m["stream_1_temperature"] == 293.15
    assert s["branch_2_mass_flow"] == 7.5 and s["branch_1_split_fraction"] == 0.25
    assert math.isnan(s["quality"])


def test_bad_stream_values_are_refused_by_name():
    from decimal import Decimal

    water = WATER.state_PT(5e5, 300.0)
    with pytest.raises(InputError, match="mixer stream 2 mass flow was given in bar"):
        mixer([(water, 1.0), (water, Q_(1.0, "bar"))])
    with pytest.raises(InputError, match="mixer stream 1 state must be a State"):
        mixer([("water", 1.0), (water, 1.0)])
    with pytest.raises(InputError, match="mixer streams must be a list"):
        mixer("water")
    with pytest.raises(InputError, match="split fraction of branch 1 must be a number"):
        splitter(water, 1.0, fractions=[True, None])
    # Decimal split fractions are numbers
    assert splitter(water, 1.0, fractions=[Decimal("0.5"), None]).branch_mass_flows[1] == 0.5
