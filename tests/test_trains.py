"""Machine trains: station bookkeeping, intercooled compression, extraction turbine."""

import math

import pytest
from iapws import IAPWS97

from workbench.errors import InputError, SpecificationError, WorkbenchError
from workbench.properties import Fluid
from workbench.trains import (
    Admission,
    CompressorStage,
    Cooler,
    Extraction,
    PipeRun,
    PressureLoss,
    PumpStage,
    ThrottleValve,
    Train,
    TurbineSection,
    extraction_turbine,
    intercooled_compressor,
)
from workbench.units import Q_

AIR = Fluid("Air")
NITROGEN = Fluid("Nitrogen")
STEAM = Fluid("Water", backend="IF97")


@pytest.mark.parametrize("fluid", [AIR, NITROGEN], ids=["air", "nitrogen"])
def test_two_stage_optimum_at_geometric_mean_pressure(fluid):
    # Ideal gas, perfect intercooling to the suction temperature, equal stage efficiencies,
    # no pressure drops: total work is least at P_i = sqrt(P1 P2) (textbook result, common
    # practice).  The real gas (Z of air and nitrogen within about 0.2 % of 1 up to 9 bar at
    # these temperatures, from memory) moves the optimum by a few tenths of a per cent, so
    # 0.5 %; at a fifth of the pressure the shift must shrink (ideal-gas limit).
    shifts = []
    for p1 in (1.0e5, 0.2e5):
        suction = fluid.state_PT(p1, 300.0)
        result = intercooled_compressor(suction, 1.0, P_out=9 * p1, stages=2,
                                        isentropic_efficiency=1.0,
                                        cooler_outlet_temperature=300.0, stage_ratios="optimal")
        geometric = math.sqrt(p1 * 9 * p1)
        (p_i,) = result.intermediate_pressures
        assert p_i == pytest.approx(geometric, rel=5e-3)
        shifts.append(abs(p_i / geometric - 1))
        # At the optimum both stages take the same power (same closed form).
        w1, w2 = result.stage_powers
        assert w1 == pytest.approx(w2, rel=5e-3)
        equal = intercooled_compressor(suction, 1.0, P_out=9 * p1, isentropic_efficiency=1.0,
                                       cooler_outlet_temperature=300.0)
        assert result.total_power <= equal.total_power * (1 + 1e-12)
    assert shifts[1] < 0.5 * shifts[0]


def test_equal_ratios_close_on_discharge_pressure_with_drops():
    # Pressure bookkeeping: each stage's suction is the previous discharge less the cooler
    # and knock-out drops, and the last stage discharges at the pressure asked (common
    # practice for a staged compressor).
    suction = AIR.state_PT(1.0e5, 300.0)
    result = intercooled_compressor(
        suction, Q_(7200.0, "kg/h"), pressure_ratio=20.0, stages=3, isentropic_efficiency=0.8,
        cooler_outlet_temperature=Q_(35.0, "degC"), cooler_pressure_drop=Q_(0.1, "bar"),
        knockout_pressure_drop=0.05e5, aftercooler=True, aftercooler_pressure_drop=0.1e5,
        cooling_water_inlet_temperature=298.15, cooling_water_outlet_temperature=308.15)
    r = result.stage_pressure_ratios
    assert r[0] == pytest.approx(r[1], rel=1e-9) and r[1] == pytest.approx(r[2], rel=1e-9)
    machines = list(result.train.machines.values())
    assert machines[-1].outlet.P == pytest.approx(20e5, rel=1e-9)
    for before, after in zip(machines, machines[1:]):
        assert after.inlet.P == pytest.approx(before.outlet.P - 0.15e5, rel=1e-9)
        # Cooler outlet 35 degC, then the isenthalpic knock-out drop of 0.05 bar cools air by
        # about 0.01 K (Joule-Thomson coefficient about 0.2 K/bar, from memory).
        assert 308.15 - 0.03 < after.inlet.T < 308.15
    # Equal ratios need more than 20^(1/3) each to make up for the drops.
    assert r[0] > 20 ** (1 / 3)
    assert result.total_power == pytest.approx(sum(result.stage_powers), rel=1e-12)
    frame = result.stations_frame()
    assert list(frame.index[:3]) == ["inlet", "stage 1 outlet", "intercooler 1 outlet"]
    assert frame["mass_flow"].eq(2.0).all()
    assert len(result.machines_frame()) == 3
    # First law over the whole train: shaft power in = enthalpy rise + heat removed.
    outlet = result.train.outlet
    assert result.total_power == pytest.approx(
        2.0 * (outlet.h - suction.h) + result.train.heat_removed, rel=1e-9)
    assert result.train.cooling_water_mass_flow > 0


