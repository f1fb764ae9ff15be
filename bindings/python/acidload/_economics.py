"""What scrubbing and oil cost: per-variant cost items, the cheapest level, sweeps and Monte Carlo.

For a case with an ``economics`` section (docs/case-format.md). The figures are the program's
(``acidload costs``); the loops run in C++ with the GIL released.
"""
from __future__ import annotations

from typing import Any, Dict, List, Optional, Sequence, Tuple

import numpy as np

from . import _core
from ._case import Case

__all__ = ["costs", "Costs", "cheapest_level", "cost_sweep", "cost_monte_carlo", "COST_ITEMS"]

#: The cost items, in the order of the summary's ``per-year`` and ``per-mwh`` maps.
COST_ITEMS: List[str] = list(_core.cost_items())


def _pandas():
    try:
        import pandas
    except ImportError as e:  # pandas is optional
        raise ImportError("to_dataframe() needs pandas: pip install pandas") from e
    return pandas


def _need_economics(case: Case) -> None:
    if not isinstance(case, Case):
        raise TypeError(f"expected an acidload.Case, not {type(case).__name__}")
    if not _core.has_economics(case._file):
        from ._errors import InputError

        raise InputError(f"{case.file}: the case has no 'economics' section with the prices", key="economics")


def _index(case: Case, variant: Optional[str]) -> int:
    if variant is None:
        return 0
    names = case.names
    if variant not in names:
        raise KeyError(f"no variant named {variant!r} (the case has: {', '.join(names)})")
    return names.index(variant)


class Costs:
    """Every variant's costs: ``summary`` is the economics block of summary.json (a dict)."""

    def __init__(self, summary: Dict[str, Any]) -> None:
        self.summary: Dict[str, Any] = summary
        self.currency: str = summary["currency"]
        self.cheapest: str = summary["cheapest"]

    @property
    def names(self) -> List[str]:
        return [v["name"] for v in self.summary["variants"]]

    def total_per_mwh(self) -> Dict[str, float]:
        """Total per MWh by variant [currency/MWh]."""
        return {v["name"]: v["total-per-mwh"] for v in self.summary["variants"]}

    def per_mwh(self) -> Dict[str, Dict[str, float]]:
        """Items per MWh by variant: {variant: {item: value}} [currency/MWh]."""
        return {v["name"]: dict(v["per-mwh"]) for v in self.summary["variants"]}

    def per_year(self) -> Dict[str, Dict[str, float]]:
        """Items per year by variant: {variant: {item: value}} [currency/year]."""
        return {v["name"]: dict(v["per-year"]) for v in self.summary["variants"]}

    def to_dataframe(self, per: str = "mwh"):
        """The cost items as a pandas DataFrame: one row per variant, one column per item plus
        ``total``, ``rank`` and ``engine_h2s_ppmv``; ``per="mwh"`` (default) or ``"year"``."""
        if per not in ("mwh", "year"):
            raise ValueError("per is 'mwh' or 'year'")
        rows = []
        for v in self.summary["variants"]:
            row = dict(v["per-mwh" if per == "mwh" else "per-year"])
            row["total"] = v["total-per-mwh" if per == "mwh" else "total-per-year"]
            row["rank"] = v["rank"]
            row["engine_h2s_ppmv"] = v["engine-h2s-ppmv"]
            rows.append(row)
        return _pandas().DataFrame(rows, index=self.names)

    def sensitivity(self) -> List[Dict[str, Any]]:
        """Which price moves the answer: per price, the swing and the factor at which the cheapest changes."""
        return list(self.summary["sensitivity"]["prices"])

    def __repr__(self) -> str:
        t = ", ".join(f"{k} {v:.2f}" for k, v in self.total_per_mwh().items())
        return f"<acidload.Costs per MWh ({self.currency}): {t}; cheapest {self.cheapest!r}>"


def costs(case: Case) -> Costs:
    """Runs every variant's scrubbing train and oil changes over the record and prices them:
    the economics block of ``acidload run --out`` (the cost items per year and per MWh, totals, ranks,
    sensitivity), as a :class:`Costs`."""
    _need_economics(case)
    import json

    return Costs(json.loads(_core.run_case(case._file).summary_json())["economics"])


def _stage(case: Case, i: int, stage: Optional[int]) -> int:
    if stage is None:
        return _core.level_stage(case._file, i)
    n = len(_core.stage_names(case._file, i))
    if not 0 <= stage < n:
        raise ValueError(f"stage {stage}: the variant has stages 0 to {n - 1}")
    return stage


def cheapest_level(case: Case, *, variant: Optional[str] = None, stage: Optional[int] = None,
                   h2s_ppmv: Optional[Tuple[float, float]] = None, points: int = 13,
                   tolerance_ppmv: float = 0.05) -> Dict[str, Any]:
    """The changeout level of a media bed (or the outlet of a fixed stage) with the lowest total per
    MWh, in ``h2s_ppmv=(low, high)`` (ppmv dry; default: just above the fresh bed's outlet to the
    stage's inlet): a scan, Brent's minimiser, and forward runs either side. Returns a dict with
    ``found``, ``level_ppmv``, ``total_per_mwh``, ``verified_low_per_mwh``, ``verified_high_per_mwh``,
    ``scan_ppmv``, ``scan_total_per_mwh``, ``reason``; ``stage`` is 0-based."""
    _need_economics(case)
    i = _index(case, variant)
    k = _stage(case, i, stage)
    low, high = h2s_ppmv if h2s_ppmv is not None else _core.default_level_range(case._file, i, k)
    return _core.cheapest_level(case._file, i, k, float(low), float(high), int(points), float(tolerance_ppmv))


def cost_sweep(case: Case, h2s_ppmv: Sequence[float], *, variant: Optional[str] = None,
               stage: Optional[int] = None) -> Tuple[np.ndarray, np.ndarray]:
    """Total per MWh at each outlet (changeout) level of a stage [currency/MWh], and the items per MWh
    as an array of levels x :data:`COST_ITEMS`."""
    _need_economics(case)
    i = _index(case, variant)
    k = _stage(case, i, stage)
    levels = np.asarray(h2s_ppmv, dtype=float).ravel()
    totals, items = _core.cost_sweep(case._file, i, k, levels.tolist())
    return np.asarray(totals), np.asarray(items)


def cost_monte_carlo(case: Case, *, draws: Optional[int] = None, seed: Optional[int] = None,
                     threads: int = 0) -> Dict[str, Any]:
    """P10/P50/P90 of every variant's total per MWh and the share of draws each is cheapest, over the
    case's ``uncertainty`` inputs (prices as ``economics.*``, and parameters such as ``fuel.h2s``)."""
    _need_economics(case)
    return _core.cost_monte_carlo(case._file, int(draws or 0), -1 if seed is None else int(seed), int(threads))
