#include "acidload/core/scrubber.hpp"

#include <cmath>
#include <limits>

#include "acidload/core/error.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

namespace {
// IUPAC standard atomic weights (conventional values): Fe 55.845, Na 22.98976928 [g/mol]; the
// model's own elements come from species.cpp.
constexpr double fe_weight = 55.845;
constexpr double na_weight = 22.98976928;

double softplus(double x) { return x > 30 ? x + std::log1p(std::exp(-x)) : std::log1p(std::exp(x)); }
double sulfur_kg_per_mol() { return atomic_weight(Element::S) * 1e-3; }
}  // namespace

std::string_view name(StageKind k) {
  switch (k) {
    case StageKind::iron_oxide: return "iron-oxide";
    case StageKind::activated_carbon: return "activated-carbon";
    case StageKind::biological: return "biological";
    case StageKind::caustic: return "caustic";
    case StageKind::fixed: return "fixed";
  }
  return "?";
}

bool is_media_bed(StageKind k) { return k == StageKind::iron_oxide || k == StageKind::activated_carbon; }

void validate(const ScrubStage& s) {
  check::fraction("stage.efficiency", s.efficiency);
  check::fraction("stage.other-sulfur-removal", s.other_sulfur_removal);
  check::fraction("stage.halogen-removal", s.halogen_removal);
  if (s.kind == StageKind::iron_oxide && s.other_sulfur_removal > 0)
    throw InputError("stage.other-sulfur-removal", format_value(s.other_sulfur_removal),
                     "0 for iron oxide: other sulfur (COS, mercaptans, sulfides) passes it");
  if (s.kind == StageKind::iron_oxide && s.halogen_removal > 0)
    throw InputError("stage.halogen-removal", format_value(s.halogen_removal), "0 for iron oxide: organic halogens pass it");
  if (!is_media_bed(s.kind)) return;
  check::in_range("stage.capacity", s.capacity, 1e-4, 2.0, "kg S per kg media");
  check::in_range("stage.bed-mass", s.bed_mass, 1e-3, 1e7, "kg");
  check::in_range("stage.breakthrough-width", s.breakthrough_width, 1e-3, 2.0, "(share of the bed life)");
  if (!(s.efficiency > 0)) throw InputError("stage.efficiency", format_value(s.efficiency), "a media bed treating some of the gas (> 0)");
  if (s.changeout.kind == ChangeoutRule::Kind::schedule) check::in_range("stage.changeout-every", s.changeout.every_hours, 1, 1e6, "h");
  else check::in_range("stage.changeout-at", s.changeout.outlet_h2s, 1e-6, 1e5, "ppmv");
}

double thomas_steepness(double width) { return 2 * std::log(9.0) / check::positive("breakthrough width", width); }

double breakthrough_share(double phi, double beta) { return 1 / (1 + std::exp(beta * (1 - phi))); }

double captured_share(double phi, double beta) { return (softplus(beta) - softplus(beta * (1 - phi))) / beta; }

double bed_outlet_ratio(double phi, double eta, double beta) { return (1 - eta) + eta * breakthrough_share(phi, beta); }

double fed_share_at_outlet_ratio(double ratio, double eta, double beta) {
  const double fresh = bed_outlet_ratio(0, eta, beta);
  if (!(ratio > fresh && ratio < 1))
    throw InputError("changeout level", format_value(ratio) + " of the inlet",
                     "a changeout outlet above what the fresh bed lets through (" + format_value(fresh) +
                         " of the inlet) and below the inlet");
  const double f = (ratio - (1 - eta)) / eta;  // F at the changeout
  return 1 - std::log(1 / f - 1) / beta;
}

double iron_oxide_theoretical_capacity() {
  const double s = atomic_weight(Element::S), o = atomic_weight(Element::O);
  return 3 * s / (2 * fe_weight + 3 * o);  // Fe2O3 + 3 H2S → Fe2S3 + 3 H2O
}

double caustic_per_sulfur() {
  const double naoh = na_weight + atomic_weight(Element::O) + atomic_weight(Element::H);
  return 2 * naoh / atomic_weight(Element::S);  // H2S + 2 NaOH → Na2S + 2 H2O
}

StageStep stage_step(const ScrubStage& s, double phi0, double h2s, double other_sulfur, double chlorine,
                     double fluorine, double hours) {
  StageStep out;
  check::non_negative("stage inlet H2S", h2s);
  check::non_negative("stage step hours", hours);
  out.other_sulfur_removed = s.other_sulfur_removal * other_sulfur;
  out.chlorine_removed = s.halogen_removal * chlorine;
  out.fluorine_removed = s.halogen_removal * fluorine;
  if (!is_media_bed(s.kind)) {
    out.h2s_removed = s.efficiency * h2s;
    return out;
  }
  const double beta = thomas_steepness(s.breakthrough_width);
  const double hold = s.capacity * s.bed_mass / sulfur_kg_per_mol();  // q₀·M [mol S]
  const double phi1 = phi0 + s.efficiency * h2s * hours / hold;
  out.fed_share_after = phi1;
  out.h2s_removed = hours > 0 ? hold * (captured_share(phi1, beta) - captured_share(phi0, beta)) / hours : 0;
  if (out.h2s_removed > h2s) out.h2s_removed = h2s;  // rounding only: G' = 1 − F ≤ 1
  return out;
}

FuelGas after_removal(const FuelGas& g, double flow, double h2s, double os, double cl, double f, double& flow_out) {
  check::positive("gas flow", flow);
  flow_out = flow - h2s - os - cl - f;
  if (!(flow_out > 0)) throw InputError("stage removal", format_value(flow - flow_out), "less than the gas flow " + format_value(flow));
  const double scale = flow / flow_out;  // every kept component: same flow, larger share
  FuelGas out = g;
  for (double& x : out.x) x *= scale;
  out.x[static_cast<std::size_t>(Gas::H2S)] = std::fmax(0.0, g[Gas::H2S] * flow - h2s) / flow_out;
  out.other_sulfur = std::fmax(0.0, g.other_sulfur * flow - os) / flow_out;
  out.chlorine = std::fmax(0.0, g.chlorine * flow - cl) / flow_out;
  out.fluorine = std::fmax(0.0, g.fluorine * flow - f) / flow_out;
  return out;
}

double hours_to_fed_share(const ScrubStage& s, double phi0, double phi1, double h2s) {
  if (!(h2s > 0)) return std::numeric_limits<double>::infinity();
  const double hold = s.capacity * s.bed_mass / sulfur_kg_per_mol();
  return (phi1 - phi0) * hold / (s.efficiency * h2s);
}

}  // namespace acidload
