"""An independent reference of acidload's oil balance (docs/model.md §8), integrated numerically with SciPy.

Written from docs/model.md §8 and the state definitions of libacidload/include/acidload/core/oil.hpp, not
from the library's closed forms, and it does not call acidload. The library solves each regime in
closed form; here the same balance is stated as ordinary differential equations in the
CONCENTRATIONS (mg KOH/g, A/cm; the C++ reference test tests/reference/test_oil_balance.cpp uses
absolute amounts instead) and integrated by ``scipy.integrate.solve_ivp`` (DOP853, rtol 1e-12) with
events for the two switches of regime:

- the floor crossing, b = b_min, where the reactive base runs out and strong acid stays free;
- the clearing of free strong acid, s = 0, when the makeup base outruns the strong acid again;
- the antioxidant reserve running out, A = 0 (docs/model.md §16): from then on oxidation and
  organic acids run f = m − (m − 1)·min(1, k/k_A) times faster (makeup's fresh reserve intercepts
  a share k/k_A of the radicals).

It is also the baseline for benchmarks: :func:`integrate` takes (rates, constants, initial state,
hours) and returns the end state and the crossing times.

The model (k = c/M with continuous makeup, else 0; B_mk = c·(b_f − b_min) with continuous makeup,
else 0; l1 = SO2 uptake of fresh oil/(b_f − b_min); all rates constant over the segment):

    dM/dt = 0 (continuous makeup) or −c (the level falls; consumed oil leaves at the oil's own
            concentrations, so removal alone changes no concentration)
    do/dt = f·k_ox − k·o;  dn/dt = r_n/M − k·n;  dt_add/dt = −k_d·t_add + k·(t_add,fresh − t_add)
    dA/dt = −k_A + k·(1 − A) while A > 0 (zero-order use), else A = 0 and f > 1; r_w = f·α·k_ox

    above the floor (b > b_min):  r_SO2 = l1·(b − b_min)/M
        db/dt   = −R/M − φ_B·r_w − r_SO2 + k·(b_f − b)
        ds/dt   = 0 (no free strong acid while reactive base is left)
        da_w/dt = (1 − φ_B)·r_w − k·a_w
        dc_n/dt = R/M + φ_B·r_w + r_SO2 − k·c_n          (base consumed becomes salt)
    at the floor, strong acid beyond the makeup base (s > 0 or R > B_mk):
        b = b_min;  ds/dt = (R − B_mk)/M − k·s;  da_w/dt = r_w − k·a_w;  dc_n/dt = B_mk/M − k·c_n
    at the floor, the makeup base left after the strong acid too small for the organic acid
    (B_mk − R < φ_B·r_w·M):
        b = b_min;  s = 0;  da_w/dt = r_w − (B_mk − R)/M − k·a_w;  dc_n/dt = B_mk/M − k·c_n
    otherwise the makeup lifts the base from the floor: the first regime.

Units: time h, mass kg, concentrations mg KOH/g, rates R and SO2 uptake in g KOH/h (÷ kg of oil =
mg KOH/g per h), r_w in mg KOH/g per h, k_ox in A/cm per h, r_n in A/cm·kg/h.
"""
from __future__ import annotations

from dataclasses import dataclass, field, fields, replace
from typing import Any, List, Mapping, Sequence, Union

import numpy as np
from scipy.integrate import solve_ivp

__all__ = ["Rates", "Constants", "State", "Outcome", "integrate", "add_fresh_oil", "ABOVE_FLOOR", "FLOOR_ACID",
           "FLOOR_WEAK"]

ABOVE_FLOOR, FLOOR_ACID, FLOOR_WEAK = "above_floor", "floor_acid", "floor_weak"


@dataclass(frozen=True)
class Rates:
    """Rates constant over a segment."""
    strong_acid: float = 0.0       # R, strong acid reaching the oil [g KOH/h]
    sulfurous_fresh: float = 0.0   # SO2 uptake of fresh oil [g KOH/h], ∝ (b − b_min)/(b_f − b_min)
    nitration: float = 0.0         # r_n [A/cm · kg/h]
    oxidation: float = 0.0         # k_ox [A/cm per h]
    organic_acid: float = 0.0      # r_w = α·k_ox [mg KOH/g per h]
    consumption: float = 0.0       # c, oil burnt [kg/h]
    continuous_makeup: bool = True  # makeup equals consumption (M constant)
    antioxidant_depletion: float = 0.0  # k_A, zero-order antioxidant use [share of fresh per h]
    depleted_factor: float = 1.0   # m, oxidation once the reserve is spent over the protected rate


