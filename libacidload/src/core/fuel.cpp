#include "acidload/core/fuel.hpp"

#include <array>
#include <cstdio>
#include <cmath>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/halocarbons.hpp"

namespace acidload {

double FuelGas::sulfur() const { return x[static_cast<std::size_t>(Gas::H2S)] + other_sulfur; }

double lower_heating_value(const FuelGas& f) {
  // H_i of every gas at the four references, made once from net_molar_heating_value (the same values:
  // a record resolves a gas, several passes each, for every new row)
  static const auto H = [] {
    std::array<std::array<double, gas_count>, 4> t{};
    for (int r = 0; r < 4; ++r)
      for (Gas g : all_gases) t[r][static_cast<std::size_t>(g)] = net_molar_heating_value(g, static_cast<CombustionReference>(r));
    return t;
  }();
  const auto& Hr = H[static_cast<std::size_t>(f.combustion)];
  double h = 0;
  for (Gas g : all_gases) h += f[g] * Hr[static_cast<std::size_t>(g)];  // Σ x_i H_i
  return h;
}

double lower_heating_value_volumetric(const FuelGas& f) {
  return lower_heating_value(f) / molar_volume(f.reference);
}

GasContext context(const FuelGas& f, double molar_flow) {
  GasContext c;
  c.reference = f.reference;
  c.water_fraction = f[Gas::H2O];
  c.methane_fraction = f[Gas::CH4];
  c.lhv_molar = lower_heating_value(f);
  c.molar_flow = molar_flow;
  return c;
}

namespace {
constexpr Gas main_species[] = {Gas::CH4, Gas::CO2, Gas::N2, Gas::O2, Gas::H2, Gas::C2H6, Gas::C3H8, Gas::Ar};


InputError h2s_refused(double x_wet) {
  const std::string shown = format_value(x_wet * 100) + " % of the wet gas";
  if (x_wet >= 1)  // more H2S than gas: a unit or a decimal point is wrong
    return InputError("fuel.h2s", shown, "a physically possible H2S content: less than 100 % of the gas (check the unit)");
  return InputError("fuel.h2s", shown,
                    "an H2S content below 20 % of the gas (the model's range: combustion and dew points are "
                    "built for biogas and landfill gas, not for acid gas)");
}
}  // namespace

FuelGas resolve(const FuelAnalysis& a) {
  validate(a.reference);
  check::in_range("fuel.water", a.water_fraction, 0.0, 0.5, "mol/mol");
  double sum_main = 0;
  for (Gas g : main_species) {
    const double v = a.main[static_cast<std::size_t>(g)];
    if (!(v >= 0 && v <= 1))  // the key's name is made only to refuse (a record resolves a gas per new row)
      check::fraction(("fuel.composition." + std::string(formula_text(g))).c_str(), v);
    sum_main += v;
  }
  // Main components are normalised to fill what the water and the H2S leave (on either basis the
  // stated fractions are shares of that remainder). Contaminant figures on the wet basis need the
  // wet composition, and figures per MJ the LHV, which depends slightly on the H2S: a fixed point
  // that converges to machine precision in a few passes (the H2S share of the LHV is ~1e-4).
  const double expected_sum = a.main_basis == Basis::dry ? 1.0 : 1.0 - a.water_fraction;
  if (!(std::fabs(sum_main - expected_sum) <= 0.1))
    throw InputError("fuel.composition", [&] { char b[32]; std::snprintf(b, sizeof b, "%.6g", sum_main * 100); return std::string(b); }() + " % in all",
                     "main components summing to " + format_value(expected_sum * 100) +
                         " % (within 10 points); they are normalised");
  FuelGas f;
  f.reference = a.reference;
  f.combustion = a.combustion;
  f.x[static_cast<std::size_t>(Gas::H2O)] = a.water_fraction;
  double h2s = 0;  // wet mole fraction of H2S
  struct Compound {
    const Formula* formula;
    double molar_mass;
  };
  std::vector<Compound> compounds;  // looked up (and their molar masses summed) in the first pass only
  compounds.reserve(a.halocarbons.size());
  for (int pass = 0; pass < 50; ++pass) {
    const double scale = (1.0 - a.water_fraction - h2s) / sum_main;
    for (Gas g : main_species) f.x[static_cast<std::size_t>(g)] = a.main[static_cast<std::size_t>(g)] * scale;
    f.x[static_cast<std::size_t>(Gas::H2S)] = h2s;
    const GasContext c = context(f);
    const double h2s_new = to_wet_mole_fraction(a.h2s, molar_mass(Gas::H2S), c);
    f.other_sulfur = to_wet_mole_fraction(a.other_sulfur, atomic_weight(Element::S) * 1e-3, c);
    f.chlorine = to_wet_mole_fraction(a.chlorine, atomic_weight(Element::Cl) * 1e-3, c);
    f.fluorine = to_wet_mole_fraction(a.fluorine, atomic_weight(Element::F) * 1e-3, c);
    for (std::size_t k = 0; k < a.halocarbons.size(); ++k) {  // per compound, by formula: x_Cl += x_i n_Cl,i
      const auto& h = a.halocarbons[k];
      if (pass == 0) {
        const Halocarbon& entry = find_halocarbon(h.compound);
        compounds.push_back({&halocarbon_formula(entry), halocarbon_molar_mass(entry)});
      }
      const Formula& fm = *compounds[k].formula;
      const double xc = to_wet_mole_fraction(h.amount, compounds[k].molar_mass, c);
      f.chlorine += xc * fm[Element::Cl];
      f.fluorine += xc * fm[Element::F];
    }
    const bool settled = pass > 0 && std::fabs(h2s_new - h2s) <= 1e-16 * (1 + h2s_new);
    // the figure just converted is the one to check (checking the previous pass's value let any
    // figure of 20 % or more through as zero)
    if (!(h2s_new < max_h2s_fraction)) throw h2s_refused(h2s_new);
    h2s = h2s_new;
    if (settled) break;
  }
  return f;
}

FuelGas with_h2s(const FuelGas& f, double x) {
  if (!(x >= 0)) check::non_negative("fuel.h2s", x);
  if (!(x < max_h2s_fraction)) throw h2s_refused(x);
  FuelGas g = f;
  double main = 0;
  for (Gas s : main_species) main += f[s];
  const double scale = (main + f[Gas::H2S] - x) / main;  // the main components fill what H2S leaves
  for (Gas s : main_species) g.x[static_cast<std::size_t>(s)] *= scale;
  g.x[static_cast<std::size_t>(Gas::H2S)] = x;
  return g;
}

double fuel_flow_from_power(double electrical_power, double electrical_efficiency, double lhv_molar) {
  check::non_negative("engine.electrical-power", electrical_power);
  check::in_range("engine.electrical-efficiency", electrical_efficiency, 0.01, 0.7, "(fraction)");
  check::positive("fuel.lower-heating-value", lhv_molar);
  return electrical_power / (electrical_efficiency * lhv_molar) * constants::seconds_per_hour;
}

}  // namespace acidload
