// acidload uncertainty CASE: Monte Carlo over the case's uncertain inputs.
#include "../cli.hpp"
#include "../report.hpp"
#include "acidload/core/error.hpp"
#include "acidload/io/lab_file.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/forecast.hpp"
#include "acidload/studies/lab_settings.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/parameters.hpp"

#include <optional>
#include "acidload/studies/economics.hpp"

namespace acidload_cli {
namespace {

struct UncertaintyOptions {
  std::string case_file, draws, seed, threads, variant, lab, parameters;
  std::vector<std::string> overlays;
  bool first_only = false, next_charge = false;
};

UncertaintyOptions parse(const std::vector<std::string>& args) {
  UncertaintyOptions o;
  Options("uncertainty")
      .positional("CASE", o.case_file)
      .value("--draws", o.draws, "N")
      .value("--seed", o.seed, "N")
      .value("--threads", o.threads, "N")
      .value("--variant", o.variant, "NAME")
      .values("--overlay", o.overlays, "FILE")
      .value("--lab", o.lab, "FILE")
      .value("--parameters", o.parameters, "KEY[,KEY…]")
      .flag("--first-charge", o.first_only)
      .flag("--next-charge", o.next_charge)
      .parse(args);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  using namespace acidload;
  const UncertaintyOptions o = parse(args);
  // The numbers are read before the case, so a malformed one is a usage error whatever the file holds.
  const DrawOptions draws = draw_options(o.draws, o.seed, o.threads, max_draws);
  const io::CaseFile file = io::load_case(o.case_file, o.overlays);
  const EngineCase& c = pick_variant(file, o.variant);
  // prices (economics.*) are for `costs --monte-carlo`; the drain interval does not depend on them
  const std::vector<UncertainInput> inputs = without_prices(file.uncertainty.inputs);
  if (inputs.empty() && o.lab.empty())
    throw InputError("uncertainty", "(no section)", "an 'uncertainty' section with inputs other than prices in " + o.case_file + ", or --lab FILE",
                     InputWhere{o.case_file, 1, 1, ""});
  if (o.lab.empty() && !o.parameters.empty()) throw UsageError("uncertainty --parameters needs --lab FILE");
  if (o.lab.empty() && o.next_charge) throw UsageError("uncertainty --next-charge needs --lab FILE");
  if (o.first_only && o.next_charge) throw UsageError("uncertainty: --first-charge or --next-charge, not both");
  std::optional<FitResult> fit;
  if (!o.lab.empty()) {  // the fit's parameters drawn jointly from its covariance
    FitSettings fs;
    fs.parameters = split_list(o.parameters);
    for (const std::string& k : fs.parameters) parameter(k);
    resolve_precision(fs, file.lab);  // the case's lab section, as fit reads it
    std::vector<LabSample> samples = io::read_lab_samples(o.lab);
    apply_lab_baselines(samples, file.lab);
    fit = calibrate(c, samples, fs);
  }
  const std::uint64_t used_seed = draws.seed_or(file.uncertainty.seed);
  if (o.next_charge) {  // the draws of predict: the fit's joint covariance and the model-form error
    PredictSettings ps;
    ps.draws = o.draws.empty() ? 400 : draws.draws_or(400);
    ps.seed = used_seed;
    const ProgressLine progress("uncertainty: the next charge, " + std::to_string(ps.draws) + " draws");
    const Prediction p = predict_charge(*fit, ps);
    print_prediction_percentiles(out, *fit, p, used_seed);
    print_caution(out);
    return exit_ok;
  }
  const int n = draws.draws_or(file.uncertainty.draws);
  const ProgressLine progress("uncertainty: " + std::to_string(n) + " draws");
  const MonteCarloResult r = monte_carlo(c, inputs, fit ? &*fit : nullptr, !o.first_only, n, used_seed, draws.threads);
  print_monte_carlo(out, c, inputs, r, used_seed);
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command uncertainty_command{
    "uncertainty", "uncertainty CASE", "Monte Carlo over uncertain inputs: P5 to P95 of every charge's interval",
    "usage: acidload uncertainty CASE [--lab FILE [--parameters KEY[,KEY…]] [--next-charge]] [--first-charge] [--draws N]\n"
    "                            [--seed N] [--threads N] [--variant NAME] [--overlay FILE]...\n\n"
    "Monte Carlo over the uncertain inputs declared in CASE's 'uncertainty' section (normal, lognormal,\n"
    "uniform, triangular) and, with --lab, over the parameters fitted to that lab file (as 'acidload fit'\n"
    "does), drawn jointly from the fit's covariance: P5, P10, P50, P90 and P95 of the drain interval of\n"
    "every charge of the record (each run on under its own last conditions to the planned maximum; the low end\n"
    "is the pessimistic one) and of the time to the first free strong acid. A draw outside a\n"
    "parameter's range is clipped into it and counted. Every draw has its own counter-based random\n"
    "stream, so the result is the same for any number of threads (default: every core). N is a whole\n"
    "number: --draws 1 to 1000000, --seed 0 to 9e15, --threads 1 to 256.\n"
    "  --first-charge  only the first charge (faster)\n"
    "  --next-charge   with --lab: the next charge after an oil change at the end of the record, under the\n"
    "                  record's last segment, as 'acidload predict' draws it (the fit's joint covariance, every\n"
    "                  draw inside the ranges, times the model-form error of predicting each past charge from\n"
    "                  the others): P5, P10, P50, P90, P95 of its interval (default 400 draws; the case's\n"
    "                  'uncertainty' inputs are not drawn in this mode)\n",
    run};

}  // namespace acidload_cli
