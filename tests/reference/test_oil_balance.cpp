// The oil balance against an independent integration of the same equations (Boost.Odeint,
// Dormand–Prince 5(4) with dense output, tolerances 1e-13), written here in absolute amounts
// (g KOH, A/cm·kg) rather than the library's concentrations, with its own event handling.
#include "../support/reference_check.hpp"

#include <array>
#include <boost/numeric/odeint.hpp>
#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "acidload/core/oil.hpp"

using namespace acidload;
namespace odeint = boost::numeric::odeint;

namespace {

// ---- the reference model ---------------------------------------------------------------
// x = {M, B, S, W, C, O, N, T, A}: mass [kg] and amounts b·M, s·M, a_w·M, c_n·M, o·M, n·M, t_add·M and
// the antioxidant reserve A·M (A as a share of fresh; zero-order use k_A·M while any is left).
using Vec = std::array<double, 9>;
enum class Mode { above, floor_acid, floor_weak };

struct Reference {
  OilBalance k;
  OilRates r;

  double makeup_base() const { return r.continuous_makeup ? r.consumption * (k.fresh_base - k.base_floor) : 0; }

  // once the reserve is spent, radicals the makeup's antioxidant (k = c/M per h of fresh reserve) cannot
  // intercept oxidise at m times the protected rate: factor m − (m − 1)·min(1, k/k_A)
  double factor(bool spent, const Vec& x) const {
    if (!spent) return 1;
    const double km = r.continuous_makeup ? r.consumption / x[0] : 0;
    return r.depleted_factor - (r.depleted_factor - 1) * std::fmin(1.0, km / r.antioxidant_depletion);
  }
  bool spent_of(const Vec& x) const {
    const double km = r.continuous_makeup ? r.consumption / x[0] : 0;
    return x[8] <= 0 && r.antioxidant_depletion > km;
  }

