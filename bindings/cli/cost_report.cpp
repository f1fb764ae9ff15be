#include "cost_report.hpp"

#include <cmath>
#include <string>

namespace acidload_cli {

using namespace acidload;

namespace {
std::string cut(const std::string& s, std::size_t n) { return s.size() <= n ? s : s.substr(0, n - 1) + "~"; }
constexpr int col = 16;
}  // namespace

void print_costs(std::FILE* out, const std::vector<VariantCosts>& v) {
  if (v.empty()) return;
  const VariantCosts& f = v.front();
  const std::string cur = f.currency.empty() ? "money" : f.currency;
  std::fprintf(out, "\nWhat it costs a year (%s; %.0f running hours, %.0f MWh a year)\n", cur.c_str(),
               f.quantities.running_hours, f.quantities.energy / 3.6e9);
  std::fprintf(out, "%-30s", "");
  for (const VariantCosts& x : v) std::fprintf(out, " %*s", col, cut(x.name, col).c_str());
  const auto row = [&](const char* label, auto get, const char* fmt) {
    std::fprintf(out, "\n%-30s", label);
    for (const VariantCosts& x : v) std::fprintf(out, fmt, col, get(x));
  };
  row("H2S at the engine [ppmv dry]", [](const VariantCosts& x) { return x.quantities.engine_h2s_ppmv; }, " %*.1f");
  row("oil changes a year", [](const VariantCosts& x) { return x.quantities.oil_changes; }, " %*.2f");
  row("media changeouts a year", [](const VariantCosts& x) {
    double n = 0;
    for (const StageYear& s : x.quantities.stages) n += s.changeouts;
    return n;
  }, " %*.2f");
  std::fprintf(out, "\n%s per MWh:", cur.c_str());
  for (std::size_t i = 0; i < cost_item_count; ++i) {
    const std::string label = "  " + std::string(name(all_cost_items[i]));
    row(label.c_str(), [i](const VariantCosts& x) { return x.per_mwh[i]; }, " %*.3f");
  }
  row("total per MWh", [](const VariantCosts& x) { return x.total_per_mwh; }, " %*.3f");
  row("total per year", [](const VariantCosts& x) { return x.total_per_year; }, " %*.0f");
  std::fprintf(out, "\n%-30s", "rank (1 = cheapest)");
  for (const VariantCosts& x : v) std::fprintf(out, " %*d", col, x.rank);
  std::fprintf(out, "\n");
  bool any = false;
  for (const VariantCosts& x : v)
    for (std::size_t k = 0; k < x.quantities.stages.size(); ++k) {
      if (!any) std::fprintf(out, "\nstages (per year):\n"), any = true;
      const StageYear& s = x.quantities.stages[k];
      const StageRecord& r = x.scrubbed.stages[k];
      std::fprintf(out, "  %-24s %-16s S removed %8.1f kg, outlet %7.2f ppmv (mean)", cut(x.name, 24).c_str(),
                   std::string(name(s.kind)).c_str(), s.sulfur_removed, r.mean_outlet_ppmv);
      if (is_media_bed(s.kind)) {
        std::fprintf(out, ", %.2f changeouts of %.0f kg", s.changeouts, s.bed_mass);
        if (r.first_bed_life >= 0) std::fprintf(out, ", first bed %.0f h", r.first_bed_life);
        else std::fprintf(out, ", first bed outlasts the record");
      }
      std::fprintf(out, "\n");
    }
  std::fprintf(out, "Counts are per year and fractional: the share of the last charge or bed used counts.\n");
}

void print_sensitivity(std::FILE* out, const std::vector<VariantCosts>& v, const std::vector<PriceSensitivity>& s, double step) {
  if (v.empty()) return;
  std::fprintf(out, "\nWhich price moves the answer (each price alone by -/+%.0f %%; totals are linear in each price):\n",
               step * 100);
  std::fprintf(out, "  %-20s %14s  %-20s %-20s %s\n", "price", "swing [/MWh]", "cheapest at -", "cheapest at +",
               "cheapest changes at");
  for (const PriceSensitivity& x : s) {
    std::string be = "no change from 0 to 10 times";
    if (x.break_even_factor >= 0) {
      char b[64];
      std::snprintf(b, sizeof b, "%.3g times the price, to ", x.break_even_factor);
      be = b + v[x.break_even_to].name;
    }
    std::fprintf(out, "  %-20s %14.3f  %-20s %-20s %s\n", std::string(name(x.price)).c_str(), x.swing,
                 cut(v[x.cheapest_low].name, 20).c_str(), cut(v[x.cheapest_high].name, 20).c_str(), be.c_str());
  }
}

void print_cheapest_level(std::FILE* out, const CostCase& c, const CheapestLevel& a) {
  const TrainStage& st = c.train.at(a.stage);
  const bool bed = is_media_bed(st.stage.kind);
  const std::string cur = c.currency.empty() ? "" : " " + c.currency;
  std::fprintf(out, "\nCheapest %s of stage %zu ('%s', %s) of '%s':\n", bed ? "changeout level" : "outlet",
               a.stage + 1, st.name.c_str(), std::string(name(st.stage.kind)).c_str(), c.engine.name.c_str());
  std::fprintf(out, "  %-12s %16s\n", "ppmv dry", ("total" + cur + "/MWh").c_str());
  for (std::size_t i = 0; i < a.grid_ppmv.size(); ++i) {
    if (std::isfinite(a.grid_total[i])) std::fprintf(out, "  %12.2f %16.4f\n", a.grid_ppmv[i], a.grid_total[i]);
    else std::fprintf(out, "  %12.2f %16s\n", a.grid_ppmv[i], "cannot be held");
  }
  if (!a.found) {
    std::fprintf(out, "no answer: %s\n", a.reason.c_str());
    return;
  }
  std::fprintf(out, "answer: %.2f ppmv dry, %.4f%s/MWh (verified forward: %.4f a step below, %.4f a step above; %d runs)\n",
               a.level_ppmv, a.total_per_mwh, cur.c_str(), a.verified_low, a.verified_high, a.evaluations);
  if (!a.reason.empty()) std::fprintf(out, "note: %s\n", a.reason.c_str());
}

void print_cost_monte_carlo(std::FILE* out, const std::vector<VariantCosts>& v, const std::vector<UncertainInput>& in,
                            const CostMonteCarlo& m, std::uint64_t seed) {
  std::fprintf(out, "\nMonte Carlo of the totals per MWh: %d draws, seed %llu, inputs:", m.draws,
               static_cast<unsigned long long>(seed));
  for (const UncertainInput& x : in) std::fprintf(out, " %s", x.key.c_str());
  std::fprintf(out, "\n  %-30s %10s %10s %10s %10s\n", "variant", "P10", "P50", "P90", "cheapest");
  for (std::size_t i = 0; i < v.size() && i < m.p50.size(); ++i)
    std::fprintf(out, "  %-30s %10.3f %10.3f %10.3f %9.0f %%\n", cut(v[i].name, 30).c_str(), m.p10[i], m.p50[i], m.p90[i],
                 m.cheapest_share[i] * 100);
  std::fprintf(out, "(every variant sees the same draws, so the shares compare like with like)\n");
}

void print_scrubbing_caution(std::FILE* out) {
  std::fprintf(out,
               "\nCaution: spent iron-oxide media self-heats and can ignite as it dries in air: keep it wet and follow\n"
               "the supplier's handling and disposal rules. Caustic (NaOH) burns skin and eyes. Opening a vessel at a\n"
               "changeout releases H2S: monitors, ventilation, permits. Local codes and licensed practice govern.\n");
}

}  // namespace acidload_cli
