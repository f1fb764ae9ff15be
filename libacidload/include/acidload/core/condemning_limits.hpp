#pragma once
// Condemning limits and the drain interval (docs/model.md §9). Defaults are common practice, no single
// source; the engine maker's and oil supplier's limits govern.
#include <array>
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "acidload/core/oil.hpp"

namespace acidload {

//! The limits that can end an oil charge. `max_hours` is the plant's planned maximum, not a property of
//! the oil: a charge that reaches it has reached no oil-condition limit within that horizon.
enum class Limit { tbn_fall, tan_rise, crossover, san, oxidation, nitration, viscosity, antioxidant, anti_wear, max_hours };
inline constexpr std::size_t limit_count = 10;
inline constexpr std::array<Limit, limit_count> all_limits{Limit::tbn_fall, Limit::tan_rise, Limit::crossover,
    Limit::san, Limit::oxidation, Limit::nitration, Limit::viscosity, Limit::antioxidant, Limit::anti_wear,
    Limit::max_hours};
//! Whether a limit is an oil-condition limit (every limit but the planned maximum, max-hours).
constexpr bool is_oil_condition(Limit l) { return l != Limit::max_hours; }
std::string_view name(Limit l);         //!< short key, e.g. "tbn-fall"
std::string_view description(Limit l);  //!< plain words, e.g. "TBN at or below 50 % of fresh"

//! The limit settings.
struct LimitSettings {
  double tbn_share_of_fresh = 0.5;  //!< TBN ≤ this share of the fresh oil's TBN [-]
  BaseNumberMethod tbn_method = BaseNumberMethod::d4739;  //!< method both TBNs are read by
  double tan_rise = 2.0;            //!< TAN ≥ fresh TAN + this [mg KOH/g]
  bool crossover = true;            //!< TAN ≥ TBN (by tbn_method) ends the charge
  double san = 0.0;                 //!< SAN above this ends the charge [mg KOH/g]; 0 = any free strong acid
  double oxidation = 20;            //!< [A/cm] (about 20 A/cm, from memory)
  double nitration = 20;            //!< [A/cm] (about 20 A/cm, from memory)
  double viscosity_rise = 0.20;     //!< kinematic viscosity at 100 °C up by this share over fresh [-] (+20 %, common practice)
  double antioxidant_remaining = 0.25;  //!< antioxidant reserve down to this share of fresh [-] (25 %: ASTM D7590, seen second-hand)
  double anti_wear_remaining = 0.0; //!< anti-wear additive down to this share of fresh [-]; off unless the lab reports it
  double max_hours = 8000;          //!< the plant's planned maximum hours on a charge: the horizon [h]
  //! Lab-only limits (not modelled; compared with lab readings): water and initial pH.
  double water = 0.005;             //!< water in the oil above this share by mass [-] (0.5 %, common practice)
  double initial_ph = 4.5;          //!< i-pH (ASTM D7946) at or below this [-] (4–4.5 for biogas engines, common practice)
  std::array<bool, limit_count> enabled{true, true, true, true, true, true, true, true, false, true};  //!< by Limit
};
void validate(const LimitSettings& s);

//! How far a state is from a limit: the reading, the limit value, and whether it is reached.
struct LimitReading {
  double value = 0;     //!< the reading (mg KOH/g, A/cm or h)
  double limit = 0;     //!< the limit value, same unit
  bool reached = false;
  //! Distance left (positive while not reached), in the reading's unit.
  double margin() const;
  bool rising = true;   //!< the limit is reached from below (TAN, SAN, …) or from above (TBN)
};
//! A lab sample's kinematic viscosity change over the fresh oil's, (ν − ν_fresh)/ν_fresh [-], both at
//! 100 °C [any one unit, e.g. cSt]: the "% change from new oil" of used-oil reports (ASTM D445 readings).
double viscosity_change(double nu, double nu_fresh);

//! The reading of one limit for a state at `oil_hours` [h] of a charge.
LimitReading read_limit(Limit l, const LimitSettings& s, const OilProperties& oil, const OilState& state,
                        double oil_hours);

//! The settings and oil a run watches its limits with, each limit's threshold held once (read_limit's
//! `limit`, which depends on the state only for the crossover, whose limit is the TBN itself).
struct LimitWatch {
  const LimitSettings* settings = nullptr;
  const OilProperties* oil = nullptr;
  std::array<double, limit_count> threshold{};
};
LimitWatch limit_watch(const LimitSettings& s, const OilProperties& oil);

//! Bit i set when limit i reads reached for `state` at `oil_hours`: read_limit(l, …).reached of every
//! limit, enabled or not (mask with the enabled ones), the same tests on the same readings, all ten
//! without a branch or a LimitReading each, for simulate's every step.
inline std::uint32_t reached_limits(const LimitWatch& w, const OilState& x, double oil_hours) {
  const OilProperties& oil = *w.oil;
  const double b = tbn(x, oil, w.settings->tbn_method), a = tan(x, oil);
  const auto bit = [](Limit l, bool reached) { return static_cast<std::uint32_t>(reached) << static_cast<unsigned>(l); };
  const auto th = [&w](Limit l) { return w.threshold[static_cast<std::size_t>(l)]; };
  return bit(Limit::tbn_fall, b <= th(Limit::tbn_fall)) | bit(Limit::tan_rise, a >= th(Limit::tan_rise)) |
         bit(Limit::crossover, a >= b) | bit(Limit::san, san(x) > th(Limit::san)) |
         bit(Limit::oxidation, x.oxidation >= th(Limit::oxidation)) |
         bit(Limit::nitration, x.nitration >= th(Limit::nitration)) |
         bit(Limit::viscosity, viscosity_rise(x, oil) >= th(Limit::viscosity)) |
         bit(Limit::antioxidant, x.antioxidant <= th(Limit::antioxidant)) |
         bit(Limit::anti_wear, anti_wear_remaining(x, oil) <= th(Limit::anti_wear)) |
         bit(Limit::max_hours, oil_hours >= th(Limit::max_hours));
}

}  // namespace acidload