  void rhs(Mode mode, bool spent, const Vec& x, Vec& d) const {
    const double M = x[0], c = r.consumption, bmin = k.base_floor, phi = k.organic_neutralised_share;
    const bool cont = r.continuous_makeup;
    const double f = factor(spent, x);
    const double rw = r.organic_acid * f, R = r.strong_acid, Bmk = makeup_base();
    const double l1 = r.sulfurous_fresh / (k.fresh_base - bmin);
    d[0] = cont ? 0 : -c;
    d[5] = r.oxidation * f * M - c * x[5] / M;
    d[8] = spent ? 0 : -r.antioxidant_depletion * M - c * x[8] / M + (cont ? c : 0);
    d[6] = r.nitration - c * x[6] / M;
    d[7] = -k.additive_depletion * x[7] - c * x[7] / M + (cont ? c * k.fresh_additive : 0);
    switch (mode) {
      case Mode::above: {
        const double so2 = l1 * (x[1] / M - bmin);
        d[1] = -R - phi * rw * M - so2 - c * x[1] / M + (cont ? c * k.fresh_base : 0);
        d[2] = 0;
        d[3] = (1 - phi) * rw * M - c * x[3] / M;
        d[4] = R + phi * rw * M + so2 - c * x[4] / M;
        break;
      }
      case Mode::floor_acid:
        d[1] = cont ? 0 : -c * bmin;
        d[2] = R - Bmk - c * x[2] / M;
        d[3] = rw * M - c * x[3] / M;
        d[4] = Bmk - c * x[4] / M;
        break;
      case Mode::floor_weak:
        d[1] = cont ? 0 : -c * bmin;
        d[2] = 0;
        d[3] = rw * M - (Bmk - R) - c * x[3] / M;
        d[4] = Bmk - c * x[4] / M;
        break;
    }
  }
  Mode mode_of(const Vec& x) const {
    if (x[1] / x[0] > k.base_floor * (1 + 1e-12)) return Mode::above;
    if (x[2] > 1e-14 * x[0] || r.strong_acid > makeup_base()) return Mode::floor_acid;
    if (makeup_base() - r.strong_acid < k.organic_neutralised_share * r.organic_acid * factor(spent_of(x), x) * x[0])
      return Mode::floor_weak;
    return Mode::above;
  }
  // the quantity whose zero ends a mode
  double switch_function(Mode m, const Vec& x) const {
    return m == Mode::above ? x[1] / x[0] - k.base_floor : x[2];
  }
};

// Integrates over `hours`, switching modes at located zeros. Returns the base switch times; the
// times the antioxidant ran out go to `spent_times` when given.
std::vector<double> integrate(const Reference& ref, Vec& x, double hours, std::vector<double>* spent_times = nullptr) {
  std::vector<double> switches;
  double t = 0;
  while (t < hours) {
    const Mode mode = ref.mode_of(x);
    const bool spent = ref.spent_of(x);
    if (mode == Mode::floor_acid) x[1] = ref.k.base_floor * x[0];
    if (mode == Mode::floor_weak) x[1] = ref.k.base_floor * x[0], x[2] = 0;
    if (spent) x[8] = 0;
    auto sys = [&](const Vec& y, Vec& d, double) { ref.rhs(mode, spent, y, d); };
    auto stepper = odeint::make_dense_output(1e-13, 1e-13, odeint::runge_kutta_dopri5<Vec>());
    stepper.initialize(x, t, std::min(1.0, hours - t));
    bool switched = false;
    const bool can_switch = mode == Mode::above || (mode == Mode::floor_acid && x[2] > 0);
    const bool can_spend = !spent && x[8] > 0 && ref.r.antioxidant_depletion > 0;
    while (stepper.current_time() < hours) {
      stepper.do_step(sys);
      double t1 = std::min(stepper.current_time(), hours);
      Vec y;
      stepper.calc_state(t1, y);
      const bool base_switch = can_switch && ref.switch_function(mode, y) < 0;
      const bool ao_switch = can_spend && y[8] < 0;
      if (base_switch || ao_switch) {
        // bisection on the dense output for each zero; the earlier one ends the mode
        const auto locate = [&](auto below) {
          double lo = stepper.previous_time(), hi = t1;
          for (int i = 0; i < 200 && hi - lo > 1e-13 * hi; ++i) {
            const double mid = 0.5 * (lo + hi);
            Vec z;
            stepper.calc_state(mid, z);
            (below(z) ? hi : lo) = mid;
          }
          return hi;
        };
        const double tb = base_switch ? locate([&](const Vec& z) { return ref.switch_function(mode, z) < 0; }) : hours * 2;
        const double ta = ao_switch ? locate([](const Vec& z) { return z[8] < 0; }) : hours * 2;
        const double hi = std::fmin(tb, ta);
        stepper.calc_state(hi, x);
        t = hi;
        if (tb <= ta) {
          switches.push_back(hi);
          if (mode == Mode::above) x[1] = ref.k.base_floor * x[0]; else x[2] = 0;
        } else {
          if (spent_times) spent_times->push_back(hi);
          x[8] = 0;
        }
        switched = true;
        break;
      }
      if (t1 >= hours) {
        x = y;
        t = hours;
        break;
      }
    }
    if (!switched) t = hours;
  }
  return switches;
}

Vec amounts(const OilState& s) {
  return {s.mass, s.base * s.mass, s.strong_acid * s.mass, s.weak_acid * s.mass, s.salts * s.mass,
          s.oxidation * s.mass, s.nitration * s.mass, s.additive_acidity * s.mass, s.antioxidant * s.mass};
}

double worst_seen = 0;  // the largest scaled deviation of any check_close, for the validation table

void check_close(const OilState& lib, const Vec& ref, double rel) {
  const Vec a = amounts(lib);
  const char* names[] = {"mass", "base", "strong acid", "weak acid", "salts", "oxidation", "nitration", "additive",
                         "antioxidant"};
  for (int i = 0; i < 9; ++i) {
    const double scale = std::fmax(std::fabs(ref[i]), 1.0 * ref[0] * (i == 0 ? 0 : 1e-2));  // 0.01 mg KOH/g of oil floor
    const std::string what = std::string(names[i]) + ": acidload " + std::to_string(a[i] / lib.mass) +
                             ", reference " + std::to_string(ref[i] / ref[0]) + " (per kg of oil)";
    INFO(what);
    CHECK(std::fabs(a[i] - ref[i]) <= rel * std::fmax(scale, 1e-300));
    worst_seen = std::fmax(worst_seen, std::fabs(a[i] - ref[i]) / std::fmax(scale, 1e-300));
  }
}

OilProperties test_oil() {
  OilProperties o;
  o.fresh_tbn = 6.0;
  o.additive_depletion = 2e-4;
  return o;
}

OilRates rates(double strong, double so2, bool continuous = true, double consumption = 0.2) {
  OilRates r;
  r.strong_acid = strong;
  r.sulfurous_fresh = so2;
  r.nitration = 0.004 * 528;
  r.oxidation = 0.007;
  r.organic_acid = 0.08 * 0.007;
  r.consumption = consumption;
  r.continuous_makeup = continuous;
  return r;
}

// Reference events, in amounts.
void ref_top_up(Vec& x, const OilProperties& oil, const OilBalance& k, double dm) {
  x[0] += dm;
  x[1] += dm * k.fresh_base;
  x[7] += dm * oil.fresh_tan;
  x[8] += dm;  // fresh oil brings its full antioxidant reserve
  const double avail = x[1] - k.base_floor * x[0];
  if (x[2] > 0 && avail > 0) {
    const double d = std::fmin(x[2], avail);
    x[2] -= d, x[1] -= d, x[4] += d;
  }
}
void ref_oil_change(Vec& x, const OilProperties& oil, const OilBalance& k, double residual, double full) {
  const double keep = residual * full / x[0];
  for (double& v : x) v *= keep;
  ref_top_up(x, oil, k, full - x[0]);
}

struct Ledgers {
  double base_start, free_start;
};

void check_ledgers(const OilState& start, const OilState& end, const OilLedger& l) {
  // base: start + added − removed − consumed = now; acid: entered = consumed + free now − free at start + removed
  const double b0 = start.base * start.mass, b1 = end.base * end.mass;
  const double scale_b = std::fmax(std::fmax(b0, l.base_added), l.base_consumed);
  INFO("base ledger: start " << b0 << " added " << l.base_added << " removed " << l.base_removed << " consumed " << l.base_consumed << " now " << b1);
  CHECK(std::fabs(b0 + l.base_added - l.base_removed - l.base_consumed - b1) <= 1e-9 * scale_b);
  const double f0 = (start.strong_acid + start.weak_acid) * start.mass, f1 = (end.strong_acid + end.weak_acid) * end.mass;
  const double scale_a = std::fmax(l.acid_entered, 1.0);
  INFO("acid ledger: entered " << l.acid_entered << " consumed " << l.base_consumed << " free " << f0 << " -> " << f1 << " removed " << l.acid_removed);
  CHECK(std::fabs(l.acid_entered - (l.base_consumed + f1 - f0 + l.acid_removed)) <= 1e-9 * scale_a);
}

}  // namespace

