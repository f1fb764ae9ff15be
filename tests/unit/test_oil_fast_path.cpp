// advance()'s one-piece path for the common segment against the general path by pieces, bit for bit.
// The check is the library's own general path (the closed forms per regime, each held to Odeint and
// SciPy in tests/reference): the fast path is only a rewriting of it and must give the same bits.
#include <doctest/doctest.h>

#include <cmath>
#include <cstring>
#include <limits>
#include <random>
#include <string>

#include "acidload/core/error.hpp"
#include "acidload/core/oil.hpp"

using namespace acidload;

namespace {
bool same_bits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }
bool same_state(const OilState& a, const OilState& b) {
  return same_bits(a.mass, b.mass) && same_bits(a.base, b.base) && same_bits(a.strong_acid, b.strong_acid) &&
         same_bits(a.weak_acid, b.weak_acid) && same_bits(a.salts, b.salts) && same_bits(a.oxidation, b.oxidation) &&
         same_bits(a.nitration, b.nitration) && same_bits(a.additive_acidity, b.additive_acidity) &&
         same_bits(a.antioxidant, b.antioxidant);
}
bool same_ledger(const OilLedger& a, const OilLedger& b) {
  return same_bits(a.base_added, b.base_added) && same_bits(a.base_removed, b.base_removed) &&
         same_bits(a.base_consumed, b.base_consumed) && same_bits(a.acid_entered, b.acid_entered) &&
         same_bits(a.acid_removed, b.acid_removed) && same_bits(a.sulfurous_taken_up, b.sulfurous_taken_up);
}

// Random balance constants: floors of zero and up to half the fresh base, additive depletion nil or
// spread over four decades (both tests draw from it in the same order).
OilBalance random_balance(std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u(0.0, 1.0);
  OilBalance k;
  k.fresh_base = 4 + 20 * u(rng);
  k.base_floor = u(rng) < 0.2 ? 0.0 : k.fresh_base * 0.5 * u(rng);
  k.fresh_additive = 2 * u(rng);
  k.additive_depletion = u(rng) < 0.2 ? 0.0 : 1e-5 * std::pow(1e-1 / 1e-5, u(rng));
  k.organic_neutralised_share = u(rng);
  return k;
}
}  // namespace

TEST_CASE("the one-piece path of advance gives the general path's bits on random segments") {
  // Random constants, states and rates with continuous makeup (the only case the one-piece path takes):
  // bases well above, just above and on the floor, antioxidant full, nearly spent, spent (with the
  // depleted factor in use) and running out within the segment, rates that are nil, small and large,
  // segments from a second to 2000 h. Where a switch falls inside, the one-piece path declines and the
  // general path runs in both calls; the count below makes sure most segments are common ones.
  std::mt19937_64 rng(19021);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  auto log_uniform = [&](double lo, double hi) { return lo * std::pow(hi / lo, u(rng)); };
  int common = 0;
  const int n = 20000;
  for (int i = 0; i < n; ++i) {
    const OilBalance k = random_balance(rng);
    OilState s;
    s.mass = log_uniform(50, 5000);
    const double pick = u(rng);
    s.base = pick < 0.1 ? k.base_floor : pick < 0.2 ? k.base_floor * (1 + 1e-12) + 1e-300
                                                    : k.base_floor + (k.fresh_base - k.base_floor) * u(rng);
    s.strong_acid = u(rng) < 0.8 ? 0.0 : u(rng);
    s.weak_acid = 3 * u(rng);
    s.salts = 5 * u(rng);
    s.oxidation = 30 * u(rng);
    s.nitration = 30 * u(rng);
    s.additive_acidity = k.fresh_additive * u(rng);
    const double a = u(rng);
    s.antioxidant = a < 0.2 ? 0.0 : a < 0.3 ? 1e-4 * u(rng) : a < 0.5 ? 1.0 : u(rng);
    OilRates r;
    r.continuous_makeup = true;
    r.consumption = u(rng) < 0.05 ? 0.0 : s.mass * log_uniform(1e-6, 1e-2);
    r.strong_acid = u(rng) < 0.3 ? 0.0 : log_uniform(1e-4, 1e2);
    r.sulfurous_fresh = u(rng) < 0.3 ? 0.0 : log_uniform(1e-4, 1e2);
    r.nitration = u(rng) < 0.1 ? 0.0 : log_uniform(1e-3, 1e3);
    r.oxidation = u(rng) < 0.1 ? 0.0 : log_uniform(1e-4, 1e-1);
    r.organic_acid = u(rng) < 0.1 ? 0.0 : log_uniform(1e-5, 1e-1);
    r.antioxidant_depletion = u(rng) < 0.2 ? 0.0 : log_uniform(1e-6, 1e-1);
    r.depleted_factor = 1 + 9 * u(rng);
    const double hours = log_uniform(3e-4, 2000);

    OilState fast = s, pieces = s;
    OilLedger lf, lp;
    lf.base_added = lp.base_added = 1.5;  // the increments are added to what the ledger holds
    const SegmentOutcome of = advance(fast, k, r, hours, lf);
    const SegmentOutcome op = detail::advance_by_pieces(pieces, k, r, hours, lp);
    const bool ok = same_state(fast, pieces) && same_ledger(lf, lp) && same_bits(of.floor_reached_at, op.floor_reached_at) &&
                    same_bits(of.acid_cleared_at, op.acid_cleared_at) &&
                    same_bits(of.antioxidant_spent_at, op.antioxidant_spent_at) && of.end_regime == op.end_regime;
    if (!ok) {
      MESSAGE("segment " << i << ": hours " << hours << ", base " << s.base << " (floor " << k.base_floor << "), antioxidant "
                         << s.antioxidant << "; base after " << fast.base << " / " << pieces.base);
      REQUIRE(ok);
    }
    if (op.floor_reached_at < 0 && op.antioxidant_spent_at < 0 && op.acid_cleared_at < 0 &&
        op.end_regime == Regime::above_floor)
      ++common;
  }
  MESSAGE(common << " of " << n << " segments without a switch");
  CHECK(common > n / 2);
}

