// The bundled demo site. Invented data: Harrowfield landfill (a fictional site), engine 2, a
// 1.2 MW lean-burn set on landfill gas. Nothing here is a measurement.
#include "demo.hpp"

#include <string>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload_cli {

using namespace acidload;

namespace {
FuelAnalysis demo_gas(double h2s_ppmv, double polish) {
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.52;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.40;
  a.main[static_cast<std::size_t>(Gas::N2)] = 0.07;
  a.main[static_cast<std::size_t>(Gas::O2)] = 0.01;
  a.main_basis = Basis::dry;
  a.water_fraction = water::water_fraction_at_humidity(1.0, 273.15 + 30, 101325 + 8000);  // saturated at 30 °C, 80 mbar g
  a.h2s = {h2s_ppmv, ConcentrationUnit::ppmv, Basis::dry};
  a.other_sulfur = {12 * polish, ConcentrationUnit::mg_per_m3, Basis::dry};
  a.halocarbons = {{"tetrachloroethene", {9 * polish, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"trichloroethene", {6 * polish, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"chloroethene", {4 * polish, ConcentrationUnit::mg_per_m3, Basis::dry}},
                   {"dichlorodifluoromethane", {5 * polish, ConcentrationUnit::mg_per_m3, Basis::dry}}};
  return a;
}

EngineCase demo_case(const std::string& name, double h2s_ppmv, double polish, double jacket_c, double tbn) {
  EngineCase c;
  c.name = name;
  c.charge.oil.fresh_tbn = tbn;
  c.charge.oil.fresh_tan = 1.5;
  c.charge.mass = 0.720 * c.charge.oil.density_15;  // 720 L at 15 °C
  Segment s;
  s.fuel = resolve(demo_gas(h2s_ppmv, polish));
  s.operation.electrical_power = 1.2e6;
  s.operation.fuel_flow = fuel_flow_from_power(1.2e6, 0.41, lower_heating_value(s.fuel));
  s.operation.air.excess_air_ratio = 1.8;
  s.operation.jacket_water_out = 273.15 + jacket_c;
  s.operation.coldest_crankcase_surface = 273.15 + 55;
  s.operation.nox = {500, NoxEmission::Unit::mg_per_m3_dry_at_o2_ref, 0.05};
  s.oil_temperature = 273.15 + 88;
  s.oil_consumption = oil_consumption(0.25e-3 / 3.6e6, 1.2e6);  // 0.25 g/kWh
  s.hours = c.model.limits.max_hours;
  s.starts = s.hours / 300;  // a start every 300 h
  c.record = {s};
  return c;
}

void print_gas(std::FILE* out, const FuelGas& gas) {
  const GasContext c = context(gas);
  std::fprintf(out, "Fuel gas (raw), wet [mol %%]:");
  for (Gas g : {Gas::CH4, Gas::CO2, Gas::N2, Gas::O2, Gas::H2O})
    std::fprintf(out, "  %s %.2f", std::string(formula_text(g)).c_str(), gas[g] * 100);
  std::fprintf(out, "\nLHV %.2f MJ/Nm3 wet (ISO 6976, 15 degC); water dew point %.1f degC at 1.01325 bar\n",
               lower_heating_value_volumetric(gas) * 1e-6, water::dew_point(gas[Gas::H2O], 101325) - 273.15);
  std::fprintf(out, "  %-22s %9s %9s %9s %9s\n", "contaminant", "ppmv dry", "mg/Nm3 dry", "mg/MJ", "mg/Nm3 CH4");
  const auto row = [&](const char* label, double x, double M) {
    std::fprintf(out, "  %-22s %9.2f %9.2f %9.3f %9.2f\n", label,
                 from_wet_mole_fraction(x, ConcentrationUnit::ppmv, Basis::dry, M, c),
                 from_wet_mole_fraction(x, ConcentrationUnit::mg_per_m3, Basis::dry, M, c),
                 from_wet_mole_fraction(x, ConcentrationUnit::mg_per_MJ, Basis::wet, M, c),
                 from_wet_mole_fraction(x, ConcentrationUnit::mg_per_m3_methane, Basis::wet, M, c));
  };
  row("H2S", gas[Gas::H2S], molar_mass(Gas::H2S));
  row("other sulfur (as S)", gas.other_sulfur, atomic_weight(Element::S) * 1e-3);
  row("organic Cl (as Cl)", gas.chlorine, atomic_weight(Element::Cl) * 1e-3);
  row("organic F (as F)", gas.fluorine, atomic_weight(Element::F) * 1e-3);
}
}  // namespace

int run_demo(std::FILE* out) {
  const std::vector<EngineCase> variants = {
      demo_case("raw gas", 300, 1.0, 90, 6.0),
      demo_case("iron oxide to 50 ppmv", 50, 1.0, 90, 6.0),
      demo_case("iron oxide + carbon to 10 ppmv", 10, 0.2, 90, 6.0),
      demo_case("jacket water 98 degC", 300, 1.0, 98, 6.0),
      demo_case("TBN 9 oil", 300, 1.0, 90, 9.0),
  };
  std::fprintf(out, "acidload %s — demo site: Harrowfield landfill, engine 2, 1.2 MW (invented data)\n\n", version());
  print_gas(out, variants.front().record.front().fuel);
  std::fprintf(out, "\n%-31s %-29s %6s %8s %9s  %-10s %5s %5s %5s %6s\n", "", "acid into the oil [g KOH/h]", "S to", "TBN fall",
               "drain", "limit", "TBN", "TAN", "SAN", "H2SO4");
  std::fprintf(out, "%-31s %5s %5s %5s %5s %5s %6s %8s %9s  %-10s %5s %5s %5s %6s\n", "variant", "H2SO4", "SO2", "HCl",
               "HF", "HNO3", "oil %", "/100 h", "interval", "reached", "end", "end", "end", "dew C");
  for (const EngineCase& c : variants) {
    const VariantSummary v = summarize(c);
    std::string interval = v.charge.first ? std::to_string(static_cast<long>(v.charge.drain_interval + 0.5)) + " h" : "not reached";
    std::string limit = v.charge.first ? std::string(name(*v.charge.first)) : "-";
    std::fprintf(out, "%-31s %5.2f %5.2f %5.2f %5.2f %5.2f %6.3f %8.3f %9s  %-10s %5.2f %5.2f %5.2f %6.1f\n",
                 v.name.c_str(), v.inflow_koh.sulfuric, v.inflow_koh.sulfurous_fresh, v.inflow_koh.hydrochloric,
                 v.inflow_koh.hydrofluoric, v.inflow_koh.nitric, v.sulfur_share_to_oil * 100,
                 -v.initial_tbn_rate * 100, interval.c_str(), limit.c_str(), v.tbn_end, v.tan_end, v.san_end,
                 v.dew_points.sulfuric > 0 ? v.dew_points.sulfuric - 273.15 : 0.0);
  }
  std::fprintf(out, "\nTBN by ASTM D4739; limits: TBN <= 50 %% of fresh, TAN >= fresh + 2, TAN >= TBN, SAN > 0,\n"
                    "oxidation or nitration >= 20 A/cm, 8000 h cap (common practice; set your own).\n");
  std::fprintf(out, "\nCaution: estimates that support, not replace, the engine maker's and oil supplier's limits,\n"
                    "lab analysis, local codes and licensed practice. Never extend a drain interval without lab\n"
                    "confirmation. H2S is toxic (the nose stops warning above ~100 ppm) and flammable; used oil\n"
                    "with free acid is corrosive.\n");
  return 0;
}

}  // namespace acidload_cli