def test_extraction_turbine_matches_if97():
    # Valve: isenthalpic; HP section with the full flow to the extraction pressure, LP with
    # the rest to the exhaust, each h2 = h1 - eta (h1 - h2s); states from IAPWS-IF97 via the
    # iapws package.
    inlet = STEAM.state_PT(60e5, 753.15)
    result = extraction_turbine(inlet, 20.0, 0.1e5, valve_outlet_pressure=55e5,
                                extraction_pressure=5e5, extraction_mass_flow=3.0,
                                hp_isentropic_efficiency=0.85, lp_isentropic_efficiency=0.80)
    h1 = IAPWS97(P=6.0, T=753.15).h
    s1 = IAPWS97(P=5.5, h=h1).s
    h2 = h1 - 0.85 * (h1 - IAPWS97(P=0.5, s=s1).h)
    s2 = IAPWS97(P=0.5, h=h2).s
    h3 = h2 - 0.80 * (h2 - IAPWS97(P=0.01, s=s2).h)
    hp, lp = result.high_pressure_section, result.low_pressure_section
    assert hp.power == pytest.approx(20.0 * (h1 - h2) * 1e3, rel=1e-6)
    assert lp.power == pytest.approx(17.0 * (h2 - h3) * 1e3, rel=1e-6)
    assert lp.outlet.x == pytest.approx(IAPWS97(P=0.01, h=h3).x, abs=1e-6)
    assert result.total_power == pytest.approx(hp.power + lp.power, rel=1e-12)
    stations = result.stations_frame()
    assert stations.loc["extraction branch", "mass_flow"] == pytest.approx(3.0)
    assert stations.loc["LP section outlet", "mass_flow"] == pytest.approx(17.0)
    assert result.to_dict()["totals"]["extracted_mass_flow"] == pytest.approx(3.0)


def test_feed_heater_on_the_extraction():
    # The bleed condenses to saturated liquid at its pressure; the heat it gives up heats
    # the feedwater (exchanger duty balance, common practice).
    inlet = STEAM.state_PT(60e5, 753.15)
    feedwater = STEAM.state_PT(80e5, 373.15)
    result = extraction_turbine(inlet, 20.0, 0.1e5, extraction_pressure=5e5,
                                extraction_mass_flow=3.0, hp_isentropic_efficiency=0.85,
                                lp_isentropic_efficiency=0.80, feedwater_inlet=feedwater,
                                feedwater_mass_flow=40.0)
    heater = result.feed_heater
    assert heater.hot_outlet.h == pytest.approx(IAPWS97(P=0.5, x=0).h * 1e3, rel=1e-6)
    assert heater.heat_released == pytest.approx(heater.heat_absorbed, rel=1e-9)
    assert feedwater.T < heater.cold_outlet.T < STEAM.saturation_temperature(5e5)
    # Half the feedwater would have to leave above the bleed's saturation temperature, which
    # a condensing heater cannot do (common practice: TTD >= 0 against saturation).
    with pytest.raises(SpecificationError, match="feedwater"):
        extraction_turbine(inlet, 20.0, 0.1e5, extraction_pressure=5e5,
                           extraction_mass_flow=3.0, hp_isentropic_efficiency=0.85,
                           lp_isentropic_efficiency=0.80, feedwater_inlet=feedwater,
                           feedwater_mass_flow=20.0)


