"""Calibration to the plant's lab history, the forecast of the current charge, and Monte Carlo.

    table = acidload.read_lab("cases/demo-site-lab.csv")   # pandas DataFrame, or a dict of numpy arrays
    fit = acidload.fit(case, "cases/demo-site-lab.csv")      # parameters chosen for what the lab reports
    fit = acidload.fit(case, table, ["model.liner-uptake", "model.oxidation-rate"], precision={"tan": 0.1})
    fit.estimates, fit.standard_errors, fit.correlation, fit.residuals, fit.s2, fit.flags, fit.held
    fit.write_overlay("fitted.yaml", case_file=..., lab_file=...)   # for acidload run --overlay
    acidload.forecast(fit)                  # lab-first: hours left to each limit, `already`, next sample due
    acidload.predict(fit)                   # the next charge's drain interval, P5/P50/P95
    acidload.monte_carlo(case)              # the case's uncertainty section

Parameters are named by their case-file keys (``model.so3-share``, ``engine.blow-by``, …; see
:data:`PARAMETERS`) and carried in the core's units (shares as fractions, K, A/cm per h, …).
Each has a range a fit never leaves and a weak prior (docs/lab-results.md); one the samples do not
respond to is held at its prior and flagged. Fewer readings than parameters raise FitRefusedError.
"""
from __future__ import annotations

import os
from typing import Any, Dict, List, Optional, Sequence, Tuple, Union

import numpy as np

from . import _core
from ._case import Case, Variant, _engine_case
from ._checks import number, whole
from ._errors import InputError

__all__ = ["read_lab", "read_lab_samples", "fit", "Fit", "forecast", "predict", "trend", "monte_carlo", "fit_residuals",
           "PARAMETERS"]

#: Keys of the parameters that can be fitted or varied.
PARAMETERS: List[str] = list(_core.parameter_keys())


def read_lab_samples(path: Union[str, os.PathLike]) -> list:
    """Lab results from a CSV file as a list of samples (columns in docs/lab-results.md); a mistake
    raises InputError with the file, line and column."""
    return list(_core.read_lab_samples(os.fspath(path)))


class _Samples(list):
    """The samples behind a lab table; shared, not copied, when pandas copies the table's attrs."""

    def __deepcopy__(self, memo: Dict[int, Any]) -> "_Samples":
        return self


class LabColumns(dict):
    """The lab table as a dict of numpy arrays (pandas not installed); ``.samples`` the samples."""
    samples: list = []


_LAB_COLUMNS = [("tbn", "tbn"), ("tan", "tan"), ("san", "san"), ("i_ph", "initial_ph"),
                ("oxidation", "oxidation"), ("nitration", "nitration")]


def read_lab(path: Union[str, os.PathLike]) -> Any:
    """Lab results from a CSV file as a table, one row per sample: a pandas DataFrame when pandas is
    installed, else a dict of numpy arrays. Columns: charge (1 = the first), oil_hours [h], lab, date,
    tbn, tbn_method, tan, san [mg KOH/g] (san_censored: reported "<x"), i_ph, oxidation, nitration
    [A/cm] (NaN where not reported), every trended reading (fe, cu, … [ppm], viscosity_100 and
    viscosity_100_fresh [cSt], antioxidant_remaining [% of fresh], water [%]) and the columns acidload
    does not know, as text. The samples themselves (for
    :func:`fit`) are in ``.attrs["samples"]`` of the DataFrame, or ``.samples`` of the dict."""
    samples = _Samples(read_lab_samples(path))
    cols: Dict[str, Any] = {
        "charge": np.array([s.charge + 1 for s in samples], dtype=int),
        "oil_hours": np.array([s.oil_hours for s in samples], dtype=float),
        "lab": np.array([s.lab for s in samples], dtype=object),
        "date": np.array([s.date for s in samples], dtype=object),
        "tbn_method": np.array(["D2896" if s.tbn_method == _core.oil.BaseNumberMethod.D2896 else "D4739"
                                for s in samples], dtype=object),
    }
    for name, attr in _LAB_COLUMNS:
        cols[name] = np.array([np.nan if getattr(s, attr) is None else getattr(s, attr) for s in samples], dtype=float)
    cols["san_censored"] = np.array([s.san_censored for s in samples], dtype=bool)
    for key in sorted({k for s in samples for k in s.trended}):
        cols[key.replace("-", "_")] = np.array([s.trended.get(key, np.nan) for s in samples], dtype=float)
    for key in sorted({k for s in samples for k in s.other}):
        cols[key.replace("-", "_")] = np.array([s.other.get(key, "") for s in samples], dtype=object)
    try:
        import pandas as pd  # optional
    except ImportError:
        out = LabColumns(cols)
        out.samples = samples
        return out
    df = pd.DataFrame(cols)
    df.attrs["samples"] = samples
    return df


