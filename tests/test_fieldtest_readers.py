"""Tests of workbench.fieldtest.readers: unit conversions against their definitions, CSV and
Excel import, missing and non-numeric cells."""

import io

import numpy as np
import pandas as pd
import pytest

from workbench.errors import InputError
from workbench.fieldtest import read_readings
from workbench.fieldtest.readers import convert_values, parse_unit


@pytest.mark.parametrize("unit, value, expected", [
    # gauge pressure + barometer (definition of gauge pressure, ASME PTC 19.2)
    ("bar(g)", 2.0, 2.0e5 + 101325.0),
    ("barg", 2.0, 2.0e5 + 101325.0),
    ("bar(a)", 2.0, 2.0e5),
    ("kPa", 150.0, 150e3),
    # 1 psi = 0.45359237 kg * 9.80665 m/s^2 / (0.0254 m)^2 = 6894.757293 Pa (exact definitions)
    ("psig", 10.0, 10 * 0.45359237 * 9.80665 / 0.0254 ** 2 + 101325.0),
    ("psia", 10.0, 10 * 0.45359237 * 9.80665 / 0.0254 ** 2),
])
def test_pressure_units(unit, value, expected):
    got = convert_values([value], unit, "pressure", "inlet_pressure", 101325.0)
    assert got[0] == pytest.approx(expected, rel=1e-12)


def test_temperature_flow_power_units():
    # Definitions: K = degC + 273.15; degF = 1.8 degC + 32; 1 h = 3600 s; 1 t = 1000 kg
    assert convert_values([25.0], "degC", "temperature", "t")[0] == pytest.approx(298.15)
    assert convert_values([212.0], "degF", "temperature", "t")[0] == pytest.approx(373.15)
    assert convert_values([300.0], "K", "temperature", "t")[0] == pytest.approx(300.0)
    assert convert_values([36.0], "t/h", "mass_flow", "m")[0] == pytest.approx(10.0)
    assert convert_values([3600.0], "m3/h", "volume_flow", "q")[0] == pytest.approx(1.0)
    assert convert_values([7200.0], "Sm3/h", "volume_flow", "q")[0] == pytest.approx(2.0)
    assert convert_values([1.5], "MW", "power", "p")[0] == pytest.approx(1.5e6)
    assert parse_unit("m3/h", "volume_flow") == ("m**3/h", False)
    with pytest.raises(InputError, match="not a unit of pressure"):
        convert_values([1.0], "degC", "pressure", "inlet_pressure")


CSV = """time;P in;T in;P out;T out;flow
1;1,20;20,0;3,10;120,5;10,0
2;;20,1;3,12;121,0;10,1
3;1,21;broken;3,11;121,2;10,2
"""


def test_csv_import_keeps_every_row_and_notes_bad_cells():
    frame = read_readings(io.StringIO(CSV), {"inlet_pressure": "P in", "inlet_temperature": "T in",
                                             "outlet_pressure": "P out",
                                             "outlet_temperature": "T out",
                                             "mass_flow": "flow"},
                          {"inlet_pressure": "bar(g)", "inlet_temperature": "degC",
                           "outlet_pressure": "bar(g)", "outlet_temperature": "degC",
                           "mass_flow": "t/h"}, sep=";", decimal=",", ambient_pressure=1.0e5)
    assert len(frame) == 3
    assert frame.loc[0, "inlet_pressure"] == pytest.approx(2.2e5)
    assert frame.loc[0, "mass_flow"] == pytest.approx(10.0 / 3.6)
    assert list(frame["time"]) == ["1", "2", "3"]
    assert frame.loc[0, "reading_problem"] == ""
    assert "inlet pressure reading (column 'P in') is missing" in frame.loc[1, "reading_problem"]
    assert "'broken'" in frame.loc[2, "reading_problem"]
    assert np.isnan(frame.loc[2, "inlet_temperature"])


