// acidload costs CASE: what each variant's scrubbing and oil cost a year and per MWh, which price
// moves the answer, the cheapest changeout (outlet) level, and Monte Carlo of the totals.
#include "../cli.hpp"
#include "../cost_report.hpp"
#include "../report.hpp"
#include "../site_report.hpp"
#include "acidload/io/site_file.hpp"
#include "acidload/acidload.hpp"
#include "acidload/io/economics_results.hpp"

namespace acidload_cli {
namespace {

struct CostsOptions {
  std::string case_file, variant, stage, low, high, step, draws, seed, threads, out;
  bool cheapest = false, monte_carlo = false;
  std::vector<std::string> overlays;
};

CostsOptions parse(const std::vector<std::string>& args) {
  CostsOptions o;
  Options("costs")
      .positional("CASE", o.case_file)
      .flag("--cheapest-level", o.cheapest)
      .value("--variant", o.variant, "NAME")
      .value("--stage", o.stage, "N")
      .pair("--range", o.low, o.high, "LOW HIGH")
      .value("--sensitivity", o.step, "SHARE")
      .flag("--monte-carlo", o.monte_carlo)
      .value("--draws", o.draws, "N")
      .value("--seed", o.seed, "N")
      .value("--threads", o.threads, "N")
      .values("--overlay", o.overlays, "FILE")
      .value("--out", o.out, "FOLDER")
      .parse(args);
  if (!o.cheapest && (!o.stage.empty() || !o.low.empty()))
    throw UsageError("--stage and --range belong to --cheapest-level");
  if (!o.monte_carlo && (!o.draws.empty() || !o.seed.empty() || !o.threads.empty()))
    throw UsageError("--draws, --seed and --threads belong to --monte-carlo");
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  using namespace acidload;
  const CostsOptions o = parse(args);
  double step = 0.2;
  if (!o.step.empty()) step = quantity_option(o.step, io::Kind::fraction, "--sensitivity");
  if (!(step > 0 && step < 1)) throw InputError("--sensitivity", o.step, "a share above 0 and below 100 %");
  const DrawOptions draws = draw_options(o.draws, o.seed, o.threads, 1e7);
  if (io::is_site_file(o.case_file)) {
    if (o.cheapest || o.monte_carlo || !o.overlays.empty() || !o.step.empty())
      throw UsageError("a site file takes only --out here (no --cheapest-level, --monte-carlo, --sensitivity or --overlay)");
    return run_site_file(out, o.case_file, o.out, true);
  }
  if (!o.out.empty()) throw UsageError("--out belongs to a site file (a case's costs go to run --out's summary.json)");
  const io::CaseFile file = io::load_case(o.case_file, o.overlays);
  if (file.costs.empty())
    throw InputError("economics", "(no section)", "an 'economics' section with the prices in " + o.case_file,
                     InputWhere{o.case_file, 1, 1, ""});
  const std::vector<VariantCosts> v = compare_costs(file.costs);
  if (!file.title.empty()) std::fprintf(out, "%s\n", file.title.c_str());
  print_costs(out, v);
  print_sensitivity(out, v, price_sensitivity(v, step), step);
  if (o.cheapest) {
    std::size_t k = 0;  // the variant asked, or the cheapest one with a stage to vary
    if (!o.variant.empty()) {
      const EngineCase& picked = pick_variant(file, o.variant);
      k = static_cast<std::size_t>(&picked - file.variants.data());
    } else {
      bool any = false;
      for (std::size_t i = 0; i < v.size(); ++i) {
        bool has = false;
        for (const TrainStage& t : file.costs[i].train) has |= t.stage.kind != StageKind::caustic && t.stage.kind != StageKind::biological;
        if (has && (!any || v[i].total_per_mwh < v[k].total_per_mwh)) k = i, any = true;
      }
      if (!any) throw InputError("scrubbing", "(no media bed or fixed stage)", "a variant with a media bed or a fixed stage");
    }
    const CostCase& c = file.costs[k];
    const std::size_t stage = o.stage.empty() ? level_stage(c)
                                              : static_cast<std::size_t>(count_option(o.stage, "--stage", 1, static_cast<double>(c.train.size()))) - 1;
    LevelRange range = default_level_range(c, stage);
    if (!o.low.empty()) range = {h2s_ppmv_dry_option(o.low, c.engine, "--range"), h2s_ppmv_dry_option(o.high, c.engine, "--range")};
    print_cheapest_level(out, c, cheapest_level(c, stage, range.low, range.high));
  }
  if (o.monte_carlo) {
    if (file.uncertainty.inputs.empty())
      throw InputError("uncertainty", "(no section)", "an 'uncertainty' section with inputs in " + o.case_file,
                       InputWhere{o.case_file, 1, 1, ""});
    const std::uint64_t used_seed = draws.seed_or(file.uncertainty.seed);
    const CostMonteCarlo m = cost_monte_carlo(file.costs, file.uncertainty.inputs, draws.draws_or(file.uncertainty.draws),
                                              used_seed, draws.threads);
    print_cost_monte_carlo(out, v, file.uncertainty.inputs, m, used_seed);
  }
  print_scrubbing_caution(out);
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command costs_command{
    "costs", "costs CASE", "what scrubbing and oil cost a year and per MWh, by variant; the cheapest level",
    "usage: acidload costs CASE [--sensitivity SHARE] [--cheapest-level [--variant NAME] [--stage N]\n"
    "                           [--range LOW HIGH]] [--monte-carlo [--draws N] [--seed N] [--threads N]]\n"
    "                           [--overlay FILE]...\n"
    "       acidload costs SITE [--out FOLDER]\n\n"
    "For a case with an 'economics' section: each variant's scrubbing train run over the record (bed\n"
    "loading, changeouts, the H2S the engine sees), its oil changes at each charge's first limit, and\n"
    "every cost item per year and per MWh with the total and the rank. Then which price moves the\n"
    "answer: each price alone by -/+SHARE (default 20 %), the cheapest variant there and the factor on\n"
    "the price at which another variant becomes the cheapest.\n\n"
    "  --cheapest-level  the changeout level of a media bed (or the outlet of a fixed stage) with the\n"
    "                    lowest total per MWh: a scan, Brent's minimiser, forward runs either side.\n"
    "                    --variant: default the cheapest variant with such a stage; --stage N (from\n"
    "                    1): default its last bed or fixed stage; --range: H2S figures such as\n"
    "                    '10 ppmv' '250 ppmv' (default: just above what the fresh bed lets through, to\n"
    "                    the stage's inlet).\n"
    "  --monte-carlo     P10/P50/P90 of each total per MWh and the share of draws each variant is\n"
    "                    cheapest, over the 'uncertainty' section's inputs: prices (economics.*) and\n"
    "                    parameters such as fuel.h2s.\n\n"
    "A site file (a 'site' section): the site's tables as 'run' prints them, then every cost item of\n"
    "each engine per MWh (its own items, plus its gas share of the shared train's); --out FOLDER\n"
    "writes site.json, engines.csv and train.csv (the rules of run --out).\n",
    run};

}  // namespace acidload_cli
