// The timeline: limits, drain interval and the directions a plant engineer expects.
#include <doctest/doctest.h>

#include <cmath>
#include <cstddef>
#include <functional>
#include <string>
#include <utility>
#include <cstdint>
#include <random>
#include <vector>

#include "../support/sanity_case.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/timeline.hpp"

using namespace acidload;
using acidload_test::sanity_charge;
using acidload_test::sanity_segment;

namespace {
double interval(const OilCharge& c, const Segment& s, const ModelParameters& m = {}) {
  const RunResult r = simulate(c, m, {s});
  return r.charges.front().drain_interval;
}
Segment hours(double h, double h2s = 300) { return sanity_segment(h, h2s); }
}  // namespace

TEST_CASE("sanity case: a drain interval ended by the TBN limit within 500-2000 h") {
  const RunResult r = simulate(sanity_charge(), {}, {hours(8000)});
  const ChargeSummary& c = r.charges.front();
  REQUIRE(c.first);
  MESSAGE("first limit: " << std::string(name(*c.first)) << " at " << c.drain_interval << " h");
  CHECK(c.drain_interval > 500);
  CHECK(c.drain_interval < 2000);
  // docs/model.md §5.5: half TBN in roughly 500–2000 h (from memory)
  const double half_tbn = c.reached_at[static_cast<std::size_t>(Limit::tbn_fall)];
  CHECK(half_tbn > 500);
  CHECK(half_tbn < 2000);
}

TEST_CASE("directions of the drain interval") {
  const OilCharge base = sanity_charge();
  const double t0 = interval(base, hours(8000));
  SUBCASE("more H2S, shorter") { CHECK(interval(base, hours(8000, 600)) < t0); }
  SUBCASE("more blow-by, shorter") {
    Segment s = hours(8000);
    s.operation.blowby_share = 0.02;
    CHECK(interval(base, s) < t0);
  }
  SUBCASE("larger SO3 share, shorter") {
    ModelParameters m;
    m.transfer.so3_share = 0.04;
    CHECK(interval(base, hours(8000), m) < t0);
  }
  SUBCASE("hotter jacket water, longer") {
    Segment s = hours(8000);
    s.operation.jacket_water_out += 10;
    CHECK(interval(base, s) > t0);
  }
  SUBCASE("bigger sump, longer") {
    OilCharge c = base;
    c.mass *= 1.5;
    CHECK(interval(c, hours(8000)) > t0);
  }
  SUBCASE("higher fresh TBN, longer") {
    OilCharge c = base;
    c.oil.fresh_tbn = 9;
    CHECK(interval(c, hours(8000)) > t0);
  }
  SUBCASE("more makeup, longer") {
    Segment s = hours(8000);
    s.oil_consumption *= 2;
    CHECK(interval(base, s) > t0);
  }
}

TEST_CASE("no contaminants: an oil-condition limit (oxidation, antioxidant, viscosity …) ends the charge") {
  Segment s = hours(8000, 0);
  const RunResult r = simulate(sanity_charge(), {}, {s});
  const ChargeSummary& c = r.charges.front();
  CHECK(c.reached_at[static_cast<std::size_t>(Limit::san)] < 0);
  CHECK(c.reached_at[static_cast<std::size_t>(Limit::tbn_fall)] < 0);
  REQUIRE(c.first);
  const Limit l = *c.first;
  CHECK((l == Limit::oxidation || l == Limit::nitration || l == Limit::tan_rise || l == Limit::antioxidant ||
         l == Limit::viscosity));
  CHECK(c.oil_limit_reached());
  CHECK(c.drain_interval < 4000);  // clean gas still ends by a mechanism within the 1000–4000 h of practice
  for (const auto& p : r.trajectory) CHECK(p.san == 0);
}

TEST_CASE("TAN rises from the first hours on sour gas") {
  RunOptions o;
  o.output_interval = 1;
  const RunResult r = simulate(sanity_charge(), {}, {hours(24)}, o);
  REQUIRE(r.trajectory.size() > 3);
  for (std::size_t i = 1; i < r.trajectory.size(); ++i) CHECK(r.trajectory[i].tan > r.trajectory[i - 1].tan);
}

