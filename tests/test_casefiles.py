"""Tests of workbench.casefiles: the one safe JSON reader for case and setup files and the
schema check that every loader uses.

Outside references: RFC 8259 (JSON: objects, numbers without NaN/Infinity, names "SHOULD be
unique"), Python's own json module as an independent parser of the shipped files, and the
definitions of the SI units (1 bar = 1e5 Pa)."""

from __future__ import annotations

import json
import os
import pathlib

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench import Q_
from workbench.casefiles import (
    MAX_DEPTH,
    Choice,
    Exact,
    Flag,
    ListOf,
    MappingOf,
    Number,
    Object,
    Text,
    Whole,
    load_json_file,
    parse_json,
    read_and_validate,
    read_json,
    validate,
)
from workbench.errors import CaseFileError, WorkbenchError

CASES = pathlib.Path(__file__).resolve().parents[1] / "workbench" / "cases"


# ---------------------------------------------------------------------- sources
def test_shipped_case_files_read_as_the_json_module_reads_them():
    # Source: Python's json module (an independent parser) on the same files
    files = sorted(CASES.glob("*.json"))
    assert files
    for path in files:
        expected = json.loads(path.read_text(encoding="utf-8"))
        assert read_json(path, "case") == expected
        assert read_json(path.read_bytes(), "case") == expected
        assert read_json(path.read_text(encoding="utf-8"), "case", text=True) == expected
        assert load_json_file(str(path), "case") == expected


def test_text_is_never_opened_as_a_path(tmp_path, monkeypatch):
    # a file whose name is the text given: it must not be read
    monkeypatch.chdir(tmp_path)
    (tmp_path / "case.json").write_text('{"secret": 1}')
    with pytest.raises(CaseFileError, match="given as a str is refused"):
        read_json("case.json", "case")
    with pytest.raises(CaseFileError, match="not valid JSON"):
        read_json("case.json", "case", text=True)
    with pytest.raises(CaseFileError, match="not valid JSON"):
        parse_json("case.json", "case")
    with pytest.raises(CaseFileError, match="not valid JSON"):
        parse_json(b"case.json", "case")
    # only an explicit path object (or load_json_file) reads it
    assert read_json(pathlib.Path("case.json"), "case") == {"secret": 1}


@pytest.mark.parametrize("source", [12, 1.5, None, ["{}"], object(), True])
def test_other_sources_are_refused(source):
    with pytest.raises(CaseFileError, match="must be bytes, a pathlib.Path"):
        read_json(source, "setup")


def test_file_problems_name_the_file(tmp_path):
    with pytest.raises(CaseFileError, match="'.*nothing.json' does not exist"):
        read_json(tmp_path / "nothing.json", "case")
    with pytest.raises(CaseFileError, match="is a folder"):
        read_json(tmp_path, "case")
    (tmp_path / "big.json").write_text('{"a": "' + "x" * 2000 + '"}')
    with pytest.raises(CaseFileError, match="larger than the limit of 100 bytes"):
        read_json(tmp_path / "big.json", "case", max_bytes=100)
    with pytest.raises(CaseFileError, match="cannot be read"):
        load_json_file("bad\0name.json", "case")
    with pytest.raises(CaseFileError, match="path must be text or a path"):
        load_json_file(b"/etc/hostname", "case")


