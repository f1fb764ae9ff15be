#include "acidload/core/heating_value.hpp"

#include <cmath>

#include "acidload/core/error.hpp"

namespace acidload {

double temperature(CombustionReference r) {
  constexpr double t[] = {273.15, 288.15, 293.15, 298.15};
  return t[static_cast<int>(r)];
}

CombustionReference combustion_reference_at(double T) {
  for (int i = 0; i < 4; ++i)
    if (std::fabs(T - temperature(static_cast<CombustionReference>(i))) < 1e-9) return static_cast<CombustionReference>(i);
  throw InputError("combustion-reference-temperature", format_value(T) + " K",
                   "one of the ISO 6976 reference temperatures 0, 15, 20 or 25 degC");
}

double gross_molar_heating_value(Gas g, CombustionReference r) {
  // kJ/mol at 0 / 15 / 20 / 25 °C, ISO 6976:2016 Table 3 (as transcribed in three public
  // implementations that agree digit for digit; they reproduce the Annex D example 1 sum).
  static constexpr double ch4[] = {892.92, 891.51, 891.05, 890.58};
  static constexpr double h2[] = {286.64, 286.15, 285.99, 285.83};
  static constexpr double h2s[] = {562.93, 562.38, 562.19, 562.01};
  static constexpr double c2h6[] = {1564.35, 1562.14, 1561.42, 1560.69};
  static constexpr double c3h8[] = {2224.03, 2221.10, 2220.13, 2219.17};
  const int i = static_cast<int>(r);
  switch (g) {
    case Gas::CH4: return ch4[i] * 1e3;
    case Gas::H2: return h2[i] * 1e3;
    case Gas::H2S: return h2s[i] * 1e3;
    case Gas::C2H6: return c2h6[i] * 1e3;
    case Gas::C3H8: return c3h8[i] * 1e3;
    case Gas::H2O: return water_vaporisation_enthalpy(r);  // ISO 6976: vapour condenses on the gross basis
    default: return 0;  // CO2, N2, O2, Ar and combustion products carry no heating value
  }
}

double water_vaporisation_enthalpy(CombustionReference r) {
  static constexpr double L[] = {45.064, 44.431, 44.222, 44.013};  // kJ/mol, ISO 6976:2016
  return L[static_cast<int>(r)] * 1e3;
}

double net_molar_heating_value(Gas g, CombustionReference r) {
  if (g == Gas::H2O) return 0;
  const double gross = gross_molar_heating_value(g, r);
  if (gross == 0) return 0;
  return gross - formula(g)[Element::H] / 2 * water_vaporisation_enthalpy(r);  // net = gross − n_H2O L
}

}  // namespace acidload