def test_admission_mixes_into_the_main_line():
    # Merge: outlet flow is the sum and the enthalpy the mass-weighted mean (common practice).
    main = STEAM.state_PT(10e5, 523.15)
    joining = STEAM.state_PT(12e5, 573.15)
    train = Train([Admission("admission", state=joining, branch_mass_flow=1.0)])
    result = train.run(main, 3.0)
    assert result.outlet_mass_flow == pytest.approx(4.0)
    assert result.outlet.h == pytest.approx((3.0 * main.h + joining.h) / 4.0, rel=1e-9)
    assert result.admitted_mass_flow == pytest.approx(1.0)
    assert [s.role for s in result.stations] == ["main", "admission", "main"]


def test_train_whose_mass_balance_does_not_close_is_refused():
    suction = AIR.state_PT(1e5, 300.0)
    train = Train([CompressorStage("stage 1", pressure_ratio=3, isentropic_efficiency=0.8),
                   Extraction("bleed", branch_mass_flow=0.5),
                   CompressorStage("stage 2", pressure_ratio=2, isentropic_efficiency=0.8,
                                   mass_flow=2.0)])
    with pytest.raises(SpecificationError, match="mass balance does not close") as info:
        train.run(suction, 2.0)
    assert "'stage 2'" in str(info.value) and "1.5" in str(info.value)
    too_much = Train([Extraction("bleed", branch_mass_flow=2.5)])
    with pytest.raises(SpecificationError, match="'bleed'"):
        too_much.run(suction, 2.0)


def test_bad_train_steps_name_the_input():
    suction = AIR.state_PT(1e5, 300.0)
    with pytest.raises(InputError, match="split fraction of step 'bleed'") as info:
        Train([Extraction("bleed", fraction=1.3)]).run(suction, 1.0)
    assert "1.3" in str(info.value)
    hot = Train([CompressorStage("stage 1", pressure_ratio=2, isentropic_efficiency=0.8),
                 Cooler("intercooler", outlet_temperature=500.0)])
    with pytest.raises(InputError, match="cooler outlet temperature") as info:
        hot.run(suction, 1.0)
    assert "'intercooler'" in str(info.value)
    with pytest.raises(InputError, match="used twice"):
        Train([PressureLoss("drop", pressure_drop=1e3), PressureLoss("drop", pressure_drop=1e3)])
    with pytest.raises(WorkbenchError, match="pump"):
        Train([PumpStage("pump", pressure_ratio=2, isentropic_efficiency=0.7)]).run(suction, 1.0)


def test_turbine_ratio_is_inlet_over_outlet_and_named_so():
    # A turbine's pressure ratio is quoted high over low, inlet over outlet (common practice,
    # the convention TurbineSection documents): ratio 4 from 8 bar ends at 2 bar.  A
    # compressor's ratio 3 from 1 bar ends at 3 bar (outlet over inlet).
    steam = STEAM.state_PT(8e5, 573.15)
    by_ratio = Train([TurbineSection("t", pressure_ratio=4.0, isentropic_efficiency=0.8)])
    assert by_ratio.run(steam, 1.0).outlet.P == pytest.approx(2e5, rel=1e-12)
    air = AIR.state_PT(1e5, 300.0)
    stage = Train([CompressorStage("c", pressure_ratio=3.0, isentropic_efficiency=0.8)])
    assert stage.run(air, 1.0).outlet.P == pytest.approx(3e5, rel=1e-12)
    # The message for a bad turbine ratio must state the turbine's convention; a ratio is
    # refused when the step is made (the input boundary), before any run.
    for ratio in (-2.0, 0.0, 0.5, 1.0):
        with pytest.raises(InputError, match="pressure ratio of step 't'") as info:
            TurbineSection("t", pressure_ratio=ratio, isentropic_efficiency=0.8)
        assert "inlet over outlet" in str(info.value) and "above 1" in str(info.value)
    with pytest.raises(InputError, match="outlet over inlet"):
        CompressorStage("c", pressure_ratio=0.0, isentropic_efficiency=0.8)
    # the machine table quotes every ratio higher over lower, as the field says
    # (workbench.fields.FIELDS["pressure_ratio"])
    mixed = Train([CompressorStage("c", pressure_ratio=2.0, isentropic_efficiency=0.8),
                   TurbineSection("t", pressure_ratio=4.0, isentropic_efficiency=0.8)])
    frame = mixed.run(air, 1.0).machines_frame()
    assert frame.loc["c", "pressure_ratio"] == pytest.approx(2.0, rel=1e-12)
    assert frame.loc["t", "pressure_ratio"] == pytest.approx(4.0, rel=1e-12)


