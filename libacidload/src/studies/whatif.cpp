#include "acidload/studies/whatif.hpp"

#include "acidload/core/error.hpp"

namespace acidload {

std::size_t record_segments(const EngineCase& c) { return c.streamed ? c.streamed->segments() : c.record.size(); }

double record_hours(const EngineCase& c) {
  if (c.streamed) return c.streamed->hours();
  double h = 0;
  for (const Segment& s : c.record) h += s.hours;
  return h;
}

const Segment& first_segment(const EngineCase& c) {
  if (c.streamed) return c.streamed->first();
  if (c.record.empty()) throw InputError("record", "(empty)", "at least one segment of operation");
  return c.record.front();
}

EngineCase held_record(const EngineCase& c, std::size_t max_segments) {
  if (!c.streamed) return c;
  if (c.streamed->segments() > max_segments)
    throw InputError("record", std::to_string(c.streamed->segments()) + " segments",
                     "a record of at most " + std::to_string(max_segments) +
                         " segments for this study, which holds the whole record in memory (run and check stream any length)");
  EngineCase out = c;
  out.streamed.reset();
  out.record.reserve(c.streamed->segments());
  const SegmentSource next = c.streamed->open();
  while (const Segment* s = next()) out.record.push_back(*s);
  return out;
}

VariantSummary summarize(const EngineCase& c) {
  if (!c.streamed && c.record.empty()) throw InputError("record", "(empty)", "at least one segment of operation");
  VariantSummary v;
  v.name = c.name;
  v.run = c.streamed ? simulate(c.charge, c.model, c.streamed->open(), c.options) : simulate(c.charge, c.model, c.record, c.options);
  const Transfer& t = v.run.first_transfer;
  v.inflow = t.inflow;
  v.inflow_koh = t.inflow.as_koh();
  v.sulfur_share_to_oil = t.sulfur_share_to_oil(1.0);
  v.initial_tbn_rate = base_rate(v.run.initial, balance_constants(c.charge.oil), v.run.first_rates);
  v.charge = v.run.charges.front();
  v.sulfur_share_to_oil_average = v.charge.sulfur_share_to_oil_average;
  // readings at the first limit, or at the end of the first charge
  const LimitReading tb = v.charge.at_end[static_cast<std::size_t>(Limit::tbn_fall)];
  const LimitReading ta = v.charge.at_end[static_cast<std::size_t>(Limit::tan_rise)];
  const LimitReading sa = v.charge.at_end[static_cast<std::size_t>(Limit::san)];
  v.tbn_end = tb.value, v.tan_end = ta.value, v.san_end = sa.value;
  {  // TBN fall averaged over the charge to its first limit (or its end), by the limit's method
    const LimitSettings& l = c.model.limits;
    const double fresh = c.charge.oil.fresh_reactive_base() + c.charge.oil.weak_base(l.tbn_method);
    const double hours = v.charge.first ? v.charge.drain_interval : v.charge.oil_hours;
    v.tbn_fall_rate_average = hours > 0 ? (tb.value - fresh) / hours : 0;
  }
  v.steady_state = v.run.steady_state;
  const Operation& op = first_segment(c).operation;
  v.dew_points = exhaust_dew_points(t.combustion, op.exhaust_pressure);
  v.emissions = emissions(t.exhaust, op.nox.o2_reference, op.nox.o2_air);
  if (c.catalyst_so3_conversion >= 0) {
    const auto after = after_oxidation_catalyst(t.exhaust, c.catalyst_so3_conversion);
    v.emissions_after_catalyst = emissions(after, op.nox.o2_reference, op.nox.o2_air);
    v.dew_points_after_catalyst = exhaust_dew_points(as_products(after), op.exhaust_pressure);
  }
  v.warnings = input_warnings(first_segment(c).fuel, op, c.fuel_gas_limits);
  if (v.charge.oil_limit_reached())
    for (const Warning& w : interval_warnings(v.charge.drain_interval)) v.warnings.push_back(w);
  v.so3_share = c.model.transfer.so3_share;
  if (t.combustion.products[static_cast<std::size_t>(Gas::SO2)] > 0)
    v.so3_share_bound = so3_share_equilibrium_bound(t.combustion, c.exhaust_temperature,
                                                   first_segment(c).operation.exhaust_pressure);
  return v;
}

}  // namespace acidload