TEST_CASE("a drain interval found inside a long segment is where the limit is met") {
  const RunResult r = simulate(sanity_charge(), {}, {hours(8000)});
  const ChargeSummary& c = r.charges.front();
  REQUIRE(c.first);
  const LimitReading at = c.at_end[static_cast<std::size_t>(*c.first)];
  CHECK(std::fabs(at.value - at.limit) <= 1e-9 * std::fabs(at.limit));
  // the other limits carry a margin at that time
  for (Limit l : all_limits) {
    if (l == *c.first) continue;
    const LimitReading x = c.at_end[static_cast<std::size_t>(l)];
    INFO(std::string(name(l)));
    CHECK(!x.reached);
    if (l == Limit::san) CHECK(x.value == 0);  // "any free acid": no margin to show, none present
    else CHECK(x.margin() > 0);
  }
}

TEST_CASE("continuous makeup can settle short of every limit: not reached, with the steady state") {
  OilCharge c = sanity_charge();
  c.oil.fresh_tbn = 15;
  ModelParameters m;
  m.limits.max_hours = 20000;
  m.oxidation.rate_at_reference = 0.001;
  m.oxidation.induction_hours = 1e5;  // an antioxidant reserve that makeup keeps ahead of
  Segment s = hours(20000, 40);
  s.operation.nox.value = 0;
  const RunResult r = simulate(c, m, {s});
  CHECK(r.charges.front().first == Limit::max_hours);
  CHECK(!r.charges.front().oil_limit_reached());
  CHECK(r.steady_state);  // the horizon is the plant's plan, not a limit: the settled state is given
  Segment shorter = s;
  shorter.hours = 5000;
  const RunResult r2 = simulate(c, m, {shorter});
  CHECK(!r2.charges.front().first);
  REQUIRE(r2.steady_state);
  CHECK(r2.steady_state->base > c.oil.base_floor);
}

TEST_CASE("events: oil change starts a new charge; hours kept apart") {
  Segment a = hours(700), b = hours(500);
  a.starts = 3;
  a.calendar_hours = 800;
  b.events.push_back({OilEvent::Kind::oil_change, -1});
  b.events.push_back({OilEvent::Kind::top_up, 5.0});
  const RunResult r = simulate(sanity_charge(), {}, {a, b});
  REQUIRE(r.charges.size() == 2);
  CHECK(r.charges[0].ended_by_change);
  CHECK(r.charges[0].oil_hours == doctest::Approx(700));
  CHECK(r.charges[1].oil_hours == doctest::Approx(500));
  CHECK(r.engine_hours == doctest::Approx(1200));
  CHECK(r.calendar_hours == doctest::Approx(1300));
  CHECK(r.starts == doctest::Approx(3));
  CHECK(r.trajectory.back().oil_hours == doctest::Approx(500));
  CHECK(r.trajectory.back().charge == 1);
  // after the change the oil is mostly fresh: 10 % residual
  const OilCharge ch = sanity_charge();
  const double b_fresh = ch.oil.fresh_reactive_base();
  const auto& p_after = r.trajectory[r.trajectory.size() - 3];  // the point recorded after the oil change
  CHECK(p_after.oil_hours == 0);
  CHECK(p_after.state.base > 0.9 * b_fresh);
  CHECK(p_after.state.base < b_fresh);
}

TEST_CASE("a run's ledgers close over events") {
  Segment a = hours(900), b = hours(900, 900), c = hours(600, 50);
  b.events.push_back({OilEvent::Kind::partial_drain, 0.3});
  c.events.push_back({OilEvent::Kind::oil_change, 0.1});
  const RunResult r = simulate(sanity_charge(), {}, {a, b, c});
  const OilLedger& l = r.ledger;
  const double b0 = r.initial.base * r.initial.mass, b1 = r.final_state.base * r.final_state.mass;
  CHECK(std::fabs(b0 + l.base_added - l.base_removed - l.base_consumed - b1) <= 1e-9 * (b0 + l.base_added));
  const double f0 = (r.initial.strong_acid + r.initial.weak_acid) * r.initial.mass;
  const double f1 = (r.final_state.strong_acid + r.final_state.weak_acid) * r.final_state.mass;
  CHECK(std::fabs(l.acid_entered - (l.base_consumed + f1 - f0 + l.acid_removed)) <= 1e-9 * l.acid_entered);
}

