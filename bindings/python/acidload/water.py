"""Water saturation by IAPWS-IF97 region 4 (IAPWS R7-97(2012), equations 30 and 31), from acidload's core."""
from ._core import water as _w

__all__ = ["saturation_pressure", "saturation_temperature", "dew_point", "T_MIN", "T_CRIT"]

T_MIN = 273.15   #: lower end of region 4 [K]
T_CRIT = 647.096  #: critical temperature, upper end of region 4 [K]


def saturation_pressure(temperature_k: float) -> float:
    """Saturation pressure p_s(T) [Pa] (IF97 eq. 30); T [K] in [273.15, 647.096], else InputError."""
    return _w.saturation_pressure(float(temperature_k))


def saturation_temperature(pressure_pa: float) -> float:
    """Saturation temperature T_s(p) [K] (IF97 eq. 31); p [Pa] in [611.213 Pa, 22.064 MPa], else InputError."""
    return _w.saturation_temperature(float(pressure_pa))


def dew_point(water_fraction: float, total_pressure_pa: float) -> float:
    """Water dew point of a gas [K]: T_s(x_H2O · p_total); x [mol/mol], p [Pa]."""
    return _w.dew_point(float(water_fraction), float(total_pressure_pa))