def test_valve_by_pressure_drop_is_isenthalpic():
    # Throttling is isenthalpic (common practice): outlet at P1 - dP with the inlet enthalpy,
    # here checked against IAPWS-IF97 via iapws at 10 bar and h1.
    steam = STEAM.state_PT(15e5, 573.15)
    result = Train([ThrottleValve("valve", pressure_drop=5e5)]).run(steam, 2.0)
    assert result.outlet.P == pytest.approx(10e5, rel=1e-12)
    reference = IAPWS97(P=1.0, h=IAPWS97(P=1.5, T=573.15).h)
    assert result.outlet.T == pytest.approx(reference.T, abs=1e-3)
    with pytest.raises(SpecificationError, match="exactly one"):
        Train([ThrottleValve("valve", P_out=9e5, pressure_drop=5e5)]).run(steam, 2.0)


def test_extraction_by_fraction_keeps_the_mass_balance():
    # Splitter mass balance (common practice): a fraction f of m leaves, (1 - f) m goes on,
    # both in the state arriving.
    steam = STEAM.state_PT(15e5, 573.15)
    result = Train([Extraction("bleed", fraction=0.25)]).run(steam, 8.0)
    branch = result.step("bleed").branch
    assert branch is result.branches[0] and branch.role == "extraction"
    assert branch.mass_flow == pytest.approx(2.0, rel=1e-12)
    assert result.outlet_mass_flow == pytest.approx(6.0, rel=1e-12)
    assert branch.state is steam and result.outlet is steam


def test_pipe_run_rise_follows_bernoulli():
    # Frictionless rising pipe of one diameter: P2 = P1 - rho g dz (Bernoulli, closed form);
    # water density at 20 degC and 3 bar from IAPWS-IF97 via iapws; standard gravity
    # g = 9.80665 m/s^2 (3rd CGPM, 1901).
    water = Fluid("Water").state_PT(3e5, 293.15)
    rho = IAPWS97(P=0.3, T=293.15).rho
    result = Train([PipeRun("riser", 0.1, options={"elevation_change": 10.0})]).run(water, 5.0)
    assert result.outlet.P == pytest.approx(3e5 - rho * 9.80665 * 10.0, rel=1e-6)


# ---------------------------------------------------------------------- names and the boundary
def test_extraction_is_a_named_attribute_and_powers_are_named_for_the_shaft():
    # Extraction state: the HP section's outlet, h2 = h1 - eta (h1 - h2s) from IAPWS-IF97 via
    # iapws (no valve here); mechanical efficiency: shaft = eta_m x fluid power for a turbine
    # (definition, workbench.fields "mechanical_efficiency").
    inlet = STEAM.state_PT(60e5, 753.15)
    result = extraction_turbine(inlet, 20.0, 0.1e5, extraction_pressure=5e5,
                                extraction_mass_flow=3.0, hp_isentropic_efficiency=0.85,
                                lp_isentropic_efficiency=0.80, mechanical_efficiency=0.98)
    h1, s1 = IAPWS97(P=6.0, T=753.15).h, IAPWS97(P=6.0, T=753.15).s
    h2 = h1 - 0.85 * (h1 - IAPWS97(P=0.5, s=s1).h)
    bleed = result.extraction
    assert bleed.mass_flow == pytest.approx(3.0, rel=1e-12)
    assert bleed.state.P == pytest.approx(5e5, rel=1e-12)
    assert bleed.state.h == pytest.approx(h2 * 1e3, rel=1e-6)
    hp, lp = result.high_pressure_section, result.low_pressure_section
    fluid_power = hp.power + lp.power
    assert result.total_shaft_power == pytest.approx(0.98 * fluid_power, rel=1e-12)
    assert result.total_power == result.total_shaft_power
    assert result.train.delivered_shaft_power == result.total_shaft_power
    totals = result.to_dict()["totals"]
    assert totals["delivered_shaft_power"] == totals["total_shaft_power"] == result.total_shaft_power
    # the machine table keeps both, named: power (fluid) and shaft_power
    frame = result.machines_frame()
    assert frame.loc["HP section", "power"] == pytest.approx(hp.power)
    assert frame.loc["HP section", "shaft_power"] == pytest.approx(0.98 * hp.power)