TEST_CASE("bad segments are refused with the field named") {
  Segment s = hours(-5);
  CHECK_THROWS_AS(simulate(sanity_charge(), {}, {s}), InputError);
  OilCharge c = sanity_charge();
  c.continuous_makeup = false;
  CHECK_THROWS_AS(simulate(c, {}, {hours(5000)}), InputError);  // burns the sump dry without a top-up
}

TEST_CASE("a record read segment by segment gives the same run; decimated trajectories keep few points") {
  std::vector<Segment> rec;
  for (int i = 0; i < 2000; ++i) rec.push_back(hours(1.0, 250 + 100 * std::sin(i / 50.0)));
  const RunResult a = simulate(sanity_charge(), {}, rec);
  std::size_t i = 0;
  RunOptions o;
  o.keep_segment_ends = false;
  o.output_interval = 100;
  const RunResult b = simulate(sanity_charge(), {}, [&]() -> const Segment* { return i < rec.size() ? &rec[i++] : nullptr; }, o);
  CHECK(a.final_state.base == doctest::Approx(b.final_state.base).epsilon(1e-12));
  CHECK(a.final_state.salts == doctest::Approx(b.final_state.salts).epsilon(1e-12));
  CHECK(a.charges.front().drain_interval == doctest::Approx(b.charges.front().drain_interval).epsilon(1e-12));
  CHECK(a.trajectory.size() == 2001);
  CHECK(b.trajectory.size() == 21);  // the start and every 100 h
  CHECK(b.trajectory.back().engine_hours == doctest::Approx(2000));
}

TEST_CASE("rates reused while the operating state repeats give the bits of a fresh computation per segment") {
  // a record whose state repeats for 6 segments at a time (the runner reuses the transfer there) against
  // the same segments advanced one by one with their rates computed afresh each time
  std::vector<Segment> rec;
  for (int i = 0; i < 48; ++i) rec.push_back(hours(1.0, 200 + 40 * (i / 6)));
  rec[20].starts = 1;  // a start changes the state of one segment only
  const OilCharge c = sanity_charge();
  const ModelParameters m;
  RunOptions o;
  o.detection_step = 0;
  const RunResult r = simulate(c, m, rec, o);
  OilState s = fresh_oil(c.oil, c.mass);
  const OilBalance k = balance_constants(c.oil);
  OilLedger ledger;
  for (const Segment& seg : rec) advance(s, k, segment_rates(seg, c, m), seg.hours, ledger);
  CHECK(r.final_state.base == s.base);
  CHECK(r.final_state.weak_acid == s.weak_acid);
  CHECK(r.final_state.salts == s.salts);
  CHECK(r.final_state.oxidation == s.oxidation);
  CHECK(r.final_state.nitration == s.nitration);
  CHECK(r.ledger.acid_entered == ledger.acid_entered);
}

namespace {
bool same_state(const OilState& a, const OilState& b) {  // every field, bit for bit (equal doubles; no NaN here)
  return a.mass == b.mass && a.base == b.base && a.strong_acid == b.strong_acid && a.weak_acid == b.weak_acid &&
         a.salts == b.salts && a.oxidation == b.oxidation && a.nitration == b.nitration &&
         a.additive_acidity == b.additive_acidity && a.antioxidant == b.antioxidant;
}
}  // namespace