# ---------------------------------------------------------------------- hostile content
@pytest.mark.parametrize("content, match", [
    # RFC 8259 section 2: a JSON text is any value; our files are objects
    ("[1, 2]", "JSON object .* not a list"),
    ('"text"', "not a text"),
    ("null", "not null"),
    ("3", "not a number"),
    ("", "not valid JSON"),
    ("{", "not valid JSON"),
    ("{'a': 1}", "not valid JSON"),
    # deep nesting: a message, never a RecursionError
    ("[" * 100_000 + "]" * 100_000, "nested deeper than"),
    ('{"a": ' + "[" * 100_000 + "]" * 100_000 + "}", "nested deeper than"),
    ('{"a": ' + "{\"b\": " * 5000 + "1" + "}" * 5000 + "}", "nested deeper than"),
    # huge integers (Python's own int parser refuses above 4300 digits with a raw ValueError)
    ('{"a": ' + "9" * 5000 + "}", "case key 'a' is an integer of 5000 digits"),
    ('{"a": {"b": -' + "1" * 40 + "}}", "case key 'a.b' is an integer of 40 digits"),
    # RFC 8259 section 6: NaN and Infinity are not JSON numbers
    ('{"a": NaN}', "case key 'a' is NaN"),
    ('{"a": [1, Infinity]}', r"case key 'a\[1\]' is Infinity"),
    ('{"a": -Infinity}', "is -Infinity"),
    ('{"a": 1e999}', "case key 'a' is the number 1e999, which overflows"),
    # RFC 8259 section 4: names SHOULD be unique; a repeated one would silently win
    ('{"a": 1, "a": 2}', "case key.*'a' appear more than once"),
    ('{"b": {"x": 1, "x": 1}}', "'b.x' appear more than once"),
    # null characters: raw (invalid JSON anyway) and escaped in values and names
    ('{"a": 1}\x00', "null character"),
    ('{"a": "x\\u0000"}', "case key 'a' holds a null character"),
    ('{"k\\u0000": 1}', "null character"),
])
def test_hostile_content_is_refused_by_name(content, match):
    for source, text in ((content, True), (content.encode("utf-8"), False)):
        with pytest.raises(CaseFileError, match=match):
            read_json(source, "case", text=text)


def test_nesting_within_the_limit_is_read():
    inner = "[" * (MAX_DEPTH - 1) + "]" * (MAX_DEPTH - 1)
    assert read_json('{"a": ' + inner + "}", "case", text=True)["a"] is not None
    # brackets inside strings are not nesting
    assert read_json('{"a": "' + "[{" * 1000 + '"}', "case", text=True) == {"a": "[{" * 1000}


def test_not_utf8_and_size_limits():
    with pytest.raises(CaseFileError, match="not UTF-8"):
        read_json(b'{"a": "\xff"}', "setup")
    assert read_json(b'\xef\xbb\xbf{"a": 1}', "setup") == {"a": 1}  # a byte-order mark
    with pytest.raises(CaseFileError, match="larger than the limit of 10 bytes"):
        read_json(b'{"a": "0123456789"}', "setup", max_bytes=10)
    with pytest.raises(CaseFileError, match="larger than the limit"):
        read_json('{"a": "0123456789"}', "setup", text=True, max_bytes=10)


def test_a_dict_source_gets_the_same_checks():
    cyclic = {}
    cyclic["x"] = cyclic
    with pytest.raises(CaseFileError, match="nested deeper"):
        read_json(cyclic, "case")
    with pytest.raises(CaseFileError, match="case key 'a' is nan"):
        read_json({"a": float("nan")}, "case")
    with pytest.raises(CaseFileError, match="more than 30 digits"):
        read_json({"a": [10 ** 5000]}, "case")
    with pytest.raises(CaseFileError, match="holds a set"):
        read_json({"a": {1, 2}}, "case")
    with pytest.raises(CaseFileError, match="key 1 that is not text"):
        read_json({"a": {1: 2}}, "case")
    assert read_json({"a": (1, 2)}, "case") == {"a": [1, 2]}


@settings(max_examples=300, derandomize=True, deadline=None)
@given(st.one_of(st.binary(max_size=200), st.text(max_size=200),
                 st.recursive(st.none() | st.booleans() | st.floats() | st.integers()
                              | st.text(max_size=5),
                              lambda inner: st.lists(inner, max_size=3)
                              | st.dictionaries(st.text(max_size=3), inner, max_size=3),
                              max_leaves=30).map(lambda v: json.dumps({"v": v}))))