def test_intercooled_total_is_shaft_power():
    # a driven machine: shaft = fluid power / eta_m (definition of mechanical efficiency)
    suction = AIR.state_PT(1e5, 300.0)
    r = intercooled_compressor(suction, 1.0, P_out=9e5, isentropic_efficiency=0.8,
                               cooler_outlet_temperature=300.0, mechanical_efficiency=0.97)
    fluid = sum(m.power for m in r.train.machines.values())
    assert r.total_shaft_power == pytest.approx(fluid / 0.97, rel=1e-12)
    assert r.total_power == r.total_shaft_power == pytest.approx(sum(r.stage_powers))
    totals = r.to_dict()["totals"]
    assert totals["total_shaft_power"] == r.total_shaft_power
    assert totals["stage_shaft_powers"] == pytest.approx(list(r.stage_shaft_powers), rel=0)
    assert totals["stage_pressure_ratios"] == pytest.approx(list(r.stage_pressure_ratios), rel=0)


def test_an_extraction_must_leave_flow_for_the_next_step():
    # Splitter mass balance: a fraction 1 sends the whole flow into the branch and nothing
    # down the train (common practice) - refused when the step is made.
    with pytest.raises(InputError, match="split fraction of step 'bleed' is 1.*leaving none"):
        Extraction("bleed", fraction=1.0)
    with pytest.raises(InputError, match="split fraction of step 'bleed'"):
        Extraction("bleed", fraction=-0.1)
    with pytest.raises(SpecificationError, match="exactly one"):
        Extraction("bleed", fraction=0.2, branch_mass_flow=1.0)
    with pytest.raises(SpecificationError, match="'bleed'"):
        Train([Extraction("bleed", branch_mass_flow=2.0)]).run(AIR.state_PT(1e5, 300.0), 2.0)


def test_tables_take_their_columns_from_the_fields_table():
    # Keys and columns are plain field names of workbench.fields.FIELDS, as in
    # MachineResult.to_dict and the device results (no unit in the key).
    from workbench.fields import FIELDS
    from workbench.machines.checks import field_key
    from workbench.trains import MACHINE_FIELDS, STATION_FIELDS, TOTAL_FIELDS
    suction = AIR.state_PT(1e5, 300.0)
    r = intercooled_compressor(suction, 1.0, P_out=4e5, isentropic_efficiency=0.8,
                               cooler_outlet_temperature=300.0,
                               cooling_water_inlet_temperature=290.0,
                               cooling_water_outlet_temperature=300.0)
    stations = r.stations_frame()
    assert list(stations.columns) == ["role", *STATION_FIELDS, "phase"]
    d = r.to_dict()
    # a stage's row has the keys and values of the stage's own MachineResult.to_dict
    stage, row = r.train.machines["stage 1"].to_dict(), d["steps"][0]
    assert list(row) == ["step", "kind", *MACHINE_FIELDS]
    assert [row[k] for k in MACHINE_FIELDS] == pytest.approx(
        [stage[k] for k in MACHINE_FIELDS], rel=0, nan_ok=True)
    assert set(d["totals"]) == {*TOTAL_FIELDS, "method", "total_shaft_power",
                                "stage_pressure_ratios", "stage_shaft_powers"}
    # every number's key is a field name (devices: a stream prefix and a field name)
    for one in (*d["stations"], *d["steps"], d["totals"]):
        numbers = [k for k, v in one.items() if not isinstance(v, str)]
        assert numbers and all(field_key(k) for k in numbers)
    labelled = r.machines_frame(headers=True)
    assert [FIELDS[n].header() for n in MACHINE_FIELDS] == list(labelled.columns[1:])
    assert "shaft power [W]" in labelled.columns and "fluid power [W]" in labelled.columns
    # quality is NaN for a single-phase station (State.quality)
    assert stations["quality"].isna().all()