TEST_CASE("states recurring out of order: the rates reused from the cache of recent states are a fresh computation's bits") {
  // Random records drawn from pools of 1 to 300 operating states (more than the cache holds, so entries
  // are replaced), in random order with back-to-back repeats; some states differ only in fields the
  // cache's hash leaves out (jacket water, NOx unit, other sulfur), so they share its set and hash and
  // only the field-by-field comparison tells them apart. Every segment end of simulate must equal the
  // plain path: each segment advanced with its rates computed afresh (segment_rates), bit for bit.
  std::mt19937_64 rng(1907);
  const OilCharge c = sanity_charge();
  const ModelParameters m;
  RunOptions o;
  o.detection_step = 0;
  for (std::size_t pool_size : {1u, 3u, 24u, 40u, 129u, 300u}) {
    std::vector<Segment> pool;
    for (std::size_t j = 0; j < pool_size; ++j) {
      Segment s = hours(std::uniform_int_distribution<int>(1, 3)(rng) * 0.5,
                        std::uniform_real_distribution<double>(50, 900)(rng));
      s.operation.load = std::uniform_real_distribution<double>(0.5, 1.0)(rng);
      if (j % 4 == 1) s.starts = 1;
      if (j > 0 && j % 5 == 0) {  // a twin of the previous state in the hashed fields
        s = pool[j - 1];
        switch (j % 3) {
          case 0: s.operation.jacket_water_out += 2; break;
          case 1: s.operation.nox.unit = NoxEmission::Unit::g_per_kWh, s.operation.nox.value = 1.0; break;
          default: s.fuel.other_sulfur += 1e-6; break;
        }
      }
      pool.push_back(s);
    }
    std::vector<Segment> rec;
    std::uniform_int_distribution<std::size_t> pick(0, pool_size - 1);
    for (int i = 0; i < 1500; ++i) {
      const std::size_t j = pick(rng);
      for (int rep = i % 7 == 0 ? 3 : 1; rep > 0; --rep) rec.push_back(pool[j]);
    }
    const RunResult r = simulate(c, m, rec, o);
    REQUIRE(r.trajectory.size() == rec.size() + 1);
    OilState s = fresh_oil(c.oil, c.mass);
    const OilBalance k = balance_constants(c.oil);
    OilLedger ledger;
    std::size_t unequal = 0;
    for (std::size_t i = 0; i < rec.size(); ++i) {
      advance(s, k, segment_rates(rec[i], c, m), rec[i].hours, ledger);
      if (!same_state(r.trajectory[i + 1].state, s)) ++unequal;
    }
    INFO("pool of " << pool_size << " states");
    CHECK(unequal == 0);
    CHECK(same_state(r.final_state, s));
    CHECK(r.ledger.acid_entered == ledger.acid_entered);
    CHECK(r.ledger.sulfurous_taken_up == ledger.sulfurous_taken_up);
  }
}

namespace {
void nudge(double& v) { v = v == 0 ? 1e-9 : v * (1 + 1e-9); }  // a change small enough to stay valid
}  // namespace

