"""Checks of values given to the package's functions: every bad value raises acidload.InputError
naming the argument (never OverflowError, RecursionError or a silent cast)."""
from __future__ import annotations

import math
import numbers
from typing import Any

import numpy as np

from ._errors import InputError

__all__ = ["number", "whole", "sweep_values"]


def _refuse(what: str, value: Any, expected: str) -> InputError:
    shown = repr(value)
    if len(shown) > 80:
        shown = shown[:77] + "..."
    return InputError(f"'{what}' = {shown}: expected {expected}", key=what, value=shown, expected=expected)


def number(value: Any, what: str) -> float:
    """A finite real number (int, float or numpy real; not bool, str or complex) as float."""
    if isinstance(value, (bool, np.bool_)) or isinstance(value, (str, bytes)) or \
            not isinstance(value, numbers.Real):
        raise _refuse(what, value, "a real number")
    try:
        v = float(value)
    except (OverflowError, ValueError, TypeError):
        raise _refuse(what, value, "a finite real number within ±1e300") from None
    if not math.isfinite(v) or abs(v) > 1e300:
        raise _refuse(what, value, "a finite real number within ±1e300")
    return v


def whole(value: Any, what: str, low: int, high: int) -> int:
    """A whole number (int or numpy integer; not bool, float or str) from low to high."""
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, numbers.Integral):
        raise _refuse(what, value, f"a whole number (int) from {low} to {high}")
    v = int(value)
    if not low <= v <= high:
        raise _refuse(what, value, f"a whole number from {low} to {high}")
    return v


def sweep_values(values: Any, what: str) -> np.ndarray:
    """The values of a sweep as a float array: complex, object, text and boolean arrays are refused,
    and so are masked arrays with a masked element (fill or compress them first)."""
    if np.ma.isMaskedArray(values):
        if np.ma.getmaskarray(values).any():
            raise _refuse(what, "a masked array", "values without masked elements (use .compressed() or .filled())")
        values = np.ma.getdata(values)
    if isinstance(values, (str, bytes)):
        raise _refuse(what, values, "a number or an array of numbers")
    try:
        a = np.asarray(values)
    except (ValueError, TypeError, OverflowError, RecursionError):
        raise _refuse(what, values, "a number or an array of numbers") from None
    if a.dtype.kind == "O":  # Python ints beyond the float range, mixed lists …
        try:
            a = np.array([number(x, what) for x in a.reshape(-1)], dtype=np.float64).reshape(a.shape)
        except InputError:
            raise
        except Exception:
            raise _refuse(what, values, "a number or an array of numbers") from None
    if a.dtype.kind == "c":
        raise _refuse(what, values, "real values (a complex array is not cast)")
    if a.dtype.kind not in "iuf":
        raise _refuse(what, values, f"numbers (got an array of {a.dtype})")
    with np.errstate(over="ignore", invalid="ignore"):
        f = a.astype(np.float64)
    bad = ~np.isfinite(f)
    if bad.any():
        i = int(np.flatnonzero(bad.reshape(-1))[0])
        raise _refuse(what, a.reshape(-1)[i], f"finite numbers (element {i} of the sweep is not)")
    return f