def _samples(lab: Any) -> list:
    if isinstance(lab, (str, os.PathLike)):
        return read_lab_samples(lab)
    if isinstance(lab, LabColumns):
        return list(lab.samples)
    attrs = getattr(lab, "attrs", None)
    if isinstance(attrs, dict) and "samples" in attrs:
        return list(attrs["samples"])
    return list(lab)


class Fit:
    """The outcome of :func:`fit`."""

    def __init__(self, result: "_core.FitResult", lab: Optional["_core.LabSettings"] = None) -> None:
        self._r = result
        self._lab = lab if lab is not None else _core.LabSettings()  # the case's lab section (alarm levels for trend)

    @property
    def keys(self) -> List[str]:
        return list(self._r.keys)

    @property
    def estimates(self) -> Dict[str, float]:
        """Estimates in each parameter's core unit."""
        return dict(zip(self._r.keys, self._r.estimates))

    @property
    def standard_errors(self) -> Dict[str, float]:
        """Standard errors (delta method) in each parameter's core unit."""
        return dict(zip(self._r.keys, self._r.standard_errors))

    @property
    def fit_estimates(self) -> np.ndarray:
        """Estimates in fit space (log of positive parameters, logit of shares)."""
        return np.array(self._r.fit_estimates)

    @property
    def baselines(self) -> List[Dict[str, Any]]:
        """FTIR baselines the fit estimated, one per lab and reading where the lab file gives none and
        the lab has no fresh-oil sample: dicts of lab, reading, value [A/cm], standard_error [A/cm], readings."""
        return list(self._r.baselines)

    @property
    def covariance(self) -> np.ndarray:
        """Covariance of the fit-space estimates, s²·(JᵀJ)⁻¹."""
        return np.array(self._r.covariance)

    @property
    def correlation(self) -> np.ndarray:
        return np.array(self._r.correlation)

    @property
    def residuals(self) -> Dict[str, Any]:
        """Every reading: sample index, reading, measured, predicted, sigma, standardized, censored, outlier."""
        return dict(self._r.residuals)

    s2 = property(lambda self: self._r.s2, doc="reduced chi-square (about 1 when the lab precisions are right)")
    degrees_of_freedom = property(lambda self: self._r.degrees_of_freedom)
    observations = property(lambda self: self._r.observations)
    iterations = property(lambda self: self._r.iterations)
    converged = property(lambda self: self._r.converged)
    flags = property(lambda self: list(self._r.flags), doc="outliers, lab changes, held and confounded parameters, in plain words")
    notes = property(lambda self: list(self._r.notes), doc="why these parameters, when chosen for what the lab reports")
    warnings = property(lambda self: list(self._r.warnings), doc="a poor fit (chi-square), a weak-base offset across methods …")
    chi2_p = property(lambda self: self._r.chi2_p, doc="P(chi-square >= the sum of squares): small means the model misfits")

    @property
    def held(self) -> Dict[str, bool]:
        """Per parameter: held at its prior because the samples do not respond to it."""
        return dict(zip(self._r.keys, self._r.held))

    def overlay_text(self, case_file: str = "CASE", lab_file: str = "LAB") -> str:
        """The estimates as an overlay (format version 1) for ``acidload run CASE --overlay FILE``."""
        return self._r.overlay_text(case_file, lab_file)

    def write_overlay(self, path: Union[str, os.PathLike], case_file: str = "CASE", lab_file: str = "LAB", *,
                      inputs: Sequence[Union[str, os.PathLike]] = ()) -> None:
        """Writes the overlay atomically, as ``acidload fit --write-overlay`` does: refused (InputError's
        sibling acidload.Error, the file left as it was) when ``path`` is ``case_file``, ``lab_file`` or
        one of ``inputs`` (any other file the fit read), or an existing file that is not an overlay
        acidload wrote. A symbolic link is written through."""
        for name, v in (("path", path), ("case_file", case_file), ("lab_file", lab_file)):
            if not isinstance(v, (str, os.PathLike)):
                raise TypeError(f"write_overlay(): {name} is a file name, not {type(v).__name__}")
        self._r.write_overlay(os.fspath(path), os.fspath(case_file), os.fspath(lab_file),
                              [os.fspath(x) for x in inputs])

    def __repr__(self) -> str:
        est = ", ".join(f"{k}={v:.4g}±{self.standard_errors[k]:.2g}" for k, v in self.estimates.items())
        return f"<acidload.Fit {est}; reduced chi-square {self.s2:.3g}>"