TEST_CASE("the cache's comparison tells apart every field the rates read, and nothing else; reuse gives a fresh computation's bits") {
  // Each field segment_rates reads (every double of the fuel and the operation, the two enums, the oil's
  // temperature and consumption, the starts per hour from starts and hours) changed alone in a copy of a
  // segment: the comparison (detail::same_operating_state, the one simulate's cache uses) must take the
  // copy for a new state, and simulate over a record mixing the two, back to back and alternating, must
  // give the plain path's segment ends bit for bit (each segment's rates computed afresh by
  // segment_rates). What segment_rates does not read (the operation's own starts per hour, which the
  // segment's starts and hours set; calendar hours; events; padding bytes) must not tell them apart, nor
  // the hours when there are no starts, nor starts and hours giving the same starts per hour.
  const Segment base = hours(1.0, 400);
  std::vector<std::pair<std::string, std::function<void(Segment&)>>> changes;
  for (std::size_t i = 0; i < gas_count; ++i)
    changes.emplace_back("fuel.x[" + std::to_string(i) + "]", [i](Segment& s) { nudge(s.fuel.x[i]); });
  changes.emplace_back("other_sulfur", [](Segment& s) { nudge(s.fuel.other_sulfur); });
  changes.emplace_back("chlorine", [](Segment& s) { nudge(s.fuel.chlorine); });
  changes.emplace_back("fluorine", [](Segment& s) { nudge(s.fuel.fluorine); });
  changes.emplace_back("reference.temperature", [](Segment& s) { nudge(s.fuel.reference.temperature); });
  changes.emplace_back("reference.pressure", [](Segment& s) { nudge(s.fuel.reference.pressure); });
  changes.emplace_back("combustion", [](Segment& s) { s.fuel.combustion = CombustionReference::t25; });
  changes.emplace_back("fuel_flow", [](Segment& s) { nudge(s.operation.fuel_flow); });
  changes.emplace_back("electrical_power", [](Segment& s) { nudge(s.operation.electrical_power); });
  changes.emplace_back("load", [](Segment& s) { s.operation.load *= 0.9; });
  changes.emplace_back("excess_air_ratio", [](Segment& s) { nudge(s.operation.air.excess_air_ratio); });
  changes.emplace_back("water_fraction", [](Segment& s) { nudge(s.operation.air.water_fraction); });
  changes.emplace_back("blowby_share", [](Segment& s) { nudge(s.operation.blowby_share); });
  changes.emplace_back("blowby_flow", [](Segment& s) { nudge(s.operation.blowby_flow); });
  changes.emplace_back("jacket_water_out", [](Segment& s) { nudge(s.operation.jacket_water_out); });
  changes.emplace_back("coldest_crankcase_surface", [](Segment& s) { nudge(s.operation.coldest_crankcase_surface); });
  changes.emplace_back("crankcase_pressure", [](Segment& s) { nudge(s.operation.crankcase_pressure); });
  changes.emplace_back("exhaust_pressure", [](Segment& s) { nudge(s.operation.exhaust_pressure); });
  changes.emplace_back("jacket_water_at_start", [](Segment& s) { nudge(s.operation.jacket_water_at_start); });
  changes.emplace_back("nox.value", [](Segment& s) { nudge(s.operation.nox.value); });
  changes.emplace_back("nox.unit", [](Segment& s) { s.operation.nox.unit = NoxEmission::Unit::g_per_kWh; });
  changes.emplace_back("nox.o2_reference", [](Segment& s) { nudge(s.operation.nox.o2_reference); });
  changes.emplace_back("nox.o2_air", [](Segment& s) { s.operation.nox.o2_air = 0.209; });
  changes.emplace_back("oil_temperature", [](Segment& s) { nudge(s.oil_temperature); });
  changes.emplace_back("oil_consumption", [](Segment& s) { nudge(s.oil_consumption); });
  changes.emplace_back("starts", [](Segment& s) { s.starts = 1; });
  changes.emplace_back("hours, with starts", [](Segment& s) { s.starts = 1, s.hours = 2; });  // starts per hour 1 against 0.5
  const OilCharge c = sanity_charge();
  const ModelParameters m;
  RunOptions o;
  o.detection_step = 0;
  const OilBalance k = balance_constants(c.oil);
  for (const auto& named : changes) {  // not a structured binding: clang++-14 refuses one in INFO's lambda
    const std::string field = named.first;
    Segment a = base;
    if (field == "hours, with starts") a.starts = 1;  // 1 start an hour: only the hours differ
    Segment b = a;
    named.second(b);
    INFO("field " << field);
    CHECK(!detail::same_operating_state(a, b));
    CHECK(!detail::same_operating_state(b, a));
    const std::vector<Segment> rec{a, a, b, a, b, b, a, b};
    const RunResult r = simulate(c, m, rec, o);
    REQUIRE(r.trajectory.size() == rec.size() + 1);
    OilState x = fresh_oil(c.oil, c.mass);
    OilLedger ledger;
    std::size_t unequal = 0;
    for (std::size_t i = 0; i < rec.size(); ++i) {
      advance(x, k, segment_rates(rec[i], c, m), rec[i].hours, ledger);
      if (!same_state(r.trajectory[i + 1].state, x)) ++unequal;
    }
    CHECK(unequal == 0);
  }
  // what the rates do not read
  Segment same = base;
  same.operation.starts_per_hour = 7;  // set from starts and hours, not read
  same.calendar_hours = 5;
  same.events.push_back(OilEvent{});
  auto* bytes = reinterpret_cast<unsigned char*>(&same.fuel);  // the padding after the enum
  for (std::size_t i = sizeof(CombustionReference); i < sizeof(double); ++i) bytes[offsetof(FuelGas, combustion) + i] = 0xa5;
  CHECK(detail::same_operating_state(base, same));
  Segment longer = base;
  longer.hours = 3;  // no starts: 0 starts per hour either way
  CHECK(detail::same_operating_state(base, longer));
  Segment two = base, four = base;
  two.starts = 2, two.hours = 1, four.starts = 4, four.hours = 2;  // 2 starts an hour both
  CHECK(detail::same_operating_state(two, four));
  Segment idle = base;
  idle.hours = 0, idle.starts = 3;  // no running hours: 0 starts per hour, as segment_rates takes it
  CHECK(detail::same_operating_state(base, idle));
}

