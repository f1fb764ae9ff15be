"""Recovery and coverage on synthetic plants made by an independent model (tests/synthetic/plant.py,
NumPy, not acidload; the ways it differs from acidload's model are documented there): three recorded
charges fitted, the fourth predicted. The checks are against the plants' own intervals, not against
acidload. Targets (docs/lab-results.md): most plants within +-10 % on the next charge's interval; the
P5-P95 band holds the truth about 90 % of the time. `tests/synthetic/run.py` prints the figures."""
import sys

import pytest

from conftest import ROOT, need_acidload

sys.path.insert(0, str(ROOT / "tests" / "synthetic"))
import run as synthetic_run  # noqa: E402


@pytest.mark.reference(quantity="next charge's drain interval on synthetic plants", tolerance="+-10 % for most; 90 % band",
                       unit="h", source="tests/synthetic/plant.py (an independent NumPy plant model)")
def test_most_plants_within_ten_percent_and_the_band_holds_the_truth():
    acidload = need_acidload()
    rows = synthetic_run.evaluate(acidload, plants_per_kind=12, draws=150)
    f = synthetic_run.figures(rows)
    print(f)
    # 24 plants: a 90 % band holds the truth in 21.6 of them on average (binomial sd 1.5 plants).
    # Figures of this run when written (seeds 1-12, 1001-1012): see docs/lab-results.md for the 40-plant
    # figures before and after the band's model-form error became the held-out spread's excess.
    assert f["all"]["coverage_90"] >= 0.75
    assert f["all"]["within_10pct"] >= 0.4
    assert f["following the model"]["within_10pct"] >= 0.6
    assert f["all"]["median_band_width"] < 0.6  # a band that holds the truth by being endless is no band
