"""Cost arithmetic from acidload's core (the per-variant costs of a case are in :func:`acidload.costs`)."""
from ._core import economics as _e

__all__ = ["capital_recovery_factor"]


def capital_recovery_factor(discount_rate: float, life_years: float) -> float:
    """i (1 + i)^n / ((1 + i)^n - 1) [1/year], 1/n at i = 0: a capital's equal yearly share."""
    return _e.capital_recovery_factor(float(discount_rate), float(life_years))
