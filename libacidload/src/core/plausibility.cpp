#include "acidload/core/plausibility.hpp"

#include <cstdio>

#include "acidload/core/constants.hpp"
#include "acidload/core/fuel.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

namespace {
std::string fixed(double v, int decimals, const char* unit) {
  char b[64];
  std::snprintf(b, sizeof b, "%.*f %s", decimals, v, unit);
  return b;
}
double ms() { return atomic_weight(Element::S) * 1e-3; }  // [kg/mol]
double halogen_mass(const FuelGas& f) {                    // [kg per mol of fuel]
  return f.chlorine * atomic_weight(Element::Cl) * 1e-3 + f.fluorine * atomic_weight(Element::F) * 1e-3;
}
}  // namespace

double sulfur_per_methane(const FuelGas& f) {
  const double ch4 = f[Gas::CH4];
  return ch4 > 0 ? f.sulfur() * ms() / (ch4 * molar_volume(ReferenceState::normal())) : 0;
}
double sulfur_per_energy(const FuelGas& f) {
  const double lhv = lower_heating_value(f);
  return lhv > 0 ? f.sulfur() * ms() / lhv : 0;
}
double halogens_per_methane(const FuelGas& f) {
  const double ch4 = f[Gas::CH4];
  return ch4 > 0 ? halogen_mass(f) / (ch4 * molar_volume(ReferenceState::normal())) : 0;
}
double halogens_per_energy(const FuelGas& f) {
  const double lhv = lower_heating_value(f);
  return lhv > 0 ? halogen_mass(f) / lhv : 0;
}

std::vector<Warning> input_warnings(const FuelGas& f, const Operation& op, const FuelGasLimits& l, const PracticeRanges& p) {
  std::vector<Warning> w;
  const auto over = [&](double value, double limit, const char* key, double shown_scale, const char* unit, const char* what) {
    if (limit >= 0 && value > limit)
      w.push_back({key, fixed(value * shown_scale, 1, unit),
                   std::string(what) + " above the engine maker's fuel-gas limit you stated (" +
                       fixed(limit * shown_scale, 1, unit) + "): the engine is run outside its fuel specification"});
  };
  over(sulfur_per_methane(f), l.sulfur_per_methane, "engine.fuel-gas-limits.sulfur", 1e6, "mg/Nm3 CH4", "total sulfur");
  over(sulfur_per_energy(f), l.sulfur_per_energy, "engine.fuel-gas-limits.sulfur", 3.6e12, "mg/kWh", "total sulfur");
  over(halogens_per_methane(f), l.halogens_per_methane, "engine.fuel-gas-limits.halogens", 1e6, "mg/Nm3 CH4",
       "organic chlorine and fluorine");
  over(halogens_per_energy(f), l.halogens_per_energy, "engine.fuel-gas-limits.halogens", 3.6e12, "mg/kWh",
       "organic chlorine and fluorine");
  const double dry_h2s = f[Gas::H2S] / (1 - f[Gas::H2O]);
  if (dry_h2s > p.h2s_high)
    w.push_back({"fuel.h2s", fixed(dry_h2s * 1e6, 0, "ppmv dry"),
                 "beyond what gas engines are run on unscrubbed (above " + fixed(p.h2s_high * 1e6, 0, "ppmv") +
                     "); check the figure and the engine maker's fuel-gas limit"});
  const double jw = op.jacket_water_out;
  for (Warning x : jacket_water_warnings(jw, p)) w.push_back(x);
  const double bb = op.blowby_share;
  if (op.blowby_flow <= 0 && (bb < p.blowby_low || bb > p.blowby_high))
    w.push_back({"engine.blow-by", fixed(bb * 100, 2, "% of the charge"),
                 bb > p.blowby_high ? "more blow-by than a serviceable engine has (0.5-2 %, under 1 % when sound): a worn engine?"
                                    : "less blow-by than engines have (0.5-2 % of the charge): check the figure"});
  const double lam = op.air.excess_air_ratio;
  if (lam < p.lambda_low || lam > p.lambda_high)
    w.push_back({"engine.excess-air-ratio", fixed(lam, 2, ""),
                 lam < p.lambda_low ? "below lean burn (1.6-2.0 usual): a stoichiometric or rich engine burns and "
                                      "condenses differently from what this model assumes"
                                    : "leaner than gas engines run (1.6-2.0 usual): check the figure"});
  return w;
}

std::vector<Warning> interval_warnings(double t, const PracticeRanges& p) {
  if (t >= 0 && t < p.interval_low)
    return {{"drain interval", fixed(t, 0, "h"),
             "shorter than any plant runs an engine (below " + fixed(p.interval_low, 0, "h") +
                 "): the gas needs scrubbing, or an input is wrong"}};
  return {};
}

std::vector<Warning> jacket_water_warnings(double jw, const PracticeRanges& p) {
  if (jw >= p.jacket_water_low && jw <= p.jacket_water_high) return {};
  return {{"engine.jacket-water-out", fixed(jw - constants::zero_celsius, 1, "degC"),
           "outside usual engine practice (" + fixed(p.jacket_water_low - constants::zero_celsius, 0, "") + "to " +
               fixed(p.jacket_water_high - constants::zero_celsius, 0, "degC") +
               " at the jacket outlet): ask the engine maker whether the engine can run there"}};
}

}  // namespace acidload
