"""The one table of result fields (workbench.fields.FIELDS): names, kinds and units agree.

References
----------
* SI brochure (BIPM, 9th edition 2019): the unit of a quotient of quantities is the quotient
  of their units, so a change of efficiency (dimensionless) per kelvin is in 1/K.
* Pint's unit registry (an outside library) for the dimension of each unit text.
"""

import re

import pytest

import workbench as wb
from workbench.fields import FIELDS, ResultField, _table
from workbench.units import SI_UNITS, to_si, ureg


def test_every_kind_has_an_si_unit_pint_understands():
    for f in FIELDS.values():
        assert f.kind in SI_UNITS, f.name
        ureg.parse_units(f.unit or "dimensionless")  # raises for a unit text pint cannot read


def test_descriptions_carry_no_unit_of_their_own():
    # The unit of a field comes from its kind; a unit written in brackets in the description
    # could contradict it (as "[1/K]" on a dimensionless row once did).
    for f in FIELDS.values():
        assert not re.search(r"\[[^\]]*\]", f.description), f.name


def test_efficiency_change_per_kelvin_is_in_per_kelvin():
    # d(eta)/dT: dimensionless over kelvin = 1/K (SI brochure, quotient of units).
    f = FIELDS["outlet_temperature_sensitivity"]
    assert f.unit == "1/K" and f.header() == "efficiency change per kelvin [1/K]"
    assert ureg.parse_units(f.unit).dimensionality == (1 / ureg.kelvin).dimensionality
    # a Quantity per degree Celsius is the same (a temperature difference), per mK 1000 times
    assert to_si(wb.Q_(0.01, "1/delta_degC"), f.kind, "sensitivity") == pytest.approx(0.01)
    assert to_si(wb.Q_(1e-5, "1/mK"), f.kind, "sensitivity") == pytest.approx(1e-2)


def test_a_name_described_twice_is_refused():
    one = ResultField("power", "power", "fluid power", "Power.")
    with pytest.raises(ValueError, match="'power' is described twice"):
        _table((one, one))
    assert list(_table((one,))) == ["power"]


def test_train_totals_are_fields():
    from workbench.trains import MACHINE_FIELDS, STATION_FIELDS, TOTAL_FIELDS

    for name in (*TOTAL_FIELDS, *MACHINE_FIELDS, *STATION_FIELDS, "total_shaft_power",
                 "stage_pressure_ratios", "stage_shaft_powers"):
        assert name in FIELDS, name
