"""Properties of the case's `lab` section (docs/lab-results.md "Lab settings in the case"): any
precision above 0 and up to its cap (10 mg KOH/g, 100 A/cm) is read as written and anything else is
refused at its file, line and column with the key as written; an alarm-level pair is accepted exactly
when both lie in the quantity's range, the critical level is at or past the caution level in the
quantity's direction and, for the quantities bound to a limit, neither is past the case's limit
(water: limits.water 0.5 % by default) — a refusal names the line and column. Numbers of a magnitude
below 1e-300 (other than 0) are refused by the number reader everywhere (io/quantity.cpp). The figures
are invented."""
import math
import pathlib

import importlib.util

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "acidload_suite_helpers_lab_settings", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_helpers = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_helpers)
acidload = _helpers.need_acidload()

PROPERTY = settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
HEAD = ("format-version: 1\nfuel:\n  composition: {CH4: 55 %, CO2: 45 %}\n  h2s: 300 ppmv\n"
        "engine:\n  power: 1 MW\n  electrical-efficiency: 40 %\noil:\n  volume: 600 L\nlab:\n")  # lab: is line 10
def readable(x):
    return x == 0 or abs(x) >= 1e-300


READINGS = {"tbn-d2896": ("mg KOH/g", 10), "tbn-d4739": ("mg KOH/g", 10), "tan": ("mg KOH/g", 10),
            "san": ("mg KOH/g", 10), "oxidation": ("A/cm", 100), "nitration": ("A/cm", 100)}


def load(text):
    return acidload.load_case_text(text, file_name="p.yaml")


@PROPERTY
@given(st.sampled_from(sorted(READINGS)), st.floats(-1e3, 1e3, allow_nan=False), st.booleans())
def test_a_precision_is_read_inside_its_range_and_refused_at_its_cell_outside(reading, x, per_lab):
    unit, cap = READINGS[reading]
    cell = f"{x!r} {unit}"
    if per_lab:  # the value on line 13, column 9 + len(reading) + 2
        text = HEAD + "  labs:\n    Some Lab:\n      precision:\n" + f"        {reading}: {cell}\n"
        where, key = f"p.yaml:14:{9 + len(reading) + 2}", f"lab.labs.Some Lab.precision.{reading}"
    else:
        text = HEAD + "  precision:\n" + f"    {reading}: {cell}\n"
        where, key = f"p.yaml:12:{5 + len(reading) + 2}", f"lab.precision.{reading}"
    if 0 < x <= cap and readable(x):
        lab = load(text).lab
        got = (lab["labs"]["Some Lab"]["precision"] if per_lab else lab["precision"])[reading.replace("-", "_")]
        assert math.isclose(got, x, rel_tol=1e-12)
    else:
        try:
            load(text)
        except acidload.InputError as e:
            assert where in str(e) and f"'{key}'" in str(e) and repr(x) in str(e) and "expected" in str(e), str(e)
        else:
            raise AssertionError(f"{reading} precision {cell} was accepted")


LEVELS = {  # quantity: (unit as written, range low, high, falling, the default case's limit or None)
    "fe": ("ppm", 0, 1e6, False, None), "si": ("mg/kg", 0, 1e6, False, None),
    "water": ("%", 0, 100, False, 0.5), "tbn": ("mg KOH/g", 0, 80, True, None),
    "antioxidant-remaining": ("%", 0, 200, True, 25.0), "i-ph": ("", 0, 14, True, 4.5),
}


@PROPERTY
@given(st.sampled_from(sorted(LEVELS)), st.floats(-50, 300, allow_nan=False), st.floats(-50, 300, allow_nan=False))
def test_an_alarm_pair_is_accepted_exactly_when_in_range_ordered_and_not_past_the_limit(quantity, caution, critical):
    unit, low, high, falling, limit = LEVELS[quantity]
    u = f" {unit}" if unit else ""
    text = HEAD + "  alarm-levels:\n" + f"    {quantity}: {{caution: {caution!r}{u}, critical: {critical!r}{u}}}\n"
    in_range = low <= caution <= high and low <= critical <= high and readable(caution) and readable(critical)
    ordered = critical <= caution if falling else critical >= caution
    past = limit is not None and ((caution < limit or critical < limit) if falling else (caution > limit or critical > limit))
    if in_range and ordered and not past:
        got = load(text).lab["alarm_levels"][quantity]
        assert math.isclose(got[0], caution, rel_tol=1e-12, abs_tol=1e-300)
        assert math.isclose(got[1], critical, rel_tol=1e-12, abs_tol=1e-300)
    else:
        try:
            load(text)
        except acidload.InputError as e:
            assert "p.yaml:12:" in str(e) and f"lab.alarm-levels.{quantity}" in str(e) and "expected" in str(e), str(e)
        else:
            raise AssertionError(f"{quantity} caution {caution} critical {critical} was accepted")