def test_any_content_gives_a_dict_or_a_case_file_error(content):
    try:
        data = read_json(content, "case", text=isinstance(content, str))
    except CaseFileError:
        return
    assert isinstance(data, dict)


# ---------------------------------------------------------------------- the schema check
SCHEMA = {
    "format": Exact(value="demo case"),
    "format_version": Exact(value=1),
    "title": Text(required=False, default="", empty=True),
    "inputs": Object(schema={
        "machine": Choice(("compressor", "turbine")),
        "inlet_pressure_Pa": Number("pressure", low=0.0, low_open=True),
        "efficiency": Number(low=0.0, high=1.0, low_open=True),
        "points": Whole(low=2, high=200, required=False, default=11),
        "composition": MappingOf(values=Number(low=0.0, high=1.0), required=False),
        "speeds_rpm": ListOf(item=Number(low=0.0), max_items=3, required=False),
        "design_power_W": Number("power", low=0.0, low_open=True, nullable=True),
        "cooled": Flag(required=False, default=False),
    }),
}
GOOD = {"format": "demo case", "format_version": 1,
        "inputs": {"machine": "turbine", "inlet_pressure_Pa": 4.0e6, "efficiency": 0.8,
                   "composition": {"Methane": 0.9, "Ethane": 0.1},
                   "speeds_rpm": [3000, 3600], "design_power_W": None}}


def test_a_good_case_is_converted_with_defaults():
    out = validate(GOOD, SCHEMA, "case")
    assert out["title"] == "" and out["inputs"]["points"] == 11
    assert out["inputs"]["cooled"] is False
    assert out["inputs"]["design_power_W"] is None
    assert out["inputs"]["inlet_pressure_Pa"] == 4.0e6
    assert isinstance(out["inputs"]["inlet_pressure_Pa"], float)
    assert out["inputs"]["speeds_rpm"] == [3000.0, 3600.0]
    # the same through bytes, in one call
    assert read_and_validate(json.dumps(GOOD).encode(), SCHEMA, "case") == out


def _with(**inputs):
    case = json.loads(json.dumps(GOOD))
    for key, value in inputs.items():
        if value is _DROP:
            del case["inputs"][key]
        else:
            case["inputs"][key] = value
    return case


_DROP = object()


