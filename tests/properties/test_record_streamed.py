"""Properties of a CSV record read as `acidload check`, `acidload run` and `acidload.load_case` read
it: checked row by row when the case is loaded and kept as its description, then read again from
the file by each run.
- Any record, good or bad, gives what the same record gives when its segments are held (the reader
  that holds them is tested against the same rows written inline, tests/unit/test_record_stream.cpp):
  the same refusal at the same file, line, column, key and value, or the same run.
- A record file changed after loading, by any single byte that keeps its size, is refused by the
  run with the file named, never run on the changed rows; an unchanged file runs.
The records are invented."""
import json
import os
import pathlib
import tempfile

import importlib.util

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "acidload_suite_helpers_streamed", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_helpers = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_helpers)
acidload = _helpers.need_acidload()
_core = acidload._core

PROPERTY = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def site_with_record(csv_path):
    """The demo site's case with its record replaced by the CSV file (variants, uncertainty, run dropped)."""
    return _helpers.demo_site_base() + f"\nrecord:\n  file: {csv_path}\nrun:\n  output-interval: 24 h\n"


# cells: mostly good figures, now and then one that is out of range, not a number, empty or quoted
GOOD_HOURS = st.sampled_from(["1", "0.5", "24", "2.25", "150"])
GOOD_H2S = st.sampled_from(["0", "120", "300.5", "451", "1e3", "  75  "])
GOOD_LOAD = st.sampled_from(["50", "85", "100.0", "", "\"90\""])
ODD = st.sampled_from(["x", "-5", "1e999", "nan", "3..4", "12 parsecs", "\"7", "1,2", "9 ppmv", "150 %", "-0"])
ODD_LINE = st.sampled_from(["", "# a remark", "1,300", "1,300,85,4"])


@st.composite
def record_lines(draw):
    """Up to 40 good rows, then up to two mistakes: a cell made odd, or an odd line put in."""
    rows = draw(st.lists(st.tuples(GOOD_HOURS, GOOD_H2S, GOOD_LOAD), min_size=0, max_size=40))
    lines = [list(r) for r in rows]
    for _ in range(draw(st.integers(0, 2))):
        if not lines or draw(st.booleans()):
            lines.insert(draw(st.integers(0, len(lines))), draw(ODD_LINE))
        else:
            i = draw(st.integers(0, len(lines) - 1))
            if isinstance(lines[i], list):
                lines[i][draw(st.integers(0, 2))] = draw(ODD)
    return [x if isinstance(x, str) else ",".join(x) for x in lines]


LINES = record_lines()


def outcome(case_path, stream):
    """The refusal as (file, line, column, key, value, expected), or the run's summary."""
    try:
        c = _core.load_case(str(case_path), [], stream=stream)
        assert all(v.streamed == stream for v in c.variants)
        summary = json.loads(_core.run_case(c).summary_json())
        summary.pop("case-file", None)
        return ("ran", json.dumps(summary, sort_keys=True))
    except acidload.InputError as e:
        return ("refused", e.file, e.line, e.column, e.key, e.value, e.expected)


@PROPERTY
@given(lines=LINES, crlf=st.booleans())
def test_a_streamed_record_is_refused_or_run_as_the_held_record_is(lines, crlf):
    with tempfile.TemporaryDirectory() as d:
        csv = pathlib.Path(d) / "record.csv"
        end = "\r\n" if crlf else "\n"
        csv.write_bytes(("hours [h],h2s [ppmv],load [%]" + end + "".join(x + end for x in lines)).encode())
        case = pathlib.Path(d) / "case.yaml"
        case.write_text(site_with_record(csv))
        held, streamed = outcome(case, False), outcome(case, True)
        assert streamed == held


@PROPERTY
@given(rows=st.integers(1, 300), where=st.floats(0, 1, exclude_max=True), new=st.sampled_from(list(b"0123456789,x#")))
def test_a_record_file_changed_after_loading_is_refused_by_the_run(rows, where, new):
    with tempfile.TemporaryDirectory() as d:
        csv = pathlib.Path(d) / "record.csv"
        text = "hours [h],h2s [ppmv],load [%]\n" + "".join(f"1,{300 + i % 7},{80 + i % 5}\n" for i in range(rows))
        csv.write_text(text)
        case = pathlib.Path(d) / "case.yaml"
        case.write_text(site_with_record(csv))
        loaded = acidload.load_case(case)
        assert loaded.run().summary is not None  # unchanged: runs
        data = bytearray(text.encode())
        at = int(where * len(data))
        if data[at] == new:
            return  # the same byte: the file is what it was
        stat = os.stat(csv)
        data[at] = new
        csv.write_bytes(bytes(data))
        os.utime(csv, ns=(stat.st_atime_ns, stat.st_mtime_ns))  # the same size and time: only the bytes differ
        try:
            loaded.run()
            raise AssertionError("a record changed since loading was run")
        except acidload.InputError as e:
            assert e.file == str(csv)
            assert e.key == "record.file"
            assert "changed since" in e.expected