TEST_CASE("advance refuses a bad rate by its name, in a common segment and in one of zero hours") {
  // A zero-hour segment never runs the one-piece path; the rates are checked before either path, so a
  // bad rate is refused with the named check's message (the rate's key) in both. Good rates and no
  // hours leave the state as it was.
  const OilBalance k{10, 2, 1, 1e-3, 0.5};
  OilState s;
  s.mass = 500, s.base = 8, s.antioxidant = 1;
  OilRates r;
  r.consumption = 0.1;
  OilLedger l;
  OilState x = s;
  const SegmentOutcome o = advance(x, k, r, 0.0, l);
  CHECK(same_state(x, s));
  CHECK(o.end_regime == Regime::above_floor);
  r.sulfurous_fresh = -1;
  CHECK_THROWS_WITH_AS(advance(x, k, r, 1.0, l), doctest::Contains("rates.sulfurous"), InputError);
  CHECK_THROWS_WITH_AS(advance(x, k, r, 0.0, l), doctest::Contains("rates.sulfurous"), InputError);
}

TEST_CASE("advance refuses exactly the rates the named checks refuse: every field, every kind of bad value") {
  // The rates are screened at once (one predicate for all) before the named checks run; each field takes
  // each value below, and advance must refuse it exactly when the field's own rule (finite and not
  // negative; the depleted factor within [1, 100]) does, naming that field.
  const OilBalance k{10, 2, 1, 1e-3, 0.5};
  OilState s;
  s.mass = 500, s.base = 8, s.antioxidant = 1;
  const double inf = std::numeric_limits<double>::infinity(), nan = std::numeric_limits<double>::quiet_NaN();
  const double big = std::numeric_limits<double>::max();
  const double values[] = {0.0, -0.0, 1e-300, 1.0, 99.999, 100.0, std::nextafter(100.0, 200.0), 0.5,
                           std::nextafter(1.0, 0.0), big, inf, -inf, nan, -1e-300, -1.0};
  struct Field {
    double OilRates::*p;
    const char* key;
    bool factor;
  };
  const Field fields[] = {{&OilRates::strong_acid, "rates.strong-acid", false},
                          {&OilRates::sulfurous_fresh, "rates.sulfurous", false},
                          {&OilRates::nitration, "rates.nitration", false},
                          {&OilRates::oxidation, "rates.oxidation", false},
                          {&OilRates::organic_acid, "rates.organic-acid", false},
                          {&OilRates::antioxidant_depletion, "rates.antioxidant-depletion", false},
                          {&OilRates::depleted_factor, "rates.depleted-factor", true},
                          {&OilRates::consumption, "oil consumption", false}};
  for (const Field& f : fields)
    for (double v : values) {
      OilRates r;
      r.consumption = 0.1, r.depleted_factor = 2;
      r.*f.p = v;
      const bool bad = f.factor ? !(v >= 1.0 && v <= 100.0) : !(v >= 0 && v <= big);
      OilState x = s;
      OilLedger l;
      INFO(f.key << " = " << v);
      if (bad) {
        CHECK_THROWS_WITH_AS(advance(x, k, r, 1.0, l), doctest::Contains(f.key), InputError);
      } else {
        // a huge rate may be refused later for what it does to the oil, never for being a bad rate
        try {
          advance(x, k, r, 1.0, l);
        } catch (const std::exception& e) {
          CHECK(std::string(e.what()).find(f.key) == std::string::npos);
        }
      }
    }
}

