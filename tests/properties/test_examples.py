"""The Examples sections of the property modules run as written (doctest)."""

import doctest
import importlib

import pytest

MODULES = ["arrays", "composition", "fluid", "saturation", "solver", "state", "transport"]


@pytest.mark.parametrize("name", MODULES)
def test_examples_run(name):
    module = importlib.import_module(f"workbench.properties.{name}")
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS)
    assert result.attempted > 0 and result.failed == 0