TEST_CASE("continuous makeup: floor crossing, SAN build-up, recovery, oil change — vs Odeint") {
  worst_seen = 0;
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  OilState s = fresh_oil(oil, 528);
  const OilState start = s;
  Vec x = amounts(s);
  OilLedger ledger;
  struct Step { double hours; OilRates r; };
  const Step steps[] = {{400, rates(4.0, 0.5)},   // heavy acid: the base falls
                        {600, rates(4.0, 0.5)},   // reaches the floor inside; SAN builds up
                        {1500, rates(0.3, 0.1)},  // scrubber fitted: SAN neutralised, base recovers
                        {300, rates(0.8, 0.1)}};  // acid just under the makeup base: organic acid limits
  double ref_crossing = -1, lib_crossing = -1, elapsed = 0;
  for (const auto& st : steps) {
    const SegmentOutcome out = advance(s, k, st.r, st.hours, ledger);
    const auto sw = integrate(Reference{k, st.r}, x, st.hours);
    if (out.floor_reached_at >= 0 && lib_crossing < 0) lib_crossing = elapsed + out.floor_reached_at;
    if (!sw.empty() && ref_crossing < 0) ref_crossing = elapsed + sw.front();
    elapsed += st.hours;
    check_close(s, x, 1e-7);
  }
  REQUIRE(lib_crossing > 0);
  INFO("floor crossing: acidload " << lib_crossing << " h, bisection on the integrator " << ref_crossing << " h");
  CHECK(std::fabs(lib_crossing - ref_crossing) <= 1e-7 * ref_crossing);
  check_ledgers(start, s, ledger);
  // oil change with a 10 % residual, then another stretch
  const OilState before_change = s;
  OilLedger l2;
  oil_change(s, oil, 0.1, 528, l2);
  ref_oil_change(x, oil, k, 0.1, 528);
  advance(s, k, rates(4.0, 0.5), 900, l2);
  integrate(Reference{k, rates(4.0, 0.5)}, x, 900);
  check_close(s, x, 1e-7);
  check_ledgers(before_change, s, l2);
  REFERENCE_CHECK("oil balance, continuous makeup, floor, SAN, recovery, oil change (worst scaled deviation)", worst_seen,
                  0.0, absolute, 1e-7, "rel", "Boost.Odeint Dormand-Prince, tol 1e-13, amounts form");
}

