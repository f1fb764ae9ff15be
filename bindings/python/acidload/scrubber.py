"""Media beds by the Thomas breakthrough form in its throughput variable (docs/model.md §18.1).

``F(phi) = 1 / (1 + exp(beta * (1 - phi)))`` with ``phi`` the sulfur fed over the bed's capacity
``q0 * M`` and ``beta = 2 ln 9 / width`` (width: share of the bed life from 10 % to 90 % breakthrough).
A share ``1 - efficiency`` of the gas passes the bed untreated. From acidload's core.
"""
from ._core import scrubber as _s

__all__ = ["thomas_steepness", "breakthrough_share", "captured_share", "bed_outlet_ratio",
           "fed_share_at_outlet_ratio", "iron_oxide_theoretical_capacity", "caustic_per_sulfur"]


def thomas_steepness(width: float) -> float:
    """beta = 2 ln 9 / width [-]."""
    return _s.thomas_steepness(float(width))


def breakthrough_share(fed_share: float, steepness: float) -> float:
    """F(phi) [-]: the share of the treated gas's H2S leaving the bed."""
    return _s.breakthrough_share(float(fed_share), float(steepness))


def captured_share(fed_share: float, steepness: float) -> float:
    """G(phi) = integral of (1 - F) from 0 to phi [-]: the sulfur held, as a share of q0 * M."""
    return _s.captured_share(float(fed_share), float(steepness))


def bed_outlet_ratio(fed_share: float, efficiency: float, steepness: float) -> float:
    """Outlet over inlet H2S: (1 - efficiency) + efficiency * F(phi) [-]."""
    return _s.bed_outlet_ratio(float(fed_share), float(efficiency), float(steepness))


def fed_share_at_outlet_ratio(ratio: float, efficiency: float, steepness: float) -> float:
    """phi at which the outlet ratio is reached [-]; InputError at or below the fresh bed's ratio."""
    return _s.fed_share_at_outlet_ratio(float(ratio), float(efficiency), float(steepness))


def iron_oxide_theoretical_capacity() -> float:
    """3 M_S / M_Fe2O3 [kg S per kg Fe2O3]; practical media hold far less (the supplier's figure governs)."""
    return _s.iron_oxide_theoretical_capacity()


def caustic_per_sulfur() -> float:
    """2 M_NaOH / M_S [kg NaOH per kg S absorbed as Na2S]."""
    return _s.caustic_per_sulfur()
