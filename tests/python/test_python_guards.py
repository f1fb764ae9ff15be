"""The package's argument checks: sweeps range-checked and interruptible, complex and masked arrays
refused, Monte Carlo's draws/seed/threads whole numbers in range, every bad value an
acidload.InputError (never OverflowError, RecursionError or a silent cast). The limits checked are
the project's documented ones (the case file's ranges, docs/case-format.md; the program's
uncertainty options), not values from its output."""
import os
import signal
import threading
import time

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from conftest import ROOT, need_acidload

acidload = need_acidload()
CASE = acidload.load_case(ROOT / "cases" / "demo-site.yaml")
HISTORY = acidload.load_case(ROOT / "cases" / "demo-site-history.yaml")


@pytest.mark.parametrize("lever,value", [("oil_volume_l", 1e-300), ("oil_volume_l", 1e300), ("oil_volume_l", 0.5),
                                         ("oil_volume_l", 200_000), ("fresh_tbn_mg_koh_per_g", 0.1),
                                         ("fresh_tbn_mg_koh_per_g", 200), ("jacket_water_out_c", -10),
                                         ("jacket_water_out_c", 200), ("h2s_ppmv", -1), ("h2s_ppmv", 2e5)])
def test_sweep_values_outside_the_case_file_ranges_are_refused(lever, value):
    with pytest.raises(acidload.InputError):
        acidload.drain_interval(CASE, **{lever: [600.0 if lever == "oil_volume_l" else 10.0, value]})


def test_complex_masked_text_and_non_finite_sweeps_are_refused():
    for values in (np.array([600 + 1j]), np.ma.array([600.0, 700.0], mask=[False, True]), "600", ["600"],
                   [float("nan")], [float("inf")], [10**400], np.array([True])):
        with pytest.raises(acidload.InputError):
            acidload.drain_interval(CASE, oil_volume_l=values)
    unmasked = np.ma.array([600.0, 700.0], mask=[False, False])
    assert np.array_equal(acidload.drain_interval(CASE, oil_volume_l=unmasked),
                          acidload.drain_interval(CASE, oil_volume_l=[600.0, 700.0]))


@pytest.mark.parametrize("kw", [dict(threads=-5, draws=100), dict(draws="100"), dict(draws=2.5), dict(draws=0),
                                dict(draws=10**30), dict(draws=True), dict(seed=-1), dict(seed=1.5),
                                dict(threads=1000), dict(threads="2")])
def test_monte_carlo_arguments_are_checked(kw):
    with pytest.raises(acidload.InputError):
        acidload.monte_carlo(HISTORY, **kw)


def test_a_long_sweep_can_be_interrupted():
    values = np.linspace(0, 600, 200_000)
    timer = threading.Timer(0.5, lambda: os.kill(os.getpid(), signal.SIGINT))
    start = time.monotonic()
    timer.start()
    with pytest.raises(KeyboardInterrupt):
        acidload.drain_interval(CASE, h2s_ppmv=values)
    assert time.monotonic() - start < 5  # the whole sweep would take minutes


def test_nested_and_cyclic_dicts_and_huge_numbers_raise_input_error():
    d = {}
    d["x"] = d
    deep = cur = {}
    for _ in range(5000):
        cur["a"] = {}
        cur = cur["a"]
    for bad in (d, deep):
        with pytest.raises(acidload.InputError):
            acidload.case_from_dict(bad)
    with pytest.raises(acidload.InputError):
        acidload.solve_for_interval(CASE, target_h=10**400, h2s_ppmv=(0, 800))
    with pytest.raises(acidload.InputError):
        acidload.molar_volume(10**400)


def test_solve_defaults_come_from_the_library():
    low, high, tol = acidload._core.default_search(acidload._case._engine_case(CASE, None), "h2s")
    assert (low, high, tol) == (0.0, 3000.0, 0.01)  # the program's solve --help states this range
    a = acidload.solve_for_interval(CASE, target_h=4000, h2s_ppmv=None)
    assert a.range == (0.0, 3000.0)


anything = st.one_of(st.none(), st.booleans(), st.integers(), st.floats(allow_nan=True, allow_infinity=True),
                     st.complex_numbers(), st.text(max_size=8), st.lists(st.floats(), max_size=3),
                     st.integers(min_value=10**300, max_value=10**400))


@settings(max_examples=150, deadline=None)
@given(draws=anything, seed=anything, threads=anything)
def test_property_monte_carlo_bad_arguments_raise_only_input_error(draws, seed, threads):
    ok = lambda v, lo, hi: isinstance(v, int) and not isinstance(v, bool) and lo <= v <= hi
    if (draws is None or ok(draws, 1, 10_000_000)) and (seed is None or ok(seed, 0, 9 * 10**15)) and ok(threads, 0, 256):
        return  # a valid call (None: the case's own setting): not what this property is about
    with pytest.raises(acidload.InputError):
        acidload.monte_carlo(HISTORY, draws=draws, seed=seed, threads=threads)


@settings(max_examples=150, deadline=None)
@given(value=anything)
def test_property_sweep_values_run_or_raise_input_error(value):
    try:
        out = acidload.drain_interval(CASE, oil_volume_l=value)
    except acidload.InputError:
        return
    assert np.all(np.isfinite(out)) and np.all(np.asarray(out) > 0)
