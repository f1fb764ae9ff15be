// The bundled demo site. Invented data: Harrowfield landfill (a fictional site), engine 2, running
// on raw landfill gas. Nothing here is a measurement.
#include "demo.hpp"

#include "acidload/acidload.hpp"

namespace acidload_cli {

using namespace acidload;

namespace {
FuelAnalysis demo_gas() {
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.52;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.40;
  a.main[static_cast<std::size_t>(Gas::N2)] = 0.07;
  a.main[static_cast<std::size_t>(Gas::O2)] = 0.01;
  a.main_basis = Basis::dry;
  a.water_fraction = water::water_fraction_at_humidity(1.0, 273.15 + 30, 101325 + 8000);  // saturated at 30 °C after the chiller
  a.reference = ReferenceState::normal();
  a.h2s = {300, ConcentrationUnit::ppmv, Basis::dry};
  a.other_sulfur = {12, ConcentrationUnit::mg_per_m3, Basis::dry};
  a.halocarbons = {{"tetrachloroethene", {9, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"trichloroethene", {6, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"chloroethene", {4, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"dichlorodifluoromethane", {5, ConcentrationUnit::mg_per_m3, Basis::dry}}};
  return a;
}

void print_figure(std::FILE* out, const char* label, double x_wet, double molar_mass, const GasContext& c) {
  std::fprintf(out, "  %-26s %10.2f %10.2f %10.2f %10.2f %10.3f %10.2f\n", label,
               from_wet_mole_fraction(x_wet, ConcentrationUnit::ppmv, Basis::dry, molar_mass, c),
               from_wet_mole_fraction(x_wet, ConcentrationUnit::ppmv, Basis::wet, molar_mass, c),
               from_wet_mole_fraction(x_wet, ConcentrationUnit::mg_per_m3, Basis::dry, molar_mass, c),
               from_wet_mole_fraction(x_wet, ConcentrationUnit::mg_per_m3, Basis::wet, molar_mass, c),
               from_wet_mole_fraction(x_wet, ConcentrationUnit::mg_per_MJ, Basis::wet, molar_mass, c),
               from_wet_mole_fraction(x_wet, ConcentrationUnit::mg_per_m3_methane, Basis::wet, molar_mass, c));
}
}  // namespace

int run_demo(std::FILE* out) {
  const FuelGas gas = resolve(demo_gas());
  const GasContext c = context(gas);
  std::fprintf(out, "acidload %s — demo site: Harrowfield landfill, engine 2 (invented data)\n\n", version());
  std::fprintf(out, "Fuel gas, wet composition [mol %%]:");
  for (Gas g : {Gas::CH4, Gas::CO2, Gas::N2, Gas::O2, Gas::H2O})
    std::fprintf(out, "  %s %.3f", std::string(formula_text(g)).c_str(), gas[g] * 100);
  std::fprintf(out, "\nLower heating value: %.3f MJ/Nm3 wet (ISO 6976, combustion at 15 degC)\n",
               lower_heating_value_volumetric(gas) * 1e-6);
  std::fprintf(out, "Water dew point of the fuel gas at 1.01325 bar: %.2f degC\n\n",
               water::dew_point(gas[Gas::H2O], 101325) - constants::zero_celsius);
  std::fprintf(out, "  %-26s %10s %10s %10s %10s %10s %10s\n", "contaminant", "ppmv dry", "ppmv wet",
               "mg/Nm3 dry", "mg/Nm3 wet", "mg/MJ", "mg/Nm3 CH4");
  print_figure(out, "H2S", gas[Gas::H2S], molar_mass(Gas::H2S), c);
  print_figure(out, "other sulfur (as S)", gas.other_sulfur, atomic_weight(Element::S) * 1e-3, c);
  print_figure(out, "total sulfur (as S)", gas.sulfur(), atomic_weight(Element::S) * 1e-3, c);
  print_figure(out, "organic chlorine (as Cl)", gas.chlorine, atomic_weight(Element::Cl) * 1e-3, c);
  print_figure(out, "organic fluorine (as F)", gas.fluorine, atomic_weight(Element::F) * 1e-3, c);
  std::fprintf(out, "\nCaution: H2S is toxic and the nose stops warning above ~100 ppm; results are estimates\n"
                    "that support, not replace, the engine maker's and oil supplier's limits and lab analysis.\n");
  return 0;
}

}  // namespace acidload_cli
