"""Economics from Python: the program's figures, the DataFrame of cost items, the cheapest level, and
properties (Hypothesis) of the cost model on the shipped cost case (invented prices):
- a higher media price never makes more scrubbing cheaper (relative to less scrubbing);
- a higher oil price never makes less scrubbing cheaper (relative to more scrubbing);
- the cheapest changeout level over a fixed scan never falls as the media price rises, never rises as
  the oil price rises.
"More scrubbing" is a lower changeout level of the same bed, or a scrubbed variant against raw gas.
"""
import json
import re
import subprocess

import pytest

from conftest import ROOT, acidload_program, need, need_acidload

COSTS = ROOT / "cases" / "demo-site-costs.yaml"
BED = "iron-oxide bed"


def load(**prices):
    """The cost case with prices replaced in its economics section (values as written, e.g. '2 per kg')."""
    acidload = need_acidload()
    text = COSTS.read_text(encoding="utf-8")
    for key, value in prices.items():
        text, n = re.subn(rf"^(  {key}: )[^#\n]*", rf"\g<1>{value}   ", text, count=1, flags=re.M)
        assert n == 1, key
    return acidload.load_case_text(text, file_name="costs.yaml", base_dir=str(ROOT / "cases"))


def test_python_costs_are_the_program_s(tmp_path):
    acidload = need_acidload()
    out = tmp_path / "out"
    subprocess.run([str(acidload_program()), "run", str(COSTS), "--out", str(out)], check=True, capture_output=True,
                   timeout=300)
    program = json.loads((out / "summary.json").read_text(encoding="utf-8"))["economics"]
    c = acidload.costs(acidload.load_case(COSTS))
    assert c.summary == program
    assert acidload.run(acidload.load_case(COSTS)).summary["economics"] == program
    assert c.currency == "EUR" and c.cheapest == program["cheapest"]
    ranks = sorted(program["variants"], key=lambda v: v["total-per-mwh"])
    assert [v["rank"] for v in ranks] == list(range(1, len(ranks) + 1))
    for v in program["variants"]:  # the total is the sum of the items, per year and per MWh
        assert sum(v["per-year"].values()) == pytest.approx(v["total-per-year"], rel=1e-9)  # JSON keeps 10 digits
        assert sum(v["per-mwh"].values()) == pytest.approx(v["total-per-mwh"], rel=1e-9)
        assert v["total-per-year"] / v["mwh-per-year"] == pytest.approx(v["total-per-mwh"], rel=1e-9)


def test_cost_items_as_a_dataframe():
    acidload = need_acidload()
    need("pandas")
    c = acidload.costs(acidload.load_case(COSTS))
    df = c.to_dataframe()
    assert list(df.index) == c.names
    assert set(acidload.COST_ITEMS) <= set(df.columns)
    assert ((df[acidload.COST_ITEMS].sum(axis=1) - df["total"]).abs() <= 1e-9 * df["total"]).all()  # 10 digits
    assert c.to_dataframe(per="year").loc["raw gas", "media"] == 0


def test_cheapest_level_verified_and_on_the_sweep():
    acidload = need_acidload()
    case = acidload.load_case(COSTS)
    a = acidload.cheapest_level(case, variant=BED)
    assert a["found"], a["reason"]
    assert a["total_per_mwh"] <= a["verified_low_per_mwh"] + 1e-12
    assert a["total_per_mwh"] <= a["verified_high_per_mwh"] + 1e-12
    totals, items = acidload.cost_sweep(case, [a["level_ppmv"]] + list(a["scan_ppmv"]), variant=BED)
    assert totals[0] == pytest.approx(a["total_per_mwh"], rel=1e-12)  # forward, at the answer
    assert (totals[1:] >= totals[0] - 1e-12).all()
    assert items.shape == (len(totals), len(acidload.COST_ITEMS))


def test_monte_carlo_of_the_costs():
    acidload = need_acidload()
    m = acidload.cost_monte_carlo(acidload.load_case(COSTS), draws=40, threads=2)
    assert m["draws"] == 40
    assert sum(m["cheapest_share"]) == pytest.approx(1)
    for lo, mid, hi in zip(m["p10_per_mwh"], m["p50_per_mwh"], m["p90_per_mwh"]):
        assert lo <= mid <= hi
    again = acidload.cost_monte_carlo(acidload.load_case(COSTS), draws=40, threads=1)
    assert again["p50_per_mwh"] == m["p50_per_mwh"]  # the counter-based stream: any thread count


def test_no_economics_section_is_an_input_error():
    acidload = need_acidload()
    with pytest.raises(acidload.InputError):
        acidload.costs(acidload.load_case(ROOT / "cases" / "demo-site.yaml"))


# ---- properties ---------------------------------------------------------------------------------
LEVELS = [20.0, 60.0, 120.0, 200.0, 270.0]  # changeout levels of the bed [ppmv dry], more scrubbing first


def sweep(**prices):
    acidload = need_acidload()
    totals, _ = acidload.cost_sweep(load(**prices), LEVELS, variant=BED)
    return totals


def test_property_media_price_never_favours_more_scrubbing():
    hypothesis = need("hypothesis")
    st = need("hypothesis.strategies")

    @hypothesis.settings(max_examples=15, deadline=None, derandomize=True)
    @hypothesis.given(low=st.floats(0.1, 5), rise=st.floats(0.05, 5), oil=st.floats(0.5, 8))
    def check(low, rise, oil):
        a = sweep(**{"iron-oxide-price": f"{low} per kg", "oil-price": f"{oil} per L"})
        b = sweep(**{"iron-oxide-price": f"{low + rise} per kg", "oil-price": f"{oil} per L"})
        for i in range(len(LEVELS)):
            for j in range(i + 1, len(LEVELS)):  # i scrubs more than j
                assert b[i] - b[j] >= a[i] - a[j] - 1e-9, (LEVELS[i], LEVELS[j])
        # over a fixed scan, the cheapest level never falls as media gets dearer
        assert LEVELS[int(b.argmin())] >= LEVELS[int(a.argmin())]

    check()


def test_property_oil_price_never_favours_less_scrubbing():
    acidload = need_acidload()
    hypothesis = need("hypothesis")
    st = need("hypothesis.strategies")

    @hypothesis.settings(max_examples=15, deadline=None, derandomize=True)
    @hypothesis.given(low=st.floats(0.5, 6), rise=st.floats(0.05, 6), media=st.floats(0.1, 5))
    def check(low, rise, media):
        a = sweep(**{"oil-price": f"{low} per L", "iron-oxide-price": f"{media} per kg"})
        b = sweep(**{"oil-price": f"{low + rise} per L", "iron-oxide-price": f"{media} per kg"})
        for i in range(len(LEVELS)):
            for j in range(i + 1, len(LEVELS)):  # j scrubs less than i
                assert b[j] - b[i] >= a[j] - a[i] - 1e-9, (LEVELS[i], LEVELS[j])
        assert LEVELS[int(b.argmin())] <= LEVELS[int(a.argmin())]
        # and between variants: raw gas against each scrubbed one
        ca = acidload.costs(load(**{"oil-price": f"{low} per L", "iron-oxide-price": f"{media} per kg"})).total_per_mwh()
        cb = acidload.costs(load(**{"oil-price": f"{low + rise} per L", "iron-oxide-price": f"{media} per kg"})).total_per_mwh()
        for name in ca:
            if name != "raw gas":
                assert cb["raw gas"] - cb[name] >= ca["raw gas"] - ca[name] - 1e-9, name

    check()