TEST_CASE("discrete top-ups: falling level, floor crossing and SAN between top-ups — vs Odeint") {
  worst_seen = 0;
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  OilState s = fresh_oil(oil, 528);
  const OilState start = s;
  Vec x = amounts(s);
  OilLedger ledger;
  const OilRates r = rates(4.0, 0.6, false, 0.25);
  double lib_crossing = -1, ref_crossing = -1, elapsed = 0;
  for (int i = 0; i < 8; ++i) {
    const SegmentOutcome out = advance(s, k, r, 150, ledger);
    const auto sw = integrate(Reference{k, r}, x, 150);
    if (out.floor_reached_at >= 0 && lib_crossing < 0) lib_crossing = elapsed + out.floor_reached_at;
    if (!sw.empty() && ref_crossing < 0) ref_crossing = elapsed + sw.front();
    elapsed += 150;
    check_close(s, x, 1e-7);
    const double dm = 528 - s.mass;  // top up to the full charge
    top_up(s, oil, dm, ledger);
    ref_top_up(x, oil, k, dm);
    check_close(s, x, 1e-7);
  }
  REQUIRE(lib_crossing > 0);
  CHECK(s.strong_acid > 0);
  CHECK(std::fabs(lib_crossing - ref_crossing) <= 1e-7 * ref_crossing);
  check_ledgers(start, s, ledger);
  REFERENCE_CHECK("oil balance, discrete top-ups, floor, SAN (worst scaled deviation)", worst_seen, 0.0, absolute, 1e-7,
                  "rel", "Boost.Odeint Dormand-Prince, tol 1e-13, amounts form");
  REFERENCE_CHECK("floor crossing time, top-ups", lib_crossing, ref_crossing, relative, 1e-7, "h",
                  "bisection on the Odeint dense output");
}

TEST_CASE("one 1000 h segment equals 1000 one-hour segments to 1e-10") {
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  for (bool continuous : {true, false}) {
    const OilRates r = rates(4.0, 0.5, continuous, continuous ? 0.2 : 0.1);
    OilState one = fresh_oil(oil, 528), many = one;
    OilLedger l1, l2;
    advance(one, k, r, 1000, l1);
    for (int i = 0; i < 1000; ++i) advance(many, k, r, 1, l2);
    INFO("continuous makeup: " << continuous);
    const Vec a = amounts(one), b = amounts(many);
    for (int i = 0; i < 8; ++i) CHECK(std::fabs(a[i] - b[i]) <= 1e-10 * std::fmax(std::fabs(a[i]), 528 * 1e-2));
    CHECK(one.strong_acid > 0);  // the run crossed the floor
    CHECK(std::fabs(l1.base_consumed - l2.base_consumed) <= 1e-10 * l1.base_consumed);
  }
}

TEST_CASE("hand check: no makeup, no oxidation — TBN falls linearly at the stoichiometric rate") {
  OilProperties oil = test_oil();
  oil.additive_depletion = 0;
  const OilBalance k = balance_constants(oil);
  // 0.01 mol/h of H2SO4: 2 × 0.01 × 56.1056 g KOH/mol = 1.122112 g KOH/h (IUPAC masses; hand arithmetic)
  OilRates r;
  r.strong_acid = 2 * 0.01 * (39.0983 + 15.9994 + 1.00794);
  r.consumption = 0;
  OilState s = fresh_oil(oil, 500);
  OilLedger l;
  advance(s, k, r, 1000, l);
  // b(t) = b0 − R t / M = 5.4 − 1.12211 × 1000 / 500 = 3.15578 mg KOH/g
  CHECK(s.base == doctest::Approx(5.4 - r.strong_acid * 1000 / 500).epsilon(1e-13));
  CHECK(tbn(s, oil, BaseNumberMethod::d2896) == doctest::Approx(6.0 - 2.244224).epsilon(1e-6));
}