def fit(case: Union[Case, Variant], lab: Any, parameters: Optional[Sequence[str]] = None, *,
        precision: Optional[Dict[str, float]] = None, lab_precision: Optional[Dict[str, Dict[str, float]]] = None,
        priors: bool = True, variant: Optional[str] = None) -> Fit:
    """Weighted least squares (Levenberg–Marquardt, weak priors, ranges kept, delta-method errors) of the
    named parameters of a variant to lab samples (a CSV path, the table from :func:`read_lab` or the list
    from :func:`read_lab_samples`). Without ``parameters`` a set matched to what the lab reports
    (``Fit.notes`` says why). ``precision``: one standard deviation per reading (keys tbn_d2896,
    tbn_d4739, tan, san [mg KOH/g], oxidation, nitration [A/cm]); ``lab_precision``: the same per lab name.
    The case's ``lab`` section (:attr:`Case.lab`) is used for what the call does not state: precedence, highest
    first, a row's ``*-sd`` column, ``lab_precision`` for its lab, ``precision``, the case's per-lab
    precision, the case's ``lab.precision``, the built-in defaults; the case's per-lab FTIR baselines go to
    that lab's rows that state none.
    ``priors=False`` drops the weak priors (plain least squares, as another optimiser would do it)."""
    settings = _lab_settings(case)
    return Fit(_core.calibrate(_engine_case(case, variant), _samples(lab), list(parameters or []),
                               dict(precision or {}), {k: dict(v) for k, v in (lab_precision or {}).items()},
                               bool(priors), settings), settings)


def _lab_settings(case: Union[Case, Variant]) -> "_core.LabSettings":
    if isinstance(case, Variant):
        return case.case._file.lab
    if isinstance(case, Case):
        return case._file.lab
    return _core.LabSettings()


def fit_residuals(case: Union[Case, Variant], lab: Any, parameters: Sequence[str], phi: Sequence[float], *,
                  variant: Optional[str] = None) -> np.ndarray:
    """The residuals a fit minimises at fit-space values ``phi`` (log or logit of each parameter): the
    standardized readings, then one prior row per parameter, (phi − phi0)/sd0: for driving the model from
    another optimiser (e.g. scipy.optimize.least_squares)."""
    return _core.fit_residuals(_engine_case(case, variant), _samples(lab), list(parameters), [float(x) for x in phi])


