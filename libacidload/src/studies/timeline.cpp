#include "acidload/studies/timeline.hpp"

#include <array>
#include <cmath>
#include <cstring>
#include <limits>

#include "acidload/core/error.hpp"
#include "acidload/core/oil_rates.hpp"
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

// Equality of operating states by value, field by field, each double compared by its bits (equal
// bits give equal results, so a repeat may reuse them; -0 against +0 only costs a recomputation).
// Not memcmp of the whole struct: the padding after an enum (NoxEmission::unit, FuelGas::combustion)
// holds whatever the stack held, so equal states compared unequal at random and the transfer was
// recomputed for every segment. The size assertions fail when a field is added: compare it too.
bool same(double a, double b) { return std::memcmp(&a, &b, sizeof(double)) == 0; }

bool same(const Operation& a, const Operation& b) {
  static_assert(sizeof(Operation) == 17 * sizeof(double), "a field was added to Operation: compare it here");
  return same(a.fuel_flow, b.fuel_flow) && same(a.electrical_power, b.electrical_power) && same(a.load, b.load) &&
         same(a.air.excess_air_ratio, b.air.excess_air_ratio) && same(a.air.water_fraction, b.air.water_fraction) &&
         same(a.blowby_share, b.blowby_share) && same(a.blowby_flow, b.blowby_flow) &&
         same(a.jacket_water_out, b.jacket_water_out) && same(a.coldest_crankcase_surface, b.coldest_crankcase_surface) &&
         same(a.crankcase_pressure, b.crankcase_pressure) && same(a.exhaust_pressure, b.exhaust_pressure) &&
         same(a.starts_per_hour, b.starts_per_hour) && same(a.jacket_water_at_start, b.jacket_water_at_start) &&
         same(a.nox.value, b.nox.value) && a.nox.unit == b.nox.unit && same(a.nox.o2_reference, b.nox.o2_reference) &&
         same(a.nox.o2_air, b.nox.o2_air);
}

bool same(const FuelGas& a, const FuelGas& b) {
  static_assert(sizeof(FuelGas) == (gas_count + 6) * sizeof(double), "a field was added to FuelGas: compare it here");
  for (std::size_t i = 0; i < gas_count; ++i)
    if (!same(a.x[i], b.x[i])) return false;
  return same(a.other_sulfur, b.other_sulfur) && same(a.chlorine, b.chlorine) && same(a.fluorine, b.fluorine) &&
         same(a.reference.temperature, b.reference.temperature) && same(a.reference.pressure, b.reference.pressure) &&
         a.combustion == b.combustion;
}

// The rates of the last operating state, reused while the state repeats (a record often holds
// long runs of identical rows); the model's constant parameters were validated once by simulate().
struct RateCache {
  bool valid = false;
  FuelGas fuel;
  Operation op;
  double oil_temperature = 0, oil_consumption = 0;
  Transfer transfer;
  OilRates rates;

  const OilRates& of(const Segment& s, const OilCharge& charge, const ModelParameters& model) {
    Operation op2 = s.operation;
    op2.starts_per_hour = s.hours > 0 ? s.starts / s.hours : 0;
    if (valid && same(op2, op) && same(s.fuel, fuel) && same(s.oil_temperature, oil_temperature) &&
        same(s.oil_consumption, oil_consumption))
      return rates;
    valid = false;
    transfer = acidload::transfer(s.fuel, op2, model.transfer, false);
    rates = oil_rates(transfer, model.oxidation, s.oil_temperature, s.oil_consumption, charge.continuous_makeup, false);
    fuel = s.fuel, op = op2, oil_temperature = s.oil_temperature, oil_consumption = s.oil_consumption;
    valid = true;
    return rates;
  }
};

// v ≥ 0 and finite, inline (NaN fails both comparisons, +inf the second): the common case of a
// segment's checks without a call; check:: then names the field.
bool finite_non_negative(double v) { return v >= 0 && v <= std::numeric_limits<double>::max(); }

