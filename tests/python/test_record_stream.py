"""A record CSV is read row by row (no tree of the whole file): a bad cell anywhere in a long record
is reported at its own file, line and column with the column's name and the value as written, by
the program and by the Python package alike, and `run --out` writes nothing when it is refused.
The expectations are the file's own layout (which line and column the bad cell was written at) and
the project's rules (exit code 3, no half-written results), not values from acidload's output."""
import subprocess

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from conftest import acidload_program, demo_site_base, need_acidload

ROWS = 20_000


def site_with_record(csv_path):
    """The demo site's case with its record replaced by the CSV file (variants, uncertainty, run dropped)."""
    return demo_site_base() + f"\nrecord:\n  file: {csv_path}\n"


def write_record(folder, bad_row, column, cell):
    """A record of ROWS hourly rows, row `bad_row` (0-based) with `cell` in `column` (0 hours, 1 H2S,
    2 load); returns the case path, the CSV path and the bad cell's 1-based line and column."""
    rows = [["1", str(300 + i % 97), str(80 + i % 13)] for i in range(ROWS)]
    rows[bad_row][column] = cell
    csv = folder / "record.csv"
    csv.write_text("hours [h],h2s [ppmv],load [%]\n" + "".join(",".join(r) + "\n" for r in rows))
    case = folder / "case.yaml"
    case.write_text(site_with_record(csv))
    col = 1 + sum(len(c) + 1 for c in rows[bad_row][:column])
    return case, csv, bad_row + 2, col


NAMES = ["hours", "h2s", "load"]
BAD = st.sampled_from(["x", "12 parsecs", "-5", "1e999", "150", "nan", "3..4"])


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(bad_row=st.integers(0, ROWS - 1), column=st.integers(0, 2), cell=BAD)
def test_a_bad_cell_anywhere_is_found_at_its_place(tmp_path_factory, bad_row, column, cell):
    if column < 2 and cell == "150":
        cell = "-150"  # 150 h and 150 ppmv are fine figures; a load of 150 % is over the range
    folder = tmp_path_factory.mktemp("rec")
    case, csv, line, col = write_record(folder, bad_row, column, cell)
    out = folder / "out"
    p = subprocess.run([str(acidload_program()), "run", str(case), "--out", str(out)], capture_output=True, text=True,
                       timeout=120)
    assert p.returncode == 3, p.stderr
    head = p.stderr.splitlines()[0]
    assert head.startswith(f"acidload: {csv}:{line}:{col}: 'record[{bad_row}].{NAMES[column]}' = '{cell}"), head
    assert not out.exists()  # refused before anything is written
    acidload = need_acidload()
    try:
        acidload.load_case(str(case))
        raise AssertionError("accepted")
    except acidload.InputError as e:
        assert (e.file, e.line, e.column) == (str(csv), line, col)
        assert e.key == f"record[{bad_row}].{NAMES[column]}"


def test_every_row_becomes_a_segment(tmp_path):
    """The whole record is read, one segment per row, by the program and by Python."""
    acidload = need_acidload()
    case, _, _, _ = write_record(tmp_path, ROWS - 1, 2, "55")
    p = subprocess.run([str(acidload_program()), "check", str(case)], capture_output=True, text=True, timeout=120)
    assert p.returncode == 0, p.stderr
    assert acidload.load_case(str(case)).variants[0]._engine_case.segments == ROWS


def test_a_streamed_record_runs_after_the_working_folder_changed(tmp_path, monkeypatch):
    """The record is read again by each run: by the path it was found at when the case was loaded,
    whatever the working folder is at the run (a case named by a relative path)."""
    acidload = need_acidload()
    case, _, _, _ = write_record(tmp_path, 0, 2, "85")
    monkeypatch.chdir(tmp_path)
    (tmp_path / "case.yaml").write_text(site_with_record("record.csv"))  # the record relative to the case
    loaded = acidload.load_case("case.yaml")
    before = loaded.run().summary["variants"][0]
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    monkeypatch.chdir(elsewhere)
    after = loaded.run().summary["variants"][0]
    assert after == before
    assert loaded.variants[0]._engine_case.segments == ROWS  # read in for the studies, from the same file
