"""Running a case: results as numpy arrays and plain dicts, pandas frames when pandas is installed."""
from __future__ import annotations

import json
import os
from typing import Any, Dict, Iterator, List, Optional, Union

import numpy as np

from . import _core
from ._case import Case

__all__ = ["run", "Result", "VariantResult", "TRAJECTORY_UNITS"]

#: The columns of a trajectory and their units. ``tbn`` is read by the limits' method
#: (``limits.tbn-method``), the method the TBN limit is judged by.
TRAJECTORY_UNITS: Dict[str, str] = {
    "engine_hours": "h",        # since the start of the record
    "oil_hours": "h",           # since the last oil change
    "calendar_hours": "h",      # since the start of the record
    "starts": "-",              # engine starts since the start of the record
    "charge": "-",              # which oil charge (1 = the one the record starts with, as trajectories.csv)
    "tbn": "mg KOH/g",          # by the limits' method
    "tbn_d2896": "mg KOH/g",
    "tbn_d4739": "mg KOH/g",
    "tan": "mg KOH/g",          # D664
    "san": "mg KOH/g",          # D664 strong acid number
    "base": "mg KOH/g",         # reactive base b
    "strong_acid": "mg KOH/g",  # free strong acid s (= SAN)
    "weak_acid": "mg KOH/g",    # free organic acids a_w
    "salts": "mg KOH/g",        # neutralised-acid salts c_n
    "additive_acidity": "mg KOH/g",  # t_add
    "oxidation": "A/cm",
    "nitration": "A/cm",
    "oil_mass": "kg",           # oil in circulation
    "antioxidant": "-",         # antioxidant reserve, share of fresh
    "viscosity_rise": "-",      # kinematic viscosity at 100 degC over fresh, less 1
    "antioxidant_remaining": "% of fresh",  # the antioxidant reserve, as trajectories.csv
    "viscosity_change": "% over fresh",     # kinematic viscosity at 100 degC, as trajectories.csv
}


def _pandas():
    try:
        import pandas
    except ImportError as e:  # pandas is optional
        raise ImportError("to_dataframe() needs pandas: pip install pandas") from e
    return pandas