class ForecastResult(list):
    """The limits of :func:`forecast` (a list of dicts: limit, reached, already, remaining_h, low_h,
    high_h, why, prior_from: the parameters not fitted whose weak prior widens the band, prior_driven:
    True when they make up most of it) with the rest as attributes: change_now, lab_first, update, kalman (the joint update's
    state vector, P, H, K, readings and precisions, docs/model.md §13.1), next_sample_in_h, warnings."""

    def __init__(self, d: Dict[str, Any]) -> None:
        super().__init__(d["limits"])
        self.change_now: bool = d["change_now"]
        self.lab_first: bool = d["lab_first"]
        self.update: List[Dict[str, Any]] = list(d["update"])
        self.kalman: Dict[str, Any] = dict(d["kalman"])
        self.next_sample_in_h: float = d["next_sample_in_h"]
        self.start_oil_hours: float = d["start_oil_hours"]
        self.end_oil_hours: float = d["end_oil_hours"]
        self.warnings: List[str] = list(d["warnings"])


def _optional_ph(v: Optional[float]) -> Optional[float]:
    if v is None:
        return None
    x = number(v, "initial_ph_limit")
    if not 0 <= x <= 14:
        raise InputError(f"'initial_ph_limit' = {v!r}: expected an i-pH from 0 to 14", key="initial_ph_limit",
                         value=repr(v), expected="an i-pH from 0 to 14")
    return x


def forecast(result: Fit, *, initial_ph_limit: Optional[float] = None, sample_interval_h: float = 250.0) -> ForecastResult:
    """The lab-first forecast of the current (last) charge: the model state moved toward the latest
    sample (a Kalman-type update), every limit that sample has already passed flagged (``already``
    True, ``why`` the reading against the limit): TBN, TAN, SAN, FTIR, and from the lab columns the
    viscosity change over fresh (viscosity-100 with viscosity-100-fresh), antioxidant remaining, water
    and i-pH against the case's limits (``limits.viscosity-change``, ``antioxidant-remaining``,
    ``water``, ``initial-ph``; water and i-pH are rows "water" and "i-ph" of their own); the hours left
    to the others with a 90 % band, and when the next sample is due. ``initial_ph_limit`` overrides
    ``limits.initial-ph`` when given. The sampling interval (250 h) is common practice, no source."""
    return ForecastResult(_core.forecast(result._r, _optional_ph(initial_ph_limit), float(sample_interval_h)))


def predict(fit_or_case: Union[Fit, Case, Variant], lab: Any = None, *, parameters: Optional[Sequence[str]] = None,
            conditions: Optional[Union[Case, Variant, Sequence[Union[Case, Variant]]]] = None, next_charge: bool = True,
            draws: int = 400, seed: int = 1, model_form: bool = True, initial_ph_limit: Optional[float] = None,
            variant: Optional[str] = None) -> Dict[str, Any]:
    """The drain interval of the next charge (after an oil change at the end of the record; oil carried
    over as the change leaves it) or, with ``next_charge=False``, of the current one continued, under
    ``conditions`` (cases whose records are the planned operation, the last segment run on to the hours
    cap; default the record's last segment). Returns interval_h and the limit that ends it, one band
    p5_h / p50_h / p95_h (P5 the pessimistic end) from draws of the fit's joint covariance widened by
    the model-form spread of predicting each past charge from the others (held_out: (charge, own,
    from_others)), the draws per limit, and ``current``: the lab-first forecast. Give a Fit, or a case
    and ``lab`` (fitted here)."""
    f = fit_or_case if isinstance(fit_or_case, Fit) else fit(fit_or_case, lab, parameters, variant=variant)
    plan: List[Any] = []
    if conditions is not None:
        for c in (conditions if isinstance(conditions, (list, tuple)) else [conditions]):
            plan.append(_engine_case(c, None))
    out = dict(_core.predict_charge(f._r, bool(next_charge), plan, int(draws), int(seed), bool(model_form), True,
                                    _optional_ph(initial_ph_limit)))
    out["current"] = ForecastResult(out["current"])
    return out