TEST_CASE("hand check: the closed-form steady state under continuous makeup") {
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  const OilRates r = rates(0.3, 0.4);
  const double M = 528, km = r.consumption / M, l1 = r.sulfurous_fresh / (k.fresh_base - k.base_floor);
  const double phi = k.organic_neutralised_share;
  // db/dt = 0: b∞ = (k b_f − φ r_w − R/M + l1 b_min/M) / (k + l1/M)
  const double b_inf = (km * k.fresh_base - phi * r.organic_acid - r.strong_acid / M + l1 * k.base_floor / M) / (km + l1 / M);
  REQUIRE(b_inf > k.base_floor);
  const OilState ss = steady_state(fresh_oil(oil, M), k, r);
  CHECK(ss.base == doctest::Approx(b_inf).epsilon(1e-12));
  CHECK(ss.oxidation == doctest::Approx(r.oxidation / km).epsilon(1e-12));
  CHECK(ss.weak_acid == doctest::Approx((1 - phi) * r.organic_acid / km).epsilon(1e-12));
  CHECK(ss.nitration == doctest::Approx(r.nitration / M / km).epsilon(1e-12));
  CHECK(ss.additive_acidity == doctest::Approx(km * oil.fresh_tan / (km + oil.additive_depletion)).epsilon(1e-12));
  CHECK(ss.strong_acid == 0);
  // above the floor: salts = (b_f − b∞) (base + salts relaxes to b_f)
  CHECK(ss.salts == doctest::Approx(k.fresh_base - b_inf).epsilon(1e-10));
}

TEST_CASE("hand check: at the floor, free acid settles at (R − makeup base)/consumption") {
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  const OilRates r = rates(4.0, 0.5);
  const OilState ss = steady_state(fresh_oil(oil, 528), k, r);
  CHECK(ss.base == k.base_floor);
  CHECK(ss.strong_acid == doctest::Approx((r.strong_acid - r.consumption * (k.fresh_base - k.base_floor)) / r.consumption).epsilon(1e-12));
}

TEST_CASE("numerical helpers of the closed forms") {
  using detail::divided_expm1_over_x;
  using detail::expm1_over_x;
  CHECK(expm1_over_x(0) == 1);
  CHECK(expm1_over_x(1e-20) == 1);
  CHECK(expm1_over_x(1) == doctest::Approx(std::exp(1.0) - 1).epsilon(1e-15));
  // divided differences: continuous across the switch between direct and series forms
  for (double x : {-30.0, -3.0, -0.5, 0.0, 0.7, 4.0})
    for (double d : {0.5, 2e-2, 1.0001e-2, 0.9999e-2, 1e-4, 1e-9, 0.0}) {
      const double series = divided_expm1_over_x(x + d, x);
      // reference: ∫₀¹ u e^{(x + θ d) u} du averaged over θ ∈ [0,1], by Gauss–Legendre in θ and u
      const double gl_x[] = {-0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498,
                             0.1834346424956498,  0.5255324099163290,  0.7966664774136267,  0.9602898564975363};
      const double gl_w[] = {0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620,
                             0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763};
      double ref = 0;
      for (int i = 0; i < 8; ++i)
        for (int j = 0; j < 8; ++j) {
          const double th = 0.5 * (gl_x[i] + 1), u = 0.5 * (gl_x[j] + 1);
          ref += 0.25 * gl_w[i] * gl_w[j] * u * std::exp((x + th * d) * u);
        }
      INFO("x " << x << " d " << d);
      if (std::fabs(x) <= 4) CHECK(series == doctest::Approx(ref).epsilon(1e-11));
    }
}

namespace {
// Distance of a from b in units in the last place of b.
double ulps(double a, double b) {
  const double m = std::fabs(b);
  return std::fabs(a - b) / (std::nextafter(m, HUGE_VAL) - m);
}
}  // namespace