class VariantResult:
    """The run of one variant.

    Attributes:
        name: the variant's name.
        summary: its entry of the JSON summary (a dict: units in the key names, as summary.json).
        trajectory: dict of numpy arrays, one per column of :data:`TRAJECTORY_UNITS`, one element
            per trajectory point (the start, every output point and every segment end).
    """

    __slots__ = ("_run", "_index", "name", "summary", "_trajectory")

    def __init__(self, run: "_core.CaseRun", index: int, summary: Dict[str, Any]) -> None:
        self._run = run
        self._index = index
        self.name: str = summary["name"]
        self.summary: Dict[str, Any] = summary
        self._trajectory: Optional[Dict[str, np.ndarray]] = None

    @property
    def trajectory(self) -> Dict[str, np.ndarray]:
        if self._trajectory is None:
            t = self._run.trajectory(self._index)
            for a in t.values():
                a.flags.writeable = False  # the results are read-only: a copy for changes
            self._trajectory = t
        return self._trajectory

    @property
    def drain_interval_h(self) -> Optional[float]:
        """Oil hours at the first oil-condition limit reached [h], or None when none is reached: not in
        the record, or not within the planned maximum hours (then see :attr:`no_limit_within_h`)."""
        return self.summary["drain-interval-h"]

    @property
    def limit_reached(self) -> Optional[str]:
        """The oil-condition limit that ends the first charge ("tbn-fall", "antioxidant", …), or None."""
        return self.summary["limit-reached"]

    @property
    def no_limit_within_h(self) -> Optional[float]:
        """When no oil-condition limit ends the first charge: the hours it ran without one [h] (the planned
        maximum, ``limits.max-hours``, or the end of the record); None when a limit was reached."""
        return self.summary["no-limit-within-h"]

    @property
    def steady_state(self) -> Optional[Dict[str, float]]:
        """Where the oil settles when no oil-condition limit is reached (continuous makeup), or None."""
        return self.summary["steady-state"]

    @property
    def exhaust(self) -> Dict[str, Any]:
        """Engine-out exhaust: SO2, SO3, HCl, HF, NOx (as NO2), H2O, O2 in ppmv and mg/Nm3, wet, dry and dry
        at the case's O2 reference (``o2-reference``, ``o2-of-air``)."""
        return self.summary["exhaust"]

    @property
    def warnings(self) -> List[Dict[str, str]]:
        """Plausibility warnings (not refusals): key, value and reason."""
        return self.summary["warnings"]

    @property
    def fresh_and_average(self) -> Dict[str, Optional[float]]:
        """Fresh-oil figures (first segment, fresh charge) beside their averages over the charge to its first
        limit: sulfur share to the oil [-] and TBN rate [mg KOH/g per h]."""
        s = self.summary
        return {"sulfur_share_to_oil_fresh": s["sulfur-share-to-oil"],
                "sulfur_share_to_oil_charge_average": s["sulfur-share-to-oil-charge-average"],
                "tbn_rate_fresh": s["initial-tbn-rate-mg-koh-per-g-per-h"],
                "tbn_rate_charge_average": s["tbn-rate-charge-average-mg-koh-per-g-per-h"]}

    @property
    def limits(self) -> Dict[str, Dict[str, Any]]:
        """Each limit: reached-at-h, value, limit, margin (units as the reading: mg KOH/g, A/cm or h)."""
        return self.summary["limits"]

    @property
    def rates(self) -> Dict[str, Any]:
        """The first segment's oil-balance rates: strong_acid [g KOH/h], sulfurous_fresh [g KOH/h],
        nitration [A/cm·kg/h], oxidation [A/cm per h], organic_acid [mg KOH/g per h],
        consumption [kg/h], continuous_makeup."""
        return self._run.first_rates(self._index)

    def to_dataframe(self):
        """The trajectory as a pandas DataFrame (needs pandas)."""
        return _pandas().DataFrame({k: np.asarray(v) for k, v in self.trajectory.items()})

    def __repr__(self) -> str:
        d = self.drain_interval_h
        return (f"<acidload.VariantResult {self.name!r}: "
                + (f"drain interval {d:.0f} h ({self.limit_reached})>" if d is not None else "no limit reached>"))


