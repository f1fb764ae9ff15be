#include "run_case.hpp"

#include <chrono>
#include <unistd.h>

#include "../cli.hpp"
#include "../cost_report.hpp"
#include "../report.hpp"
#include "acidload/io/report.hpp"
#include "acidload/io/results.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload_cli {

int run_case(std::FILE* out, const acidload::io::CaseFile& c, const std::string& out_folder,
             const std::string& summary_csv) {
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  const bool terminal = isatty(STDERR_FILENO);
  bool shown = false;
  std::vector<acidload::VariantSummary> rows;
  for (std::size_t i = 0; i < c.variants.size(); ++i) {
    if (terminal && std::chrono::duration<double>(clock::now() - start).count() > 1.0) {
      std::fprintf(stderr, "\racidload: running variant %zu of %zu …", i + 1, c.variants.size());
      shown = true;
    }
    rows.push_back(acidload::summarize(c.variants[i]));
  }
  std::optional<acidload::io::EconomicsResults> econ;  // with an economics section: the costs too
  if (!c.costs.empty()) {
    econ.emplace();
    econ->variants = acidload::compare_costs(c.costs);
    econ->sensitivity = acidload::price_sensitivity(econ->variants, econ->sensitivity_step);
  }
  if (shown) std::fprintf(stderr, "\r%60s\r", "");
  if (!out_folder.empty()) acidload::io::write_results(out_folder, c, rows, econ ? &*econ : nullptr);
  if (!summary_csv.empty()) acidload::io::write_summary_csv(summary_csv, acidload::io::summary_csv(c, rows), acidload::io::report_inputs(c, ""));
  print_comparison(out, c, rows);
  if (econ) {
    print_costs(out, econ->variants);
    print_sensitivity(out, econ->variants, econ->sensitivity, econ->sensitivity_step);
    print_scrubbing_caution(out);
  }
  if (!out_folder.empty())
    std::fprintf(out, "\nResults written to %s/summary.json and %s/trajectories.csv\n", out_folder.c_str(),
                 out_folder.c_str());
  if (!summary_csv.empty()) std::fprintf(out, "Comparison table written to %s\n", summary_csv.c_str());
  print_caution(out);
  print_oil_cautions(out, c);
  return exit_ok;
}

}  // namespace acidload_cli
