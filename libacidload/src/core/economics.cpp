#include "acidload/core/economics.hpp"

#include <cmath>

#include "acidload/core/error.hpp"

namespace acidload {

std::string_view name(CostItem i) {
  switch (i) {
    case CostItem::oil_changes: return "oil-changes";
    case CostItem::makeup_oil: return "makeup-oil";
    case CostItem::oil_change_labour: return "oil-change-labour";
    case CostItem::oil_change_downtime: return "oil-change-downtime";
    case CostItem::lab: return "lab";
    case CostItem::media: return "media";
    case CostItem::media_disposal: return "media-disposal";
    case CostItem::changeout_labour: return "changeout-labour";
    case CostItem::changeout_downtime: return "changeout-downtime";
    case CostItem::consumables: return "consumables";
    case CostItem::capital: return "capital";
    case CostItem::engine_wear: return "engine-wear";
  }
  return "?";
}

std::string_view name(Price p) {
  switch (p) {
    case Price::oil: return "oil-price";
    case Price::oil_change_labour: return "oil-change-labour";
    case Price::electricity: return "electricity-price";
    case Price::lab: return "lab-cost";
    case Price::media: return "media-price";
    case Price::disposal: return "disposal-price";
    case Price::changeout_labour: return "changeout-labour";
    case Price::consumables: return "consumables";
    case Price::capital: return "capital";
    case Price::wear: return "wear-cost";
  }
  return "?";
}

Price price_of(CostItem i) {
  switch (i) {
    case CostItem::oil_changes:
    case CostItem::makeup_oil: return Price::oil;
    case CostItem::oil_change_labour: return Price::oil_change_labour;
    case CostItem::oil_change_downtime:
    case CostItem::changeout_downtime: return Price::electricity;
    case CostItem::lab: return Price::lab;
    case CostItem::media: return Price::media;
    case CostItem::media_disposal: return Price::disposal;
    case CostItem::changeout_labour: return Price::changeout_labour;
    case CostItem::consumables: return Price::consumables;
    case CostItem::capital: return Price::capital;
    case CostItem::engine_wear: return Price::wear;
  }
  return Price::oil;
}

double capital_recovery_factor(double i, double n) {
  check::in_range("discount rate", i, 0.0, 1.0, "(0 to 100 %)");
  check::in_range("life", n, 1e-3, 200.0, "years");
  if (i == 0) return 1 / n;
  const double g = std::pow(1 + i, n);  // (1 + i)ⁿ
  return i * g / (g - 1);               // CRF = i(1+i)ⁿ/((1+i)ⁿ − 1)
}

void validate(const Prices& p) {
  check::non_negative("economics.oil-price", p.oil);
  check::non_negative("economics.oil-change-labour", p.oil_change_labour);
  check::in_range("economics.oil-change-downtime", p.oil_change_downtime, 0.0, 1e4, "h");
  check::non_negative("economics.electricity-price", p.electricity);
  check::non_negative("economics.lab-cost", p.lab_sample);
  check::in_range("economics.sampling-interval", p.sampling_interval, 0.0, 1e6, "h");
  check::non_negative("economics.iron-oxide-price", p.iron_oxide);
  check::non_negative("economics.carbon-price", p.carbon);
  check::non_negative("economics.disposal-price", p.disposal);
  check::non_negative("economics.changeout-labour", p.changeout_labour);
  check::in_range("economics.changeout-downtime", p.changeout_downtime, 0.0, 1e4, "h");
  check::non_negative("economics.caustic-price", p.caustic);
  check::in_range("economics.caustic-excess", p.caustic_excess, 1.0, 10.0, "(times the stoichiometric NaOH)");
  check::non_negative("economics.biological-consumables", p.biological);
  check::in_range("economics.discount-rate", p.discount_rate, 0.0, 1.0, "(0 to 100 %)");
  check::non_negative("economics.wear-cost", p.wear_cost);
  check::non_negative("economics.wear-hours", p.wear_hours);
}

CostItems cost_items(const YearQuantities& q, const Prices& p) {
  validate(p);
  if (q.stage_costs.size() != q.stages.size())
    throw InputError("stage costs", std::to_string(q.stage_costs.size()), std::to_string(q.stages.size()) + " (one per stage)");
  CostItems c{};
  const auto at = [&](CostItem i) -> double& { return c[static_cast<std::size_t>(i)]; };
  const double lost_per_hour_down = q.power * 3600 * p.electricity;  // W·s per h × price per J
  at(CostItem::oil_changes) = q.oil_changes * q.oil_per_change * p.oil;
  at(CostItem::makeup_oil) = q.makeup_oil * p.oil;
  at(CostItem::oil_change_labour) = q.oil_changes * p.oil_change_labour;
  at(CostItem::oil_change_downtime) = q.oil_changes * p.oil_change_downtime * lost_per_hour_down;
  at(CostItem::lab) = p.sampling_interval > 0 ? q.running_hours / p.sampling_interval * p.lab_sample : 0;
  for (std::size_t k = 0; k < q.stages.size(); ++k) {
    const StageYear& s = q.stages[k];
    const StageCosts& sc = q.stage_costs[k];
    const double media_kg = s.changeouts * s.bed_mass;
    if (s.kind == StageKind::iron_oxide) at(CostItem::media) += media_kg * p.iron_oxide;
    if (s.kind == StageKind::activated_carbon) at(CostItem::media) += media_kg * p.carbon;
    at(CostItem::media_disposal) += media_kg * p.disposal;
    at(CostItem::changeout_labour) += s.changeouts * p.changeout_labour;
    at(CostItem::changeout_downtime) += s.changeouts * p.changeout_downtime * lost_per_hour_down;
    if (s.kind == StageKind::caustic)
      at(CostItem::consumables) += s.sulfur_removed * caustic_per_sulfur() * p.caustic_excess * p.caustic;
    if (s.kind == StageKind::biological) at(CostItem::consumables) += s.sulfur_removed * p.biological;
    at(CostItem::consumables) += sc.running;
    if (sc.capital > 0) at(CostItem::capital) += sc.capital * capital_recovery_factor(p.discount_rate, sc.life_years);
  }
  // overhaul hours brought forward = wear_hours per 1000 h per ppmv × (running h / 1000) × ppmv
  const double advanced = p.wear_hours * q.running_hours / 1000 * q.engine_h2s_ppmv;
  at(CostItem::engine_wear) = advanced / 1000 * p.wear_cost;
  return c;
}

double total(const CostItems& items) {
  double t = 0;
  for (double v : items) t += v;
  return t;
}

CostItems per_mwh(const CostItems& items, double energy) {
  check::positive("energy generated", energy);
  CostItems out{};
  const double mwh = energy / 3.6e9;
  for (std::size_t i = 0; i < cost_item_count; ++i) out[i] = items[i] / mwh;
  return out;
}

}  // namespace acidload