TEST_CASE("advance with a step memo gives advance's bits over runs of segments, repeated and changing") {
  // The memo keeps the one-piece step's coefficients while the mass, the hours and whether the
  // antioxidant is out repeat; it must never change a bit. Runs of segments on one set of rates, with
  // the hours repeating or changing, the antioxidant running out part-way, and the mass changing (no
  // makeup, so the oil falls), are advanced twice: without a memo and with one memo per rates; the
  // memo is cleared whenever the rates are drawn anew, as the timeline's rate cache does.
  std::mt19937_64 rng(19022);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  auto log_uniform = [&](double lo, double hi) { return lo * std::pow(hi / lo, u(rng)); };
  int reused = 0;
  for (int run = 0; run < 2000; ++run) {
    const OilBalance k = random_balance(rng);
    OilState s;
    s.mass = log_uniform(50, 5000);
    s.base = k.base_floor + (k.fresh_base - k.base_floor) * u(rng);
    s.weak_acid = 3 * u(rng);
    s.salts = 5 * u(rng);
    s.additive_acidity = k.fresh_additive * u(rng);
    s.antioxidant = u(rng) < 0.3 ? 1e-3 * u(rng) : u(rng);
    OilState plain = s, memoised = s;
    OilLedger lp, lm;
    StepMemo memo;
    OilRates r;
    for (int seg = 0; seg < 60; ++seg) {
      if (seg % 20 == 0) {  // new rates: the memo is cleared
        r = OilRates{};
        r.continuous_makeup = u(rng) < 0.8;
        r.consumption = plain.mass * log_uniform(1e-6, 1e-3);
        r.strong_acid = u(rng) < 0.3 ? 0.0 : log_uniform(1e-4, 1e1);
        r.sulfurous_fresh = u(rng) < 0.3 ? 0.0 : log_uniform(1e-4, 1e1);
        r.nitration = log_uniform(1e-3, 1e2);
        r.oxidation = log_uniform(1e-4, 1e-2);
        r.organic_acid = log_uniform(1e-5, 1e-2);
        r.antioxidant_depletion = log_uniform(1e-5, 1e-1);
        r.depleted_factor = 1 + 9 * u(rng);
        memo.clear();
      }
      const double hours = u(rng) < 0.7 ? 1.0 : log_uniform(1e-2, 50);
      const SegmentOutcome op = advance(plain, k, r, hours, lp);
      const bool was_filled = memo.filled;
      const double memo_mass = memo.mass, memo_hours = memo.hours, mass_before = memoised.mass;
      const SegmentOutcome om = advance(memoised, k, r, hours, lm, memo);
      if (was_filled && memo_mass == mass_before && memo_hours == hours) ++reused;
      const bool ok = same_state(plain, memoised) && same_ledger(lp, lm) &&
                      same_bits(op.floor_reached_at, om.floor_reached_at) &&
                      same_bits(op.acid_cleared_at, om.acid_cleared_at) &&
                      same_bits(op.antioxidant_spent_at, om.antioxidant_spent_at) && op.end_regime == om.end_regime;
      if (!ok) {
        MESSAGE("run " << run << ", segment " << seg << ": hours " << hours << ", base " << plain.base << " / "
                       << memoised.base);
        REQUIRE(ok);
      }
    }
  }
  MESSAGE(reused << " segments found their coefficients in the memo");
  CHECK(reused > 20000);
}