TEST_CASE("a run's totals of hours and starts are the sums of its segments'") {
  // segments run in one step each (no detection steps, no output interval): the totals are the plain
  // sums in record order, bit for bit (calendar hours default to the running hours)
  std::mt19937_64 rng(77);
  std::uniform_real_distribution<double> u(0, 1);
  std::vector<Segment> rec;
  double engine = 0, calendar = 0, starts = 0;
  for (int i = 0; i < 500; ++i) {
    Segment s = hours(0.1 + 3 * u(rng));
    if (i % 3 == 0) s.calendar_hours = s.hours * (1 + u(rng));
    if (i % 4 == 0) s.starts = std::floor(2 * s.hours * u(rng));  // at most 2 an hour
    rec.push_back(s);
    engine += s.hours;
    calendar += s.calendar_hours < 0 ? s.hours : s.calendar_hours;
    starts += s.starts;
  }
  RunOptions o;
  o.detection_step = 0;
  const RunResult r = simulate(sanity_charge(), {}, rec, o);
  CHECK(r.engine_hours == engine);
  CHECK(r.calendar_hours == calendar);
  CHECK(r.starts == starts);
  // in detection steps of 0.7 h the same totals to rounding (each step adds its share)
  o.detection_step = 0.7;
  const RunResult d = simulate(sanity_charge(), {}, rec, o);
  CHECK(d.calendar_hours == doctest::Approx(calendar).epsilon(1e-12));
  CHECK(d.starts == doctest::Approx(starts).epsilon(1e-12));
}

TEST_CASE("every trajectory point holds its state's readings and the run's counts at that point") {
  // the readings of each point against the reading functions of its own state (docs/model.md §9's
  // lab readings), bit for bit; hours and starts at the point against the sums over the segments before it
  std::vector<Segment> rec;
  for (int i = 0; i < 300; ++i) {
    Segment s = hours(1.0 + i % 3, 200 + 2 * i);
    s.starts = i % 5 == 0 ? 1 : 0;
    if (i == 150) s.events.push_back(OilEvent{OilEvent::Kind::oil_change, -1});
    rec.push_back(s);
  }
  const OilCharge c = sanity_charge();
  RunOptions o;
  o.detection_step = 0;
  const RunResult r = simulate(c, {}, rec, o);
  REQUIRE(r.trajectory.size() == rec.size() + 2);  // the start, an oil change, every segment end
  double engine = 0, starts = 0;
  int charge = 0;
  std::size_t p = 1, wrong = 0;
  for (const Segment& s : rec) {
    if (!s.events.empty()) ++charge, ++p;  // the point at the change
    engine += s.hours, starts += s.starts;
    const TrajectoryPoint& t = r.trajectory[p++];
    wrong += t.engine_hours != engine || t.calendar_hours != engine || t.starts != starts || t.charge != charge ||
             t.tbn_d2896 != tbn(t.state, c.oil, BaseNumberMethod::d2896) ||
             t.tbn_d4739 != tbn(t.state, c.oil, BaseNumberMethod::d4739) || t.tan != acidload::tan(t.state, c.oil) ||
             t.san != san(t.state) || t.viscosity_rise != viscosity_rise(t.state, c.oil);
  }
  CHECK(wrong == 0);
  CHECK(r.trajectory.front().tbn_d4739 == tbn(r.initial, c.oil, BaseNumberMethod::d4739));
}

