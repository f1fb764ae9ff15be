#pragma once
// Heating values from composition by ISO 6976:2016 ideal molar values.
#include "acidload/core/species.hpp"

namespace acidload {

//! Combustion reference temperatures tabulated by ISO 6976: 0, 15, 20 and 25 °C.
enum class CombustionReference { t0, t15, t20, t25 };
//! The temperature of a combustion reference [K].
double temperature(CombustionReference r);
//! The reference for a temperature [K]; throws InputError unless it is 273.15, 288.15, 293.15 or 298.15 K.
CombustionReference combustion_reference_at(double temperature);

//! Ideal gross molar calorific value of a species [J/mol] (ISO 6976:2016 Table 3; 0 for inerts).
double gross_molar_heating_value(Gas g, CombustionReference r);
//! Enthalpy of vaporisation of water at the reference temperature [J/mol] (ISO 6976:2016).
double water_vaporisation_enthalpy(CombustionReference r);
//! Ideal net (lower) molar calorific value [J/mol]: gross − (H atoms / 2) · L(T), water vapour 0.
double net_molar_heating_value(Gas g, CombustionReference r);

}  // namespace acidload
