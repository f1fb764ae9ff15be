// acidload uncertainty CASE: Monte Carlo over the case's uncertain inputs.
#include "../cli.hpp"
#include "../report.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/economics.hpp"

namespace acidload_cli {
namespace {

struct UncertaintyOptions {
  std::string case_file, draws, seed, threads, variant;
  std::vector<std::string> overlays;
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
      .parse(args);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  using namespace acidload;
  const UncertaintyOptions o = parse(args);
  // The numbers are read before the case, so a malformed one is a usage error whatever the file holds.
  const std::optional<std::uint64_t> draws =
      o.draws.empty() ? std::nullopt : std::optional(count_option(o.draws, "--draws", 1, max_draws));
  const std::optional<std::uint64_t> seed =
      o.seed.empty() ? std::nullopt : std::optional(count_option(o.seed, "--seed", 0, 9e15));
  const int threads = o.threads.empty() ? 0 : static_cast<int>(count_option(o.threads, "--threads", 1, 256));
  const io::CaseFile file = io::load_case(o.case_file, o.overlays);
  const EngineCase& c = pick_variant(file, o.variant);
  // prices (economics.*) are for `costs --monte-carlo`; the drain interval does not depend on them
  const std::vector<UncertainInput> inputs = without_prices(file.uncertainty.inputs);
  if (inputs.empty())
    throw InputError("uncertainty", "(no section)", "an 'uncertainty' section with inputs other than prices in " + o.case_file,
                     InputWhere{o.case_file, 1, 1, ""});
  const std::uint64_t used_seed = seed ? *seed : file.uncertainty.seed;
  const int n = draws ? static_cast<int>(*draws) : file.uncertainty.draws;
  const ProgressLine progress("uncertainty: " + std::to_string(n) + " draws");
  const MonteCarloResult r = monte_carlo(c, inputs, n, used_seed, threads);
  print_monte_carlo(out, c, inputs, r, used_seed);
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command uncertainty_command{
    "uncertainty", "uncertainty CASE", "Monte Carlo over the case's uncertain inputs: P10/P50/P90 of the interval",
    "usage: acidload uncertainty CASE [--draws N] [--seed N] [--threads N] [--variant NAME] [--overlay FILE]...\n\n"
    "Monte Carlo over the uncertain inputs declared in CASE's 'uncertainty' section (normal, lognormal,\n"
    "uniform, triangular): P10, P50 and P90 of the drain interval and of the time to the first free\n"
    "strong acid. Every draw has its own counter-based random stream, so the result is the same for\n"
    "any number of threads (default: every core). N is a whole number: --draws 1 to 10000000,\n"
    "--seed 0 to 9e15, --threads 1 to 256.\n",
    run};

}  // namespace acidload_cli