TEST_CASE("simulate's limit mask: reached_limits reads every limit as read_limit does") {
  // random states about each threshold (some exactly on it, where >= and > differ), random settings and
  // both TBN methods, an oil with and without additive acidity: bit l of the mask against
  // read_limit(l, ...).reached with every limit enabled, and no bit where a limit is disabled... the
  // mask does not look at `enabled` (simulate masks with the limits it watches), read_limit does
  std::mt19937_64 rng(2026);
  std::uniform_real_distribution<double> u(0, 1);
  std::size_t compared = 0, reached = 0;
  for (int trial = 0; trial < 20000; ++trial) {
    LimitSettings s;
    s.tbn_share_of_fresh = u(rng);
    s.tbn_method = trial % 2 ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
    s.tan_rise = 4 * u(rng);
    s.san = trial % 3 ? 0.0 : u(rng);
    s.oxidation = 40 * u(rng), s.nitration = 40 * u(rng), s.viscosity_rise = 0.4 * u(rng);
    s.antioxidant_remaining = u(rng), s.anti_wear_remaining = u(rng), s.max_hours = 1 + 9999 * u(rng);
    s.enabled.fill(true);
    OilProperties oil;
    oil.fresh_tbn = 3 + 12 * u(rng);
    oil.fresh_tan = trial % 5 ? 3 * u(rng) : 0.0;
    oil.salt_titration_share = u(rng);
    const LimitWatch w = limit_watch(s, oil);
    OilState x = fresh_oil(oil, 500);
    x.base = oil.fresh_tbn * u(rng), x.strong_acid = trial % 2 ? 0.0 : 0.5 * u(rng), x.weak_acid = 3 * u(rng);
    x.salts = 5 * u(rng), x.oxidation = 40 * u(rng), x.nitration = 40 * u(rng);
    x.additive_acidity = oil.fresh_tan * u(rng), x.antioxidant = u(rng);
    double h = 10000 * u(rng);
    switch (trial % 8) {  // on a threshold exactly
      case 0: x.oxidation = s.oxidation; break;
      case 1: x.strong_acid = s.san; break;
      case 2: x.antioxidant = s.antioxidant_remaining; break;
      case 3: h = s.max_hours; break;
      case 4: x.nitration = s.nitration; break;
      case 5: x.base = read_limit(Limit::tbn_fall, s, oil, x, h).limit - oil.weak_base(s.tbn_method); break;
      default: break;
    }
    const std::uint32_t mask = reached_limits(w, x, h);
    for (Limit l : all_limits) {
      const bool bit = (mask >> static_cast<unsigned>(l)) & 1u;
      CHECK(bit == read_limit(l, s, oil, x, h).reached);
      ++compared;
      reached += bit;
    }
  }
  MESSAGE(compared << " readings compared, " << reached << " reached");
  CHECK(reached > compared / 10);  // both outcomes well represented
  CHECK(reached < compared * 9 / 10);
}

TEST_CASE("simulate locates every limit in the segment where the plain readings first find it reached") {
  // random hourly records until several limits are reached; the trajectory's segment ends read with
  // read_limit (the plain path) give, for every enabled limit, the first segment whose end reads
  // reached: simulate's time for that limit must lie in that segment, and a limit never read reached
  // must not be reported
  std::mt19937_64 rng(4242);
  std::uniform_real_distribution<double> u(0, 1);
  RunOptions o;
  o.detection_step = 0;
  for (int trial = 0; trial < 12; ++trial) {
    OilCharge c = sanity_charge();
    c.continuous_makeup = trial % 2 == 0;
    ModelParameters m;
    m.limits.enabled.fill(true);
    m.limits.anti_wear_remaining = 0.5;
    m.limits.max_hours = 900 + 600 * u(rng);
    m.limits.tbn_share_of_fresh = 0.3 + 0.5 * u(rng);
    std::vector<Segment> rec;
    for (int i = 0; i < 1500; ++i) rec.push_back(hours(1.0, 100 + 1200 * u(rng)));
    const RunResult r = simulate(c, m, rec, o);
    const ChargeSummary& cs = r.charges.front();
    for (Limit l : all_limits) {
      double lo = -1, hi = -1;  // the segment of the first reading reached
      for (std::size_t i = 1; i < r.trajectory.size(); ++i)
        if (read_limit(l, m.limits, c.oil, r.trajectory[i].state, r.trajectory[i].oil_hours).reached) {
          lo = r.trajectory[i - 1].oil_hours, hi = r.trajectory[i].oil_hours;
          break;
        }
      const double t = cs.reached_at[static_cast<std::size_t>(l)];
      INFO("trial " << trial << ", limit " << std::string(name(l)) << ": plain segment [" << lo << ", " << hi
                    << "], simulate " << t);
      if (hi < 0) {
        CHECK(t < 0);
      } else {
        CHECK(t >= lo);
        CHECK(t <= hi);
      }
    }
  }
}