def test_excel_import(tmp_path):
    path = tmp_path / "readings.xlsx"
    pd.DataFrame({"P1 [psig]": [14.5, "n/a"], "T1 [degF]": [68.0, 70.0]}).to_excel(
        path, index=False)
    frame = read_readings(path, {"inlet_pressure": "P1 [psig]", "inlet_temperature": "T1 [degF]"},
                          {"inlet_pressure": "psig", "inlet_temperature": "degF"})
    # 14.5 psi = 99974 Pa (exact psi definition) + 101325 Pa barometer
    assert frame.loc[0, "inlet_pressure"] == pytest.approx(14.5 * 6894.757293168 + 101325.0)
    assert frame.loc[0, "inlet_temperature"] == pytest.approx(293.15)
    assert "not a number" in frame.loc[1, "reading_problem"]


def test_map_errors_name_the_problem():
    raw = io.StringIO("a,b\n1,2\n")
    with pytest.raises(InputError, match="not in the file"):
        read_readings(raw, {"inlet_pressure": "c"}, {"inlet_pressure": "bar"})
    with pytest.raises(InputError, match="unknown reading name"):
        read_readings(io.StringIO("a\n1\n"), {"suction": "a"}, {"suction": "bar"})
    with pytest.raises(InputError, match="no unit given"):
        read_readings(io.StringIO("a\n1\n"), {"inlet_pressure": "a"}, {})


# ---------------------------------------------------------------------- hostile units and files
from workbench.errors import ReadingsError, WorkbenchError  # noqa: E402
from workbench.fieldtest.readers import read_table  # noqa: E402

MAP = {"inlet_pressure": "P1", "inlet_temperature": "T1"}
UNITS = {"inlet_pressure": "bar", "inlet_temperature": "degC"}


@pytest.mark.parametrize("unit", ["kg/(s", "bar)", "**", "bar; import os", "", None, 5,
                                  "x" * 200, "degC", "m3/h"])
def test_bad_pressure_units_are_refused_by_column_and_unit(unit):
    # a unit text goes through the input boundary (workbench.units.parse_unit) before pint
    with pytest.raises(InputError) as info:
        read_readings(b"P1,T1\n1,20\n", MAP, {**UNITS, "inlet_pressure": unit})
    message = str(info.value)
    assert "inlet pressure" in message
    if isinstance(unit, str) and unit.strip():
        assert "'P1'" in message and repr(unit[:40])[:-1] in message


def test_unit_with_an_open_bracket_names_the_column():
    # the case of the issue: "kg/(s" made pint raise its TokenError
    with pytest.raises(InputError, match=r"mass flow \(column 'F'\).*'kg/\(s'"):
        read_readings(b"F\n1\n", {"mass_flow": "F"}, {"mass_flow": "kg/(s"})


@pytest.mark.parametrize("unit, expected", [
    ("bar(g)", ("bar", True)), ("psig", ("psi", True)), ("kPa(a)", ("kPa", False)),
    ("bar abs", ("bar", False)), ("bar gauge", ("bar", True)), ("MPa", ("MPa", False)),
])
def test_gauge_and_absolute_marks_are_kept(unit, expected):
    assert parse_unit(unit, "pressure") == expected


def test_speed_units_by_definition():
    # 1 rev/s = 60 rev/min; 1 rad/s = 60 / (2 pi) rev/min (definition of the radian)
    assert convert_values([3000.0], "rpm", "speed", "speed")[0] == 3000.0
    assert convert_values([50.0], "Hz", "speed", "speed")[0] == pytest.approx(3000.0)
    assert convert_values([100 * np.pi], "rad/s", "speed", "speed")[0] == pytest.approx(3000.0)
    with pytest.raises(InputError, match="shaft speed"):
        convert_values([1.0], "m/s", "speed", "speed")


def test_unknown_kind_is_refused():
    with pytest.raises(InputError, match="kind of reading"):
        convert_values([1.0], "bar", "stress", "x")


@pytest.mark.parametrize("cmap, units, match", [
    ("P1", UNITS, "column map must be a dict"),
    (MAP, ["bar"], "units must be a dict"),
    ({"inlet_pressure": 3}, UNITS, "column map entry 'inlet_pressure'"),
    (MAP, {**UNITS, "suction": "bar"}, "unknown reading name.*'suction'"),
])
def test_maps_are_validated_by_name(cmap, units, match):
    with pytest.raises(InputError, match=match):
        read_readings(b"P1,T1\n1,20\n", cmap, units)


