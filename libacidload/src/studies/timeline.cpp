#include "acidload/studies/timeline.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <algorithm>
#include <limits>
#include <type_traits>
#include <utility>

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

void check_segment(const Segment& s, const OilCharge& charge, const ModelParameters& model) {
  Operation op = s.operation;
  op.starts_per_hour = s.hours > 0 ? s.starts / s.hours : 0;
  // oil_rates refuses by the operation, oil temperature and consumption alone, never by the transfer's figures
  oil_rates(transfer_checks(s.fuel, op, model.transfer), model.oxidation, s.oil_temperature, s.oil_consumption,
            charge.continuous_makeup);
}

namespace {

// Operating states compared by value, each double by its bits (equal bits give equal results, so a
// recurring state may reuse them; -0 against +0 only costs a recomputation). Not memcmp of whole
// structs: the padding after an enum (NoxEmission::unit, FuelGas::combustion) holds whatever the stack
// held, so equal states compared unequal at random. The doubles that lie back to back in FuelGas and
// Operation are compared as runs of 64-bit words (their bytes are their bits; the compiler compares two
// words at a time), the enums and the starts per hour one by one, the differences or-ed together
// without a branch per field, in two groups: the runs holding the fields that vary from row to row
// first, so that a new state is told apart after those, a repeat reading every field anyway. The
// layout assertions fail when a field is added or moved: compare it too.
std::uint64_t bits(double v) {
  std::uint64_t u;
  std::memcpy(&u, &v, sizeof u);
  return u;
}
std::uint64_t differ(double a, double b) { return bits(a) ^ bits(b); }

// The bytes [from, to) of a and b as 64-bit words, or-ed differences: zero when the bits agree.
template <std::size_t from, std::size_t to, class T>
std::uint64_t differ_words(const T& a, const T& b) {
  static_assert(from % sizeof(std::uint64_t) == 0 && to % sizeof(std::uint64_t) == 0 && to <= sizeof(T), "whole words");
  const auto* pa = reinterpret_cast<const unsigned char*>(&a);
  const auto* pb = reinterpret_cast<const unsigned char*>(&b);
  std::uint64_t d = 0;
  for (std::size_t i = from; i < to; i += sizeof(std::uint64_t)) {
    std::uint64_t x, y;
    std::memcpy(&x, pa + i, sizeof x);
    std::memcpy(&y, pb + i, sizeof y);
    d |= x ^ y;
  }
  return d;
}

// Where the runs of doubles lie (offsetof: both are standard-layout aggregates of doubles and enums).
static_assert(std::is_standard_layout_v<FuelGas> && std::is_standard_layout_v<Operation>, "offsetof");
constexpr std::size_t fuel_doubles_end = offsetof(FuelGas, combustion);  // x, other S, Cl, F, reference
static_assert(fuel_doubles_end == (gas_count + 5) * sizeof(double) && sizeof(FuelGas) == (gas_count + 6) * sizeof(double),
              "a field was added to FuelGas: compare it here");
constexpr std::size_t op_starts = offsetof(Operation, starts_per_hour);  // fuel flow … exhaust pressure before it
constexpr std::size_t op_nox = offsetof(Operation, nox);
static_assert(op_starts == 11 * sizeof(double) && offsetof(Operation, jacket_water_at_start) == op_starts + sizeof(double) &&
                  op_nox == op_starts + 2 * sizeof(double) && offsetof(NoxEmission, unit) == sizeof(double) &&
                  offsetof(NoxEmission, o2_reference) == 2 * sizeof(double) && sizeof(NoxEmission) == 4 * sizeof(double) &&
                  sizeof(Operation) == 17 * sizeof(double),
              "a field was added to Operation: compare it here");

// What the rates of a segment depend on besides the run's constant parameters.
struct OperatingState {
  FuelGas fuel;
  Operation op;  // starts_per_hour from the segment's starts and hours
  double oil_temperature = 0, oil_consumption = 0;
};
// A segment's starts per hour, as segment_rates sets it: the division only when there are starts (+0
// starts give +0 either way: 0 / h = +0 for h > 0).
double starts_per_hour(const Segment& s) {
  if (bits(s.starts) == 0) return 0;
  return s.hours > 0 ? s.starts / s.hours : 0;
}
// a against a segment's state, without copying the segment's fields into an OperatingState first
// b's starts per hour is b_starts_per_hour (a segment holds its starts and hours instead). Zero when equal.
std::uint64_t differ(const OperatingState& a, const Segment& b, double b_starts_per_hour) {
  // the mole fractions, fuel flow, power and load, the oil's temperature and consumption, the starts
  constexpr std::size_t fractions_end = gas_count * sizeof(double), op_load_end = offsetof(Operation, air);
  static_assert(offsetof(FuelGas, x) == 0 && op_load_end == 3 * sizeof(double), "the first group's words moved");
  const std::uint64_t d = differ_words<0, fractions_end>(a.fuel, b.fuel) | differ_words<0, op_load_end>(a.op, b.operation) |
                          differ(a.oil_temperature, b.oil_temperature) | differ(a.oil_consumption, b.oil_consumption) |
                          differ(a.op.starts_per_hour, b_starts_per_hour);
  if (d != 0) return d;
  // the traces and reference state; air … exhaust pressure; jacket water at start, NOx value; its O2 figures; the enums
  return differ_words<fractions_end, fuel_doubles_end>(a.fuel, b.fuel) | differ_words<op_load_end, op_starts>(a.op, b.operation) |
         differ_words<op_starts + sizeof(double), op_nox + offsetof(NoxEmission, unit)>(a.op, b.operation) |
         differ_words<op_nox + offsetof(NoxEmission, o2_reference), sizeof(Operation)>(a.op, b.operation) |
         static_cast<std::uint64_t>(a.op.nox.unit != b.operation.nox.unit) |
         static_cast<std::uint64_t>(a.fuel.combustion != b.fuel.combustion);
}

OperatingState operating_state(const Segment& s, double starts_per_hour) {
  OperatingState k;
  k.fuel = s.fuel, k.op = s.operation, k.op.starts_per_hour = starts_per_hour;
  k.oil_temperature = s.oil_temperature, k.oil_consumption = s.oil_consumption;
  return k;
}

// A hash of the fields that usually vary from row to row; it only picks the set, the comparison decides.
// Their bit patterns summed (one add each: the miss path of an all-distinct record pays for it), then
// mixed (the 64-bit finaliser of MurmurHash3) so that the top bits depend on every field.
std::uint64_t hash(const Segment& s, double starts_per_hour) {
  std::uint64_t h = bits(s.operation.fuel_flow) + bits(s.operation.electrical_power) + bits(s.operation.load) +
                    bits(starts_per_hour) + bits(s.oil_temperature) + bits(s.oil_consumption);
  for (double v : s.fuel.x) h += bits(v);
  h ^= h >> 33;
  h *= 0xff51afd7ed558ccdull;
  h ^= h >> 33;
  h *= 0xc4ceb9fe1a85ec53ull;
  return h ^ (h >> 33);
}

// The transfer, rates and step coefficients of recent operating states, reused when a state recurs: at once when it
// repeats the last segment's (long runs of identical rows), otherwise from a small four-way
// set-associative table by a hash of the state (daily load cycles, quantised readings), each hit
// confirmed field by field. Exact: transfer and oil_rates are pure functions of the state and of the
// run's constant parameters (validated once by simulate()), so a reused result is the recomputed one
// bit for bit. The entries (about 1.2 kB each, at most sets × ways) grow with the states seen, so a
// short record (a Monte Carlo draw) allocates little; they are addressed by index, and a reference to
// one is held only until the next lookup. A new state replaces the one of its set used longest ago.
class RateCache {
 public:
  static constexpr std::size_t sets = 32, ways = 4;