def trend(result: Fit, levels: Optional[Dict[str, Tuple[float, float]]] = None) -> Dict[str, Any]:
    """Trend and alarms after a fit: the latest sample against the model's band, the current charge's TBN
    slope against the model's (tbn_slope, tbn_slope_model [mg KOH/g per h]) with the H2S it implies
    (implied_h2s_ppmv; "acid load above the model: check H2S and scrubber breakthrough"), and wear metals,
    silicon, sodium, potassium, water, viscosity-100 (change over fresh [%] with viscosity-100-fresh,
    else from the charge's first sample), antioxidant-remaining [% of fresh] and i-ph against caution and
    critical levels. For water, viscosity-100, antioxidant-remaining and i-ph the critical level is the
    case's limit and the caution level lies before it; a level given for them beyond the limit raises
    InputError. The case's ``lab.alarm-levels`` replace the defaults, and ``levels`` replaces both: {"fe": (30, 50), "tbn": (2.5, 2.0)} (a level pair falling,
    as for TBN, alarms at or below). Defaults: :func:`default_alarm_levels` (for the default limits),
    common practice, no source; the engine maker's and oil supplier's limits govern."""
    lv = []
    for q, (caution, critical) in (levels or {}).items():
        lv.append((q, float(caution), float(critical), float(critical) >= float(caution)))
    return dict(_core.trend(result._r, lv, result._lab))


def default_alarm_levels() -> List[Tuple[str, float, float, bool, str]]:
    """(quantity, caution, critical, rising, basis) of the default alarm levels."""
    return list(_core.default_alarm_levels())


def monte_carlo(case: Union[Case, Variant], *, inputs: Optional[Sequence[Tuple[str, str, float, float, float]]] = None,
                draws: Optional[int] = None, seed: Optional[int] = None, threads: int = 0, fit: Optional[Fit] = None,
                every_charge: bool = False, variant: Optional[str] = None) -> Dict[str, Any]:
    """Monte Carlo over uncertain inputs: the case's ``uncertainty`` section unless ``inputs`` gives
    (key, distribution, a, b, c) tuples in core units, and with ``fit`` the fitted parameters drawn
    jointly (correlated) from its covariance over its fitted case. Returns per-draw arrays
    (drain_interval_h of the first charge, first_san_h — inf where none), their P5/P10/P50/P90/P95
    (the low end the pessimistic one), with ``every_charge`` each charge of the record run on to the
    plant's planned maximum (``charges``), and ``clipped``: draws with an input outside its range, clipped into it.
    Identical for any thread count."""
    if inputs is None or draws is None or seed is None:
        file_inputs, file_draws, file_seed = (_core.case_uncertainty(case._file) if isinstance(case, Case)
                                              else ([], 1000, 1))
        inputs = file_inputs if inputs is None else inputs
        draws = file_draws if draws is None else draws
        seed = file_seed if seed is None else seed
    if not inputs and fit is None:
        raise ValueError("no uncertain inputs: give inputs, a fit, or an uncertainty section in the case")
    # The same limits as the program's uncertainty command (--draws, --seed, --threads); 0 threads: every core.
    draws = whole(draws, "draws", 1, 10_000_000)
    seed = whole(seed, "seed", 0, 9 * 10**15)
    threads = whole(threads, "threads", 0, 256)
    checked = []
    for i, item in enumerate(inputs):
        try:
            key, dist, a, b, c = item
        except (TypeError, ValueError):
            raise InputError(f"'inputs[{i}]' = {item!r}: expected (key, distribution, a, b, c)", key=f"inputs[{i}]",
                             value=repr(item), expected="(key, distribution, a, b, c)") from None
        if not isinstance(key, str) or not isinstance(dist, str):
            raise InputError(f"'inputs[{i}]': the key and the distribution are text", key=f"inputs[{i}]",
                             value=repr(item), expected="(key, distribution, a, b, c) with key and distribution as text")
        checked.append((key, dist, number(a, f"inputs[{i}][2]"), number(b, f"inputs[{i}][3]"), number(c, f"inputs[{i}][4]")))
    return dict(_core.monte_carlo(_engine_case(case, variant), checked, draws, seed, threads,
                                  fit._r if fit is not None else None, bool(every_charge)))
