"""Sweeps and inverse questions over one lever: the loop runs in C++ with the GIL released."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Dict, Optional, Tuple, Union

import numpy as np

from . import _core
from ._case import Case, Variant, _engine_case
from ._checks import number, sweep_values

__all__ = ["drain_interval", "solve_for_interval", "InverseAnswer", "LEVERS"]


@dataclass(frozen=True)
class _Lever:
    core_name: str   # acidload::Lever by name()
    unit: str        # the Python keyword's unit
    scale: float     # core value = keyword value · scale + offset
    offset: float

    def to_core(self, v):
        return np.asarray(v, dtype=float) * self.scale + self.offset

    def from_core(self, x: float) -> float:
        return (x - self.offset) / self.scale


#: The levers, by keyword: the keyword names the lever and its unit.
LEVERS: Dict[str, _Lever] = {
    "h2s_ppmv": _Lever("h2s", "ppmv (dry)", 1.0, 0.0),
    "fresh_tbn_mg_koh_per_g": _Lever("fresh-tbn", "mg KOH/g", 1.0, 0.0),
    "jacket_water_out_c": _Lever("jacket-water-out", "degC", 1.0, _core.ZERO_CELSIUS),
    "oil_volume_l": _Lever("oil-volume", "L", 1e-3, 0.0),
}


def _one_lever(levers: Dict[str, Any], what: str) -> Tuple[str, _Lever, Any]:
    unknown = [k for k in levers if k not in LEVERS]
    if unknown or len(levers) != 1:
        raise TypeError(f"{what} takes one lever keyword of: {', '.join(LEVERS)}"
                        + (f" (unknown: {', '.join(unknown)})" if unknown else f" (got {len(levers)})"))
    (k, v), = levers.items()
    return k, LEVERS[k], v


def drain_interval(case: Union[Case, Variant], *, variant: Optional[str] = None, **lever: Any):
    """The drain interval [h] of a variant (the base case unless ``variant`` names one or a Variant is
    given); None when no oil-condition limit is reached within the plant's planned maximum
    (``limits.max-hours``): "no limit within N h" — the horizon is never counted as an interval.

    With one lever keyword holding an array (any shape), the drain interval for each value, as a numpy
    array of the same shape, NaN where no limit is reached within the planned maximum — the sweep runs
    in C++ with the GIL released::

        acidload.drain_interval(case, h2s_ppmv=np.linspace(0, 600, 61))
        acidload.drain_interval(case, oil_volume_l=[400, 600, 800])
        acidload.drain_interval(case, jacket_water_out_c=np.arange(80, 100.5, 2.5))
        acidload.drain_interval(case, fresh_tbn_mg_koh_per_g=[6, 9, 12])

    H2S is set in every segment of the record (power and efficiency kept: the fuel flow follows the
    heating value); so is the jacket-water temperature.
    """
    ec = _engine_case(case, variant)
    if not lever:
        return _core.drain_interval(ec)
    k, lv, values = _one_lever(lever, "drain_interval()")
    core = np.array(lv.to_core(sweep_values(values, k)), dtype=np.float64, order="C")
    out = _core.sweep_drain_interval(ec, lv.core_name, core.reshape(-1)).reshape(core.shape)
    if core.ndim:
        return out
    return None if np.isnan(out) else float(out)


@dataclass(frozen=True)
class InverseAnswer:
    """The answer of :func:`solve_for_interval`, in the lever keyword's unit."""
    found: bool                  #: a value in the range meets the target
    lever: str                   #: the lever keyword, e.g. "h2s_ppmv"
    unit: str                    #: its unit
    value: Optional[float]       #: the answer (None when not found)
    target_h: float              #: the drain interval asked for [h]
    interval_at_value_h: Optional[float]  #: the forward model's interval at the answer [h]
    range: Tuple[float, float]   #: the range searched, in the lever's unit
    interval_at_low_h: Optional[float]   #: at the low end [h]; None: no limit within the planned maximum
    interval_at_high_h: Optional[float]  #: at the high end [h]; None: no limit within the planned maximum
    jump: bool                   #: no answer: the interval jumps over the target (near ``jump_at``)
    jump_at: Optional[float]     #: where, in the lever's unit (None unless ``jump``)
    jump_from_h: Optional[float]  #: the interval just below the jump [h]; None: no limit within the planned maximum
    jump_to_h: Optional[float]    #: just above it [h]; None: no limit within the planned maximum
    reason: str                  #: why there is no answer, in plain words ("" when found)
    evaluations: int             #: forward runs used


def solve_for_interval(case: Union[Case, Variant], *, target_h: float, variant: Optional[str] = None,
                       tolerance: Optional[float] = None, **lever: Tuple[float, float]) -> InverseAnswer:
    """The value of one lever in a range at which the drain interval equals ``target_h`` [h]
    (acidload::solve_for_interval: TOMS 748 bracketing on the exact forward model), e.g.::

        acidload.solve_for_interval(case, target_h=4000, h2s_ppmv=(0, 800))
        acidload.solve_for_interval(case, target_h=2000, oil_volume_l=(300, 3000))

    A lever given as ``None`` (``h2s_ppmv=None``) searches the library's default range, the one the
    program's ``solve`` uses. ``tolerance`` is in the lever's unit (default: the library's, as the
    program's ``solve``: 0.01 ppmv, 1e-4 mg KOH/g, 0.001 K, 0.001 L). "No answer in the range" is an
    answer: ``found`` is False and ``reason`` says why; nothing is extrapolated.
    """
    ec = _engine_case(case, variant)
    k, lv, rng = _one_lever(lever, "solve_for_interval()")
    d_low, d_high, d_tol = _core.default_search(ec, lv.core_name)  # core units
    if rng is None:
        low, high = lv.from_core(d_low), lv.from_core(d_high)
    else:
        try:
            low, high = rng
        except (TypeError, ValueError):
            raise TypeError(f"{k}= takes a range (low, high) in {lv.unit}, or None for the default range") from None
        low, high = number(low, k + "[0]"), number(high, k + "[1]")
    target_h = number(target_h, "target_h")
    tol_core = d_tol if tolerance is None else number(tolerance, "tolerance") * lv.scale
    a = _core.solve_for_interval(ec, lv.core_name, float(target_h), float(lv.to_core(low)), float(lv.to_core(high)),
                                 tol_core)
    return InverseAnswer(found=a.found, lever=k, unit=lv.unit, value=lv.from_core(a.value) if a.found else None,
                         target_h=float(target_h), interval_at_value_h=a.interval_at_value if a.found else None,
                         range=(low, high), interval_at_low_h=a.interval_at_low, interval_at_high_h=a.interval_at_high,
                         jump=a.jump, jump_at=lv.from_core(a.value) if a.jump else None, jump_from_h=a.jump_from,
                         jump_to_h=a.jump_to, reason=a.reason, evaluations=a.evaluations)