TEST_CASE("E and phi2 against mpmath") {
  // {x, E(x) = (e^x − 1)/x, φ2(x) = (x − 1 + e^−x)/x²}: mpmath at 60 digits or more
  // (tests/reference/python/series_table.py prints these lines; tests/python/test_series_table.py
  // holds them to its output). Around both switches of the series (|x| = 2⁻⁶ and 0.1) and far out.
  struct Row {
    double x, E, phi2;
  };
  static const Row rows[] = {
    // series-table:begin
    {0.0, 1.0, 5.0e-1},
    {1e-300, 1.0, 5.0e-1},
    {-1e-300, 1.0, 5.0e-1},
    {1e-12, 1.0000000000005, 4.999999999998333333333e-1},
    {-1e-12, 9.999999999995e-1, 5.000000000001666666667e-1},
    {1e-08, 1.000000005000000016667, 4.999999983333333375e-1},
    {-1e-08, 9.999999950000000166667e-1, 5.000000016666666708333e-1},
    {1e-05, 1.000005000016666708334, 4.999983333374999916665e-1},
    {-1e-05, 9.999950000166666249997e-1, 5.000016666708333416668e-1},
    {0.00012, 1.00006000240007200173, 4.999800005999856002875e-1},
    {-0.00012, 9.999400023999280017264e-1, 5.000200006000144002885e-1},
    {0.00031, 1.000155016017908035297, 4.999483373372517544928e-1},
    {-0.00031, 9.998450160154254519561e-1, 5.000516706710816044939e-1},
    {0.00077, 1.000385098835691804776, 4.998716913670293798564e-1},
    {-0.00077, 9.996150987976473873977e-1, 5.001283580413049299503e-1},
    {0.0009765625, 1.000488440234532088674, 4.998372793120034251495e-1},
    {-0.0009765625, 9.995118776569218716551e-1, 5.001628001608588017455e-1},
    {0.0023, 1.001150882173858290237, 4.996168869819805207118e-1},
    {-0.0023, 9.988508811599414448218e-1, 5.003835538514305462399e-1},
    {0.0061, 1.003056211135758275095, 4.989848818604130255652e-1},
    {-0.0061, 9.969561922206514803509e-1, 5.010182189767663772686e-1},
    {0.0078125, 1.003916442425341144762, 4.987004558297023436755e-1},
    {-0.0078125, 9.9610390268883045044e-1, 5.013046304436665295431e-1},
    {0.011, 1.00552022224723236694, 4.981716972619694783151e-1},
    {-0.011, 9.945201113301183360566e-1, 5.018383861120333873367e-1},
    {0.015624999999999998, 1.00785334954788783647, 4.974059741528309229931e-1},
    {-0.015624999999999998, 9.922280316538620176911e-1, 5.026143710648215898683e-1},
    {0.015625, 1.007853349547887837346, 4.974059741528309227062e-1},
    {-0.015625, 9.922280316538620168327e-1, 5.026143710648215901597e-1},
    {0.0157, 1.007891243419847157902, 4.973935715850879406e-1},
    {-0.0157, 9.921909209261141199897e-1, 5.026269694170164692037e-1},
    {0.02, 1.010067001337790508218, 4.966832668882555519666e-1},
    {-0.02, 9.900663346622348887539e-1, 5.033500668895254004299e-1},
    {0.05, 1.025421927520480795385, 4.917698002856036361189e-1},
    {-0.05, 9.754115099857198168291e-1, 5.084385504096158794814e-1},
    {0.09999999999999999, 1.051709180756476243665, 4.837418035959573177453e-1},
    {-0.09999999999999999, 9.516258196404042722534e-1, 5.170918075647624797115e-1},
    {0.1, 1.051709180756476251085, 4.837418035959573155446e-1},
    {-0.1, 9.516258196404042657602e-1, 5.170918075647624821436e-1},
    {0.3, 1.166196025253343673149, 4.535357853524207356726e-1},
    {-0.3, 8.639392643942737843335e-1, 5.53986750844478930998e-1},
    {1.0, 1.71828182845904523536, 3.678794411714423215955e-1},
    {-1.0, 6.321205588285576784045e-1, 7.182818284590452353603e-1},
    {4.0, 1.339953750828605976953e+1, 1.886447274305458862684e-1},
    {-4.0, 2.454210902778164549266e-1, 3.099884377071514942382},
    {30.0, 3.562158193841154048997e+11, 3.222222222222232619581e-2},
    {-30.0, 3.333333333333021412568e-2, 1.187386064610384682999e+10},
    // series-table:end
  };
  for (const Row& r : rows) {
    INFO("x = " << r.x);
    const double E = detail::expm1_over_x(r.x), p = detail::phi2(r.x);
    // the series (|x| < 2⁻⁶): within an ulp; expm1(x)/x beyond: two roundings, within two
    CHECK(ulps(E, r.E) <= (std::fabs(r.x) < 0x1p-6 ? 1.0 : 2.0));
    // φ2's series (|x| < 0.1) within an ulp; its direct form beyond cancels: at x = 0.1 the numerator is
    // 0.0048 of terms near 1, so a relative 1e-13 (pre-existing; the closed forms use it for segments
    // of more than 0.1/Λ hours only)
    if (std::fabs(r.x) < 0.1)
      CHECK(ulps(p, r.phi2) <= 1.0);
    else
      CHECK(p == doctest::Approx(r.phi2).epsilon(1e-13));
  }
}

