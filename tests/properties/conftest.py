"""Fluids shared by the property tests (made once per module: they are costly to create)."""

import pytest

import workbench as wb


@pytest.fixture(scope="module")
def water():
    return wb.Fluid("Water")


@pytest.fixture(scope="module")
def water_if97():
    return wb.Fluid("Water", backend="IF97")


@pytest.fixture(scope="module")
def natural_gas():
    return wb.Fluid({"Methane": 0.85, "Ethane": 0.08, "Propane": 0.04, "Nitrogen": 0.03})
