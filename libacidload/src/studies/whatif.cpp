#include "acidload/studies/whatif.hpp"

#include "acidload/core/error.hpp"

namespace acidload {

VariantSummary summarize(const EngineCase& c) {
  if (c.record.empty()) throw InputError("record", "(empty)", "at least one segment of operation");
  VariantSummary v;
  v.name = c.name;
  v.run = simulate(c.charge, c.model, c.record, c.options);
  const Transfer& t = v.run.first_transfer;
  v.inflow = t.inflow;
  v.inflow_koh = t.inflow.as_koh();
  v.sulfur_share_to_oil = t.sulfur_share_to_oil(1.0);
  v.initial_tbn_rate = base_rate(v.run.initial, balance_constants(c.charge.oil), v.run.first_rates);
  v.charge = v.run.charges.front();
  // readings at the first limit, or at the end of the first charge
  const LimitReading tb = v.charge.at_end[static_cast<std::size_t>(Limit::tbn_fall)];
  const LimitReading ta = v.charge.at_end[static_cast<std::size_t>(Limit::tan_rise)];
  const LimitReading sa = v.charge.at_end[static_cast<std::size_t>(Limit::san)];
  v.tbn_end = tb.value, v.tan_end = ta.value, v.san_end = sa.value;
  v.steady_state = v.run.steady_state;
  v.dew_points = exhaust_dew_points(t.combustion, c.record.front().operation.exhaust_pressure);
  v.so3_share = c.model.transfer.so3_share;
  if (t.combustion.products[static_cast<std::size_t>(Gas::SO2)] > 0)
    v.so3_share_bound = so3_share_equilibrium_bound(t.combustion, c.exhaust_temperature,
                                                   c.record.front().operation.exhaust_pressure);
  return v;
}

}  // namespace acidload
