"""Properties of the lab reader's oil-life columns (docs/lab-results.md): any antioxidant-remaining
from 0 to 200 % and any fresh viscosity above 0 and up to 10000 cSt is read as written; anything else
is refused with the file, line and column of the cell. And the viscosity change the forecast and
the trend hold to limits.viscosity-change is (ν − ν_fresh)/ν_fresh, the definition (hand formula).
The readings are invented."""
import math
import pathlib
import tempfile

import importlib.util

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "acidload_suite_helpers_lab", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_helpers = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_helpers)
acidload = _helpers.need_acidload()

PROPERTY = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def read(column, cell):
    with tempfile.TemporaryDirectory() as d:
        p = pathlib.Path(d) / "lab.csv"
        p.write_text(f"charge,oil-hours,tbn,{column}\n1,250,4.0,{cell}\n")
        return acidload.read_lab_samples(p)[0].trended.get(column.split(" ")[0])


@PROPERTY
@given(st.floats(-1e4, 1e4, allow_nan=False))
def test_antioxidant_remaining_is_read_from_0_to_200_percent_and_refused_elsewhere(x):
    cell = repr(x)
    if 0 <= x <= 200:
        assert read("antioxidant-remaining [%]", cell) == x
    else:
        try:
            read("antioxidant-remaining [%]", cell)
        except acidload.InputError as e:
            assert "lab.csv:2:11" in str(e) and cell in str(e), str(e)
        else:
            raise AssertionError(f"{cell} % antioxidant remaining was accepted")


@PROPERTY
@given(st.floats(-100, 1e5, allow_nan=False), st.floats(0.5, 1e3))
def test_fresh_viscosity_is_read_above_0_up_to_10000_cst_and_the_change_is_the_definition(fresh, nu):
    cell = repr(fresh)
    if 0 < fresh <= 1e4:
        assert read("viscosity-100-fresh [mm2/s]", cell) == fresh
        change = acidload._core.viscosity_change(nu, fresh)
        assert math.isclose(change, (nu - fresh) / fresh, rel_tol=1e-12, abs_tol=1e-15)
    else:
        try:
            read("viscosity-100-fresh [mm2/s]", cell)
        except acidload.InputError as e:
            assert "lab.csv:2:11" in str(e) and "viscosity-100-fresh" in str(e), str(e)
        else:
            raise AssertionError(f"{cell} cSt fresh viscosity was accepted")
