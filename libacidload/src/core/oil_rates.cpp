#include "acidload/core/oil_rates.hpp"

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"
#include "acidload/core/oil.hpp"

namespace acidload {

double oil_consumption(double specific, double power) {
  check::in_range("oil.consumption", specific, 0.0, 5e-9, "kg/J (up to 18 g/kWh)");
  check::non_negative("engine.electrical-power", power);
  return specific * power * constants::seconds_per_hour;
}

double specific_consumption(double flow, double power) {
  check::non_negative("oil.consumption", flow);
  check::positive("engine.power", power);
  return flow / (power * constants::seconds_per_hour);  // [kg/h] / ([W] · [s/h]) = kg/J
}

OilRates oil_rates(const Transfer& t, const OxidationLaw& law, double sump_T, double consumption, bool continuous,
                   bool check_law) {
  if (check_law) validate(law);
  check::in_range("engine.oil-temperature", sump_T, constants::engine_temperature_min, constants::engine_temperature_max, "K");
  OilRates r;
  r.strong_acid = t.inflow.strong_koh();
  r.sulfurous_fresh = t.inflow.sulfurous_fresh_koh();
  r.nitration = law.nitration_yield * t.inflow.nitric;  // [A/cm per mol/kg] × [mol/h] = A/cm·kg/h
  // the temperature factor once: both rates follow it (oxidation_rate and antioxidant_depletion_rate
  // of oil.hpp, the same expressions, so the same bits)
  const double f = oxidation_temperature_factor(law, sump_T + law.ring_zone_offset);
  r.oxidation = law.rate_at_reference * f;                // k_ox(T)
  r.organic_acid = law.organic_acid_yield * r.oxidation;  // α·k_ox
  r.antioxidant_depletion = f / law.induction_hours;      // k_A(T)
  r.depleted_factor = law.depleted_factor;
  r.consumption = consumption;
  r.continuous_makeup = continuous;
  return r;
}

}  // namespace acidload
