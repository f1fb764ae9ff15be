// acidload solve CASE --for LEVER --target HOURS: the lever value that gives a target drain interval.
#include "../cli.hpp"
#include "../report.hpp"
#include "acidload/acidload.hpp"
#include "acidload/core/plausibility.hpp"
#include "acidload/studies/inverse.hpp"

#include <cmath>

namespace acidload_cli {
namespace {

struct SolveOptions {
  std::string case_file, lever, target, low, high, variant;
  std::vector<std::string> overlays;
};

SolveOptions parse(const std::vector<std::string>& args) {
  SolveOptions o;
  Options("solve")
      .positional("CASE", o.case_file)
      .value("--for", o.lever, "LEVER")
      .value("--target", o.target, "HOURS")
      .pair("--range", o.low, o.high, "LOW HIGH")
      .value("--variant", o.variant, "NAME")
      .values("--overlay", o.overlays, "FILE")
      .parse(args);
  if (o.lever.empty()) throw UsageError("solve needs --for h2s|fresh-tbn|jacket-water-out|oil-volume");
  if (o.target.empty()) throw UsageError("solve needs --target, e.g. --target '4000 h'");
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  using namespace acidload;
  const SolveOptions o = parse(args);
  const std::optional<Lever> lever = lever_named(o.lever);
  if (!lever) throw UsageError("--for '" + o.lever + "': one of h2s, fresh-tbn, jacket-water-out, oil-volume");
  const double target = quantity_option(o.target, io::Kind::duration, "--target");
  if (!(target > 0)) throw InputError("--target", o.target, "a drain interval above 0 h");
  const io::CaseFile file = io::load_case(o.case_file, o.overlays);
  const EngineCase& c = pick_variant(file, o.variant);
  // How the lever is read and shown: its kind on the command line and its unit in the answer.
  io::Kind kind = io::Kind::number;
  double shown_offset = 0, shown_scale = 1;
  const char* unit = "";
  switch (*lever) {
    case Lever::h2s_ppmv_dry: unit = "ppmv dry"; break;
    case Lever::fresh_tbn: kind = io::Kind::acid_number, unit = "mg KOH/g"; break;
    case Lever::jacket_water_out: kind = io::Kind::temperature, unit = "degC", shown_offset = -273.15; break;
    case Lever::oil_volume: kind = io::Kind::volume, unit = "L", shown_scale = 1e3; break;
  }
  LeverSearch search = default_search(c, *lever);
  if (!o.low.empty()) {
    if (*lever == Lever::h2s_ppmv_dry) {
      search.low = h2s_ppmv_dry_option(o.low, c, "--range");
      search.high = h2s_ppmv_dry_option(o.high, c, "--range");
    } else {
      search.low = quantity_option(o.low, kind, "--range");
      search.high = quantity_option(o.high, kind, "--range");
    }
  }
  const InverseAnswer r = (ProgressLine("solve: searching " + o.lever), solve_for_interval(c, *lever, target, search.low, search.high, search.tolerance));
  const auto show = [&](double v) { return (v + shown_offset) * shown_scale; };
  std::fprintf(out, "%s — variant '%s': %s for a drain interval of %.0f h\n", file.title.c_str(), c.name.c_str(),
               o.lever.c_str(), target);
  // an interval in words: "N h", or "no limit within N h" where no limit is reached (the planned maximum)
  const auto words = [&](const std::optional<double>& h) {
    char b[64];
    if (h) std::snprintf(b, sizeof b, "%.0f h", *h);
    else std::snprintf(b, sizeof b, "no limit within %.0f h", c.model.limits.max_hours);
    return std::string(b);
  };
  std::fprintf(out, "range searched: %.4g to %.4g %s (interval %s and %s at its ends)\n", show(search.low), show(search.high),
               unit, words(r.interval_at_low).c_str(), words(r.interval_at_high).c_str());
  if (r.found) {
    // three significant figures: the inputs behind a drain interval carry no more (the root itself in brackets)
    std::fprintf(out, "answer: %.3g %s — the model run at the answer gives %s (%d runs; root %.6g)\n", show(r.value),
                 unit, words(r.interval_at_value).c_str(), r.evaluations, show(r.value));
    std::vector<Warning> w;
    if (*lever == Lever::jacket_water_out) w = jacket_water_warnings(r.value);
    if (*lever == Lever::fresh_tbn && r.value > high_tbn_caution)
      w.push_back({"oil.fresh-tbn", std::to_string(static_cast<int>(std::lround(r.value))) + " mg KOH/g",
                   "more base means more ash: gas engines are limited to low-ash oils; only with the engine maker's approval"});
    for (const Warning& x : w) std::fprintf(out, "warning: %s = %s: %s\n", x.key.c_str(), x.value.c_str(), x.reason.c_str());
  }
  else if (target >= c.model.limits.max_hours)
    std::fprintf(out, "no answer: %s\n", r.reason.c_str());
  else if (r.jump)
    std::fprintf(out, "no answer: near %.4g %s the interval jumps from %s to %s, past the target%s\n", show(r.value), unit,
                 words(r.jump_from).c_str(), words(r.jump_to).c_str(),
                 !r.jump_from || !r.jump_to ? ": the target lies where no limit is reached" : "");
  else
    std::fprintf(out, "no answer in the range: the interval is %s at %.4g %s and %s at %.4g %s, both %s the target\n",
                 words(r.interval_at_low).c_str(), show(search.low), unit, words(r.interval_at_high).c_str(), show(search.high),
                 unit, r.interval_at_low.value_or(c.model.limits.max_hours) > target ? "above" : "below");
  if (!r.found && !r.jump) {  // which limit holds the interval at the far end: the lever cannot move it
    const double lo = r.interval_at_low.value_or(c.model.limits.max_hours), hi = r.interval_at_high.value_or(c.model.limits.max_hours);
    const VariantSummary far = summarize(with_lever(c, *lever, hi > lo ? search.high : search.low));
    if (far.charge.oil_limit_reached())
      std::fprintf(out, "at the far end of the range the %s limit ends the charge (%.0f h)\n",
                   std::string(name(*far.charge.first)).c_str(), far.charge.drain_interval);
  }
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command solve_command{
    "solve", "solve CASE", "an inverse question: the H2S, fresh TBN, jacket water or oil volume for a target interval",
    "usage: acidload solve CASE --for LEVER --target HOURS [--range LOW HIGH] [--variant NAME] [--overlay FILE]...\n\n"
    "Finds the value of one lever at which the drain interval equals the target, by bracketing\n"
    "root-finding on the forward model, and checks it by running the model at the answer.\n"
    "LEVER and its unit:\n"
    "  h2s                highest H2S [ppmv, dry] that still reaches the target (default range 0 to 3000 ppmv)\n"
    "  fresh-tbn          fresh-oil TBN needed [mg KOH/g] (default range: just above the floor to 30 mg KOH/g)\n"
    "  jacket-water-out   lowest jacket-water outlet temperature [degC] (default range 60 to 120 degC)\n"
    "  oil-volume         oil in circulation needed [L] (default range: a tenth to ten times the case's)\n"
    "HOURS as '4000 h'. LOW and HIGH with units, e.g. --range '0 ppmv' '800 ppmv'; for h2s any\n"
    "contaminant unit and basis ('50 ppmv wet', '700 mg/Nm3'), converted to ppmv dry in the gas of\n"
    "the variant's first segment.\n"
    "'No answer in the range' is a plain answer: the model is not extrapolated.\n",
    run};

}  // namespace acidload_cli