@pytest.mark.parametrize("case, match", [
    (_with(inlet_pressure_Pa=-1.0), "case key 'inputs.inlet_pressure_Pa' -1 Pa is outside"),
    (_with(inlet_pressure_Pa=0), "'inputs.inlet_pressure_Pa' 0 Pa is outside"),
    (_with(inlet_pressure_Pa="4e6"), "'inputs.inlet_pressure_Pa' must be a number"),
    (_with(inlet_pressure_Pa=True), "'inputs.inlet_pressure_Pa' must be a number"),
    (_with(inlet_pressure_Pa=None), "'inputs.inlet_pressure_Pa' is missing"),
    (_with(inlet_pressure_Pa=[1.0]), "'inputs.inlet_pressure_Pa' must be a single number"),
    (_with(inlet_pressure_Pa=10 ** 29), "'inputs.inlet_pressure_Pa' .* is too large"),
    (_with(inlet_pressure_Pa=_DROP), "'inputs.inlet_pressure_Pa' is missing"),
    (_with(efficiency=1.2), "'inputs.efficiency' 1.2 is outside the allowed range"),
    (_with(machine="pump"), "'inputs.machine' must be one of 'compressor', 'turbine'"),
    (_with(machine=1), "'inputs.machine' must be one of"),
    (_with(points=2.5), "'inputs.points' must be a whole number"),
    (_with(points=5.0), "'inputs.points' must be a whole number"),
    (_with(points=1), "'inputs.points' 1 is outside"),
    (_with(points=True), "'inputs.points' must be a whole number"),
    (_with(composition={"Methane": 1.5}), "'inputs.composition.Methane' 1.5 is outside"),
    (_with(composition={}), "'inputs.composition' has 0 entries"),
    (_with(composition=[0.5]), "'inputs.composition' must be an object"),
    (_with(composition={"": 0.5}), "case key 'inputs.composition' name '' must be a non-empty text"),
    (_with(speeds_rpm=[1, 2, 3, 4]), "'inputs.speeds_rpm' has 4 entries"),
    (_with(speeds_rpm=[1, "x"]), r"'inputs.speeds_rpm\[1\]' must be a number"),
    (_with(cooled="yes"), "'inputs.cooled' must be True or False"),
    (_with(design_power_W=-5), "'inputs.design_power_W' -5 W is outside"),
    (_with(extra=1), r"unknown case key\(s\) 'inputs.extra' \(allowed in 'inputs'"),
    ({**GOOD, "other": 1}, r"unknown case key\(s\) 'other'"),
    ({**GOOD, "format": "something else"}, "case key 'format' must be 'demo case'"),
    ({**GOOD, "format_version": True}, "case key 'format_version' must be 1"),
    ({**GOOD, "format_version": 1.0}, "case key 'format_version' must be 1"),
    ({**GOOD, "title": "a\x07b"}, "case key 'title' .* control characters"),
    ({**GOOD, "title": "x" * 300}, "case key 'title' is 300 characters long"),
    ({**GOOD, "inputs": []}, "case key 'inputs' must be an object"),
    ([], "a case must be an object"),
])
def test_wrong_values_are_refused_naming_the_key(case, match):
    with pytest.raises(CaseFileError, match=match):
        validate(case, SCHEMA, "case")


def test_a_plain_callable_is_a_spec_and_its_errors_become_case_file_errors():
    def column(value, name):
        if value not in ("P1", "T1"):
            raise WorkbenchError(f"{name}: the readings file has no column {value!r}")
        return value
    assert validate({"c": "P1"}, {"c": column}, "setup") == {"c": "P1"}
    with pytest.raises(CaseFileError, match="setup key 'c': the readings file has no column"):
        validate({"c": "X"}, {"c": column}, "setup")


def test_numbers_pass_through_the_units_boundary():
    # a Number spec is workbench.units.to_si: Quantities are converted (1 bar = 1e5 Pa) and
    # their dimension checked, as for every other entry point
    spec = {"p": Number("pressure", low=0.0, low_open=True)}
    assert validate({"p": Q_(2.0, "bar")}, spec, "case") == {"p": 2.0e5}
    with pytest.raises(CaseFileError, match="case key 'p' was given in .*not a unit of pressure"):
        validate({"p": Q_(2.0, "m")}, spec, "case")
    with pytest.raises(WorkbenchError, match="kind of quantity"):
        Number("pressur")


def test_environment_untouched_by_reading(tmp_path):
    # reading never writes: the folder is as it was
    before = sorted(os.listdir(tmp_path))
    read_json(b'{"a": 1}', "case")
    assert sorted(os.listdir(tmp_path)) == before


def test_defaults_are_copied_and_optional_objects_fill_their_own():
    schema = {"inputs": Object(required=False, schema={
        "composition": MappingOf(values=Number(low=0.0, high=1.0),
                                 default={"Methane": 1.0}),
        "points": Whole(low=2, default=11)})}
    first = validate({}, schema, "case")
    assert first == {"inputs": {"composition": {"Methane": 1.0}, "points": 11}}
    first["inputs"]["composition"]["Ethane"] = 0.5
    assert validate({}, schema, "case")["inputs"]["composition"] == {"Methane": 1.0}
    needed = {"inputs": Object(required=False, schema={"p": Number("pressure")})}
    with pytest.raises(CaseFileError, match="case key 'inputs.p' is missing"):
        validate({}, needed, "case")
