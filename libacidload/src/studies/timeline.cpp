#include "acidload/studies/timeline.hpp"

#include <cmath>

#include "acidload/core/error.hpp"
#include "acidload/core/rates.hpp"
#include "acidload/core/species.hpp"

namespace acidload {

OilRates segment_rates(const Segment& s, const OilCharge& charge, const ModelParameters& model, Transfer* out) {
  Operation op = s.operation;
  op.starts_per_hour = s.hours > 0 ? s.starts / s.hours : 0;
  const Transfer t = transfer(s.fuel, op, model.transfer);
  if (out) *out = t;
  return oil_rates(t, model.oxidation, s.oil_temperature, s.oil_consumption, charge.continuous_makeup);
}

namespace {

struct Runner {
  const OilCharge& charge;
  const ModelParameters& model;
  const RunOptions& opt;
  OilBalance k;
  RunResult result;
  OilState state;
  double engine_h = 0, oil_h = 0, calendar_h = 0, starts = 0;
  int charge_index = 0;
  std::optional<Segment> last_segment;  // kept for the steady state
  double fuel_s = 0, oil_s = 0;         // fuel sulfur and sulfur to the oil of the current charge up to its first limit [mol]
  double since_output = 0;              // hours since the last output point

  ChargeSummary& current() { return result.charges.back(); }

  void open_charge(double oil_hours) {
    ChargeSummary c;
    c.index = charge_index;
    c.start_engine_hours = engine_h;
    c.reached_at.fill(-1);
    result.charges.push_back(c);
    fuel_s = oil_s = 0;
    oil_h = oil_hours;
  }

  void record_point() {
    since_output = 0;
    TrajectoryPoint p;
    p.engine_hours = engine_h;
    p.oil_hours = oil_h;
    p.calendar_hours = calendar_h;
    p.starts = starts;
    p.charge = charge_index;
    p.state = state;
    p.tbn_d2896 = tbn(state, charge.oil, BaseNumberMethod::d2896);
    p.tbn_d4739 = tbn(state, charge.oil, BaseNumberMethod::d4739);
    p.tan = acidload::tan(state, charge.oil);
    p.san = san(state);
    p.viscosity_rise = acidload::viscosity_rise(state, charge.oil);
    result.trajectory.push_back(p);
  }

  void close_charge() {
    ChargeSummary& c = current();
    c.oil_hours = oil_h;
    if (!c.first && fuel_s > 0) c.sulfur_share_to_oil_average = oil_s / fuel_s;
    if (!c.first)
      for (Limit l : all_limits) c.at_end[static_cast<std::size_t>(l)] = read_limit(l, model.limits, charge.oil, state, oil_h);
  }

  // Marks limits reached at the end of a step of length dt from `before`; locates each exactly. `t` is the
  // step's transfer, for the charge averages up to the first limit.
  void check_limits(const OilState& before, const OilRates& r, double dt, const Transfer& t) {
    const bool had_first = current().first.has_value();
    ChargeSummary& c = current();
    for (Limit l : all_limits) {
      const auto i = static_cast<std::size_t>(l);
      if (c.reached_at[i] >= 0) continue;
      if (!read_limit(l, model.limits, charge.oil, state, oil_h).reached) continue;
      // bisection on the exact solution: not reached at lo, reached at hi
      double lo = 0, hi = dt;
      if (read_limit(l, model.limits, charge.oil, before, oil_h - dt).reached) hi = 0;
      for (int it = 0; it < 200 && hi - lo > 1e-13 * (1 + oil_h); ++it) {
        const double mid = 0.5 * (lo + hi);
        OilState x = before;
        OilLedger scratch;
        advance(x, k, r, mid, scratch);
        if (read_limit(l, model.limits, charge.oil, x, oil_h - dt + mid).reached) hi = mid; else lo = mid;
      }
      c.reached_at[i] = oil_h - dt + hi;
    }
    // the first limit and the readings there
    if (!c.first) {
      double t_first = -1;
      for (Limit l : all_limits) {
        const double t = c.reached_at[static_cast<std::size_t>(l)];
        if (t >= 0 && (t_first < 0 || t < t_first)) t_first = t, c.first = l;
      }
      if (c.first) {
        c.drain_interval = t_first;
        OilState x = before;
        OilLedger scratch;
        const double back = t_first - (oil_h - dt);
        if (back > 0) advance(x, k, r, back, scratch);
        if (!had_first) {  // charge averages up to the first limit: only the part of the step before it
          const double strong_s = t.inflow.sulfuric_liner + t.inflow.sulfuric_blowby;
          fuel_s += t.sulfur_flow * std::fmax(back, 0.0);
          oil_s += strong_s * std::fmax(back, 0.0) + scratch.sulfurous_taken_up / (2 * koh_molar_mass() * 1e3);
          if (fuel_s > 0) c.sulfur_share_to_oil_average = oil_s / fuel_s;
        }
        for (Limit l : all_limits)
          c.at_end[static_cast<std::size_t>(l)] = read_limit(l, model.limits, charge.oil, x, t_first);
      }
    }
  }