@dataclass(frozen=True)
class Constants:
    """Constants of the oil."""
    fresh_base: float              # b_f, reactive base of fresh oil [mg KOH/g]
    base_floor: float              # b_min [mg KOH/g]
    fresh_additive: float          # t_add of fresh oil [mg KOH/g]
    additive_depletion: float      # k_d [1/h]
    organic_neutralised_share: float  # φ_B [-]


@dataclass(frozen=True)
class State:
    """The oil's state: mass [kg]; concentrations [mg KOH/g]; oxidation, nitration [A/cm]."""
    mass: float
    base: float
    strong_acid: float = 0.0
    weak_acid: float = 0.0
    salts: float = 0.0
    oxidation: float = 0.0
    nitration: float = 0.0
    additive_acidity: float = 0.0
    antioxidant: float = 1.0       # A, share of the fresh reserve

    def as_array(self) -> np.ndarray:
        return np.array([getattr(self, f.name) for f in fields(self)], dtype=float)

    @staticmethod
    def from_array(y: Sequence[float]) -> "State":
        return State(*[float(v) for v in y])


@dataclass
class Outcome:
    """What a segment did."""
    state: State                                              # at the end
    floor_crossings: List[float] = field(default_factory=list)  # hours into the segment where b reached b_min
    acid_cleared: List[float] = field(default_factory=list)     # hours into the segment where s reached 0
    regimes: List[str] = field(default_factory=list)            # regimes in order
    steps: int = 0                                              # integrator steps (for benchmarks)


def _as(cls, x: Union[Any, Mapping[str, Any]]):
    if isinstance(x, cls):
        return x
    names = [f.name for f in fields(cls)]
    if isinstance(x, Mapping):
        return cls(**{n: x[n] for n in names if n in x})
    return cls(**{n: getattr(x, n) for n in names if hasattr(x, n)})


def _makeup_base(r: Rates, k: Constants) -> float:
    return r.consumption * (k.fresh_base - k.base_floor) if r.continuous_makeup else 0.0


def _km(r: Rates, mass: float) -> float:
    return r.consumption / mass if r.continuous_makeup else 0.0


def _spent(s: State, r: Rates) -> bool:
    return s.antioxidant <= 0 and r.antioxidant_depletion > _km(r, s.mass)


def _factor(spent: bool, r: Rates, mass: float) -> float:
    if not spent:
        return 1.0
    return r.depleted_factor - (r.depleted_factor - 1) * min(1.0, _km(r, mass) / r.antioxidant_depletion)


def _regime(s: State, r: Rates, k: Constants) -> str:
    if s.base > k.base_floor * (1 + 1e-13):
        return ABOVE_FLOOR
    bmk = _makeup_base(r, k)
    if s.strong_acid > 0 or r.strong_acid > bmk:
        return FLOOR_ACID
    if bmk - r.strong_acid < k.organic_neutralised_share * r.organic_acid * _factor(_spent(s, r), r, s.mass) * s.mass:
        return FLOOR_WEAK
    return ABOVE_FLOOR


def _rhs(regime: str, spent: bool, r: Rates, k: Constants):
    c, phi, R = r.consumption, k.organic_neutralised_share, r.strong_acid
    l1 = r.sulfurous_fresh / (k.fresh_base - k.base_floor)
    bmk = _makeup_base(r, k)

    def f(_t, y):
        M, b, s, aw, cn, o, n, ta, A = y
        km = c / M if r.continuous_makeup else 0.0
        f = _factor(spent, r, M)
        rw = r.organic_acid * f
        d = np.empty(9)
        d[0] = 0.0 if r.continuous_makeup else -c
        d[5] = f * r.oxidation - km * o
        d[8] = 0.0 if spent else -r.antioxidant_depletion + km * (1.0 - A)
        d[6] = r.nitration / M - km * n
        d[7] = -k.additive_depletion * ta + km * (k.fresh_additive - ta)
        if regime == ABOVE_FLOOR:
            so2 = l1 * (b - k.base_floor) / M
            d[1] = -R / M - phi * rw - so2 + km * (k.fresh_base - b)
            d[2] = 0.0
            d[3] = (1 - phi) * rw - km * aw
            d[4] = R / M + phi * rw + so2 - km * cn
        elif regime == FLOOR_ACID:
            d[1] = 0.0
            d[2] = (R - bmk) / M - km * s
            d[3] = rw - km * aw
            d[4] = bmk / M - km * cn
        else:  # FLOOR_WEAK
            d[1] = 0.0
            d[2] = 0.0
            d[3] = rw - (bmk - R) / M - km * aw
            d[4] = bmk / M - km * cn
        return d

    return f