  // The last looked-up state's entry (its transfer, rates and oil consumption).
  const Transfer& transfer() const { return entries_[last_].transfer; }
  const OilRates& rates() const { return entries_[last_].rates; }
  double oil_consumption() const { return entries_[last_].key.oil_consumption; }
  // The last looked-up state's step coefficients, for advance(): they belong to its rates.
  StepMemo& memo() { return entries_[last_].memo; }

  const OilRates& of(const Segment& s, const OilCharge& charge, const ModelParameters& model) {
    const double starts_per_hour = acidload::starts_per_hour(s);
    if (!entries_.empty() && differ(entries_[last_].key, s, starts_per_hour) == 0) return entries_[last_].rates;  // a repeat
    const std::uint64_t h = hash(s, starts_per_hour);
    const std::size_t set = static_cast<std::size_t>(h >> 59) % sets;  // the hash's top bits
    Set& t = sets_[set];
    ++clock_;
    for (std::size_t w = 0; w < ways; ++w)
      if (t.entry[w] >= 0 && t.hash[w] == h && differ(entries_[static_cast<std::size_t>(t.entry[w])].key, s, starts_per_hour) == 0) {
        last_ = static_cast<std::size_t>(t.entry[w]);
        t.used[w] = clock_;
        return entries_[last_].rates;
      }
    // a miss: an empty way of the set, else the one used longest ago
    std::size_t w = 0;
    for (std::size_t v = 1; v < ways; ++v)
      if (t.entry[w] >= 0 && (t.entry[v] < 0 || t.used[v] < t.used[w])) w = v;
    if (t.entry[w] < 0) {
      t.entry[w] = static_cast<std::int32_t>(entries_.size());
      entries_.emplace_back();
    }
    t.hash[w] = h, t.used[w] = clock_;
    last_ = static_cast<std::size_t>(t.entry[w]);
    Entry& e = entries_[last_];
    e.key = operating_state(s, starts_per_hour);
    e.transfer = acidload::transfer(e.key.fuel, e.key.op, model.transfer, false);
    e.rates = oil_rates(e.transfer, model.oxidation, s.oil_temperature, s.oil_consumption, charge.continuous_makeup, false);
    e.memo.clear();  // new rates: the coefficients of the state this entry held no longer apply
    return e.rates;
  }

