#include "site_report.hpp"

#include <cmath>

#include "cli.hpp"
#include "cost_report.hpp"
#include "report.hpp"
#include "acidload/io/results.hpp"
#include "acidload/io/site_file.hpp"

namespace acidload_cli {

using namespace acidload;

namespace {
std::string cut(const std::string& s, std::size_t n) { return s.size() <= n ? s : s.substr(0, n - 1) + "~"; }

void print_site(std::FILE* out, const io::SiteFile& f, const SiteResult& r, bool costs) {
  const std::string cur = f.currency.empty() ? "money" : f.currency;
  double hours = 0;
  for (const Segment& s : r.raw) hours += s.hours;
  std::fprintf(out, "Site: %s (%zu engines on one gas supply and one train; %.0f running hours on the site's clock)\n",
               terminal_safe(r.name).c_str(), r.engines.size(), hours);
  std::fprintf(out, "\nEngines\n%-20s %9s %11s %12s %12s %14s %14s\n", "engine", "gas share", "H2S [ppmv]", "oil changes",
               "1st drain [h]", (cur + "/year").c_str(), (cur + "/MWh").c_str());
  for (const SiteEngine& e : r.engines) {
    std::fprintf(out, "%-20s %8.1f%% %11.1f %12.2f ", terminal_safe(cut(e.name, 20)).c_str(), e.gas_share * 100, e.mean_h2s_ppmv,
                 e.oil.changes);
    if (e.oil.intervals.empty()) std::fprintf(out, "%12s ", "-");
    else std::fprintf(out, "%12.0f ", e.oil.intervals.front());
    std::fprintf(out, "%14.0f %14.3f\n", e.costs.total_per_year, e.costs.total_per_mwh);
  }
  std::fprintf(out, "H2S is the running-hours mean behind the train; '1st drain' the first charge's interval (projected to its limit).\n");
  std::fprintf(out, "\nShared train (the bed loads with the engines' summed gas flow)\n");
  if (r.scrubbed.stages.empty()) std::fprintf(out, "  none: every engine burns the raw gas\n");
  for (std::size_t k = 0; k < r.scrubbed.stages.size(); ++k) {
    const StageRecord& s = r.scrubbed.stages[k];
    const TrainStage& t = f.site.train[k];
    std::fprintf(out, "  %-22s %-16s S removed %9.1f kg, outlet %7.2f ppmv (mean)", terminal_safe(cut(t.name, 22)).c_str(),
                 std::string(name(t.stage.kind)).c_str(), s.sulfur_removed, s.mean_outlet_ppmv);
    if (is_media_bed(t.stage.kind)) {
      const double beds = s.changeouts + s.bed_share_used;
      std::fprintf(out, ", %d changeouts", s.changeouts);
      if (beds > 0) std::fprintf(out, ", %.0f h a bed", hours / beds);
      if (s.first_bed_life >= 0) std::fprintf(out, ", first bed %.0f h", s.first_bed_life);
      else std::fprintf(out, ", first bed outlasts the record");
    }
    std::fprintf(out, "\n");
  }
  std::fprintf(out, "Sulfur balance of the site: closed to %.1e of the raw gas's sulfur\n", r.sulfur_balance_error);
  std::fprintf(out, "\nSite a year (%s): shared items %.0f (split by gas share), all engines %.0f\n", cur.c_str(),
               [&] {
                 double t = 0;
                 for (double v : r.shared_per_year) t += v;
                 return t;
               }(),
               r.total_per_year);
  if (costs) {
    std::vector<VariantCosts> v;
    for (const SiteEngine& e : r.engines) v.push_back(e.costs);
    print_costs(out, v);
    std::fprintf(out, "Ranks compare engines, not choices: each engine's shared items are its gas share of the site's.\n");
  }
}
}  // namespace

int run_site_file(std::FILE* out, const std::string& file, const std::string& out_folder, bool costs, int threads) {
  const io::SiteFile f = io::load_site(file);
  if (costs && !f.priced)
    throw InputError("economics", "(no section)", "an 'economics' section with the prices in " + file, InputWhere{file, 1, 1, ""});
  SiteResult r;
  {
    const ProgressLine progress("running the site: " + std::to_string(f.site.engines.size()) + " engines");
    r = run_site(f.site, threads);
  }
  if (costs) {  // ranks among the engines, by total per MWh
    for (SiteEngine& e : r.engines) {
      e.costs.rank = 1;
      for (const SiteEngine& o : r.engines) e.costs.rank += o.costs.total_per_mwh < e.costs.total_per_mwh;
    }
  }
  if (!out_folder.empty())
    io::write_results_folder(out_folder,
                             {{"site.json", io::site_json(f, r)},
                              {"engines.csv", io::site_engines_csv(r)},
                              {"train.csv", io::site_train_csv(f, r)}},
                             {file});
  print_site(out, f, r, costs);
  if (!out_folder.empty())
    std::fprintf(out, "\nResults written to %s: site.json, engines.csv, train.csv\n", terminal_safe(out_folder).c_str());
  if (!f.site.train.empty()) print_scrubbing_caution(out);
  print_caution(out);
  return exit_ok;
}

int check_site_file(std::FILE* out, const std::string& file) {
  const io::SiteFile f = io::load_site(file);
  std::fprintf(out, "Site: %s (%s)\n", terminal_safe(f.site.name).c_str(), terminal_safe(file).c_str());
  if (f.gas_hours.empty()) std::fprintf(out, "gas: the 'fuel' analysis throughout\n");
  else {
    double h = 0;
    for (double x : f.gas_hours) h += x;
    std::fprintf(out, "gas record: %zu stretches, %.0f running hours on the site's clock\n", f.gas_hours.size(), h);
  }
  std::fprintf(out, "train: %zu stages\n", f.site.train.size());
  for (const TrainStage& t : f.site.train)
    std::fprintf(out, "  %-22s %s\n", terminal_safe(t.name).c_str(), std::string(name(t.stage.kind)).c_str());
  std::fprintf(out, "engines: %zu\n", f.site.engines.size());
  for (const CostCase& c : f.site.engines) {
    double h = 0, flow = 0;
    for (const Segment& s : c.engine.record) h += s.hours, flow += s.operation.fuel_flow * s.hours;
    std::fprintf(out, "  %-22s %zu segments, %.0f running hours, mean fuel flow %.1f mol/h, oil %.0f kg\n",
                 terminal_safe(c.engine.name).c_str(), c.engine.record.size(), h, h > 0 ? flow / h : 0, c.engine.charge.mass);
  }
  std::fprintf(out, "\n%s: no mistakes found\n", file.c_str());
  return exit_ok;
}

}  // namespace acidload_cli