TEST_CASE("E's short series against the C library's expm1 in long double") {
  // Reference: expm1l(x)/x in x87 extended precision (64-bit significand: about 1e-19 relative, a
  // thousandth of a double's ulp) at 20 000 arguments log-uniform in 1e-9 ≤ |x| < 2⁻⁶, both signs: the
  // range of the series. Within 0.6 ulp everywhere (0.52 seen), the mean about a quarter of an ulp.
  std::mt19937_64 rng(2026);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  double worst = 0, sum = 0;
  const int n = 20000;
  for (int i = 0; i < n; ++i) {
    const double x = (i % 2 ? -1 : 1) * 1e-9 * std::pow(0x1p-6 / 1e-9, u(rng));
    const long double ref = std::expm1l(static_cast<long double>(x)) / static_cast<long double>(x);
    const double e = detail::expm1_over_x(x);
    const long double m = std::fabs(ref);
    const double d = static_cast<double>(std::fabs(static_cast<long double>(e) - ref) /
                                         static_cast<long double>(std::nextafter(static_cast<double>(m), HUGE_VAL) - static_cast<double>(m)));
    worst = std::fmax(worst, d);
    sum += d;
  }
  MESSAGE("E(x) against expm1l(x)/x: worst " << worst << " ulp, mean " << sum / n);
  CHECK(worst < 0.6);
  CHECK(sum / n < 0.3);
}

TEST_CASE("free acid cleared into the organic-acid-limited floor — vs Odeint") {
  worst_seen = 0;
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  OilState s = steady_state(fresh_oil(oil, 528), k, rates(4.0, 0.5));  // at the floor, SAN > 0
  REQUIRE(s.strong_acid > 0);
  const OilState start = s;
  Vec x = amounts(s);
  OilLedger ledger;
  // acid just below the makeup base (0.88 g KOH/h) but above it with the organic acid share
  const OilRates r = rates(0.8, 0.1);
  const SegmentOutcome out = advance(s, k, r, 12000, ledger);
  const auto sw = integrate(Reference{k, r}, x, 12000);
  REQUIRE(sw.size() == 1);
  CHECK(out.acid_cleared_at == doctest::Approx(sw.front()).epsilon(1e-7));
  CHECK(out.end_regime == Regime::floor_weak);
  CHECK(s.base == k.base_floor);
  CHECK(s.strong_acid == 0);
  check_close(s, x, 1e-7);
  check_ledgers(start, s, ledger);
  REFERENCE_CHECK("oil balance, free acid cleared to the organic-limited floor (worst scaled deviation)", worst_seen, 0.0,
                  absolute, 1e-7, "rel", "Boost.Odeint Dormand-Prince, tol 1e-13, amounts form");
}

