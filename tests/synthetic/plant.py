"""Synthetic plant histories for testing acidload's fit and prediction: an oil-balance model of its own,
written in NumPy without acidload, that differs from acidload's model in the documented ways below.
Everything here is invented; none of it is measured.

The plant (per hour, rates held over each hour and integrated exactly for linear decay):
  reactive base   db/dt = -R_s(t) - phi*alpha*k_ox(t) + k*(b0 - b)        (b >= floor_b)
  oxidation       do/dt = k_ox(t) - k*o,         k_ox(t) = k0*(1 + t/tau)
  nitration       dn/dt = n0 - k*n
  organic acids   dw/dt = (1 - phi)*alpha*k_ox(t) - k*w
  salts           dc/dt = R_s(t) + phi*alpha*k_ox(t) - k*c
  additive TAN    da/dt = -kd*a + k*(a0 - a)
  TBN (D4739) = b;  TAN = a + w + beta*c + lab TAN bias
with R_s = s_share * (sulfur flow) * 2 * M(KOH) / M_oil * (H2S(t)/H_ref)^(gamma - 1), k = consumption / M_oil
(continuous makeup), and at an oil change `residual` of the oil stays.

How the plants differ from acidload's model (acidload does not know any of this):
  1. acid load: a constant share of the fuel sulfur (no liner-wall temperature or dew-point
     dependence), and for the "differing" plants a power law in H2S (gamma 0.8 to 1.2);
  2. oxidation speeds up with oil age (tau 1500 to 6000 h for the differing plants; none for the others);
  3. H2S drifts within a charge (up to +-30 % end to end, the charge mean as recorded), also in the
     predicted charge, where the operator only knows the planned mean;
  4. the lab's TAN reads off by a fixed bias (up to +-0.1 mg KOH/g) for the differing plants;
  5. the oil left at a change is 8 % (acidload's case says 10 %), the base floor 0.5 mg KOH/g.
Lab readings are the plant's values plus normal noise of the lab's stated precision.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Dict, List, Tuple

import numpy as np

M_KOH = 56.1056  # g/mol (IUPAC masses: K 39.0983, O 15.999, H 1.008)
V_M = 22.414e-3  # m3/mol, ideal gas at 0 degC, 101.325 kPa (CODATA, R*T/p)
LHV_CH4 = 35.88e6  # J/Nm3 (ISO 6976 at 0 degC combustion 25 degC, from memory)

# The engine and oil every synthetic plant shares (and the case file states to acidload)
POWER_W, EFFICIENCY, CH4_SHARE = 1.2e6, 0.41, 0.55
OIL_VOLUME_M3, OIL_DENSITY = 0.72, 880.0
CONSUMPTION_KG_H = 0.25e-3 * 1200  # 0.25 g/kWh at 1200 kW
FRESH_TBN, FRESH_TAN = 5.4, 1.5  # D4739 [mg KOH/g]
LIMIT_TAN_RISE, LIMIT_TBN_SHARE, LIMIT_FTIR = 2.0, 0.5, 20.0
SIGMA = {"tbn": 0.20, "tan": 0.15, "oxidation": 1.0, "nitration": 1.0}  # acidload's default precisions


@dataclass
class Plant:
    seed: int
    differing: bool
    s_share: float
    gamma: float
    k0: float
    tau: float
    alpha: float
    phi: float
    beta: float
    n0: float
    kd: float
    tan_bias: float
    h2s: List[float]  # charge means [ppmv], the last one the predicted charge
    drift: List[float]  # end-to-end relative drift of H2S within each charge
    hours: List[float]  # hours each recorded charge ran (the last, predicted one is run to its limit)
    residual: float = 0.08
    floor_b: float = 0.5

    @property
    def oil_mass(self) -> float:
        return OIL_VOLUME_M3 * OIL_DENSITY

    def sulfur_mol_h(self, h2s_ppmv: np.ndarray) -> np.ndarray:
        gas_nm3_h = POWER_W / EFFICIENCY * 3600 / (LHV_CH4 * CH4_SHARE)
        return gas_nm3_h * h2s_ppmv * 1e-6 / V_M


def make_plant(seed: int, differing: bool, charges: int = 4) -> Plant:
    rng = np.random.default_rng(seed)
    h2s = list(rng.uniform(180, 420, charges))
    return Plant(
        seed=seed, differing=differing,
        s_share=rng.uniform(0.0015, 0.004),
        gamma=rng.uniform(0.8, 1.2) if differing else 1.0,
        k0=rng.uniform(0.006, 0.012),
        tau=rng.uniform(1500, 6000) if differing else np.inf,
        alpha=rng.uniform(0.05, 0.12), phi=0.5, beta=0.2,
        n0=rng.uniform(0.003, 0.008), kd=2e-4,
        tan_bias=rng.uniform(-0.1, 0.1) if differing else 0.0,
        h2s=h2s,
        drift=list(rng.uniform(-0.3, 0.3, charges)) if differing else [0.0] * charges,
        hours=list(rng.uniform(450, 800, charges - 1)),
    )


@dataclass
class State:
    b: float
    o: float = 0.0
    n: float = 0.0
    w: float = 0.0
    c: float = 0.0
    a: float = FRESH_TAN

    def readings(self, plant: Plant) -> Dict[str, float]:
        return {"tbn": self.b, "tan": self.a + self.w + plant.beta * self.c + plant.tan_bias,
                "oxidation": self.o, "nitration": self.n}


def _decay(x: float, target: float, rate: float, source: float, dt: float) -> float:
    """Exact solution of dx/dt = source + rate*(target - x) over dt (rate > 0)."""
    eq = target + source / rate
    return eq + (x - eq) * np.exp(-rate * dt)


def run_charge(plant: Plant, k: int, start: State, hours: float, sample_every: float = 0) -> Tuple[State, List[Tuple[float, Dict[str, float]]], float]:
    """Runs charge k for `hours` (to its first limit when hours is inf) from `start`; returns the end
    state, the true readings at every sample time, and the hour the first limit was reached (inf if none)."""
    m = plant.oil_mass
    kk = CONSUMPTION_KG_H / m
    mean = plant.h2s[k]
    length = hours if np.isfinite(hours) else 6000.0
    x = State(**start.__dict__)
    samples: List[Tuple[float, Dict[str, float]]] = []
    reached = np.inf
    t = 0.0
    dt = 1.0
    while t < length - 1e-9:
        step = min(dt, length - t)
        h2s = mean * (1 + plant.drift[k] * ((t + step / 2) / max(length, 1.0) - 0.5))
        r_s = plant.s_share * plant.sulfur_mol_h(np.array(h2s)) * 2 * M_KOH / m * (h2s / 300.0) ** (plant.gamma - 1)
        k_ox = plant.k0 * (1 + (t + step / 2) / plant.tau)
        acid = float(r_s) + plant.phi * plant.alpha * k_ox
        if x.b > plant.floor_b:
            x.b = max(plant.floor_b, _decay(x.b, FRESH_TBN, kk, -acid, step))
        x.o = _decay(x.o, 0.0, kk, k_ox, step)
        x.n = _decay(x.n, 0.0, kk, plant.n0, step)
        x.w = _decay(x.w, 0.0, kk, (1 - plant.phi) * plant.alpha * k_ox, step)
        x.c = _decay(x.c, 0.0, kk, acid, step)
        x.a = FRESH_TAN + (x.a - FRESH_TAN) * np.exp(-(kk + plant.kd) * step) \
            - FRESH_TAN * plant.kd / (kk + plant.kd) * (1 - np.exp(-(kk + plant.kd) * step))
        t += step
        r = x.readings(plant)
        if not np.isfinite(reached):
            r_true = dict(r)
            r_true["tan"] -= plant.tan_bias  # the limits are on the oil, not on the lab's bias
            if (r_true["tbn"] <= LIMIT_TBN_SHARE * FRESH_TBN or r_true["tan"] >= FRESH_TAN + LIMIT_TAN_RISE
                    or r_true["tan"] >= r_true["tbn"] or r_true["oxidation"] >= LIMIT_FTIR or r_true["nitration"] >= LIMIT_FTIR):
                reached = t
                if not np.isfinite(hours):
                    break
        if sample_every and abs(t / sample_every - round(t / sample_every)) < 1e-9:
            samples.append((t, r))
    return x, samples, reached


def history(plant: Plant, sample_every: float = 150.0):
    """The recorded charges (all but the last) with their noisy lab samples, and the truth: the
    predicted (last) charge's drain interval. Returns (samples, truth_interval) with samples as
    (charge 1-based, oil hours, readings)."""
    rng = np.random.default_rng(plant.seed + 10_000)
    fresh = State(b=FRESH_TBN)
    x = fresh
    rows = []
    for k, hours in enumerate(plant.hours):
        x, samples, _ = run_charge(plant, k, x, hours, sample_every)
        for t, r in samples:
            rows.append((k + 1, t, {q: v + SIGMA[q] * rng.standard_normal() for q, v in r.items()}))
        # oil change: `residual` of the old oil stays, the rest is fresh
        keep = plant.residual
        x = State(b=keep * x.b + (1 - keep) * FRESH_TBN, o=keep * x.o, n=keep * x.n, w=keep * x.w, c=keep * x.c,
                  a=keep * x.a + (1 - keep) * FRESH_TAN)
    _, _, truth = run_charge(plant, len(plant.hours), x, np.inf)
    return rows, truth


def case_yaml(plant: Plant) -> str:
    """The plant as an acidload case: what its operator knows (engine, oil, the recorded charge means)."""
    segs = []
    for k, hours in enumerate(plant.hours):
        ev = ", event: oil-change" if k > 0 else ""
        segs.append(f"    - {{hours: {hours:.3f} h, h2s: {plant.h2s[k]:.3f} ppmv{ev}}}")
    return f"""# A synthetic plant (tests/synthetic/plant.py, seed {plant.seed}): invented, not measured.