def integrate(rates: Union[Rates, Mapping[str, Any], Any], constants: Union[Constants, Mapping[str, Any], Any],
              state: Union[State, Mapping[str, Any], Any], hours: float, *, rtol: float = 1e-12,
              method: str = "DOP853") -> Outcome:
    """Integrates the balance over ``hours`` [h] of constant rates from ``state``.

    ``rates``, ``constants`` and ``state`` are :class:`Rates`, :class:`Constants`, :class:`State` or
    mappings / objects with those field names. Returns the end state, the floor crossings and the
    acid clearings (hours into the segment), and the regimes passed through.
    """
    r, k, s = _as(Rates, rates), _as(Constants, constants), _as(State, state)
    out = Outcome(state=s)
    out.antioxidant_spent = []
    t = 0.0
    y = s.as_array()
    scale = np.maximum(np.abs(y), 1.0)
    for _ in range(16):  # a segment of constant rates passes through at most a few regimes
        regime = _regime(State.from_array(y), r, k)
        spent = _spent(State.from_array(y), r)
        if regime != ABOVE_FLOOR:
            y[1] = k.base_floor  # on the floor exactly
        if regime == FLOOR_WEAK:
            y[2] = 0.0
        if spent:
            y[8] = 0.0
        out.regimes.append(regime)
        events = []
        if regime == ABOVE_FLOOR:
            def floor(_t, yy):
                return yy[1] - k.base_floor
            floor.terminal, floor.direction = True, -1
            events.append(floor)
        elif regime == FLOOR_ACID and r.strong_acid < _makeup_base(r, k) and y[2] > 0:
            def cleared(_t, yy):
                return yy[2]
            cleared.terminal, cleared.direction = True, -1
            events.append(cleared)
        if not spent and y[8] > 0 and r.antioxidant_depletion > 0:
            def reserve(_t, yy):
                return yy[8]
            reserve.terminal, reserve.direction = True, -1
            events.append(reserve)
        sol = solve_ivp(_rhs(regime, spent, r, k), (t, hours), y, method=method, rtol=rtol, atol=1e-14 * scale,
                        events=events or None, dense_output=False)
        if not sol.success:
            raise RuntimeError(f"solve_ivp failed in {regime}: {sol.message}")
        out.steps += len(sol.t) - 1
        if sol.status == 1:  # an event ended the regime
            which = next(i for i, te in enumerate(sol.t_events) if len(te))
            t_event = float(sol.t_events[which][0])
            y = np.array(sol.y_events[which][0], dtype=float)
            if events[which].__name__ == "reserve":
                y[8] = 0.0
                out.antioxidant_spent.append(t_event)
            elif regime == ABOVE_FLOOR:
                y[1] = k.base_floor
                out.floor_crossings.append(t_event)
            else:
                y[2] = 0.0
                out.acid_cleared.append(t_event)
            t = t_event
            if t >= hours:
                break
            continue
        y = sol.y[:, -1].copy()
        break
    out.state = State.from_array(y)
    return out


def add_fresh_oil(state: Union[State, Mapping[str, Any], Any], constants: Union[Constants, Mapping[str, Any], Any],
                  added_mass: float) -> State:
    """Mixes ``added_mass`` [kg] of fresh oil into the charge (a top-up); free strong acid then meets the
    fresh base at once, down to the floor (oil.hpp: top_up)."""
    s, k = _as(State, state), _as(Constants, constants)
    m = s.mass + added_mass
    old, new = s.mass / m, added_mass / m
    b = s.base * old + k.fresh_base * new
    strong = s.strong_acid * old
    salts = s.salts * old
    neutralised = min(strong, max(b - k.base_floor, 0.0))
    return replace(s, mass=m, base=b - neutralised, strong_acid=strong - neutralised, weak_acid=s.weak_acid * old,
                   salts=salts + neutralised, oxidation=s.oxidation * old, nitration=s.nitration * old,
                   additive_acidity=s.additive_acidity * old + k.fresh_additive * new,
                   antioxidant=s.antioxidant * old + new)