def _xlsx_bytes(tmp_path):
    path = tmp_path / "good.xlsx"
    pd.DataFrame({"P1": [1.0, 2.0], "T1": [20.0, 21.0]}).to_excel(path, index=False)
    return path.read_bytes()


def test_bytes_and_paths_give_the_same_table(tmp_path):
    content = _xlsx_bytes(tmp_path)
    from_bytes = read_readings(content, MAP, UNITS, file_name="upload.xlsx")
    from_path = read_readings(tmp_path / "good.xlsx", MAP, UNITS)
    from_str = read_readings(str(tmp_path / "good.xlsx"), MAP, UNITS)
    pd.testing.assert_frame_equal(from_bytes, from_path)
    pd.testing.assert_frame_equal(from_str, from_path)
    # 1 bar = 1e5 Pa (definition); K = degC + 273.15
    assert list(from_path["inlet_pressure"]) == [1.0e5, 2.0e5]
    assert list(from_path["inlet_temperature"]) == pytest.approx([293.15, 294.15])
    # CSV bytes with a byte-order mark and a Latin-1 degree sign in a header
    csv = "P1;T1 °C\n1,5;20\n".encode("cp1252")
    frame = read_readings(csv, {"inlet_pressure": "P1", "inlet_temperature": "T1 °C"}, UNITS,
                          sep=";", decimal=",")
    assert frame.loc[0, "inlet_pressure"] == pytest.approx(1.5e5)
    frame = read_readings(codecs_bom() + b"P1,T1\n1,20\n", MAP, UNITS)
    assert frame.loc[0, "inlet_pressure"] == 1.0e5


def codecs_bom():
    import codecs
    return codecs.BOM_UTF8


