#pragma once
// Physical constants and reference conditions [SI].
namespace acidload::constants {

inline constexpr double molar_gas_constant = 8.314462618;   //!< R [J/(mol·K)], exact (CODATA 2018)
inline constexpr double standard_atmosphere = 101325.0;     //!< [Pa], exact by definition
inline constexpr double zero_celsius = 273.15;              //!< 0 °C [K], exact by definition
//! The normal state of "Nm³" (0 °C, 101.325 kPa) and the ideal-gas molar volume there, V_m = R·T_n/p_n
//! with CODATA R [m³/mol] (≈ 22.414 L/mol): 1 Nm³ is 1/V_m mol. The one definition of the normal cubic
//! metre, used by the case reader's units (io/quantity.cpp) and the typed constructors (acidload/units.hpp).
inline constexpr double normal_molar_volume = molar_gas_constant * zero_celsius / standard_atmosphere;  //!< [m³/mol]
inline constexpr double mmhg = 133.322387415;               //!< 1 conventional mmHg [Pa] (13.5951 g/cm³ · 1 mm · g_n; the torr, 101325/760, differs by 1.4e-7)
inline constexpr double hours_per_second = 1.0 / 3600.0;    //!< [h/s]
inline constexpr double seconds_per_hour = 3600.0;          //!< [s/h]
//! The range of engine metal, coolant and sump-oil temperatures the model is built for: 0 to 150 °C
//! (liquid jacket water at the pressures of a closed cooling circuit; common practice, no source).
inline constexpr double engine_temperature_min = 273.15;    //!< [K]
inline constexpr double engine_temperature_max = 423.15;    //!< [K]
//! The coldest crankcase surface may be below freezing (a breather in winter): from -40 °C.
inline constexpr double crankcase_surface_min = 233.15;     //!< [K]
//! Dry air mole fractions N2, O2, Ar, CO2 (US Standard Atmosphere 1976 / ISO 2533 composition,
//! from memory; CO2 as in that composition, lower than today's ≈ 420 ppm). Sum is 1.
inline constexpr double air_n2 = 0.78084;                   //!< [mol/mol]
inline constexpr double air_o2 = 0.20946;                   //!< [mol/mol]
inline constexpr double air_ar = 0.00934;                   //!< [mol/mol]
inline constexpr double air_co2 = 0.00036;                  //!< [mol/mol]

}  // namespace acidload::constants