TEST_CASE("antioxidant reserve spent inside a segment: induction, then faster oxidation — vs Odeint") {
  worst_seen = 0;
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  double worst_spent = 0;
  for (const bool continuous : {true, false}) {
    OilState s = fresh_oil(oil, 528);
    const OilState start = s;
    Vec x = amounts(s);
    OilLedger ledger;
    OilRates r = rates(continuous ? 1.2 : 0.9, 0.3, continuous, 0.2);
    r.antioxidant_depletion = 1.0 / 900;  // faster than makeup (0.2/528 per h): the reserve runs out
    r.depleted_factor = 6;
    double lib_spent = -1, elapsed = 0;
    std::vector<double> ref_spent;
    for (int i = 0; i < 6; ++i) {
      const SegmentOutcome out = advance(s, k, r, 300, ledger);
      std::vector<double> sp;
      integrate(Reference{k, r}, x, 300, &sp);
      if (out.antioxidant_spent_at >= 0 && lib_spent < 0) lib_spent = elapsed + out.antioxidant_spent_at;
      if (!sp.empty() && ref_spent.empty()) ref_spent.push_back(elapsed + sp.front());
      elapsed += 300;
      check_close(s, x, 1e-7);
      if (!continuous) {
        const double dm = 528 - s.mass;
        top_up(s, oil, dm, ledger);
        ref_top_up(x, oil, k, dm);
        check_close(s, x, 1e-7);
      }
    }
    REQUIRE(lib_spent > 0);
    REQUIRE(!ref_spent.empty());
    INFO("antioxidant spent: acidload " << lib_spent << " h, bisection on the integrator " << ref_spent.front() << " h");
    CHECK(std::fabs(lib_spent - ref_spent.front()) <= 1e-7 * ref_spent.front());
    worst_spent = std::fmax(worst_spent, std::fabs(lib_spent - ref_spent.front()) / ref_spent.front());
    if (continuous) {
      CHECK(s.antioxidant == 0);  // makeup cannot refill it
      CHECK(antioxidant_spent(s, r));
      CHECK(oxidation_rate_now(s, r) > r.oxidation);
    }
    check_ledgers(start, s, ledger);
  }
  REFERENCE_CHECK("oil balance with the antioxidant reserve spent, makeup and top-ups (worst scaled deviation)", worst_seen,
                  0.0, absolute, 1e-7, "rel", "Boost.Odeint Dormand-Prince, tol 1e-13, amounts form");
  REFERENCE_CHECK("time the antioxidant reserve runs out (worst relative deviation)", worst_spent, 0.0, absolute, 1e-7,
                  "rel", "bisection on the Odeint dense output");
}

TEST_CASE("hand check: the antioxidant lasts τ_A without makeup, and its zero-order steady state with makeup") {
  // without makeup the zero-order reserve falls linearly: A = 1 − t/τ_A, spent at exactly τ_A
  // (derived from dA/dt = −1/τ_A); with makeup k < k_A it reaches 0 at t = ln(1 + k/(k_A − k))/k
  // (derived from dA/dt = k − k_A − k·A, A(0) = 1).
  const OilProperties oil = test_oil();
  const OilBalance k = balance_constants(oil);
  OilRates r = rates(0, 0, false, 1e-9);
  r.antioxidant_depletion = 1.0 / 1500;
  OilState s = fresh_oil(oil, 528);
  OilLedger l;
  const SegmentOutcome out = advance(s, k, r, 2000, l);
  REFERENCE_CHECK("induction period without makeup", out.antioxidant_spent_at, 1500.0, relative, 1e-9, "h",
                  "derived: zero-order depletion, A = 1 − t/τ_A");
  OilRates rc = rates(0, 0, true, 0.1);
  rc.antioxidant_depletion = 1.0 / 1500;
  const double km = 0.1 / 528, ka = 1.0 / 1500;
  OilState c = fresh_oil(oil, 528);
  const SegmentOutcome oc = advance(c, k, rc, 5000, l);
  REFERENCE_CHECK("antioxidant spent under makeup", oc.antioxidant_spent_at, std::log1p(km / (ka - km)) / km, relative, 1e-9,
                  "h", "derived: dA/dt = k − k_A − k A, A(0) = 1");
  CHECK(depleted_oxidation_factor(6, km, ka) == doctest::Approx(6 - 5 * km / ka));
  CHECK(depleted_oxidation_factor(6, 2 * ka, ka) == 1);  // makeup outruns the use: fully protected
}
