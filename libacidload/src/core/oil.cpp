#include "acidload/core/oil.hpp"

#include <cmath>
#include <cstddef>
#include <cstring>
#include <limits>
#if defined(__SSE2__)
#include <emmintrin.h>
#endif

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"

namespace acidload {

// ---------------------------------------------------------------------------------------------
// Oil, oxidation and readings

double OilProperties::fresh_reactive_base() const { return fresh_tbn - weak_base(fresh_tbn_method); }

void validate(const OilProperties& o) {
  check::in_range("oil.fresh-tbn", o.fresh_tbn, 0.5, 80.0, "mg KOH/g");
  check::in_range("model.weak-base-d2896", o.weak_base_d2896, 0.0, 10.0, "mg KOH/g");
  check::in_range("model.weak-base-d4739", o.weak_base_d4739, 0.0, 10.0, "mg KOH/g");
  check::in_range("model.base-floor", o.base_floor, 0.0, 40.0, "mg KOH/g");
  if (!(o.fresh_reactive_base() > o.base_floor))
    throw InputError("model.base-floor", format_value(o.base_floor),
                     "a floor below the fresh oil's reactive base (" + format_value(o.fresh_reactive_base()) +
                         " mg KOH/g = fresh TBN less the method's weak base)");
  check::in_range("oil.fresh-tan", o.fresh_tan, 0.0, 20.0, "mg KOH/g");
  check::in_range("model.additive-depletion", o.additive_depletion, 0.0, 1.0, "1/h");
  check::fraction("model.salt-titration-share", o.salt_titration_share);
  check::fraction("model.organic-neutralised-share", o.organic_neutralised_share);
  check::in_range("oil.density", o.density_15, 600.0, 1200.0, "kg/m3");
  check::in_range("oil.viscosity-per-oxidation", o.viscosity_per_oxidation, 0.0, 1.0, "per A/cm");
  check::in_range("oil.viscosity-per-nitration", o.viscosity_per_nitration, 0.0, 1.0, "per A/cm");
}

void validate(const OxidationLaw& l) {
  check::in_range("model.oxidation-rate", l.rate_at_reference, 0.0, 10.0, "A/cm per h");
  check::in_range("model.oxidation-reference-temperature", l.reference_temperature, 273.15, 573.15, "K");
  check::in_range("model.oxidation-doubling-interval", l.doubling_interval, 1.0, 50.0, "K");
  check::in_range("model.activation-energy", l.activation_energy, 1e3, 400e3, "J/mol");
  check::in_range("model.ring-zone-offset", l.ring_zone_offset, 0.0, 150.0, "K");
  check::in_range("model.organic-acid-yield", l.organic_acid_yield, 0.0, 5.0, "mg KOH/g per A/cm");
  check::in_range("model.nitration-yield", l.nitration_yield, 0.0, 1e6, "A/cm per mol/kg");
  check::in_range("model.induction-time", l.induction_hours, 1.0, 1e6, "h");
  check::in_range("model.depleted-oxidation-factor", l.depleted_factor, 1.0, 100.0, "(rate with the antioxidant spent over the protected rate)");
}

double oxidation_temperature_factor(const OxidationLaw& l, double T) {
  check::temperature("ring-zone temperature", T);
  if (l.kind == OxidationLaw::Kind::doubling) return std::exp2((T - l.reference_temperature) / l.doubling_interval);
  return std::exp(-l.activation_energy / constants::molar_gas_constant * (1 / T - 1 / l.reference_temperature));
}

double oxidation_rate(const OxidationLaw& l, double T) { return l.rate_at_reference * oxidation_temperature_factor(l, T); }

double antioxidant_depletion_rate(const OxidationLaw& l, double T) {
  return oxidation_temperature_factor(l, T) / l.induction_hours;
}

namespace {
// f = m − (m − 1)·min(1, k/k_A), inline for the one-piece path; q < 1 ? q : 1 is fmin(1, q) for every
// q (NaN gives 1 as there) without the library call.
inline double depleted_factor_of(double m, double makeup, double depletion) {
  if (depletion <= 0) return 1;
  const double q = makeup / depletion;
  return m - (m - 1) * (q < 1 ? q : 1.0);
}
}  // namespace

double depleted_oxidation_factor(double m, double makeup, double depletion) { return depleted_factor_of(m, makeup, depletion); }

OilState fresh_oil(const OilProperties& oil, double mass) {
  check::positive("oil mass", mass);
  OilState s;
  s.mass = mass;
  s.base = oil.fresh_reactive_base();
  s.additive_acidity = oil.fresh_tan;
  s.antioxidant = 1;
  return s;
}


namespace {
// v ≥ 0 and finite, inline: NaN fails both comparisons, +inf the second.
bool finite_non_negative(double v) { return v >= 0 && v <= std::numeric_limits<double>::max(); }
// Every rate fine: the common case, checked without a call per field; otherwise the named checks below
// find the first bad field and say so, as before.
#if defined(__SSE2__)
// The eight rates lie in declaration order at the struct's start; two compared per instruction: each
// within [0, DBL_MAX] (so NaN and ±inf fail), the depleted factor within [1, 100].
static_assert(offsetof(OilRates, strong_acid) == 0 && offsetof(OilRates, sulfurous_fresh) == 8 &&
                  offsetof(OilRates, nitration) == 16 && offsetof(OilRates, oxidation) == 24 &&
                  offsetof(OilRates, organic_acid) == 32 && offsetof(OilRates, antioxidant_depletion) == 40 &&
                  offsetof(OilRates, depleted_factor) == 48 && offsetof(OilRates, consumption) == 56,
              "rates_fine reads the rates as eight doubles in this order");
bool rates_fine(const OilRates& r) {
  double v[8];
  std::memcpy(v, &r, sizeof v);
  const __m128d zero = _mm_setzero_pd(), big = _mm_set1_pd(std::numeric_limits<double>::max());
  const auto in = [](__m128d x, __m128d lo, __m128d hi) { return _mm_and_pd(_mm_cmpge_pd(x, lo), _mm_cmple_pd(x, hi)); };
  const __m128d ok = _mm_and_pd(_mm_and_pd(in(_mm_loadu_pd(v), zero, big), in(_mm_loadu_pd(v + 2), zero, big)),
                                _mm_and_pd(in(_mm_loadu_pd(v + 4), zero, big),
                                           in(_mm_loadu_pd(v + 6), _mm_set_pd(0.0, 1.0), _mm_set_pd(std::numeric_limits<double>::max(), 100.0))));
  return _mm_movemask_pd(ok) == 3;
}
#else
bool rates_fine(const OilRates& r) {
  return finite_non_negative(r.strong_acid) && finite_non_negative(r.sulfurous_fresh) &&
         finite_non_negative(r.nitration) && finite_non_negative(r.oxidation) && finite_non_negative(r.organic_acid) &&
         finite_non_negative(r.consumption) && finite_non_negative(r.antioxidant_depletion) &&
         r.depleted_factor >= 1.0 && r.depleted_factor <= 100.0;
}
#endif
}  // namespace

void validate(const OilRates& r) {
  if (rates_fine(r)) return;
  check::non_negative("rates.strong-acid", r.strong_acid);
  check::non_negative("rates.sulfurous", r.sulfurous_fresh);
  check::non_negative("rates.nitration", r.nitration);
  check::non_negative("rates.oxidation", r.oxidation);
  check::non_negative("rates.organic-acid", r.organic_acid);
  check::non_negative("oil consumption", r.consumption);
  check::non_negative("rates.antioxidant-depletion", r.antioxidant_depletion);
  check::in_range("rates.depleted-factor", r.depleted_factor, 1.0, 100.0, "");
}

OilBalance balance_constants(const OilProperties& oil) {
  validate(oil);
  return {oil.fresh_reactive_base(), oil.base_floor, oil.fresh_tan, oil.additive_depletion,
          oil.organic_neutralised_share};
}

// ---------------------------------------------------------------------------------------------
// Closed forms of dy/dt = a0 + a1/M(t) − (l0 + l1/M(t))·y with M(t) = M0 − c·t.

namespace {
// Away from 0 the direct forms, kept out of line: the common small arguments below then need no call,
// and so the closed forms around them keep their values in registers.
[[gnu::noinline]] double expm1_over_x_direct(double x) { return std::expm1(x) / x; }
[[gnu::noinline]] double phi2_direct(double x) { return (x - 1 + std::exp(-x)) / (x * x); }

// φ2(x) = (x − 1 + e^{−x})/x² = E[0, −x] = Σ (−x)ᵏ/(k + 2)! for |x| < 2⁻⁶ (an hour of makeup, SO2
// uptake or additive loss: |x| ≈ 1e-4–1e-2): to x⁶ by Horner, the first term left out, x⁷/9!, below
// 6.2e-19 (a ninetieth of an ulp of 1/2).
inline double phi2_short(double x) {
  return 1.0 / 2 - x * (1.0 / 6 - x * (1.0 / 24 - x * (1.0 / 120 - x * (1.0 / 720 - x * (1.0 / 5040 - x * (1.0 / 40320))))));
}

// E(x) = (eˣ − 1)/x = Σ xᵏ/(k + 1)! = 1 + x·φ2(−x). For |x| < 2⁻⁶ so, by the short series of φ2: the
// first term left out, x⁸/9!, is below 1e-20, and x·φ2(−x) is below 2⁻⁷, so its rounding is far below
// an ulp of 1 and the sum is within about half an ulp — closer than expm1(x)/x's two roundings — with no
// call and no division. Where a closed form needs both E(−x) and φ2(x), one series serves both
// (E_phi2 below). Elsewhere expm1(x)/x.
inline double E_of(double x) {
  if (std::fabs(x) < 0x1p-6) return 1 + x * phi2_short(-x);
  return expm1_over_x_direct(x);
}

// φ2(x) = (x − 1 + e^{−x})/x² = E[0, −x]: the series where the direct form would cancel, by Horner — to
// x⁶ for |x| < 2⁻⁶ (above), to x¹⁰ for |x| < 0.1 (the first term left out below 1e-18); the direct
// form elsewhere.
inline double phi2_of(double x) {
  if (std::fabs(x) < 0x1p-6) return phi2_short(x);
  if (std::fabs(x) < 0.1) {
    static constexpr double c[11] = {1.0 / 2, 1.0 / 6, 1.0 / 24, 1.0 / 120, 1.0 / 720, 1.0 / 5040, 1.0 / 40320, 1.0 / 362880, 1.0 / 3628800, 1.0 / 39916800, 1.0 / 479001600};
    double sum = c[10];
    for (int k = 9; k >= 0; --k) sum = c[k] - x * sum;
    return sum;
  }
  return phi2_direct(x);
}

// E(−x) and φ2(x) with the bits of E_of(−x) and phi2_of(x): on the short series' range E(−x) =
// 1 + (−x)·φ2(x) is E_of's own expression, so the series is summed once for both.
struct EPhi2 {
  double E, phi2;
};
inline EPhi2 E_phi2(double x) {
  if (std::fabs(x) < 0x1p-6) {
    const double p = phi2_short(x);
    return {1 + (-x) * p, p};
  }
  return {E_of(-x), phi2_of(x)};
}
}  // namespace

namespace detail {
double expm1_over_x(double x) { return E_of(x); }
double phi2(double x) { return phi2_of(x); }

namespace {
// I_n(m) = ∫₀¹ uⁿ e^{m u} du, the n-th derivative of expm1_over_x at m.
double moment(int n, double m) {
  if (std::fabs(m) < 2) {  // Σ m^k / (k! (n + k + 1))
    double term = 1, sum = 1.0 / (n + 1);
    for (int k = 1; k < 40; ++k) {
      term *= m / k;
      const double add = term / (n + k + 1);
      sum += add;
      if (std::fabs(add) < 1e-18 * std::fabs(sum)) break;
    }
    return sum;
  }
  double I = std::expm1(m) / m;  // I_0; then I_n = (e^m − n I_{n−1}) / m
  for (int k = 1; k <= n; ++k) I = (std::exp(m) - k * I) / m;
  return I;
}
}  // namespace

double divided_expm1_over_x(double x, double y) {
  const double d = x - y;
  if (std::fabs(d) > 1e-2) return (expm1_over_x(x) - expm1_over_x(y)) / d;
  const double mid = 0.5 * (x + y);  // f[x,y] = f'(m) + f'''(m) d²/24 + f⁽⁵⁾(m) d⁴/1920 + …
  return moment(1, mid) + moment(3, mid) * d * d / 24 + moment(5, mid) * d * d * d * d / 1920;
}
}  // namespace detail

namespace {
using detail::divided_expm1_over_x;
inline double expm1_over_x(double x) { return E_of(x); }

struct Linear {
  double a0 = 0, a1 = 0, l0 = 0, l1 = 0;
};
inline double phi2(double x) { return phi2_of(x); }

// E(x) and φ2(x), remembered for the last few arguments: within a piece of a segment most states
// share one exponent (−k·t of the makeup), so of the ~10 evaluations only ~3 differ. Pure: the same
// argument gives the same bits. Kept with the piece's mass law (below), which every closed form
// receives, so no thread shares it.
template <int N>
struct Memo {
  double x[N], y[N];
  int turn = 0;
  Memo() {
    for (int i = 0; i < N; ++i) x[i] = std::numeric_limits<double>::quiet_NaN(), y[i] = 0;
  }
  template <class F>
  double operator()(double arg, F f) {
    for (int i = 0; i < N; ++i)
      if (arg == x[i]) return y[i];
    turn = (turn + 1) % N;
    x[turn] = arg;
    return y[turn] = f(arg);
  }
};

struct Mass {
  double m0 = 0;  // [kg] at the start of the piece
  double c = 0;   // decline [kg/h]; 0 with continuous makeup
  double inv = 0; // 1/m0 [1/kg]: every a1/M0 and l1/M0 at constant mass is a1·inv, one division a piece
  mutable Memo<4> E_memo{};     // E(x) of this piece's closed forms
  mutable Memo<3> phi2_memo{};  // φ2(x) of this piece's closed forms
  double E(double x) const { return E_memo(x, expm1_over_x); }
  double phi2_of(double x) const { return phi2_memo(x, phi2); }
  double at(double t) const { return m0 - c * t; }
  double integral(double t) const { return m0 * t - 0.5 * c * t * t; }  // ∫M dt
};

// y(t) and ∫₀ᵗ y.
struct Solution {
  double y, integral;
};

// y(t) alone, where the integral is not needed (the crossing search).
double value(const Linear& e, double y0, const Mass& m, double t);

Solution solve(const Linear& e, double y0, const Mass& m, double t) {
  if (t == 0) return {y0, 0};
  if (m.c == 0 || (e.a0 == 0 && e.a1 == 0 && e.l1 == 0)) {
    // constant coefficients: y = y0 + (A − Λ y0)·t·E(−Λt), ∫y = y0 t + (A − Λ y0)·t²·E[0, −Λt]
    const double A = m.c == 0 ? e.a0 + e.a1 * m.inv : e.a0;
    const double L = m.c == 0 ? e.l0 + e.l1 * m.inv : e.l0;
    const double slope = A - L * y0;
    return {y0 + slope * t * m.E(-L * t), y0 * t + slope * t * t * m.phi2_of(L * t)};
  }
  // falling mass, l0 = 0 (no makeup): with m = M/M0, L = ln m, g = l1/c, T_M = M0/c,
  // y = y0 m^g + a0 T_M (m^g − m)/(1 − g) + (a1/c)(1 − m^g)/g, in stable divided-difference form.
  const double TM = m.m0 / m.c;
  const double L = std::log1p(-t / TM);
  const double g = e.l1 / m.c;
  const double A1 = e.a0 * TM, A2 = e.a1 / m.c;
  const double mg = std::exp(g * L), mm = std::exp(L);
  const double y = y0 * mg - A1 * mm * L * expm1_over_x((g - 1) * L) - A2 * L * expm1_over_x(g * L);
  // ∫₀ᵗ y dt = T_M [y0 h(g) − A1 h[g,1] − A2 h[g,0]], h(p) = ∫_m¹ s^p ds = −L E((p+1)L)
  const double h = -L * expm1_over_x((g + 1) * L);
  const double h_g1 = -L * L * divided_expm1_over_x((g + 1) * L, 2 * L);
  const double h_g0 = -L * L * divided_expm1_over_x((g + 1) * L, L);
  return {y, TM * (y0 * h - A1 * h_g1 - A2 * h_g0)};
}

double value(const Linear& e, double y0, const Mass& m, double t) {
  if (m.c == 0) {
    const double A = e.a0 + e.a1 * m.inv, L = e.l0 + e.l1 * m.inv;
    return y0 + (A - L * y0) * t * m.E(-L * t);
  }
  return solve(e, y0, m, t).y;
}

// Time in (0, t_max] at which y reaches `target`, or −1. y is monotone within a regime.
double crossing(const Linear& e, double y0, const Mass& m, double target, double t_max) {
  const double y_end = value(e, y0, m, t_max);
  if ((y0 - target) * (y_end - target) > 0 || y0 == target) return -1;
  if (m.c == 0) {
    // y∞ + (y0 − y∞) e^{−Λt} = target  ⇒  t = −log1p(−u)/Λ = (target − y0)/(A − Λ y0) · (−log1p(−u)/u),
    // u = Λ (target − y0)/(A − Λ y0) < 1 since target lies between y0 and y(t_max)
    const double A = e.a0 + e.a1 * m.inv, L = e.l0 + e.l1 * m.inv;
    const double slope = A - L * y0;
    const double u = L * (target - y0) / slope;
    const double t = (target - y0) / slope * (u == 0 ? 1.0 : -std::log1p(-u) / u);
    return std::fmin(std::fmax(t, 0.0), t_max);
  }
  // otherwise: Illinois (regula falsi) on the monotone closed form, to machine precision
  double lo = 0, hi = t_max, flo = y0 - target, fhi = y_end - target;
  int side = 0;
  for (int it = 0; it < 200 && hi - lo > 1e-14 * t_max; ++it) {
    double t = (lo * fhi - hi * flo) / (fhi - flo);
    if (!(t > lo && t < hi)) t = 0.5 * (lo + hi);
    const double f = value(e, y0, m, t) - target;
    if (f == 0) return t;
    if ((f > 0) == (fhi > 0)) {
      hi = t, fhi = f;
      if (side == -1) flo /= 2;
      side = -1;
    } else {
      lo = t, flo = f;
      if (side == 1) fhi /= 2;
      side = 1;
    }
  }
  return 0.5 * (lo + hi);
}

// The equations of each state in a regime.
struct Equations {
  Linear base, strong, weak, oxidation, nitration, additive, base_plus_salts, antioxidant;
  bool base_fixed = false, strong_fixed = false, antioxidant_fixed = false;
};

struct Context {
  const OilBalance& k;
  const OilRates& r;
  Mass mass;
  double makeup_rate;   // k = c/M [1/h] with continuous makeup, else 0
  double makeup_base;   // B_mk = c·(b_fresh − b_min) [g KOH/h] with continuous makeup, else 0
  double so2_coeff;     // l1 = SO2 uptake of fresh oil / (b_fresh − b_min) [kg/h]
  bool spent = false;   // antioxidant reserve spent: oxidation at k_ox·f
  double oxidation = 0; // oxidation rate of this piece [A/cm per h]
  double organic = 0;   // organic acid formed in this piece [mg KOH/g per h]
};

// k = c·(1/M) and l1 = SO2 uptake·(1/(b_fresh − b_min)), as the one-piece path computes them: one
// division by the mass and one by the base span, each used for all the terms it divides.
double makeup_rate_of(const OilState& s, const OilRates& r) { return r.continuous_makeup ? r.consumption * (1 / s.mass) : 0; }
double so2_coefficient(const OilBalance& k, const OilRates& r) { return r.sulfurous_fresh * (1 / (k.fresh_base - k.base_floor)); }
// fmax(0, fmin(1, x)) without the two library calls (NaN gives 1 as there)
double clamp01(double x) { return !(x <= 1) ? 1.0 : x > 0 ? x : 0.0; }

bool spent_at(const OilState& s, const OilRates& r) {
  return s.antioxidant <= 0 && r.antioxidant_depletion > makeup_rate_of(s, r);
}

Context make_context(const OilState& s, const OilBalance& k, const OilRates& r) {
  Context c{k, r, {s.mass, r.continuous_makeup ? 0.0 : r.consumption, 1 / s.mass}, 0, 0, 0};
  if (r.continuous_makeup) {
    c.makeup_rate = r.consumption * c.mass.inv;
    c.makeup_base = r.consumption * (k.fresh_base - k.base_floor);
  }
  c.so2_coeff = so2_coefficient(k, r);
  c.spent = spent_at(s, r);
  const double f = c.spent ? depleted_factor_of(r.depleted_factor, c.makeup_rate, r.antioxidant_depletion) : 1.0;
  c.oxidation = r.oxidation * f;
  c.organic = r.organic_acid * f;
  return c;
}

Equations equations(Regime g, const Context& c) {
  const double km = c.makeup_rate, phi = c.k.organic_neutralised_share, rw = c.organic;
  Equations e;
  e.oxidation = {c.oxidation, 0, km, 0};
  // dA/dt = −k_A + k (1 − A) while any is left (zero order: the radicals, not A, set the pace)
  e.antioxidant = {km - c.r.antioxidant_depletion, 0, km, 0};
  e.antioxidant_fixed = c.spent;
  e.nitration = {0, c.r.nitration, km, 0};
  e.additive = {km * c.k.fresh_additive, 0, km + c.k.additive_depletion, 0};
  e.base_plus_salts = {km * c.k.fresh_base, 0, km, 0};  // u = b + c_n: base consumed becomes salt 1:1
  switch (g) {
    case Regime::above_floor:  // db/dt = −φ r_w − R/M − l1 (b − b_min)/M + k (b_f − b)
      e.base = {-phi * rw + km * c.k.fresh_base, -c.r.strong_acid + c.so2_coeff * c.k.base_floor, km, c.so2_coeff};
      e.strong_fixed = true;
      e.weak = {(1 - phi) * rw, 0, km, 0};
      break;
    case Regime::floor_acid:  // ds/dt = (R − B_mk)/M − k s; all organic acid stays free
      e.base_fixed = true;
      e.strong = {0, c.r.strong_acid - c.makeup_base, km, 0};
      e.weak = {rw, 0, km, 0};
      break;
    case Regime::floor_weak:  // makeup base left after the strong acid neutralises part of the organic acid
      e.base_fixed = e.strong_fixed = true;
      e.weak = {rw, -(c.makeup_base - c.r.strong_acid), km, 0};
      break;
  }
  return e;
}

Regime regime_at(const OilState& s, const Context& c) {
  if (s.base > c.k.base_floor) return Regime::above_floor;
  if (s.strong_acid > 0 || c.r.strong_acid > c.makeup_base) return Regime::floor_acid;
  if (c.makeup_base - c.r.strong_acid < c.k.organic_neutralised_share * c.organic * s.mass)
    return Regime::floor_weak;
  return Regime::above_floor;  // at the floor, but the makeup lifts the base again
}

// Advances one piece of a regime; returns the ledger increments into `ledger`.
void advance_piece(OilState& s, Regime g, const Context& c, const Equations& e, double t, OilLedger& ledger) {
  const auto b = e.base_fixed ? Solution{s.base, s.base * t} : solve(e.base, s.base, c.mass, t);
  const auto sa = e.strong_fixed ? Solution{s.strong_acid, s.strong_acid * t} : solve(e.strong, s.strong_acid, c.mass, t);
  const auto w = solve(e.weak, s.weak_acid, c.mass, t);
  const double u = value(e.base_plus_salts, s.base + s.salts, c.mass, t);
  const double R = c.r.strong_acid, IM = c.mass.integral(t), cons = c.r.consumption;
  const double so2 = g == Regime::above_floor ? c.so2_coeff * (b.integral - c.k.base_floor * t) : 0;
  if (c.r.continuous_makeup) ledger.base_added += cons * c.k.fresh_base * t;
  ledger.base_removed += cons * b.integral;
  ledger.base_consumed += g == Regime::above_floor
                              ? R * t + c.k.organic_neutralised_share * c.organic * IM + so2
                              : c.makeup_base * t;
  ledger.acid_entered += R * t + c.organic * IM + so2;
  ledger.sulfurous_taken_up += so2;
  ledger.acid_removed += cons * (sa.integral + w.integral);
  s.mass = c.mass.at(t);
  s.base = b.y;
  s.strong_acid = sa.y;
  s.weak_acid = w.y;
  s.salts = u - b.y;
  s.oxidation = value(e.oxidation, s.oxidation, c.mass, t);
  s.nitration = value(e.nitration, s.nitration, c.mass, t);
  s.additive_acidity = value(e.additive, s.additive_acidity, c.mass, t);
  s.antioxidant = e.antioxidant_fixed ? 0.0 : clamp01(value(e.antioxidant, s.antioxidant, c.mass, t));
}

// The common case of a segment: continuous makeup (constant mass), above the base floor throughout,
// the antioxidant reserve not running out within it — one piece, no switch. The same closed forms as
// solve(), value() and advance_piece() above (y = y0 + (A − Λ y0)·t·E(−Λt), ∫y = y0 t + (A − Λ y0)·t²·φ2(Λt)),
// written out so that each of the three distinct exponentials is evaluated once and the crossing
// tests reuse the end values: the same operations in the same order, so bit for bit the results of
// the general path. Returns false, changing nothing, where a switch may fall inside the segment.
// The coefficients of that step: what depends on the constants, the rates, the mass m0, the length t
// and whether the antioxidant reserve is out (s.antioxidant ≤ 0), not on the rest of the state.
// make_context() and equations() written out for this case (c = 0, no piece memo set up, only the
// coefficients used): each value is the same expression of the same operands as there.
// z: a1·(1/M0) and l1·(1/M0) of the equations without a 1/M term, 0·(1/M0) there: +0 exactly for
// any mass whose inverse is finite (above 5.6e-309 kg), so the product is not formed; the additions of z stay.
[[gnu::always_inline]] inline void steady_coefficients(detail::SteadyCoefficients& c, const OilBalance& k, const OilRates& r, double m0, double t,
                                bool antioxidant_out) {
  const double z = 0.0;
  const double inv_m0 = 1 / m0;  // c.mass.inv
  const double km = r.consumption * inv_m0;  // c.makeup_rate
  c.makeup_base = r.consumption * (k.fresh_base - k.base_floor);
  c.so2_coeff = so2_coefficient(k, r);
  c.depletion_above_makeup = r.antioxidant_depletion > km;
  c.spent = antioxidant_out && c.depletion_above_makeup;  // spent_at()
  const double f = c.spent ? depleted_factor_of(r.depleted_factor, km, r.antioxidant_depletion) : 1.0;
  const double oxidation = r.oxidation * f;
  c.organic = r.organic_acid * f;
  const double phi = k.organic_neutralised_share;
  c.Ab = (-phi * c.organic + km * k.fresh_base) + (-r.strong_acid + c.so2_coeff * k.base_floor) * inv_m0;
  c.Lb = km + c.so2_coeff * inv_m0;
  const EPhi2 eb = E_phi2(c.Lb * t);  // E(−Λ_b t), and φ2(Λ_b t) for the base's integral
  c.Eb = eb.E, c.phi2b = eb.phi2;
  c.Lk = km + z;
  const EPhi2 ek = E_phi2(c.Lk * t);
  c.Ek = ek.E, c.phi2k = ek.phi2;
  c.Aa = (km - r.antioxidant_depletion) + z;
  c.Aw = (1 - phi) * c.organic + z;
  c.Au = km * k.fresh_base + z;
  // Mass::integral with c = 0 is m0·t − 0.5·0·t·t = m0·t exactly (t > 0 finite: the product is +0)
  const double R = r.strong_acid, IM = m0 * t, cons = r.consumption;
  c.base_added = cons * k.fresh_base * t;
  c.consumed_fixed = R * t + phi * c.organic * IM;  // the ledger's sums below add so2 to these, left to right
  c.entered_fixed = R * t + c.organic * IM;
  c.floor_t = k.base_floor * t;
  c.Ao = oxidation + z, c.An = 0.0 + r.nitration * inv_m0;
  c.Ad = km * k.fresh_additive + z, c.Ld = (km + k.additive_depletion) + z;
  c.Ed = expm1_over_x(-c.Ld * t);
}

// The step itself under those coefficients (s.mass is their m0, t their length).
[[gnu::always_inline]] inline bool steady_step(OilState& s, const OilBalance& k, const OilRates& r, const detail::SteadyCoefficients& c, double t,
                        OilLedger& ledger) {
  // regime_at(): above the floor, or at it with the makeup lifting the base again
  if (!(s.base > k.base_floor)) {
    if (s.strong_acid > 0 || r.strong_acid > c.makeup_base) return false;
    if (c.makeup_base - r.strong_acid < k.organic_neutralised_share * c.organic * s.mass) return false;
  }
  // the base, and its crossing of the floor (as crossing(): none if both ends lie on one side)
  const double slope_b = c.Ab - c.Lb * s.base;
  const double yb = s.base + slope_b * t * c.Eb;
  if (!((s.base - k.base_floor) * (yb - k.base_floor) > 0 || s.base == k.base_floor)) return false;
  double anti = 0;
  if (!c.spent) {
    anti = s.antioxidant + (c.Aa - c.Lk * s.antioxidant) * t * c.Ek;
    const bool watched = s.antioxidant > 0 && c.depletion_above_makeup;
    if (watched && !(s.antioxidant * anti > 0 || s.antioxidant == 0)) return false;
    anti = clamp01(anti);
  }
  const double b_int = s.base * t + slope_b * t * t * c.phi2b;
  const double slope_w = c.Aw - c.Lk * s.weak_acid;
  const double yw = s.weak_acid + slope_w * t * c.Ek, w_int = s.weak_acid * t + slope_w * t * t * c.phi2k;
  const double u0 = s.base + s.salts;
  const double u = u0 + (c.Au - c.Lk * u0) * t * c.Ek;
  const double cons = r.consumption;
  const double so2 = c.so2_coeff * (b_int - c.floor_t);
  ledger.base_added += c.base_added;
  ledger.base_removed += cons * b_int;
  ledger.base_consumed += c.consumed_fixed + so2;
  ledger.acid_entered += c.entered_fixed + so2;
  ledger.sulfurous_taken_up += so2;
  ledger.acid_removed += cons * (s.strong_acid * t + w_int);
  // s.mass stays: Mass::at with c = 0 is m0 − 0·t = m0 exactly
  s.base = yb;
  s.weak_acid = yw;
  s.salts = u - yb;
  s.oxidation = s.oxidation + (c.Ao - c.Lk * s.oxidation) * t * c.Ek;
  s.nitration = s.nitration + (c.An - c.Lk * s.nitration) * t * c.Ek;
  s.additive_acidity = s.additive_acidity + (c.Ad - c.Ld * s.additive_acidity) * t * c.Ed;
  s.antioxidant = anti;
  if (s.base < k.base_floor) {  // rounding at the very end
    s.salts += s.base - k.base_floor;
    s.base = k.base_floor;
  }
  return true;
}

// The memo's refill, out of line: where the rates repeat it is the rare branch of advance() with a memo.
[[gnu::noinline]] void refill(StepMemo& memo, const OilBalance& k, const OilRates& r, double m0, double t, bool out) {
  steady_coefficients(memo.c, k, r, m0, t, out);
  memo.filled = true, memo.mass = m0, memo.hours = t, memo.antioxidant_out = out;
}

bool advance_steady(OilState& s, const OilBalance& k, const OilRates& r, double t, OilLedger& ledger) {
  detail::SteadyCoefficients c;
  steady_coefficients(c, k, r, s.mass, t, s.antioxidant <= 0);
  return steady_step(s, k, r, c, t, ledger);
}
}  // namespace

bool antioxidant_spent(const OilState& s, const OilRates& r) { return spent_at(s, r); }

double oxidation_rate_now(const OilState& s, const OilRates& r) {
  if (!spent_at(s, r)) return r.oxidation;
  return r.oxidation * depleted_oxidation_factor(r.depleted_factor, makeup_rate_of(s, r), r.antioxidant_depletion);
}

Regime regime_of(const OilState& s, const OilBalance& k, const OilRates& r) {
  return regime_at(s, make_context(s, k, r));
}

double base_rate(const OilState& s, const OilBalance& k, const OilRates& r) {
  const Context c = make_context(s, k, r);
  const Regime g = regime_at(s, c);
  if (g != Regime::above_floor) return 0;
  const Linear e = equations(g, c).base;  // db/dt = a0 + a1/M − (l0 + l1/M) b
  return e.a0 + e.a1 / s.mass - (e.l0 + e.l1 / s.mass) * s.base;
}

namespace {
// advance()'s checks of its arguments, before either path.
[[gnu::always_inline]] inline void check_step(const OilState& s, const OilBalance& k, const OilRates& r, double hours) {
  if (!rates_fine(r)) validate(r);
  if (!finite_non_negative(hours)) check::non_negative("segment hours", hours);
  if (!(s.mass > 0 && s.mass <= std::numeric_limits<double>::max())) check::positive("oil mass", s.mass);
  if (s.base < k.base_floor * (1 - 1e-12) - 1e-300)
    throw InputError("oil.base", format_value(s.base), "a reactive base at or above the floor " + format_value(k.base_floor));
  if (!r.continuous_makeup && r.consumption * hours >= 0.9 * s.mass)
    throw InputError("segment hours", format_value(hours) + " h",
                     "a stretch without top-up that burns less than 90 % of the oil (" +
                         format_value(0.9 * s.mass / r.consumption) + " h at this consumption)");
}
}  // namespace

SegmentOutcome advance(OilState& s, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger) {
  check_step(s, k, r, hours);
  if (r.continuous_makeup && hours > 0 && advance_steady(s, k, r, hours, ledger)) return {};  // end_regime: above_floor
  return detail::advance_by_pieces(s, k, r, hours, ledger);
}

SegmentOutcome advance(OilState& s, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger, StepMemo& memo) {
  check_step(s, k, r, hours);
  if (r.continuous_makeup && hours > 0) {
    // the key: mass and hours are positive and finite here, so == compares their bits
    const bool out = s.antioxidant <= 0;
    if (!(memo.filled && memo.mass == s.mass && memo.hours == hours && memo.antioxidant_out == out))
      refill(memo, k, r, s.mass, hours, out);
    if (steady_step(s, k, r, memo.c, hours, ledger)) return {};  // end_regime: above_floor
  }
  return detail::advance_by_pieces(s, k, r, hours, ledger);
}

// Kept out of line: advance()'s fast path then sets up no frame for the pieces.
[[gnu::noinline]] SegmentOutcome detail::advance_by_pieces(OilState& s, const OilBalance& k, const OilRates& r,
                                                          double hours, OilLedger& ledger) {
  SegmentOutcome out;
  double done = 0;
  for (int piece = 0; piece < 16 && done < hours; ++piece) {
    const Context c = make_context(s, k, r);
    const Regime g = regime_at(s, c);
    const Equations e = equations(g, c);
    const double left = hours - done;
    double t_switch = -1;
    if (g == Regime::above_floor) t_switch = crossing(e.base, s.base, c.mass, k.base_floor, left);
    if (g == Regime::floor_acid && s.strong_acid > 0) t_switch = crossing(e.strong, s.strong_acid, c.mass, 0, left);
    // the antioxidant reserve running out is a switch too: oxidation and organic acids speed up there
    const double t_spent = !c.spent && s.antioxidant > 0 && r.antioxidant_depletion > c.makeup_rate
                               ? crossing(e.antioxidant, s.antioxidant, c.mass, 0, left) : -1;
    if (t_spent >= 0 && t_spent < left && (t_switch < 0 || t_spent < t_switch)) {
      advance_piece(s, g, c, e, t_spent, ledger);
      if (g == Regime::above_floor && s.base < k.base_floor) {  // rounding: the base switch lies just after
        s.salts += s.base - k.base_floor;
        s.base = k.base_floor;
      }
      if (g == Regime::floor_acid && s.strong_acid < 0) s.strong_acid = 0;
      s.antioxidant = 0;
      if (out.antioxidant_spent_at < 0) out.antioxidant_spent_at = done + t_spent;
      done += t_spent;
      continue;
    }
    if (t_switch < 0 || t_switch >= left) {
      advance_piece(s, g, c, e, left, ledger);
      if (g == Regime::above_floor && s.base < k.base_floor) {  // rounding at the very end
        s.salts += s.base - k.base_floor;
        s.base = k.base_floor;
      }
      if (g == Regime::floor_acid && s.strong_acid < 0) s.strong_acid = 0;
      out.end_regime = g;
      return out;
    }
    advance_piece(s, g, c, e, t_switch, ledger);
    if (g == Regime::above_floor) {
      s.salts += s.base - k.base_floor;  // keep base + salts as solved while the base lands on the floor
      s.base = k.base_floor;
      if (out.floor_reached_at < 0) out.floor_reached_at = done + t_switch;
    } else {
      s.strong_acid = 0;
      if (out.acid_cleared_at < 0) out.acid_cleared_at = done + t_switch;
    }
    done += t_switch;
  }
  out.end_regime = regime_of(s, k, r);
  return out;
}

OilState steady_state(const OilState& s, const OilBalance& k, const OilRates& r) {
  if (!r.continuous_makeup || r.consumption <= 0)
    throw NotModelledError("no steady state without continuous makeup: the oil changes until it is topped up");
  OilState x = s;
  OilLedger scratch;
  const double km = r.consumption / s.mass;
  advance(x, k, r, 800.0 / km, scratch);  // e^{−800} = 0 in double precision: every transient has died
  return x;
}

// ---------------------------------------------------------------------------------------------
// Events

namespace {
void neutralise_at_once(OilState& s, double floor, OilLedger& ledger) {
  if (s.strong_acid > 0 && s.base > floor) {
    const double d = std::fmin(s.strong_acid, s.base - floor);
    s.strong_acid -= d;
    s.base -= d;
    s.salts += d;
    ledger.base_consumed += d * s.mass;
  }
}
void add_fresh(OilState& s, const OilProperties& oil, double added, OilLedger& ledger) {
  const double m = s.mass + added;
  const double f_old = s.mass / m, f_new = added / m;
  s.base = s.base * f_old + oil.fresh_reactive_base() * f_new;
  s.additive_acidity = s.additive_acidity * f_old + oil.fresh_tan * f_new;
  s.strong_acid *= f_old;
  s.weak_acid *= f_old;
  s.salts *= f_old;
  s.oxidation *= f_old;
  s.nitration *= f_old;
  s.antioxidant = s.antioxidant * f_old + f_new;  // fresh oil brings its full reserve
  s.mass = m;
  ledger.base_added += added * oil.fresh_reactive_base();
  neutralise_at_once(s, oil.base_floor, ledger);
}
void remove_oil(OilState& s, double removed, OilLedger& ledger) {
  ledger.base_removed += removed * s.base;
  ledger.acid_removed += removed * (s.strong_acid + s.weak_acid);
  s.mass -= removed;
}
}  // namespace

void top_up(OilState& s, const OilProperties& oil, double mass, OilLedger& ledger) {
  check::non_negative("top-up mass", mass);
  add_fresh(s, oil, mass, ledger);
}

void partial_drain(OilState& s, const OilProperties& oil, double share, double full_mass, OilLedger& ledger) {
  check::fraction("drained share", share);
  check::positive("oil mass", full_mass);
  remove_oil(s, share * s.mass, ledger);
  if (full_mass > s.mass) add_fresh(s, oil, full_mass - s.mass, ledger);
}

void oil_change(OilState& s, const OilProperties& oil, double residual_share, double full_mass, OilLedger& ledger) {
  check::in_range("residual share", residual_share, 0.0, 0.9, "(share of the charge left in the system)");
  check::positive("oil mass", full_mass);
  const double keep = std::fmin(s.mass, residual_share * full_mass);
  remove_oil(s, s.mass - keep, ledger);
  if (s.mass <= 0) {  // nothing left: the system holds fresh oil only
    const double m = full_mass;
    s = fresh_oil(oil, m);
    ledger.base_added += m * oil.fresh_reactive_base();
    return;
  }
  add_fresh(s, oil, full_mass - s.mass, ledger);
}

}  // namespace acidload
