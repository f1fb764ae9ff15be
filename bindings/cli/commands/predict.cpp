// acidload predict CASE --lab FILE: the drain interval of the next charge (or the current one
// continued) under stated conditions, with one band.
#include "../report.hpp"
#include "acidload/core/error.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/studies/forecast.hpp"
#include "fit_common.hpp"

namespace acidload_cli {
namespace {

struct PredictOptions {
  FitOptions fit;
  std::string plan, draws, seed;
  bool current = false;
};

PredictOptions parse(const std::vector<std::string>& args) {
  PredictOptions o;
  Options p("predict");
  fit_options(p, o.fit)
      .value("--plan", o.plan, "FILE")
      .value("--draws", o.draws, "N")
      .value("--seed", o.seed, "N")
      .flag("--current", o.current)
      .parse(args);
  require_fit_options("predict", o.fit);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  using namespace acidload;
  const PredictOptions o = parse(args);
  PredictSettings ps;
  ps.next_charge = !o.current;
  if (!o.draws.empty()) ps.draws = static_cast<int>(count_option(o.draws, "--draws", 10, 1e5));
  if (!o.seed.empty()) ps.seed = count_option(o.seed, "--seed", 0, 9e15);
  io::CaseFile plan;
  if (!o.plan.empty()) {  // the planned operation: the record of a case file's (chosen) variant
    plan = io::load_case(o.plan);
    ps.conditions = pick_variant(plan, o.fit.variant.empty() ? "" : o.fit.variant).record;
  }
  const FitRun r = fit_case(o.fit);
  for (const std::string& n : r.lab_notes) std::fprintf(out, "note: %s\n", n.c_str());
  const Prediction p = predict_charge(r.fit, ps);
  for (const std::string& n : r.fit.notes) std::fprintf(out, "%s%s\n", n.back() == ':' ? "" : "  - ", n.c_str());
  if (!r.fit.notes.empty()) std::fprintf(out, "\n");
  print_prediction(out, r.fit, p);
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command predict_command{
    "predict", "predict CASE", "the next charge's drain interval with one band (P5/P50/P95), after a fit",
    "usage: acidload predict CASE --lab FILE [--parameters KEY[,KEY…]] [--precision R=SD,…] [--plan FILE]\n"
    "                        [--current] [--draws N] [--seed N] [--variant NAME] [--overlay FILE]...\n\n"
    "Fits as 'acidload fit' does, then answers how long the next charge will last: an oil change at the\n"
    "end of CASE's record (the oil left in the system carried over), the current charge started from its\n"
    "latest sample (lab-first), and the planned operation run on to the planned maximum. Prints the drain\n"
    "interval, the limit that ends it and one band for it (P5 pessimistic, P50, P95 optimistic) from\n"
    "draws of the fit's joint covariance widened by the model's own error, estimated by predicting each\n"
    "past charge from the others. Limits the latest sample has already passed are flagged first.\n"
    "  --plan FILE   a case file whose record is the planned operation (default: the record's last segment)\n"
    "  --current     the current charge continued instead of the next one (hours left are shown too)\n"
    "  --precision R=SD,…  one standard deviation per reading, in its unit: tbn (both methods), tbn-d2896,\n"
    "                      tbn-d4739, tan, san [mg KOH/g], oxidation, nitration [A/cm]; a lab file's *-sd\n"
    "                      columns win over these\n"
    "  --draws N     parameter draws (default 400); --seed N their stream (default 1)\n"
    "Never extend a drain interval without lab confirmation.\n",
    run};

}  // namespace acidload_cli
