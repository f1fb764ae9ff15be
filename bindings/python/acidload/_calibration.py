"""Calibration to the plant's lab history, the forecast of the current charge, and Monte Carlo.

    lab = acidload.read_lab("cases/demo-site-lab.csv")
    fit = acidload.fit(case, lab, ["model.liner-uptake", "model.oxidation-rate"])
    fit.estimates, fit.standard_errors, fit.correlation, fit.residuals, fit.s2, fit.flags
    fit.write_overlay("fitted.yaml", case_file=..., lab_file=...)   # for acidload run --overlay
    acidload.forecast(fit)                                            # hours left to each limit
    acidload.monte_carlo(case)                                        # the case's uncertainty section

Parameters are named by their case-file keys (``model.so3-share``, ``engine.blow-by``, …; see
:data:`PARAMETERS`) and carried in the core's units (shares as fractions, K, A/cm per h, …).
A fit the data cannot identify raises :class:`FitRefusedError` with the reason.
"""
from __future__ import annotations

import os
from typing import Any, Dict, List, Optional, Sequence, Tuple, Union

import numpy as np

from . import _core
from ._case import Case, Variant, _engine_case
from ._checks import number, whole
from ._errors import InputError

__all__ = ["read_lab", "fit", "Fit", "forecast", "monte_carlo", "fit_residuals", "PARAMETERS"]

#: Keys of the parameters that can be fitted or varied.
PARAMETERS: List[str] = list(_core.parameter_keys())


def read_lab(path: Union[str, os.PathLike]) -> list:
    """Lab results from a CSV file (columns in docs/lab-results.md); a mistake raises InputError with
    the file, line and column."""
    return list(_core.read_lab_samples(os.fspath(path)))


class Fit:
    """The outcome of :func:`fit`."""

    def __init__(self, result: "_core.FitResult") -> None:
        self._r = result

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
    flags = property(lambda self: list(self._r.flags), doc="outliers and lab changes, in plain words")

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


def fit(case: Union[Case, Variant], lab: Union[str, os.PathLike, Sequence[Any]], parameters: Sequence[str], *,
        variant: Optional[str] = None) -> Fit:
    """Weighted least squares (Levenberg–Marquardt, log/logit space, delta-method errors) of the named
    parameters of a variant to lab samples (a CSV path or the list from :func:`read_lab`)."""
    samples = read_lab(lab) if isinstance(lab, (str, os.PathLike)) else list(lab)
    return Fit(_core.calibrate(_engine_case(case, variant), samples, list(parameters)))


def fit_residuals(case: Union[Case, Variant], lab: Sequence[Any], parameters: Sequence[str], phi: Sequence[float], *,
                  variant: Optional[str] = None) -> np.ndarray:
    """The standardized residuals a fit minimises, at fit-space values ``phi`` (log or logit of each
    parameter): for driving the model from another optimiser (e.g. scipy.optimize.least_squares)."""
    return _core.fit_residuals(_engine_case(case, variant), list(lab), list(parameters), [float(x) for x in phi])


def forecast(result: Fit) -> List[Dict[str, Any]]:
    """Remaining hours of the current (last) charge to each limit, with a 90 % band from the
    covariance: dicts with limit, reached, already, remaining_h, low_h, high_h."""
    return list(_core.forecast(result._r))


def monte_carlo(case: Union[Case, Variant], *, inputs: Optional[Sequence[Tuple[str, str, float, float, float]]] = None,
                draws: Optional[int] = None, seed: Optional[int] = None, threads: int = 0,
                variant: Optional[str] = None) -> Dict[str, Any]:
    """Monte Carlo over uncertain inputs: the case's ``uncertainty`` section unless ``inputs`` gives
    (key, distribution, a, b, c) tuples in core units. Returns per-draw arrays (drain_interval_h,
    first_san_h — inf where none) and their P10/P50/P90; identical for any thread count."""
    if inputs is None or draws is None or seed is None:
        if not isinstance(case, Case):
            raise TypeError("give inputs, draws and seed, or a Case with an uncertainty section")
        file_inputs, file_draws, file_seed = _core.case_uncertainty(case._file)
        inputs = file_inputs if inputs is None else inputs
        draws = file_draws if draws is None else draws
        seed = file_seed if seed is None else seed
    if not inputs:
        raise ValueError("no uncertain inputs: give inputs or an uncertainty section in the case")
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
    return dict(_core.monte_carlo(_engine_case(case, variant), checked, draws, seed, threads))
