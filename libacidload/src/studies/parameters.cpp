#include "acidload/studies/parameters.hpp"

#include <cmath>

#include "acidload/core/error.hpp"
#include "acidload/studies/inverse.hpp"

namespace acidload {

const std::vector<ParameterInfo>& parameter_table() {
  static const std::vector<ParameterInfo> t = {
      {"model.so3-share", "-", Bound::share},
      {"model.liner-uptake", "-", Bound::share},
      {"model.liner-wall-rise", "K", Bound::positive},
      {"model.capture-so2", "-", Bound::share},
      {"model.capture-no2", "-", Bound::share},
      {"model.burnt-share-of-blow-by", "-", Bound::share},
      {"model.wet-so2-factor", "-", Bound::positive},
      {"model.oxidation-rate", "A/cm per h", Bound::positive},
      {"model.ring-zone-offset", "K", Bound::positive},
      {"model.organic-acid-yield", "mg KOH/g per A/cm", Bound::positive},
      {"model.nitration-yield", "A/cm per mol/kg", Bound::positive},
      {"model.induction-time", "h", Bound::positive},
      {"model.depleted-oxidation-factor", "-", Bound::positive},
      {"model.viscosity-per-oxidation", "per A/cm", Bound::positive},
      {"model.viscosity-per-nitration", "per A/cm", Bound::positive},
      {"model.weak-base-d2896", "mg KOH/g", Bound::positive},
      {"model.weak-base-d4739", "mg KOH/g", Bound::positive},
      {"model.base-floor", "mg KOH/g", Bound::positive},
      {"model.additive-depletion", "1/h", Bound::positive},
      {"model.salt-titration-share", "-", Bound::share},
      {"model.organic-neutralised-share", "-", Bound::share},
      {"engine.blow-by", "-", Bound::share},
      {"engine.jacket-water-out", "K", Bound::positive},
      {"fuel.h2s", "ppmv dry", Bound::positive},
      {"oil.fresh-tbn", "mg KOH/g", Bound::positive},
      {"oil.volume", "m3", Bound::positive},
      {"oil.consumption", "kg/h", Bound::positive},
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
  if (key == "engine.jacket-water-out") return lever_value(c, Lever::jacket_water_out);
  if (key == "fuel.h2s") return lever_value(c, Lever::h2s_ppmv_dry);
  if (key == "oil.fresh-tbn") return lever_value(c, Lever::fresh_tbn);
  if (key == "oil.volume") return lever_value(c, Lever::oil_volume);
  return *field(const_cast<EngineCase&>(c), key, 0);
}

void set_parameter(EngineCase& c, std::string_view key, double v) {
  const ParameterInfo& p = parameter(key);
  if (!std::isfinite(v) || (p.bound == Bound::positive && v <= 0) || (p.bound == Bound::share && !(v > 0 && v < 1)))
    throw InputError(std::string(key), format_value(v),
                     p.bound == Bound::share ? "a share between 0 and 1" : "a positive value");
  if (key == "engine.jacket-water-out") c = with_lever(c, Lever::jacket_water_out, v);
  else if (key == "fuel.h2s") c = with_lever(c, Lever::h2s_ppmv_dry, v);
  else if (key == "oil.fresh-tbn") c = with_lever(c, Lever::fresh_tbn, v);
  else if (key == "oil.volume") c = with_lever(c, Lever::oil_volume, v);
  else if (per_segment(key)) {
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

double to_fit_space(Bound b, double x) {
  switch (b) {
    case Bound::positive: return std::log(x);
    case Bound::share: return std::log(x / (1 - x));
    case Bound::free: return x;
  }
  return x;
}
double from_fit_space(Bound b, double phi) {
  switch (b) {
    case Bound::positive: return std::exp(phi);
    case Bound::share: return 1 / (1 + std::exp(-phi));
    case Bound::free: return phi;
  }
  return phi;
}
double dx_dphi(Bound b, double phi) {
  switch (b) {
    case Bound::positive: return std::exp(phi);
    case Bound::share: {
      const double x = 1 / (1 + std::exp(-phi));
      return x * (1 - x);
    }
    case Bound::free: return 1;
  }
  return 1;
}

}  // namespace acidload