@pytest.mark.parametrize("make, match", [
    (lambda: CompressorStage("c", pressure_ratio="3", isentropic_efficiency=0.8),
     "pressure ratio of step 'c' must be a number"),
    (lambda: CompressorStage("c", P_out=True, isentropic_efficiency=0.8),
     "outlet pressure of step 'c' must be a number"),
    (lambda: CompressorStage("c", P_out=Q_(3, "m"), isentropic_efficiency=0.8),
     "outlet pressure of step 'c' was given in"),
    (lambda: CompressorStage("c", P_out=3e5), "isentropic or polytropic efficiency"),
    (lambda: CompressorStage("c", P_out=3e5, isentropic_efficiency=1.2),
     "isentropic efficiency of step 'c' 1.2 is outside"),
    (lambda: CompressorStage("c", P_out=3e5, isentropic_efficiency=float("nan")),
     "isentropic efficiency of step 'c' must be a finite number"),
    (lambda: CompressorStage(5, P_out=3e5, isentropic_efficiency=0.8), "train step name"),
    (lambda: Cooler("ic", outlet_temperature=None), "cooler outlet temperature of step 'ic'"),
    (lambda: Cooler("ic", outlet_temperature=300.0, pressure_drop=-1.0),
     "pressure drop of step 'ic' -1 Pa is outside"),
    (lambda: ThrottleValve("v", pressure_drop=0.0), "pressure drop of step 'v' 0 Pa is outside"),
    (lambda: PipeRun("p", 1e-300), "diameter of step 'p'"),
    (lambda: PipeRun("p", 0.1, options="length=3"), "options of pipe 'p'"),
    (lambda: Admission("a", state="steam", branch_mass_flow=1.0), "state of admission 'a'"),
    (lambda: Admission("a", state=STEAM.state_PT(1e6, 500.0), branch_mass_flow=0),
     "branch mass flow of step 'a'"),
    (lambda: PressureLoss("d", pressure_drop=1e3, mass_flow=-1.0), "mass flow of step 'd'"),
    (lambda: Train("stage 1"), "list of steps"),
])
def test_steps_take_their_numbers_through_the_input_boundary(make, match):
    with pytest.raises(WorkbenchError, match=match):
        make()


def test_steps_accept_quantities():
    # 2 bar = 2e5 Pa; 35 degC = 308.15 K (definitions)
    assert TurbineSection("t", P_out=Q_(2, "bar"), isentropic_efficiency=0.8).P_out == 2e5
    assert Cooler("c", Q_(35, "degC")).outlet_temperature == pytest.approx(308.15)


@pytest.mark.parametrize("options, match", [
    ({"stages": "2"}, "number of stages must be a whole number"),
    ({"stages": 2.5}, "number of stages must be a whole number"),
    ({"stages": True}, "number of stages must be a whole number"),
    ({"stages": 9}, "number of stages 9 is outside"),
    ({"stage_ratios": "geometric"}, "stage ratios must be one of 'equal', 'optimal'"),
    ({"stage_ratios": [0.5]}, "pressure ratio of stage 1"),
    ({"stage_ratios": 3.0}, "stage ratios must be 'equal', 'optimal' or a list"),
    ({"stage_ratios": [2.0, 2.0]}, "stage ratios has 2 values; 1 are needed"),
    ({"aftercooler": "yes"}, "aftercooler must be True or False"),
    ({"cooler_pressure_drop": -5.0}, "cooler pressure drop -5 Pa is outside"),
    ({"cooler_outlet_temperature": [300.0, 300.0]}, "cooler outlet temperature has 2 values"),
    ({"P_out": None, "pressure_ratio": 0.5}, "overall pressure ratio 0.5 is outside"),
])
def test_intercooled_compressor_options_through_the_boundary(options, match):
    suction = AIR.state_PT(1e5, 300.0)
    kwargs = dict(P_out=9e5, isentropic_efficiency=0.8, cooler_outlet_temperature=300.0)
    kwargs.update(options)
    with pytest.raises(WorkbenchError, match=match):
        intercooled_compressor(suction, 1.0, **kwargs)


def test_unknown_step_name_lists_the_steps():
    r = Train([PressureLoss("drop", pressure_drop=1e3)]).run(AIR.state_PT(1e5, 300.0), 1.0)
    with pytest.raises(InputError, match="no step 'valve'.*'drop'"):
        r.step("valve")