struct Runner {
  const OilCharge& charge;
  const ModelParameters& model;
  const RunOptions& opt;
  OilBalance k;
  RunResult result;
  OilState state;
  double engine_h = 0, oil_h = 0, calendar_h = 0, starts = 0;
  int charge_index = 0;
  RateCache cache{};
  bool any_segment = false;             // the last segment's rates (in the cache) give the steady state
  double fuel_s = 0, oil_s = 0;         // fuel sulfur and sulfur to the oil of the current charge up to its first limit [mol]
  double since_output = 0;              // hours since the last output point
  std::array<Limit, limit_count> watched{};  // the current charge's enabled limits not reached yet, in order
  std::size_t watched_count = 0;
  const double so2_g_koh_per_mol = 2 * koh_molar_mass() * 1e3;  // SO2 counts 2 equivalents of KOH

  ChargeSummary& current() { return result.charges.back(); }

  void open_charge(double oil_hours) {
    ChargeSummary c;
    c.index = charge_index;
    c.start_engine_hours = engine_h;
    c.reached_at.fill(-1);
    result.charges.push_back(c);
    watched_count = 0;  // a disabled limit never reads reached: not watched
    for (Limit l : all_limits)
      if (model.limits.enabled[static_cast<std::size_t>(l)]) watched[watched_count++] = l;
    fuel_s = oil_s = 0;
    oil_h = oil_hours;
  }

  void record_point() {
    since_output = 0;
    TrajectoryPoint& p = result.trajectory.emplace_back();  // filled in place
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
    std::size_t kept = 0;  // the watched limits not reached in this step, in their order
    for (std::size_t w = 0; w < watched_count; ++w) {
      const Limit l = watched[w];
      const auto i = static_cast<std::size_t>(l);
      watched[kept++] = l;
      if (opt.stop_when_interval_and_san_known && c.first && l != Limit::san) continue;  // not asked for
      if (!read_limit(l, model.limits, charge.oil, state, oil_h).reached) continue;
      --kept;  // reached: located below, no longer watched
      // Illinois (regula falsi) on the exact solution's margin to the limit: not reached at lo,
      // reached at hi; a bisection step whenever the secant falls outside the bracket
      const LimitReading at_start = read_limit(l, model.limits, charge.oil, before, oil_h - dt);
      double lo = 0, hi = dt;
      double m_lo = at_start.margin(), m_hi = read_limit(l, model.limits, charge.oil, state, oil_h).margin();
      if (at_start.reached) hi = 0;
      int side = 0;
      const double width = 1e-13 * (1 + oil_h);  // the time is located to this [h]
      for (int it = 0; it < 200 && hi - lo > width; ++it) {
        double t = m_lo > m_hi ? lo + (hi - lo) * m_lo / (m_lo - m_hi) : 0.5 * (lo + hi);
        if (!(t > lo && t < hi) || it % 8 == 7) t = 0.5 * (lo + hi);  // a bisection now and then bounds the steps
        if (it == 0 && m_lo == 0) t = lo + width;  // at the limit already (free acid from nil): just after?
        OilState x = before;
        OilLedger scratch;
        advance(x, k, r, t, scratch);
        const LimitReading at = read_limit(l, model.limits, charge.oil, x, oil_h - dt + t);
        if (at.reached) {
          hi = t, m_hi = at.margin();
          if (side == -1) m_lo /= 2;
          side = -1;
        } else {
          lo = t, m_lo = at.margin();
          if (side == 1) m_hi /= 2;
          side = 1;
        }
      }
      c.reached_at[i] = oil_h - dt + hi;
    }
    watched_count = kept;
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
          oil_s += strong_s * std::fmax(back, 0.0) + scratch.sulfurous_taken_up / so2_g_koh_per_mol;
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

  bool done_with_first_charge() const {
    const ChargeSummary& c = result.charges.front();
    if (opt.stop_at_first_limit) return c.first.has_value();
    if (opt.stop_when_interval_and_san_known)
      return c.first && (c.reached_at[static_cast<std::size_t>(Limit::san)] >= 0 ||
                         !model.limits.enabled[static_cast<std::size_t>(Limit::san)]);
    return false;
  }

  // The first limit is known and only the first free strong acid is still watched: strong acid is
  // nil and stays nil while the base keeps above its floor (it forms only at the floor).
  bool only_san_left() const {
    return opt.stop_when_interval_and_san_known && charge_index == 0 && result.charges.front().first &&
           state.strong_acid == 0;
  }

  void run_segment(const Segment& s, bool first) {
    if (!finite_non_negative(s.hours)) check::non_negative("segment.hours", s.hours);
    if (!finite_non_negative(s.starts)) check::non_negative("segment.starts", s.starts);
    for (const OilEvent& e : s.events) apply(e);
    const OilRates r = cache.of(s, charge, model);
    if (first) result.first_transfer = cache.transfer, result.first_rates = r;
    const Transfer& t = cache.transfer;  // this segment's, for the charge averages
    any_segment = true;
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
      if (only_san_left()) {  // the rest of the segment in one step, if no free acid can appear in it
        double rest = s.hours - done;
        if (opt.output_interval > 0) rest = std::fmin(rest, std::fmax(opt.output_interval - since_output, dt));
        OilState x = state;
        OilLedger l = result.ledger;
        const SegmentOutcome o = advance(x, k, r, rest, l);
        if (o.floor_reached_at < 0 && x.strong_acid == 0) dt = rest;  // the base stayed above its floor
        else if (o.floor_reached_at > dt) dt = o.floor_reached_at;    // no free acid before the floor
      }
      const SegmentOutcome out = advance(state, k, r, dt, result.ledger);
      const double so2_mol = (result.ledger.sulfurous_taken_up - so2_before) / so2_g_koh_per_mol;
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
      if (done_with_first_charge()) return;
    }
    if (opt.keep_segment_ends) record_point();
  }
};

}  // namespace