  void apply(const OilEvent& e) {
    switch (e.kind) {
      case OilEvent::Kind::top_up:
        top_up(state, charge.oil, e.amount < 0 ? std::fmax(0.0, charge.mass - state.mass) : e.amount, result.ledger);
        break;
      case OilEvent::Kind::partial_drain:
        partial_drain(state, charge.oil, e.amount, charge.mass, result.ledger);
        break;
      case OilEvent::Kind::oil_change:
        close_charge();
        current().ended_by_change = true;
        oil_change(state, charge.oil, e.amount < 0 ? charge.residual_share : e.amount, charge.mass, result.ledger);
        ++charge_index;
        open_charge(0);
        break;
    }
    record_point();
  }

  void run_segment(const Segment& s, bool first) {
    check::non_negative("segment.hours", s.hours);
    check::non_negative("segment.starts", s.starts);
    for (const OilEvent& e : s.events) apply(e);
    Transfer t;
    const OilRates r = segment_rates(s, charge, model, &t);
    if (first) result.first_transfer = t, result.first_rates = r;
    last_segment = s;
    const double cal = s.calendar_hours < 0 ? s.hours : s.calendar_hours;
    if (cal < s.hours) throw InputError("segment.calendar-hours", format_value(cal), "at least the running hours " + format_value(s.hours));
    double done = 0;
    while (done < s.hours) {
      double dt = s.hours - done;
      if (opt.detection_step > 0) dt = std::fmin(dt, opt.detection_step);
      if (opt.output_interval > 0) dt = std::fmin(dt, std::fmax(opt.output_interval - since_output, 0.0));
      if (dt <= 0) dt = std::fmin(s.hours - done, opt.output_interval);
      const OilState before = state;
      const double so2_before = result.ledger.sulfurous_taken_up;
      const SegmentOutcome out = advance(state, k, r, dt, result.ledger);
      const double so2_mol = (result.ledger.sulfurous_taken_up - so2_before) / (2 * koh_molar_mass() * 1e3);
      const bool counting = !current().first;
      if (out.floor_reached_at >= 0 && current().floor_reached_at < 0) current().floor_reached_at = oil_h + out.floor_reached_at;
      if (out.antioxidant_spent_at >= 0 && current().antioxidant_spent_at < 0)
        current().antioxidant_spent_at = oil_h + out.antioxidant_spent_at;
      done += dt;
      engine_h += dt;
      oil_h += dt;
      calendar_h += dt / s.hours * cal;
      starts += dt / s.hours * s.starts;
      check_limits(before, r, dt, t);
      if (counting && !current().first) {  // the whole step counts toward the charge averages
        fuel_s += t.sulfur_flow * dt;
        oil_s += (t.inflow.sulfuric_liner + t.inflow.sulfuric_blowby) * dt + so2_mol;
      }
      since_output += dt;
      if (opt.output_interval > 0 && since_output >= opt.output_interval - 1e-9) {
        since_output = 0;
        if (done < s.hours || !opt.keep_segment_ends) record_point();
      }
      if (opt.stop_at_first_limit && result.charges.front().first) return;
    }
    if (opt.keep_segment_ends) record_point();
  }
};

}  // namespace

RunResult simulate(const OilCharge& charge, const ModelParameters& model, const SegmentSource& next,
                   const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours) {
  validate(charge.oil);
  check::positive("oil.mass", charge.mass);
  check::in_range("oil.residual-share", charge.residual_share, 0.0, 0.9, "(share)");
  validate(model.limits);
  Runner run{charge, model, options, balance_constants(charge.oil), {}, start ? *start : fresh_oil(charge.oil, charge.mass)};
  run.result.initial = run.state;
  run.open_charge(start_oil_hours);
  run.record_point();
  std::optional<Segment> last;
  bool first = true;
  while (const Segment* s = next()) {
    run.run_segment(*s, first);
    first = false;
    if (!options.keep_segment_ends) last = *s;
    if (options.stop_at_first_limit && run.result.charges.front().first) break;
  }
  if (!options.keep_segment_ends && last && (run.result.trajectory.empty() ||
                                             run.result.trajectory.back().engine_hours != run.engine_h))
    run.record_point();  // the end of the record is always kept
  run.close_charge();
  RunResult& r = run.result;
  r.final_state = run.state;
  r.engine_hours = run.engine_h;
  r.calendar_hours = run.calendar_h;
  r.starts = run.starts;
  const Segment* tail = run.last_segment ? &*run.last_segment : nullptr;
  if (tail && !r.charges.back().oil_limit_reached() && charge.continuous_makeup && tail->oil_consumption > 0) {
    const OilRates rates = segment_rates(*tail, charge, model);
    r.steady_state = steady_state(run.state, run.k, rates);
  }
  return r;
}

RunResult simulate(const OilCharge& charge, const ModelParameters& model, const std::vector<Segment>& record,
                   const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours) {
  std::size_t i = 0;
  return simulate(charge, model, [&]() -> const Segment* { return i < record.size() ? &record[i++] : nullptr; },
                  options, start, start_oil_hours);
}

}  // namespace acidload