class Result:
    """The run of every variant of a case.

    Attributes:
        summary: the JSON summary as a dict, exactly as ``acidload run CASE --out DIR`` writes
            summary.json (units in the key names; ``summary["variants"]`` one entry per variant).
        variants: one :class:`VariantResult` per variant, base first; also ``result["name"]``.
        trajectory: every variant's trajectory, concatenated as in trajectories.csv: the columns of
            :data:`TRAJECTORY_UNITS` plus ``variant`` (the variant's name per point).
    """

    def __init__(self, run: "_core.CaseRun") -> None:
        self._run = run
        self.summary: Dict[str, Any] = json.loads(run.summary_json())
        self.variants: List[VariantResult] = [VariantResult(run, i, s) for i, s in enumerate(self.summary["variants"])]
        self._trajectory: Optional[Dict[str, np.ndarray]] = None

    @property
    def names(self) -> List[str]:
        return [v.name for v in self.variants]

    def __getitem__(self, name: Union[str, int]) -> VariantResult:
        if isinstance(name, int):
            return self.variants[name]
        for v in self.variants:
            if v.name == name:
                return v
        raise KeyError(f"no variant named {name!r} (the result has: {', '.join(self.names)})")

    def __iter__(self) -> Iterator[VariantResult]:
        return iter(self.variants)

    def __len__(self) -> int:
        return len(self.variants)

    @property
    def trajectory(self) -> Dict[str, np.ndarray]:
        if self._trajectory is None:
            parts = [v.trajectory for v in self.variants]
            out: Dict[str, np.ndarray] = {
                "variant": np.concatenate([np.full(len(p["tan"]), v.name, dtype=object)
                                           for p, v in zip(parts, self.variants)])}
            for k in TRAJECTORY_UNITS:
                out[k] = np.concatenate([p[k] for p in parts])
            self._trajectory = out
        return self._trajectory

    def to_dataframe(self):
        """Every trajectory as one long pandas DataFrame with a ``variant`` column (needs pandas)."""
        return _pandas().DataFrame(self.trajectory)

    def summary_table(self):
        """One row per variant: drain interval, limit, TBN/TAN/SAN at the end, acid inflow — a pandas
        DataFrame indexed by variant name (needs pandas)."""
        rows = []
        for v in self.summary["variants"]:
            row = {"drain_interval_h": v["drain-interval-h"], "limit_reached": v["limit-reached"],
                   "no_limit_within_h": v["no-limit-within-h"],
                   "s_to_oil_pct_fresh": 100 * v["sulfur-share-to-oil"],
                   "s_to_oil_pct_charge_average": (None if v["sulfur-share-to-oil-charge-average"] is None
                                                   else 100 * v["sulfur-share-to-oil-charge-average"]),
                   "tbn_fall_per_100h_fresh": -100 * v["initial-tbn-rate-mg-koh-per-g-per-h"],
                   "tbn_fall_per_100h_charge_average": -100 * v["tbn-rate-charge-average-mg-koh-per-g-per-h"]}
            for k, x in v["at-drain-or-end"].items():
                row[k.replace("-", "_") + "_at_end"] = x
            for k, x in v["acid-inflow-g-koh-per-h"].items():
                row[k.replace("-", "_") + "_g_koh_per_h"] = x
            row["sulfur_share_to_oil"] = v["sulfur-share-to-oil"]
            row["initial_tbn_rate_mg_koh_per_g_per_h"] = v["initial-tbn-rate-mg-koh-per-g-per-h"]
            rows.append(row)
        return _pandas().DataFrame(rows, index=self.names)

    def trajectories_csv(self) -> str:
        """The trajectories as CSV text, as the program writes trajectories.csv."""
        return self._run.trajectories_csv()

    def write(self, folder: Union[str, "os.PathLike[str]"]) -> None:
        """Writes summary.json and trajectories.csv into folder, atomically, as ``acidload run --out``
        does, with the same rules: the folder becomes acidload's own (a .acidload-results marker
        inside); an existing folder that is not (or holds files acidload did not write), or the folder
        of the case file, is refused with acidload.Error and left as it was; a symbolic link is
        written through."""
        if not isinstance(folder, (str, os.PathLike)):
            raise TypeError(f"write() takes a folder name, not {type(folder).__name__}")
        self._run.write_results(os.fspath(folder))

    def summary_csv(self) -> str:
        """The comparison table as CSV text (one row per variant and charge, charges from 1, units in the
        header), as ``acidload run CASE --summary-csv FILE`` writes it."""
        return self._run.summary_csv()

    def report_html(self, lab: Optional[Union[str, "os.PathLike[str]"]] = None,
                    parameters: Optional[List[str]] = None) -> str:
        """The report page as HTML text, made by the same C++ writer as ``acidload report``.

        lab: a lab CSV file: its readings are drawn against the model fitted to them (``parameters``,
        default model.liner-uptake and model.oxidation-rate) with a 90 % band."""
        return self._run.report_html(os.fspath(lab) if lab is not None else "", list(parameters or []))

    def report(self, path: Union[str, "os.PathLike[str]"], lab: Optional[Union[str, "os.PathLike[str]"]] = None,
               parameters: Optional[List[str]] = None) -> None:
        """Writes the report page (one self-contained HTML file: inline CSS and SVG, no scripts, nothing
        fetched; prints on A4) as ``acidload report CASE --out path`` does: atomically, and an existing
        file is replaced only if it is an acidload report (else acidload.Error, the file left as it was)."""
        self._run.write_report(os.fspath(path), os.fspath(lab) if lab is not None else "", list(parameters or []))

    def __repr__(self) -> str:
        return f"<acidload.Result of {self.summary['case'] or self.summary['case-file']!r}: {len(self)} variant(s)>"


def run(case: Case) -> Result:
    """Runs every variant of a case through the oil balance (the GIL released while the C++ library
    runs) and returns a :class:`Result`: the summary as a dict, trajectories as numpy arrays."""
    if not isinstance(case, Case):
        raise TypeError(f"run() takes an acidload.Case, not {type(case).__name__}")
    return Result(_core.run_case(case._file))
