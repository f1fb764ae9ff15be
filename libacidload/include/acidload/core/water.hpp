#pragma once
// Water saturation by IAPWS-IF97 region 4 (IAPWS R7-97(2012), equations 30 and 31).

namespace acidload::water {

inline constexpr double if97_t_min = 273.15;    //!< lower end of region 4 [K]
inline constexpr double if97_t_crit = 647.096;  //!< critical temperature, upper end [K]
inline constexpr double if97_p_min = 611.212677;  //!< p_sat(273.15 K) [Pa]
inline constexpr double if97_p_crit = 22.064e6;   //!< critical pressure [Pa]

//! Saturation pressure p_s(T) [Pa], IF97 eq. 30; T in [273.15, 647.096] K else InputError.
double saturation_pressure(double temperature);
//! Saturation temperature T_s(p) [K], IF97 eq. 31; p in [611.213 Pa, 22.064 MPa] else InputError.
double saturation_temperature(double pressure);
//! Water dew point of a gas [K]: T_s(x_H2O · p_total). x_H2O [mol/mol], p_total [Pa].
double dew_point(double water_fraction, double total_pressure);
//! Water vapour mole fraction of a gas at relative humidity phi [0–1], temperature T [K] and
//! total pressure p [Pa]: x = phi · p_s(T) / p.
double water_fraction_at_humidity(double relative_humidity, double temperature, double total_pressure);

}  // namespace acidload::water