namespace {
// simulate() with room for `points` trajectory points made at once where the record's length is
// known: a point per segment grown by doubling cost more than the oil balance itself (copies and
// first touches of the new blocks).
RunResult run_record(const OilCharge& charge, const ModelParameters& model, const SegmentSource& next,
                     const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours,
                     std::size_t points) {
  validate(charge.oil);
  check::positive("oil.mass", charge.mass);
  check::in_range("oil.residual-share", charge.residual_share, 0.0, 0.9, "(share)");
  validate(model.limits);
  validate(model.transfer);  // constant over the run: validated once here, not per segment
  validate(model.oxidation);
  Runner run{charge, model, options, balance_constants(charge.oil), {}, start ? *start : fresh_oil(charge.oil, charge.mass)};
  run.result.trajectory.reserve(points);
  run.result.initial = run.state;
  run.open_charge(start_oil_hours);
  run.record_point();
  bool first = true;
  while (const Segment* s = next()) {
    run.run_segment(*s, first);
    first = false;
    if (run.done_with_first_charge()) break;
  }
  if (!options.keep_segment_ends && run.any_segment && (run.result.trajectory.empty() ||
                                             run.result.trajectory.back().engine_hours != run.engine_h))
    run.record_point();  // the end of the record is always kept
  run.close_charge();
  RunResult& r = run.result;
  r.final_state = run.state;
  r.engine_hours = run.engine_h;
  r.calendar_hours = run.calendar_h;
  r.starts = run.starts;
  if (run.any_segment && !r.charges.back().oil_limit_reached() && charge.continuous_makeup &&
      run.cache.oil_consumption > 0)
    r.steady_state = steady_state(run.state, run.k, run.cache.rates);  // under the last segment's rates
  return r;
}
}  // namespace

RunResult simulate(const OilCharge& charge, const ModelParameters& model, const SegmentSource& next,
                   const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours) {
  return run_record(charge, model, next, options, start, start_oil_hours, 1);
}

RunResult simulate(const OilCharge& charge, const ModelParameters& model, const std::vector<Segment>& record,
                   const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours) {
  std::size_t i = 0;
  // the start, a point per segment end and one per event (events, too, record a point)
  std::size_t points = 1;
  if (options.keep_segment_ends && options.output_interval <= 0) {
    points += record.size();
    for (const Segment& s : record) points += s.events.size();
  }
  return run_record(charge, model, [&]() -> const Segment* { return i < record.size() ? &record[i++] : nullptr; },
                    options, start, start_oil_hours, points);
}

}  // namespace acidload
