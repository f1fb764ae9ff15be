"""A CSV record of plain rows (read straight from their bytes, a repeated row taking the segment made
before) runs exactly as the same rows written inline in the case's YAML, which go through the
registry's reader key by key and share none of the CSV reader's code: the same summary, figure for
figure, or a refusal by both. Rows repeat (a small pool of figures), numbers are written with up to
15 decimals, now and then with leading zeros or a '+'; the records are invented."""
import json
import pathlib
import tempfile

import importlib.util

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "acidload_suite_helpers_plain_rows", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_helpers = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_helpers)
acidload = _helpers.need_acidload()
_core = acidload._core


def site_with(record_yaml):
    """The demo site's case with its record replaced (variants, uncertainty, run dropped)."""
    return _helpers.demo_site_base() + "\n" + record_yaml + "run:\n  output-interval: 24 h\n"


def number(draw, low, high):
    x = draw(st.floats(low, high, allow_nan=False))
    text = f"{x:.{draw(st.integers(0, 15))}f}"
    form = draw(st.integers(0, 9))
    return "00" + text if form == 0 else "+" + text if form == 1 else text


@st.composite
def records(draw):
    """Rows of hours, H2S and load drawn from a pool of a few rows, so that many repeat."""
    pool = [(number(draw, 0.1, 48), number(draw, 0, 2000), number(draw, 30, 100))
            for _ in range(draw(st.integers(1, 5)))]
    return [draw(st.sampled_from(pool)) for _ in range(draw(st.integers(1, 80)))]


def outcome(case_path):
    try:
        c = _core.load_case(str(case_path), [], stream=True)
        summary = json.loads(_core.run_case(c).summary_json())
        summary.pop("case-file", None)
        return ("ran", json.dumps(summary, sort_keys=True))
    except acidload.InputError as e:
        return ("refused",)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(rows=records(), crlf=st.booleans())
def test_plain_csv_rows_run_as_the_same_rows_inline(rows, crlf):
    with tempfile.TemporaryDirectory() as d:
        csv = pathlib.Path(d) / "record.csv"
        end = "\r\n" if crlf else "\n"
        csv.write_bytes(("hours [h],h2s [ppmv],load [%]" + end + "".join(",".join(r) + end for r in rows)).encode())
        from_csv = pathlib.Path(d) / "csv.yaml"
        from_csv.write_text(site_with(f"record:\n  file: {csv}\n"))
        inline = pathlib.Path(d) / "inline.yaml"
        inline.write_text(site_with("record:\n  segments:\n" + "".join(
            f"    - {{hours: {h} h, h2s: {s} ppmv, load: {l} %}}\n" for h, s, l in rows)))
        a, b = outcome(from_csv), outcome(inline)
        assert a[0] == b[0]
        assert a == b
