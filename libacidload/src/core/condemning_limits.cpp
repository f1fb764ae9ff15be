#include "acidload/core/condemning_limits.hpp"

#include "acidload/core/error.hpp"

namespace acidload {

std::string_view name(Limit l) {
  constexpr std::string_view n[] = {"tbn-fall",  "tan-rise",    "crossover", "san",      "oxidation",
                                    "nitration", "viscosity",   "antioxidant", "anti-wear", "max-hours"};
  return n[static_cast<std::size_t>(l)];
}

std::string_view description(Limit l) {
  constexpr std::string_view d[] = {"TBN fallen to its limit share of fresh", "TAN risen by its limit over fresh",
                                    "TAN at or above TBN",                     "free strong acid (SAN) present",
                                    "oxidation at its limit",                  "nitration at its limit",
                                    "viscosity at 100 degC risen to its limit", "antioxidant reserve down to its limit",
                                    "anti-wear additive down to its limit",     "the planned maximum hours reached"};
  return d[static_cast<std::size_t>(l)];
}

void validate(const LimitSettings& s) {
  check::fraction("limits.tbn-share-of-fresh", s.tbn_share_of_fresh);
  check::in_range("limits.tan-rise", s.tan_rise, 0.0, 50.0, "mg KOH/g");
  check::in_range("limits.san", s.san, 0.0, 50.0, "mg KOH/g");
  check::in_range("limits.oxidation", s.oxidation, 0.0, 1000.0, "A/cm");
  check::in_range("limits.nitration", s.nitration, 0.0, 1000.0, "A/cm");
  check::in_range("limits.viscosity-change", s.viscosity_rise, 0.0, 5.0, "(share of fresh)");
  check::fraction("limits.antioxidant-remaining", s.antioxidant_remaining);
  check::fraction("limits.anti-wear-remaining", s.anti_wear_remaining);
  check::in_range("limits.max-hours", s.max_hours, 1.0, 1e6, "h");
  check::in_range("limits.water", s.water, 0.0, 1.0, "(share by mass)");
  check::in_range("limits.initial-ph", s.initial_ph, 0.0, 14.0, "");
}

double viscosity_change(double nu, double nu_fresh) {
  check::positive("viscosity-100", nu);
  check::positive("viscosity-100-fresh", nu_fresh);
  return nu / nu_fresh - 1;  // (ν − ν_fresh)/ν_fresh, the change as a share of fresh
}

double LimitReading::margin() const { return rising ? limit - value : value - limit; }

LimitReading read_limit(Limit l, const LimitSettings& s, const OilProperties& oil, const OilState& x, double hours) {
  LimitReading r;
  switch (l) {
    case Limit::tbn_fall: {
      const double fresh = oil.fresh_reactive_base() + oil.weak_base(s.tbn_method);  // fresh TBN by the limit's method
      r.value = tbn(x, oil, s.tbn_method);
      r.limit = s.tbn_share_of_fresh * fresh;
      r.rising = false;
      r.reached = r.value <= r.limit;
      break;
    }
    case Limit::tan_rise:
      r.value = tan(x, oil);
      r.limit = oil.fresh_tan + s.tan_rise;
      r.reached = r.value >= r.limit;
      break;
    case Limit::crossover:
      r.value = tan(x, oil);
      r.limit = tbn(x, oil, s.tbn_method);
      r.reached = r.value >= r.limit;
      break;
    case Limit::san:
      r.value = san(x);
      r.limit = s.san;
      r.reached = r.value > r.limit;
      break;
    case Limit::oxidation:
      r.value = x.oxidation;
      r.limit = s.oxidation;
      r.reached = r.value >= r.limit;
      break;
    case Limit::nitration:
      r.value = x.nitration;
      r.limit = s.nitration;
      r.reached = r.value >= r.limit;
      break;
    case Limit::viscosity:
      r.value = viscosity_rise(x, oil);
      r.limit = s.viscosity_rise;
      r.reached = r.value >= r.limit;
      break;
    case Limit::antioxidant:
      r.value = x.antioxidant;
      r.limit = s.antioxidant_remaining;
      r.rising = false;
      r.reached = r.value <= r.limit;
      break;
    case Limit::anti_wear:
      r.value = anti_wear_remaining(x, oil);
      r.limit = s.anti_wear_remaining;
      r.rising = false;
      r.reached = r.value <= r.limit;
      break;
    case Limit::max_hours:
      r.value = hours;
      r.limit = s.max_hours;
      r.reached = r.value >= r.limit;
      break;
  }
  if (!s.enabled[static_cast<std::size_t>(l)]) r.reached = false;
  return r;
}

LimitWatch limit_watch(const LimitSettings& s, const OilProperties& oil) {
  LimitWatch w{&s, &oil, {}};
  const OilState any{};
  for (Limit l : all_limits) w.threshold[static_cast<std::size_t>(l)] = read_limit(l, s, oil, any, 0).limit;
  return w;
}

}  // namespace acidload
