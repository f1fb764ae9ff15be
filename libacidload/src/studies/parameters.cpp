#include "acidload/studies/parameters.hpp"

#include <algorithm>
#include <cmath>

#include "acidload/core/error.hpp"
#include "acidload/studies/inverse.hpp"

namespace acidload {

const std::vector<ParameterInfo>& parameter_table() {
  // Ranges are those the core's validation accepts (core/transfer.cpp, core/oil.cpp). The priors are
  // ours (chosen), weak on purpose: σ = 2 in logit space is about a factor of 7 near the low end of a
  // range (e^2 = 7.4), σ = ln 10 in log space a factor of 10 either way; both centred on the case's
  // value (the model default unless the case sets one). The basis names what the width rests on.
  constexpr double ln10 = 2.302585092994046, logit_sd = 2.0;
  const std::string logit = "chosen: weak, logit σ 2 (about a factor of 7 either way while the value is small against the top of its range)";
  const std::string share = "chosen: weak, logit σ 2 (a share from about 1/7 to 7 times the default's odds)";
  const std::string log10 = "chosen: weak, a factor of 10 either way (log σ ln 10)";
  const std::string stated = "; the case states it, the prior only keeps a direction the samples do not see defined";
  static const std::vector<ParameterInfo> t = {
      {"model.so3-share", "-", Bound::share, 0, 1, logit_sd, share},
      {"model.liner-uptake", "-", Bound::interval, 0, 0.1, logit_sd, logit + "; the acid load the lab's TBN fall measures"},
      {"model.liner-wall-rise", "K", Bound::interval, 0, 200, logit_sd, logit},
      {"model.capture-so2", "-", Bound::share, 0, 1, logit_sd, share},
      {"model.capture-no2", "-", Bound::share, 0, 1, logit_sd, share},
      {"model.burnt-share-of-blow-by", "-", Bound::share, 0, 1, logit_sd, share},
      {"model.wet-so2-factor", "-", Bound::interval, 1, 100, logit_sd, logit},
      {"model.oxidation-rate", "A/cm per h", Bound::interval, 0, 10, logit_sd, logit + "; the lab's FTIR oxidation measures it"},
      {"model.ring-zone-offset", "K", Bound::interval, 0, 150, logit_sd, logit},
      {"model.organic-acid-yield", "mg KOH/g per A/cm", Bound::interval, 0, 5, logit_sd, logit + "; TAN against oxidation measures it"},
      {"model.nitration-yield", "A/cm per mol/kg", Bound::interval, 0, 1e6, logit_sd, logit + "; the lab's FTIR nitration measures it"},
      {"model.induction-time", "h", Bound::interval, 1, 1e6, logit_sd,
       logit + "; antioxidant readings would measure it; not fitted, it is the forecast band's prior spread"},
      {"model.depleted-oxidation-factor", "-", Bound::interval, 1, 100, logit_sd, logit + "; not fitted, a forecast band's prior spread"},
      {"model.viscosity-per-oxidation", "per A/cm", Bound::interval, 0, 1, logit_sd, logit + "; not fitted, a forecast band's prior spread"},
      {"model.viscosity-per-nitration", "per A/cm", Bound::interval, 0, 1, logit_sd, logit + "; not fitted, a forecast band's prior spread"},
      {"model.weak-base-d2896", "mg KOH/g", Bound::interval, 0, 10, logit_sd, logit + "; a fresh oil titrated by both methods pins it"},
      {"model.weak-base-d4739", "mg KOH/g", Bound::interval, 0, 10, logit_sd, logit + "; a fresh oil titrated by both methods pins it"},
      {"model.base-floor", "mg KOH/g", Bound::interval, 0, 40, logit_sd, logit},
      {"model.additive-depletion", "1/h", Bound::interval, 0, 1, logit_sd, logit + "; not fitted, a forecast band's prior spread"},
      {"model.salt-titration-share", "-", Bound::share, 0, 1, logit_sd, share},
      {"model.organic-neutralised-share", "-", Bound::share, 0, 1, logit_sd, share},
      {"engine.blow-by", "-", Bound::interval, 0, 0.1, logit_sd, logit + stated},
      {"engine.jacket-water-out", "K", Bound::interval, 273.15, 423.15, logit_sd, logit + stated},
      {"fuel.h2s", "ppmv dry", Bound::positive, 0, 0, ln10, log10 + stated},
      {"oil.fresh-tbn", "mg KOH/g", Bound::interval, 0.5, 80, logit_sd, logit + stated},
      {"oil.volume", "m3", Bound::interval, 1e-3, 100, logit_sd, logit + stated},
      {"oil.consumption", "kg/h", Bound::positive, 0, 0, ln10, log10 + stated},
  };
  return t;
}

const ParameterInfo& parameter(std::string_view key) {
  for (const auto& p : parameter_table())
    if (p.key == key) return p;
  std::string keys;
  for (const auto& p : parameter_table()) keys += (keys.empty() ? "" : ", ") + p.key;
  throw InputError("parameter", std::string(key), "one of: " + keys);
}

namespace {
// One accessor for both directions: returns a pointer to the field of the case (or of its first
// segment) that holds the parameter, or nullptr for those set through a lever.
double* field(EngineCase& c, std::string_view key, std::size_t segment) {
  TransferParameters& t = c.model.transfer;
  OxidationLaw& o = c.model.oxidation;
  OilProperties& oil = c.charge.oil;
  if (key == "model.so3-share") return &t.so3_share;
  if (key == "model.liner-uptake") return &t.liner_uptake;
  if (key == "model.liner-wall-rise") return &t.liner_wall_rise;
  if (key == "model.capture-so2") return &t.capture_so2;
  if (key == "model.capture-no2") return &t.capture_no2;
  if (key == "model.burnt-share-of-blow-by") return &t.burnt_share_of_blowby;
  if (key == "model.wet-so2-factor") return &t.wet_so2_factor;
  if (key == "model.oxidation-rate") return &o.rate_at_reference;
  if (key == "model.ring-zone-offset") return &o.ring_zone_offset;
  if (key == "model.organic-acid-yield") return &o.organic_acid_yield;
  if (key == "model.nitration-yield") return &o.nitration_yield;
  if (key == "model.induction-time") return &o.induction_hours;
  if (key == "model.depleted-oxidation-factor") return &o.depleted_factor;
  if (key == "model.viscosity-per-oxidation") return &oil.viscosity_per_oxidation;
  if (key == "model.viscosity-per-nitration") return &oil.viscosity_per_nitration;
  if (key == "model.weak-base-d2896") return &oil.weak_base_d2896;
  if (key == "model.weak-base-d4739") return &oil.weak_base_d4739;
  if (key == "model.base-floor") return &oil.base_floor;
  if (key == "model.additive-depletion") return &oil.additive_depletion;
  if (key == "model.salt-titration-share") return &oil.salt_titration_share;
  if (key == "model.organic-neutralised-share") return &oil.organic_neutralised_share;
  if (key == "engine.blow-by") return &c.record.at(segment).operation.blowby_share;
  if (key == "oil.consumption") return &c.record.at(segment).oil_consumption;
  return nullptr;
}
bool per_segment(std::string_view key) { return key == "engine.blow-by" || key == "oil.consumption"; }
}  // namespace

double get_parameter(const EngineCase& c, std::string_view key) {
  parameter(key);
  for (Lever l : all_levers)
    if (key == case_key(l)) return lever_value(c, l);
  return *field(const_cast<EngineCase&>(c), key, 0);
}

void set_parameter(EngineCase& c, std::string_view key, double v) {
  const ParameterInfo& p = parameter(key);
  const bool ok = std::isfinite(v) && (p.bound == Bound::positive   ? v > 0
                                       : p.bound == Bound::share    ? v > 0 && v < 1
                                       : p.bound == Bound::interval ? v >= p.low && v <= p.high
                                                                    : true);
  if (!ok) throw InputError(std::string(key), format_value(v), "a value " + range_text(p));
  for (Lever l : all_levers)
    if (key == case_key(l)) {
      c = with_lever(c, l, v);
      return;
    }
  if (per_segment(key)) {
    // scale every segment by the same factor, so a record's variation is kept
    const double first = *field(c, key, 0);
    for (std::size_t i = 0; i < c.record.size(); ++i) {
      double* f = field(c, key, i);
      *f = first > 0 ? *f * (v / first) : v;
    }
  } else {
    *field(c, key, 0) = v;
  }
}

namespace {
constexpr double phi_cap = 40;  // exp(±40): far beyond any range a fit needs, and never overflows
double logistic(double phi) { return 1 / (1 + std::exp(-phi)); }
}  // namespace

double to_fit_space(const ParameterInfo& p, double x) {
  switch (p.bound) {
    case Bound::positive: return std::log(x);
    case Bound::share: return std::log(x / (1 - x));
    case Bound::interval: {
      const double u = (x - p.low) / (p.high - p.low);
      return std::log(u / (1 - u));
    }
    case Bound::free: return x;
  }
  return x;
}
double from_fit_space(const ParameterInfo& p, double phi) {
  if (p.bound != Bound::free) phi = std::clamp(phi, -phi_cap, phi_cap);
  switch (p.bound) {
    case Bound::positive: return std::exp(phi);
    case Bound::share: return logistic(phi);
    case Bound::interval: return p.low + (p.high - p.low) * logistic(phi);
    case Bound::free: return phi;
  }
  return phi;
}
double dx_dphi(const ParameterInfo& p, double phi) {
  if (p.bound != Bound::free) phi = std::clamp(phi, -phi_cap, phi_cap);
  switch (p.bound) {
    case Bound::positive: return std::exp(phi);
    case Bound::share: return logistic(phi) * (1 - logistic(phi));
    case Bound::interval: return (p.high - p.low) * logistic(phi) * (1 - logistic(phi));
    case Bound::free: return 1;
  }
  return 1;
}
double inside_range(const ParameterInfo& p, double x) {
  switch (p.bound) {
    case Bound::positive: return std::max(x, 1e-9);
    case Bound::share: return std::clamp(x, 1e-3, 1 - 1e-3);
    case Bound::interval: {
      const double e = 1e-3 * (p.high - p.low);
      return std::clamp(x, p.low + e, p.high - e);
    }
    case Bound::free: return x;
  }
  return x;
}
std::string fit_space_text(const ParameterInfo& p) {
  switch (p.bound) {
    case Bound::positive: return "log";
    case Bound::share: return "logit";
    case Bound::interval: return "logit of the range";
    case Bound::free: return "linear";
  }
  return "";
}
std::string range_text(const ParameterInfo& p) {
  switch (p.bound) {
    case Bound::positive: return "above 0";
    case Bound::share: return "between 0 and 1 (a share)";
    case Bound::interval: return "from " + format_value(p.low) + " to " + format_value(p.high);
    case Bound::free: return "(any finite value)";
  }
  return "";
}

}  // namespace acidload