format-version: 1
case: synthetic plant {plant.seed}
fuel:
  basis: dry
  composition: {{CH4: {CH4_SHARE * 100:.0f} %, CO2: {100 - CH4_SHARE * 100:.0f} %}}
  water-dew-point: 30 degC
  h2s: 300 ppmv
engine:
  rated-power: {POWER_W / 1e6} MW
  load: 100 %
  electrical-efficiency: {EFFICIENCY * 100:.0f} %
  excess-air-ratio: 1.8
  jacket-water-out: 90 degC
  oil-temperature: 88 degC
  nox: 500 mg/Nm3 at 5 % O2
oil:
  volume: {OIL_VOLUME_M3 * 1000:.0f} L
  density: {OIL_DENSITY:.0f} kg/m3
  fresh-tbn: {FRESH_TBN} mg KOH/g
  tbn-method: D4739
  fresh-tan: {FRESH_TAN} mg KOH/g
  consumption: 0.25 g/kWh
  makeup: continuous
limits:
  tbn-method: D4739
record:
  segments:
{chr(10).join(segs)}
"""


def plan_yaml(plant: Plant) -> str:
    """The planned operation of the predicted charge: its H2S mean, otherwise as the case."""
    base = case_yaml(plant).split("record:")[0]
    return base + f"record:\n  segments:\n    - {{hours: 100 h, h2s: {plant.h2s[-1]:.3f} ppmv}}\n"


def lab_csv(rows) -> str:
    out = ["# synthetic lab results (tests/synthetic/plant.py): invented, not measured",
           "charge,oil-hours,tbn [mg KOH/g],tbn-method,tan [mg KOH/g],oxidation [A/cm],nitration [A/cm]"]
    for charge, t, r in rows:
        out.append(f"{charge},{t:.0f},{max(r['tbn'], 0):.3f},D4739,{max(r['tan'], 0):.3f},{max(r['oxidation'], 0):.3f},"
                   f"{max(r['nitration'], 0):.3f}")
    return "\n".join(out) + "\n"
