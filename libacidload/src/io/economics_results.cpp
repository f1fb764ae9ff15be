#include "acidload/io/economics_results.hpp"

#include <cmath>
#include <cstdio>
#include <sstream>

#include "output_text.hpp"

namespace acidload::io {

namespace {
std::string num(double v) { return detail::json_number(v); }
std::string quote(const std::string& s) { return detail::json_string(s); }
std::string items(const CostItems& c) {
  std::string s = "{";
  for (std::size_t i = 0; i < cost_item_count; ++i)
    s += (i ? ", " : "") + quote(std::string(name(all_cost_items[i]))) + ": " + num(c[i]);
  return s + "}";
}
std::string list(const std::vector<double>& v) {
  std::string s = "[";
  for (std::size_t i = 0; i < v.size(); ++i) s += (i ? ", " : "") + num(v[i]);
  return s + "]";
}
}  // namespace

std::string economics_json(const EconomicsResults& r, int indent) {
  const std::string p(static_cast<std::size_t>(indent), ' ');
  std::ostringstream j;
  const std::string currency = r.variants.empty() ? "" : r.variants.front().currency;
  j << "{\n" << p << "  \"currency\": " << quote(currency) << ",\n";
  j << p << "  \"note\": " << quote("Costs from the case's prices (invented where the case says so). Items per year and per MWh "
                                    "generated; downtime is electricity not generated at the case's price.")
    << ",\n";
  j << p << "  \"items\": [";
  for (std::size_t i = 0; i < cost_item_count; ++i) j << (i ? ", " : "") << quote(std::string(name(all_cost_items[i])));
  j << "],\n" << p << "  \"variants\": [";
  std::string cheapest;
  for (std::size_t v = 0; v < r.variants.size(); ++v) {
    const VariantCosts& x = r.variants[v];
    if (x.rank == 1) cheapest = x.name;
    const YearQuantities& q = x.quantities;
    j << (v ? "," : "") << "\n" << p << "    {\"name\": " << quote(x.name) << ", \"rank\": " << x.rank
      << ", \"total-per-year\": " << num(x.total_per_year) << ", \"total-per-mwh\": " << num(x.total_per_mwh) << ",\n";
    j << p << "     \"engine-h2s-ppmv\": " << num(q.engine_h2s_ppmv) << ", \"hours-per-year\": " << num(q.running_hours)
      << ", \"mwh-per-year\": " << num(q.energy / 3.6e9) << ", \"oil-changes-per-year\": " << num(q.oil_changes)
      << ", \"oil-per-change-l\": " << num(q.oil_per_change * 1e3) << ", \"makeup-oil-l-per-year\": " << num(q.makeup_oil * 1e3)
      << ",\n";
    j << p << "     \"per-year\": " << items(x.per_year) << ",\n";
    j << p << "     \"per-mwh\": " << items(x.per_mwh) << ",\n";
    j << p << "     \"stages\": [";
    for (std::size_t k = 0; k < q.stages.size(); ++k) {
      const StageRecord& s = x.scrubbed.stages[k];
      j << (k ? ", " : "") << "{\"kind\": " << quote(std::string(name(q.stages[k].kind)))
        << ", \"changeouts-per-year\": " << num(q.stages[k].changeouts)
        << ", \"first-bed-life-h\": " << (s.first_bed_life >= 0 ? num(s.first_bed_life) : "null")
        << ", \"sulfur-removed-kg-per-year\": " << num(q.stages[k].sulfur_removed)
        << ", \"mean-outlet-h2s-ppmv\": " << num(s.mean_outlet_ppmv) << "}";
    }
    j << "]}";
  }
  j << "\n" << p << "  ],\n" << p << "  \"cheapest\": " << quote(cheapest) << ",\n";
  j << p << "  \"sensitivity\": {\"step\": " << num(r.sensitivity_step) << ", \"prices\": [";
  for (std::size_t i = 0; i < r.sensitivity.size(); ++i) {
    const PriceSensitivity& s = r.sensitivity[i];
    const auto vname = [&](std::size_t k) { return k < r.variants.size() ? quote(r.variants[k].name) : std::string("null"); };
    j << (i ? "," : "") << "\n" << p << "    {\"price\": " << quote(std::string(name(s.price)))
      << ", \"total-per-mwh-low\": " << list(s.total_low) << ", \"total-per-mwh-high\": " << list(s.total_high)
      << ", \"cheapest-low\": " << vname(s.cheapest_low) << ", \"cheapest-high\": " << vname(s.cheapest_high)
      << ", \"swing-per-mwh\": " << num(s.swing) << ", \"break-even-factor\": "
      << (s.break_even_factor >= 0 ? num(s.break_even_factor) : "null")
      << ", \"break-even-to\": " << (s.break_even_factor >= 0 ? vname(s.break_even_to) : "null") << "}";
  }
  j << "]}";
  if (r.cheapest) {
    const CheapestLevel& a = *r.cheapest;
    j << ",\n" << p << "  \"cheapest-level\": {\"variant\": " << quote(r.cheapest_variant) << ", \"stage\": " << a.stage + 1
      << ", \"found\": " << (a.found ? "true" : "false") << ", \"level-ppmv\": " << num(a.level_ppmv)
      << ", \"total-per-mwh\": " << num(a.total_per_mwh) << ", \"verified-low-per-mwh\": " << num(a.verified_low)
      << ", \"verified-high-per-mwh\": " << num(a.verified_high) << ", \"reason\": " << quote(a.reason)
      << ",\n" << p << "    \"scan-ppmv\": " << list(a.grid_ppmv) << ", \"scan-total-per-mwh\": " << list(a.grid_total) << "}";
  }
  if (r.monte_carlo) {
    const CostMonteCarlo& m = *r.monte_carlo;
    j << ",\n" << p << "  \"monte-carlo\": {\"draws\": " << m.draws << ", \"p10-per-mwh\": " << list(m.p10)
      << ", \"p50-per-mwh\": " << list(m.p50) << ", \"p90-per-mwh\": " << list(m.p90)
      << ", \"cheapest-share\": " << list(m.cheapest_share) << "}";
  }
  j << "\n" << p << "}";
  return j.str();
}

}  // namespace acidload::io
