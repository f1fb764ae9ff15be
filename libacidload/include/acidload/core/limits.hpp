#pragma once
// Condemning limits and the drain interval (docs/model.md §9). Defaults are common practice, no single
// source; the engine maker's and oil supplier's limits govern.
#include <array>
#include <cstddef>
#include <string_view>

#include "acidload/core/oil.hpp"

namespace acidload {

//! The limits that can end an oil charge.
enum class Limit { tbn_fall, tan_rise, crossover, san, oxidation, nitration, max_hours };
inline constexpr std::size_t limit_count = 7;
inline constexpr std::array<Limit, limit_count> all_limits{Limit::tbn_fall, Limit::tan_rise, Limit::crossover,
    Limit::san, Limit::oxidation, Limit::nitration, Limit::max_hours};
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
  double max_hours = 8000;          //!< hours cap on a charge [h]
  std::array<bool, limit_count> enabled{true, true, true, true, true, true, true};  //!< by Limit
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
//! The reading of one limit for a state at `oil_hours` [h] of a charge.
LimitReading read_limit(Limit l, const LimitSettings& s, const OilProperties& oil, const OilState& state,
                        double oil_hours);

}  // namespace acidload