def _bad_files(tmp_path):
    good = _xlsx_bytes(tmp_path)
    (tmp_path / "truncated.xlsx").write_bytes(good[: len(good) // 2])
    (tmp_path / "text.xlsx").write_text("P1,T1\n1,20\n")
    (tmp_path / "folder.csv").mkdir()
    (tmp_path / "junk.csv").write_bytes(bytes(np.random.default_rng(7).integers(
        0, 256, 5000, dtype=np.uint8)))
    (tmp_path / "empty.csv").write_bytes(b"")
    (tmp_path / "blank.csv").write_text("\n  \n")
    (tmp_path / "header.csv").write_text("P1,T1\n")
    (tmp_path / "header.xlsx").write_bytes(b"")
    pd.DataFrame({"P1": [], "T1": []}).to_excel(tmp_path / "header.xlsx", index=False)
    (tmp_path / "old.xls").write_bytes(b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 600)
    (tmp_path / "zip.csv").write_bytes(_zip_without_workbook())
    (tmp_path / "ragged.csv").write_text("P1,T1\n1,2\n1,2,3,4\n")
    (tmp_path / "dupes.csv").write_text("P1, P1 ,T1\n1,2,3\n")
    return {
        "truncated.xlsx": "damaged or truncated",
        "text.xlsx": "not an Excel workbook",
        "folder.csv": "is a folder",
        "junk.csv": "binary data",
        "empty.csv": "is empty",
        "blank.csv": "is empty",
        "header.csv": "header row but no readings",
        "header.xlsx": "header row but no readings",
        "old.xls": "old binary Excel format",
        "zip.csv": "not a readable Excel workbook",
        "ragged.csv": "could not be read as a table",
        "dupes.csv": "more than one column named 'P1'",
        "missing.csv": "does not exist",
    }


def _zip_without_workbook():
    import zipfile
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w") as archive:
        archive.writestr("hello.txt", "not a workbook")
    return buffer.getvalue()


def test_broken_files_get_messages_naming_the_file(tmp_path):
    for name, expected in _bad_files(tmp_path).items():
        path = tmp_path / name
        with pytest.raises(ReadingsError) as info:
            read_readings(path, MAP, UNITS)
        assert name in str(info.value) and expected in str(info.value), (name, info.value)
        if path.is_file():  # the same bytes given as an upload
            with pytest.raises(ReadingsError, match=expected):
                read_table(path.read_bytes(), file_name=name)


def test_size_limit_and_wrong_source_types(tmp_path):
    with pytest.raises(ReadingsError, match="larger than the limit of 10 bytes"):
        read_table(b"P1,T1\n1,20\n", file_name="big.csv", max_bytes=10)
    (tmp_path / "big.csv").write_text("P1,T1\n1,20\n")
    with pytest.raises(ReadingsError, match="larger than the limit"):
        read_table(tmp_path / "big.csv", max_bytes=10)
    for source in (None, 12, ["a.csv"], {"P1": [1]}):
        with pytest.raises(InputError, match="must be a path, the file's bytes"):
            read_table(source)
    with pytest.raises(ReadingsError, match="cannot be opened"):
        read_table("bad\0name.csv")
    with pytest.raises(ReadingsError, match="no worksheet 'Nope'"):
        read_table(_xlsx_bytes(tmp_path), file_name="a.xlsx", sheet_name="Nope")


def test_cells_that_overflow_are_noted_not_raised():
    frame = read_readings(b"P1,T1\n1e400,20\n1e300,20\n-inf,20\n2,20\n", MAP, UNITS)
    assert np.isnan(frame["inlet_pressure"][:3]).all()
    assert "not a finite number" in frame.loc[0, "reading_problem"]
    assert "too large" in frame.loc[1, "reading_problem"]
    assert "not a finite number" in frame.loc[2, "reading_problem"]
    assert frame.loc[3, "inlet_pressure"] == 2.0e5 and frame.loc[3, "reading_problem"] == ""


def test_a_4000_column_file_reads_completely():
    # the wide logger export of the issue: every column kept, in order, values converted.
    # (It used to take ~14 s because columns were inserted one by one; speed itself is not
    # asserted here.)
    n = 4000
    header = ",".join(f"c{i}" for i in range(n))
    rows = [",".join(str(r + i / 1000) for i in range(n)) for r in range(20)]
    content = ("\n".join([header, *rows]) + "\n").encode()
    frame = read_readings(content, {"inlet_pressure": "c1", "inlet_temperature": "c3999"},
                          {"inlet_pressure": "bar", "inlet_temperature": "degC"},
                          file_name="wide.csv")
    assert frame.shape == (20, n - 2 + 3)
    assert list(frame.columns[:3]) == ["c0", "c2", "c3"]
    assert list(frame.columns[-3:]) == ["inlet_pressure", "inlet_temperature",
                                        "reading_problem"]
    # 1 bar = 1e5 Pa; K = degC + 273.15 (definitions)
    assert frame["inlet_pressure"].tolist() == pytest.approx([(r + 0.001) * 1e5
                                                              for r in range(20)])
    assert frame["inlet_temperature"].tolist() == pytest.approx([r + 3.999 + 273.15
                                                                 for r in range(20)])
    assert frame.loc[19, "c3998"] == "22.998"


def test_no_raw_exception_from_random_bytes():
    # whatever the bytes, the reader returns a frame or a WorkbenchError (never a raw one)
    rng = np.random.default_rng(11)
    seeds = [b"P1,T1\n", b"PK\x03\x04", b"\xef\xbb\xbf", b"", b"P1;T1\n1;\"2\n"]
    for i in range(200):
        tail = bytes(rng.integers(0, 256, int(rng.integers(0, 300)), dtype=np.uint8))
        content = seeds[i % len(seeds)] + tail
        for name in ("x.csv", "x.xlsx"):
            try:
                read_readings(content, MAP, UNITS, file_name=name)
            except WorkbenchError:
                pass


def test_a_workbook_that_expands_beyond_reason_is_refused():
    # a "zip bomb": 10 MB of zeros compress to about 10 kB (deflate, RFC 1951)
    import zipfile
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", zipfile.ZIP_DEFLATED) as archive:
        archive.writestr("xl/worksheets/sheet1.xml", b"0" * 10_000_000)
    content = buffer.getvalue()
    assert len(content) < 100_000
    with pytest.raises(ReadingsError, match="expands to 10,000,000 bytes"):
        read_table(content, file_name="bomb.xlsx", max_bytes=100_000)
