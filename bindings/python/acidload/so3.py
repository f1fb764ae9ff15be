"""SO2 + ½ O2 ⇌ SO3 equilibrium from NIST-JANAF thermochemistry (standard pressure 1 bar), from acidload's
core. An equilibrium share is a bound on the SO3 share, never the model (engines are kinetically limited)."""
from ._core import so3 as _s

__all__ = ["kp", "standard_gibbs_reaction", "equilibrium_so3_share", "T_MIN", "T_MAX", "STANDARD_PRESSURE_PA"]

T_MIN: float = _s.T_MIN                        #: lowest temperature of the data fits [K]
T_MAX: float = _s.T_MAX                        #: highest temperature of the data fits [K]
STANDARD_PRESSURE_PA: float = _s.STANDARD_PRESSURE  #: p° of the data [Pa] (1 bar)


def kp(temperature_k: float) -> float:
    """Kp = (p_SO3/p°)/((p_SO2/p°)·(p_O2/p°)^½) [bar^-½], p° = 1 bar, at T [K] in [298, 6000]."""
    return _s.kp(float(temperature_k))


def standard_gibbs_reaction(temperature_k: float) -> float:
    """ΔG° of SO2 + ½ O2 ⇌ SO3 at p° = 1 bar [J/mol], at T [K]."""
    return _s.standard_gibbs_reaction(float(temperature_k))


def equilibrium_so3_share(temperature_k: float, o2_fraction: float, total_pressure_pa: float) -> float:
    """Equilibrium SO3/(SO2 + SO3) [mol/mol] at T [K], O2 mole fraction [mol/mol], total pressure [Pa]
    (sulfur as a trace)."""
    return _s.equilibrium_so3_share(float(temperature_k), float(o2_fraction), float(total_pressure_pa))