 private:
  struct Entry {
    OperatingState key;
    Transfer transfer;
    OilRates rates;
    StepMemo memo;  // advance()'s coefficients under these rates (and the run's constant oil balance)
  };
  struct Set {
    std::array<std::uint64_t, ways> hash{};
    std::array<std::uint64_t, ways> used{};          // the lookup count when last used
    std::array<std::int32_t, ways> entry{-1, -1, -1, -1};  // into entries_, -1 empty
  };
  std::vector<Entry> entries_;
  std::array<Set, sets> sets_{};
  std::size_t last_ = 0;
  std::uint64_t clock_ = 0;
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
  std::uint32_t watched_mask = 0;       // the same limits as bits
  const double so2_g_koh_per_mol = 2 * koh_molar_mass() * 1e3;  // SO2 counts 2 equivalents of KOH
  LimitWatch limits{};  // set by run_record before the first step

  ChargeSummary& current() { return result.charges.back(); }

  void open_charge(double oil_hours) {
    ChargeSummary c;
    c.index = charge_index;
    c.start_engine_hours = engine_h;
    c.reached_at.fill(-1);
    result.charges.push_back(c);
    watched_count = 0;  // a disabled limit never reads reached: not watched
    watched_mask = 0;
    for (Limit l : all_limits)
      if (model.limits.enabled[static_cast<std::size_t>(l)])
        watched[watched_count++] = l, watched_mask |= 1u << static_cast<unsigned>(l);
    fuel_s = oil_s = 0;
    oil_h = oil_hours;
  }

  // Every field given at once (emplace_back() and then each field would store every field twice: zero, value)
  void record_point() {
    since_output = 0;
    const OilProperties& oil = charge.oil;
    result.trajectory.push_back(TrajectoryPoint{engine_h, oil_h, calendar_h, starts, charge_index, state,
                                                tbn(state, oil, BaseNumberMethod::d2896), tbn(state, oil, BaseNumberMethod::d4739),
                                                acidload::tan(state, oil), san(state), acidload::viscosity_rise(state, oil)});
  }

  void close_charge() {
    ChargeSummary& c = current();
    c.oil_hours = oil_h;
    if (!c.first && fuel_s > 0) c.sulfur_share_to_oil_average = oil_s / fuel_s;
    if (!c.first)
      for (Limit l : all_limits) c.at_end[static_cast<std::size_t>(l)] = read_limit(l, model.limits, charge.oil, state, oil_h);
  }

  // Marks limits reached at the end of a step of length dt from `before`; locates each exactly. `t` is the
  // step's transfer, for the charge averages up to the first limit. Inline: the mask is the common step's
  // only work; the locating is out of line.
  [[gnu::always_inline]] inline void check_limits(const OilState& before, const OilRates& r, double dt, const Transfer& t) {
    const std::uint32_t now = reached_limits(limits, state, oil_h) & watched_mask;
    if (now != 0) locate_limits(now, before, r, dt, t);  // else nothing to locate, the first limit still unknown (the common step)
  }

  // The limits of `now` (watched, reached at the end of this step) located, and the first limit's readings.
  [[gnu::noinline]] void locate_limits(std::uint32_t now, const OilState& before, const OilRates& r, double dt, const Transfer& t) {
    const bool had_first = current().first.has_value();
    ChargeSummary& c = current();
    std::size_t kept = 0;  // the watched limits not reached in this step, in their order
    for (std::size_t w = 0; w < watched_count; ++w) {
      const Limit l = watched[w];
      const auto i = static_cast<std::size_t>(l);
      watched[kept++] = l;
      if (opt.stop_when_interval_and_san_known && c.first && l != Limit::san) continue;  // not asked for
      if (!(now >> i & 1u)) continue;
      --kept;  // reached: located below, no longer watched
      watched_mask &= ~(1u << i);
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
    const bool any_reached = kept < watched_count;
    watched_count = kept;
    // the first limit and the readings there (only when a limit was reached in this step: reached_at
    // is set only above, so with none reached the first limit stays unknown)
    if (!c.first && any_reached) {
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

  // inline into each run_record instance: the call's prologue and epilogue cost more than the loop's own bookkeeping
  [[gnu::always_inline]] inline void run_segment(const Segment& s, bool first) {
    if (!finite_non_negative(s.hours)) check::non_negative("segment.hours", s.hours);
    if (!finite_non_negative(s.starts)) check::non_negative("segment.starts", s.starts);
    for (const OilEvent& e : s.events) apply(e);
    const OilRates& r = cache.of(s, charge, model);  // the cache's entry, not a copy: valid until the next segment's lookup
    if (first) result.first_transfer = cache.transfer(), result.first_rates = r;
    const Transfer& t = cache.transfer();  // this segment's, for the charge averages
    any_segment = true;
    const double cal = s.calendar_hours < 0 ? s.hours : s.calendar_hours;
    if (cal < s.hours) throw InputError("segment.calendar-hours", format_value(cal), "at least the running hours " + format_value(s.hours));
    double done = 0;
    while (done < s.hours) {
      double dt = s.hours - done;  // > 0 (done < s.hours, both finite)
      // fmin of two positive numbers (not a call to libm's fmin, which must also handle NaN and zeros)
      if (opt.detection_step > 0 && opt.detection_step < dt) dt = opt.detection_step;
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
      const SegmentOutcome out = advance(state, k, r, dt, result.ledger, cache.memo());
      const double so2_mol = (result.ledger.sulfurous_taken_up - so2_before) / so2_g_koh_per_mol;
      const bool counting = !current().first;
      if (out.floor_reached_at >= 0 && current().floor_reached_at < 0) current().floor_reached_at = oil_h + out.floor_reached_at;
      if (out.antioxidant_spent_at >= 0 && current().antioxidant_spent_at < 0)
        current().antioxidant_spent_at = oil_h + out.antioxidant_spent_at;
      done += dt;
      engine_h += dt;
      oil_h += dt;
      if (dt == s.hours) {  // the whole segment in one step: dt / s.hours is exactly 1, so the same sums
        calendar_h += cal;
        starts += s.starts;
      } else {
        calendar_h += dt / s.hours * cal;
        starts += dt / s.hours * s.starts;
      }
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

namespace detail {
bool same_operating_state(const Segment& a, const Segment& b) {
  return differ(operating_state(a, acidload::starts_per_hour(a)), b, acidload::starts_per_hour(b)) == 0;
}
}  // namespace detail

namespace {
// simulate() with room for `points` trajectory points made at once where the record's length is
// known: a point per segment grown by doubling cost more than the oil balance itself (copies and
// first touches of the new blocks).
template <class Next>  // a held record's own loop, or a SegmentSource (no std::function call per segment for the former)
RunResult run_record(const OilCharge& charge, const ModelParameters& model, Next&& next,
                     const RunOptions& options, const std::optional<OilState>& start, double start_oil_hours,
                     std::size_t points) {
  validate(charge.oil);
  check::positive("oil.mass", charge.mass);
  check::in_range("oil.residual-share", charge.residual_share, 0.0, 0.9, "(share)");
  validate(model.limits);
  validate(model.transfer);  // constant over the run: validated once here, not per segment
  validate(model.oxidation);
  Runner run{charge, model, options, balance_constants(charge.oil), RunResult{}, start ? *start : fresh_oil(charge.oil, charge.mass)};
  run.limits = limit_watch(model.limits, charge.oil);
  // room for the points known up front: a held record's length, or what a streamed one's reader asks
  run.result.trajectory.reserve(std::max(points, options.reserve_points));
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
      run.cache.oil_consumption() > 0)
    r.steady_state = steady_state(run.state, run.k, run.cache.rates());  // under the last segment's rates
  return std::move(r);  // not a copy: the trajectory of a long record is the run's largest part
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
