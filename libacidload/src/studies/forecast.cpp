#include "acidload/studies/forecast.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>

#include "acidload/core/error.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/parameters.hpp"
#include "acidload/studies/trend.hpp"

namespace acidload {

namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

std::string g3(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.3g", v);
  return b;
}

double hours_of(const std::vector<Segment>& r) {
  double t = 0;
  for (const Segment& s : r) t += s.hours;
  return t;
}

std::vector<double> charge_starts(const std::vector<Segment>& record) {
  std::vector<double> starts{0};
  double t = 0;
  for (const Segment& s : record) {
    for (const OilEvent& e : s.events)
      if (e.kind == OilEvent::Kind::oil_change) starts.push_back(t);
    t += s.hours;
  }
  return starts;
}

// A piece of a segment: `hours` of it, its starts and calendar time in proportion.
Segment piece(const Segment& s, double hours, bool keep_events) {
  Segment p = s;
  p.starts = s.hours > 0 ? s.starts * hours / s.hours : 0;
  p.calendar_hours = s.calendar_hours < 0 ? -1 : s.calendar_hours * hours / s.hours;
  p.hours = hours;
  if (!keep_events) p.events.clear();
  return p;
}

// The record cut at engine hours t: what runs before and what runs after.
std::pair<std::vector<Segment>, std::vector<Segment>> cut(const std::vector<Segment>& record, double t) {
  std::vector<Segment> before, after;
  double t0 = 0;
  for (const Segment& s : record) {
    const double t1 = t0 + s.hours;
    if (t1 <= t + 1e-9) before.push_back(s);
    else if (t0 >= t - 1e-9) after.push_back(s);
    else {
      before.push_back(piece(s, t - t0, true));
      after.push_back(piece(s, t1 - t, false));
    }
    t0 = t1;
  }
  return {before, after};
}

// The conditions to run on: the planned segments, the last continued to the planned maximum.
std::vector<Segment> future_of(const EngineCase& c, const std::vector<Segment>& planned) {
  std::vector<Segment> f = planned.empty() ? std::vector<Segment>{piece(c.record.back(), c.record.back().hours, false)} : planned;
  f.push_back(piece(f.back(), c.model.limits.max_hours, false));
  f.back().hours = c.model.limits.max_hours;
  f.back().starts = planned.empty() && c.record.back().hours > 0 ? c.record.back().starts / c.record.back().hours * f.back().hours
                                                                  : (f[f.size() - 2].hours > 0 ? f[f.size() - 2].starts / f[f.size() - 2].hours * f.back().hours : 0);
  f.back().calendar_hours = -1;
  return f;
}

RunOptions quiet() {
  RunOptions o;
  o.output_interval = 0;
  o.keep_segment_ends = false;
  return o;
}

// The readings of a state (the FTIR ones without the lab's baseline).
double reading_of(const std::string& r, const OilState& x, const OilProperties& oil, BaseNumberMethod m) {
  if (r == "tbn") return tbn(x, oil, m);
  if (r == "tan") return tan(x, oil);
  if (r == "san") return san(x);
  if (r == "oxidation") return x.oxidation;
  return x.nitration;
}

// The latest sample of the current (last) charge, or none.
std::optional<std::size_t> latest_in_current(const FitResult& fit) {
  const int last = static_cast<int>(charge_starts(fit.fitted.record).size()) - 1;
  std::optional<std::size_t> k;
  for (std::size_t i = 0; i < fit.samples.size(); ++i)
    if (fit.samples[i].charge == last && (!k || fit.samples[i].oil_hours >= fit.samples[*k].oil_hours)) k = i;
  return k;
}

struct Reading {
  std::string name;
  double measured = 0, sigma = 0, gain = 0;
};

// The measured readings of a sample that update the state (a censored SAN does not).
std::vector<Reading> readings_of(const FitResult& fit, const LabSample& s) {
  std::vector<Reading> r;
  const auto add = [&](const char* n, const std::optional<double>& v, double baseline) {
    if (v) r.push_back({n, *v - baseline, reading_sigma(s, n, fit.precision, fit.lab_precision), 0});
  };
  add("tbn", s.tbn, 0);
  add("tan", s.tan, 0);
  if (!s.san_censored) add("san", s.san, 0);
  add("oxidation", s.oxidation, s.oxidation_baseline);
  add("nitration", s.nitration, s.nitration_baseline);
  return r;
}

// The oil state as the vector the lab-first update works on (docs/model.md §13.1): the readings are
// sums of its components, y = H·v, with the weak base of the sample's method and the titrating salts
// β·c_n as components of their own, so that H holds only 0 and 1 and the parameters that act on the
// readings directly (b_weak, β) act through v.
constexpr std::size_t state_size = 8;
const std::array<const char*, state_size> state_names = {"base", "weak-base", "additive-acidity", "weak-acid",
                                                          "strong-acid", "titrating-salts", "oxidation", "nitration"};
std::array<double, state_size> state_vector(const OilState& x, const OilProperties& oil, BaseNumberMethod m) {
  return {x.base, oil.weak_base(m), x.additive_acidity, x.weak_acid, x.strong_acid, oil.salt_titration_share * x.salts,
          x.oxidation, x.nitration};
}
// The row of H for a reading: TBN = b + b_weak; TAN = t_add + a_w + s + β·c_n; SAN = s; FTIR o, n (docs/model.md §8.1).
std::array<double, state_size> reading_row(const std::string& r) {
  if (r == "tbn") return {1, 1, 0, 0, 0, 0, 0, 0};
  if (r == "tan") return {0, 0, 1, 1, 1, 1, 0, 0};
  if (r == "san") return {0, 0, 0, 0, 1, 0, 0, 0};
  if (r == "oxidation") return {0, 0, 0, 0, 0, 0, 1, 0};
  return {0, 0, 0, 0, 0, 0, 0, 1};
}

// The state at the sample as the model has it (case c), then moved by the held gain matrix K:
// v⁺ = v + K·(y − H·v) (docs/model.md §13.1); the oil's own components kept ≥ 0 (the reactive base at or above
// its floor), the weak base (a parameter of the oil, not of the state) not carried.
OilState updated_state(const EngineCase& c, const std::vector<Segment>& before, const std::vector<Reading>& readings,
                       const Eigen::MatrixXd& K, BaseNumberMethod method, std::vector<StateUpdate>* log,
                       std::vector<double>* posterior) {
  OilState x = simulate(c.charge, c.model, before, quiet()).final_state;
  const auto v = state_vector(x, c.charge.oil, method);
  const Eigen::Index m = static_cast<Eigen::Index>(readings.size());
  Eigen::VectorXd innovation(m);
  for (Eigen::Index i = 0; i < m; ++i)
    innovation[i] = readings[static_cast<std::size_t>(i)].measured - reading_of(readings[static_cast<std::size_t>(i)].name, x, c.charge.oil, method);
  Eigen::VectorXd w = Eigen::Map<const Eigen::VectorXd>(v.data(), state_size);
  if (m > 0) w += K * innovation;
  if (posterior) posterior->assign(w.data(), w.data() + state_size);
  const double beta = c.charge.oil.salt_titration_share;
  const OilState prior = x;
  // the reactive base is held at or above its floor, as the oil balance holds it (below it strong acid stays free)
  x.base = std::max({0.0, c.charge.oil.base_floor, w[0]});
  x.additive_acidity = std::max(0.0, w[2]);
  x.weak_acid = std::max(0.0, w[3]);
  x.strong_acid = std::max(0.0, w[4]);
  if (beta > 0) x.salts = std::max(0.0, w[5] / beta);
  x.oxidation = std::max(0.0, w[6]);
  x.nitration = std::max(0.0, w[7]);
  if (log)
    for (Eigen::Index i = 0; i < m; ++i) {
      const Reading& r = readings[static_cast<std::size_t>(i)];
      log->push_back({r.name, reading_of(r.name, prior, c.charge.oil, method), r.measured, reading_of(r.name, x, c.charge.oil, method), r.gain});
    }
  return x;
}

EngineCase with_phi(const FitResult& fit, const std::vector<double>& phi) {
  EngineCase c = fit.fitted;
  for (std::size_t j = 0; j < fit.parameters.size(); ++j)
    set_parameter(c, fit.parameters[j].key, from_fit_space(parameter(fit.parameters[j].key), phi[j]));
  return c;
}

std::vector<double> phi_hat(const FitResult& fit) {
  std::vector<double> phi;
  for (const FittedParameter& p : fit.parameters) phi.push_back(p.fit_estimate);
  return phi;
}

// Where the current charge starts from: the lab-first state at the latest sample, or a fresh run.
struct Start {
  bool lab_first = false;
  std::size_t sample = 0;
  double oil_hours = 0;             // at the start [h]
  std::vector<Segment> before, rest;  // the record up to the sample, and after it
  std::vector<Reading> readings;    // with their own gains (H·K)ᵢᵢ
  BaseNumberMethod method = BaseNumberMethod::d4739;
  Eigen::MatrixXd K;                // the gain matrix, state_size × readings, held for every parameter draw
  KalmanUpdate kalman;              // its inputs, for the reader (and the test against NumPy)
};

Start start_of(const FitResult& fit, bool lab_first) {
  Start st;
  const EngineCase& c = fit.fitted;
  const auto k = lab_first ? latest_in_current(fit) : std::nullopt;
  if (!k) {
    st.rest = c.record;
    return st;
  }
  st.lab_first = true;
  st.sample = *k;
  const LabSample& s = fit.samples[*k];
  st.method = s.tbn_method;
  st.oil_hours = s.oil_hours;
  const std::vector<double> starts = charge_starts(c.record);
  std::tie(st.before, st.rest) = cut(c.record, starts.back() + s.oil_hours);
  st.readings = readings_of(fit, s);
  // the joint update (docs/model.md §13.1): P = J·C·Jᵀ + Q, J = ∂v/∂φ at the sample, C the fit's covariance,
  // Q = H⁺·D·H⁺ᵀ with D = (χ²ᵣ − 1)₊·diag(σ²) the scatter beyond the lab precision the fit shows
  // (so that H·Q·Hᵀ = D); K = P·Hᵀ·(H·P·Hᵀ + R)⁻¹, R = diag(σ²)
  const std::vector<double> phi = phi_hat(fit);
  const Eigen::Index p = static_cast<Eigen::Index>(phi.size()), m = static_cast<Eigen::Index>(st.readings.size()),
                     n = static_cast<Eigen::Index>(state_size);
  Eigen::MatrixXd J = Eigen::MatrixXd::Zero(n, p);
  for (Eigen::Index j = 0; j < p; ++j) {
    const double h = 1e-4 * std::max(1.0, std::fabs(phi[static_cast<std::size_t>(j)]));
    std::vector<double> up = phi, down = phi;
    up[static_cast<std::size_t>(j)] += h, down[static_cast<std::size_t>(j)] -= h;
    const EngineCase a = with_phi(fit, up), b = with_phi(fit, down);
    const auto va = state_vector(simulate(a.charge, a.model, st.before, quiet()).final_state, a.charge.oil, st.method);
    const auto vb = state_vector(simulate(b.charge, b.model, st.before, quiet()).final_state, b.charge.oil, st.method);
    for (Eigen::Index i = 0; i < n; ++i) J(i, j) = (va[static_cast<std::size_t>(i)] - vb[static_cast<std::size_t>(i)]) / (2 * h);
  }
  Eigen::MatrixXd C(p, p);
  for (Eigen::Index i = 0; i < p; ++i)
    for (Eigen::Index j = 0; j < p; ++j) C(i, j) = fit.covariance[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)];
  Eigen::MatrixXd H = Eigen::MatrixXd::Zero(m, n), R = Eigen::MatrixXd::Zero(m, m), D = Eigen::MatrixXd::Zero(m, m);
  for (Eigen::Index i = 0; i < m; ++i) {
    const Reading& r = st.readings[static_cast<std::size_t>(i)];
    const auto row = reading_row(r.name);
    for (Eigen::Index k = 0; k < n; ++k) H(i, k) = row[static_cast<std::size_t>(k)];
    R(i, i) = r.sigma * r.sigma;
    D(i, i) = std::max(0.0, fit.s2 - 1) * r.sigma * r.sigma;
  }
  Eigen::MatrixXd P = J * C * J.transpose();
  if (m > 0) {
    const Eigen::MatrixXd Hp = H.completeOrthogonalDecomposition().pseudoInverse();
    P += Hp * D * Hp.transpose();
    st.K = P * H.transpose() * (H * P * H.transpose() + R).ldlt().solve(Eigen::MatrixXd::Identity(m, m));
  } else {
    st.K = Eigen::MatrixXd::Zero(n, 0);
  }
  const Eigen::MatrixXd HK = H * st.K;
  for (Eigen::Index i = 0; i < m; ++i) st.readings[static_cast<std::size_t>(i)].gain = HK(i, i);
  KalmanUpdate& ku = st.kalman;
  ku.state = {state_names.begin(), state_names.end()};
  const auto v = state_vector(simulate(c.charge, c.model, st.before, quiet()).final_state, c.charge.oil, st.method);
  ku.prior.assign(v.begin(), v.end());
  const auto rows = [](const Eigen::MatrixXd& A) {
    std::vector<std::vector<double>> out(static_cast<std::size_t>(A.rows()));
    for (Eigen::Index i = 0; i < A.rows(); ++i)
      for (Eigen::Index j = 0; j < A.cols(); ++j) out[static_cast<std::size_t>(i)].push_back(A(i, j));
    return out;
  };
  ku.sensitivity = rows(J), ku.covariance = rows(P), ku.reading_matrix = rows(H), ku.gain = rows(st.K);
  for (const Reading& r : st.readings) {
    ku.readings.push_back(r.name), ku.measured.push_back(r.measured), ku.sigma.push_back(r.sigma);
  }
  ku.extra_variance_factor = std::max(0.0, fit.s2 - 1);
  return st;
}

// Runs the current charge on from its start (and, for the next charge, an oil change and the
// future): returns the run and the oil hours of the current charge at the end of the record.
struct Ran {
  RunResult run;
  double end_oil_hours = 0;
  OilState at_sample;
  std::vector<double> posterior;  // v⁺ before the ≥ 0 clamps
};
Ran run_on(const EngineCase& c, const Start& st, const std::vector<Segment>& future, bool next_charge,
           std::vector<StateUpdate>* log) {
  Ran out;
  std::vector<Segment> rec = st.rest;
  const double rest_hours = hours_of(st.rest);
  std::vector<Segment> f = future;
  if (next_charge) f.front().events.insert(f.front().events.begin(), OilEvent{OilEvent::Kind::oil_change, -1});
  rec.insert(rec.end(), f.begin(), f.end());
  RunOptions o = quiet();
  if (st.lab_first) {
    out.at_sample = updated_state(c, st.before, st.readings, st.K, st.method, log, &out.posterior);
    out.run = simulate(c.charge, c.model, rec, o, out.at_sample, st.oil_hours);
    out.end_oil_hours = st.oil_hours + rest_hours;
  } else {
    out.run = simulate(c.charge, c.model, rec, o);
    const std::vector<double> starts = charge_starts(c.record);
    out.end_oil_hours = hours_of(c.record) - starts.back();
  }
  return out;
}

double charge_interval(const ChargeSummary& ch, const EngineCase& c) {
  return ch.first ? ch.drain_interval : c.model.limits.max_hours;
}

// The lab readings of the latest sample against every limit it can be read against.
void already_by_sample(const FitResult& fit, const LabSample& s, const LabLimits& lab, std::vector<LimitForecast>& out) {
  const LimitSettings& L = fit.fitted.model.limits;
  const OilProperties& oil = fit.fitted.charge.oil;
  // the sample's own reading is the plainer evidence: it replaces "the model … passes it" where both hold
  const auto mark = [&](Limit l, const std::string& why) {
    for (LimitForecast& f : out)
      if (f.key == name(l) && (!f.already || f.why.rfind("the model", 0) == 0))
        f.already = true, f.reached = true, f.remaining = f.low = f.high = 0, f.why = why;
  };
  const auto on = [&](Limit l) { return L.enabled[static_cast<std::size_t>(l)]; };
  std::optional<double> tbn_l;  // the sample's TBN by the limit's method
  if (s.tbn) tbn_l = *s.tbn - oil.weak_base(s.tbn_method) + oil.weak_base(L.tbn_method);
  const std::string at = " in sample " + std::to_string(&s - fit.samples.data() + 1) + " (" + s.where + ")";
  if (tbn_l && on(Limit::tbn_fall)) {
    const double lim = L.tbn_share_of_fresh * (oil.fresh_reactive_base() + oil.weak_base(L.tbn_method));
    if (*tbn_l <= lim) mark(Limit::tbn_fall, "TBN " + g3(*s.tbn) + at + " is at or below the limit " + g3(lim) + " mg KOH/g");
  }
  if (s.tan && on(Limit::tan_rise) && *s.tan >= oil.fresh_tan + L.tan_rise)
    mark(Limit::tan_rise, "TAN " + g3(*s.tan) + at + " is at or above fresh + " + g3(L.tan_rise) + " = " + g3(oil.fresh_tan + L.tan_rise));
  if (s.tan && tbn_l && on(Limit::crossover) && L.crossover && *s.tan >= *tbn_l)
    mark(Limit::crossover, "TAN " + g3(*s.tan) + at + " is at or above TBN " + g3(*tbn_l));
  if (s.san && !s.san_censored && on(Limit::san) && *s.san > L.san)
    mark(Limit::san, "SAN " + g3(*s.san) + at + (L.san == 0 ? " shows free strong acid (limit: any)" : " is above the limit " + g3(L.san)));
  if (s.oxidation && on(Limit::oxidation) && *s.oxidation - s.oxidation_baseline >= L.oxidation)
    mark(Limit::oxidation, "oxidation " + g3(*s.oxidation - s.oxidation_baseline) + " A/cm" + at + " is at or above " + g3(L.oxidation));
  if (s.nitration && on(Limit::nitration) && *s.nitration - s.nitration_baseline >= L.nitration)
    mark(Limit::nitration, "nitration " + g3(*s.nitration - s.nitration_baseline) + " A/cm" + at + " is at or above " + g3(L.nitration));
  // the oil-life limits the lab reads directly: viscosity change over fresh, antioxidant remaining
  const std::size_t i = static_cast<std::size_t>(&s - fit.samples.data());
  if (const std::optional<double> dv = sample_viscosity_change(fit.samples, i); dv && on(Limit::viscosity) && *dv >= L.viscosity_rise)
    mark(Limit::viscosity, "viscosity at 100 degC " + g3(s.trended.at("viscosity-100")) + " cSt" + at + " is " + g3(100 * *dv) +
                               " % over fresh (" + g3(*fresh_viscosity(fit.samples, i)) + " cSt): at or above the limit +" +
                               g3(100 * L.viscosity_rise) + " % (limits.viscosity-change)");
  if (const auto a = s.trended.find("antioxidant-remaining");
      a != s.trended.end() && on(Limit::antioxidant) && a->second / 100 <= L.antioxidant_remaining)
    mark(Limit::antioxidant, "antioxidant remaining " + g3(a->second) + " % of fresh" + at + " is at or below the limit " +
                                 g3(100 * L.antioxidant_remaining) + " % (limits.antioxidant-remaining)");
  // lab-only limits (not modelled): a row of their own, reached or not
  const auto lab_only = [&](const char* key, bool passed, const std::string& why) {
    LimitForecast f;
    f.key = key;
    f.limit = Limit::max_hours;
    f.remaining = f.low = f.high = inf;
    if (passed) f.already = f.reached = true, f.remaining = f.low = f.high = 0, f.why = why;
    out.push_back(f);
  };
  if (s.initial_ph) {
    const double lim = lab.initial_ph.value_or(L.initial_ph);
    lab_only("i-ph", *s.initial_ph <= lim,
             "i-pH " + g3(*s.initial_ph) + at + " is at or below the limit " + g3(lim) +
                 (lab.initial_ph ? " (set for this forecast)" : " (limits.initial-ph)"));
  }
  if (const auto w = s.trended.find("water"); w != s.trended.end())
    lab_only("water", w->second / 100 > L.water,
             "water " + g3(w->second) + " %" + at + " is above the limit " + g3(100 * L.water) + " % (limits.water)");
}

}  // namespace

Forecast forecast_current(const FitResult& fit, const LabLimits& lab) {
  Forecast out;
  const EngineCase& c = fit.fitted;
  const Start st = start_of(fit, true);
  out.lab_first = st.lab_first;
  out.latest_sample = st.sample;
  out.start_oil_hours = st.oil_hours;
  const std::vector<Segment> future = future_of(c, {});
  const auto remaining = [&](const EngineCase& x, std::vector<StateUpdate>* log, Ran* keep) {
    Ran r = run_on(x, st, future, false, log);
    const ChargeSummary& ch = r.run.charges.back();  // the rest of the record holds no oil change
    std::array<double, limit_count> t{};
    for (std::size_t k = 0; k < limit_count; ++k) t[k] = ch.reached_at[k] >= 0 ? ch.reached_at[k] - r.end_oil_hours : inf;
    if (keep) *keep = std::move(r);
    return t;
  };
  Ran centre;
  const std::array<double, limit_count> t0 = remaining(c, &out.update, &centre);
  out.start = centre.at_sample;
  out.kalman = st.kalman;
  out.kalman.posterior = centre.posterior;
  out.end_oil_hours = centre.end_oil_hours;
  // linearised band: gradients in fit space (the gains held), the covariance
  const std::vector<double> phi = phi_hat(fit);
  const std::size_t p = phi.size();
  std::vector<std::array<double, limit_count>> grad(p);
  for (std::size_t j = 0; j < p; ++j) {
    const double h = 1e-4 * std::max(1.0, std::fabs(phi[j]));
    std::vector<double> up = phi, down = phi;
    up[j] += h, down[j] -= h;
    const auto ta = remaining(with_phi(fit, up), nullptr, nullptr), tb = remaining(with_phi(fit, down), nullptr, nullptr);
    for (std::size_t k = 0; k < limit_count; ++k) grad[j][k] = (ta[k] - tb[k]) / (2 * h);
  }
  // parameters not fitted that drive a limit (prior_band_drivers): each moved to φ0 ± 1.645σ of its
  // weak prior, the hours left there (a limit not reached counts at the horizon) give that side's
  // reach; sides combine with the fit's half-width in quadrature (docs/model.md §13.1)
  const double horizon = t0[static_cast<std::size_t>(Limit::max_hours)];
  std::array<double, limit_count> prior_down{}, prior_up{};
  std::array<std::vector<std::string>, limit_count> prior_from;
  for (const std::string& key : prior_band_parameters()) {
    bool fitted = false;
    for (const FittedParameter& fp : fit.parameters) fitted |= fp.key == key;
    const std::vector<Limit> drives = prior_band_drivers(key);
    if (fitted || drives.empty()) continue;
    const ParameterInfo& info = parameter(key);
    const double phi0 = to_fit_space(info, inside_range(info, get_parameter(c, key)));
    const auto at = [&](double phi_k) {
      EngineCase x = c;
      set_parameter(x, key, from_fit_space(info, phi_k));
      return remaining(x, nullptr, nullptr);
    };
    const double z = 1.6448536269514722 * info.prior_sd;  // 90 %: z(0.95) σ
    const auto ta = at(phi0 + z), tb = at(phi0 - z);
    for (const Limit l : drives) {
      const auto k = static_cast<std::size_t>(l);
      if (!std::isfinite(t0[k])) continue;
      const double a = std::isfinite(ta[k]) ? ta[k] : horizon, b = std::isfinite(tb[k]) ? tb[k] : horizon;
      const double down = std::max(0.0, t0[k] - std::min(a, b)), up = std::max(0.0, std::max(a, b) - t0[k]);
      if (down + up <= 0) continue;
      prior_down[k] += down * down, prior_up[k] += up * up;
      prior_from[k].push_back(key);
    }
  }
  for (std::size_t k = 0; k < limit_count; ++k) {
    if (!c.model.limits.enabled[k]) continue;
    LimitForecast f;
    f.limit = all_limits[k];
    f.key = std::string(name(f.limit));
    f.reached = std::isfinite(t0[k]);
    f.remaining = t0[k];
    if (f.reached && t0[k] <= 0) {
      f.already = true;
      f.remaining = f.low = f.high = 0;
      f.why = "the model, started from the latest sample, passes it before the end of the record";
    } else if (f.reached) {
      double var = 0;
      for (std::size_t i = 0; i < p; ++i)
        for (std::size_t j = 0; j < p; ++j)
          if (std::isfinite(grad[i][k]) && std::isfinite(grad[j][k])) var += grad[i][k] * fit.covariance[i][j] * grad[j][k];
      const double half = 1.6448536269514722 * std::sqrt(std::max(0.0, var));  // 90 %: z(0.95)
      f.prior_from = prior_from[k];
      f.prior_driven = prior_down[k] + prior_up[k] > 2 * half * half;  // the priors' share of the band is the larger
      f.low = std::max(0.0, t0[k] - std::sqrt(half * half + prior_down[k]));
      f.high = t0[k] + std::sqrt(half * half + prior_up[k]);
    } else {
      f.low = f.high = inf;
    }
    out.limits.push_back(f);
  }
  if (st.lab_first) already_by_sample(fit, fit.samples[st.sample], lab, out.limits);
  double first = inf, first_low = inf;
  for (const LimitForecast& f : out.limits) {
    out.change_now |= f.already;
    if (f.reached && f.remaining < first) first = f.remaining, first_low = f.low;
  }
  // next sample: the regular interval after the latest sample, or halfway to the band's early end
  // when that comes sooner
  const double since = st.lab_first ? out.end_oil_hours - out.start_oil_hours : 0;
  out.next_sample_in = out.change_now ? 0 : std::max(0.0, std::min(lab.sample_interval - since, 0.5 * first_low));
  (void)first;
  out.warnings = fit.warnings;
  if (!st.lab_first) out.warnings.push_back("no sample of the current charge: the forecast starts from the model, not from a measurement");
  return out;
}

std::vector<LimitForecast> forecast(const FitResult& fit) { return forecast_current(fit).limits; }

std::vector<Limit> prior_band_drivers(const std::string& key) {
  // the limits each of them drives beyond what the readings fix: the antioxidant reserve by its induction
  // time; oxidation, once the reserve is spent, by the depleted factor and the induction time; viscosity
  // by its rises per oxidation and nitration and by the oxidation after depletion; anti-wear by its loss
  if (key == "model.induction-time") return {Limit::antioxidant, Limit::oxidation, Limit::viscosity};
  if (key == "model.depleted-oxidation-factor") return {Limit::oxidation, Limit::viscosity};
  if (key == "model.viscosity-per-oxidation" || key == "model.viscosity-per-nitration") return {Limit::viscosity};
  if (key == "model.additive-depletion") return {Limit::anti_wear};
  return {};
}

const std::vector<std::string>& prior_band_parameters() {
  static const std::vector<std::string> k = {"model.induction-time", "model.depleted-oxidation-factor",
                                             "model.viscosity-per-oxidation", "model.viscosity-per-nitration",
                                             "model.additive-depletion"};
  return k;
}

// ---- predict --------------------------------------------------------------------------------

namespace {

double normal01(std::uint64_t seed, std::uint64_t draw, std::uint64_t dim) {
  return std::sqrt(-2 * std::log(uniform01(seed, draw, 2 * dim))) * std::cos(6.283185307179586 * uniform01(seed, draw, 2 * dim + 1));
}

// The interval of charge k of the record, continued under its own last segment to the cap.
double interval_of_charge(const EngineCase& c, int k) {
  std::vector<Segment> rec;
  int charge = 0;
  for (std::size_t i = 0; i < c.record.size(); ++i) {
    bool change = false;
    for (const OilEvent& e : c.record[i].events) change |= e.kind == OilEvent::Kind::oil_change;
    if (change && i > 0) ++charge;
    if (charge > k) break;
    rec.push_back(c.record[i]);
  }
  EngineCase x = c;
  x.record = rec;
  const std::vector<Segment> f = future_of(x, {});
  rec.push_back(f.back());
  const RunResult r = simulate(c.charge, c.model, rec, quiet());
  return charge_interval(r.charges.back(), c);
}

}  // namespace

Prediction predict_charge(const FitResult& fit, const PredictSettings& s) {
  check::in_range("draws", s.draws, 0, 1e6, "");
  for (const Segment& seg : s.conditions) check::positive("planned segment hours", seg.hours);
  Prediction out;
  out.next_charge = s.next_charge;
  const EngineCase& c = fit.fitted;
  out.current = forecast_current(fit, s.lab);
  const Start st = start_of(fit, s.lab_first);
  const std::vector<Segment> future = future_of(c, s.conditions);
  const auto interval = [&](const EngineCase& x, std::optional<Limit>* limit) {
    const Ran r = run_on(x, st, future, s.next_charge, nullptr);
    const ChargeSummary& ch = r.run.charges.back();  // the next, or the current one continued
    if (limit) *limit = ch.first;
    return charge_interval(ch, x);
  };
  const double end_oil_hours = run_on(c, st, future, false, nullptr).end_oil_hours;
  out.interval = interval(c, &out.limit);

  // model form: each past charge (with samples, before the current one) from the others
  const int charges = static_cast<int>(charge_starts(c.record).size());
  if (s.model_form) {
    EngineCase original = c;
    for (const FittedParameter& p : fit.parameters) set_parameter(original, p.key, p.initial);
    FitSettings fs;
    for (const FittedParameter& p : fit.parameters) fs.parameters.push_back(p.key);
    fs.precision = fit.precision;
    fs.lab_precision = fit.lab_precision;
    for (int k = 0; k < charges; ++k) {
      std::vector<LabSample> own, others;
      for (const LabSample& x : fit.samples) (x.charge == k ? own : others).push_back(x);
      if (own.size() < 2 || others.size() < 2) continue;
      try {
        const FitResult a = calibrate(original, own, fs), b = calibrate(original, others, fs);
        out.held_out.push_back({k, interval_of_charge(a.fitted, k), interval_of_charge(b.fitted, k)});
      } catch (const FitRefusedError&) {
        continue;  // too few readings in one part: that charge tells nothing here
      }
    }
    double ss = 0;
    for (const HeldOutCharge& h : out.held_out) ss += std::pow(std::log(h.from_others / h.own), 2);
    if (!out.held_out.empty()) out.model_form_spread = std::sqrt(ss / static_cast<double>(out.held_out.size()));
    if (out.held_out.size() < 2)
      out.warnings.push_back("fewer than two past charges could be predicted from the others: the band holds the parameters' "
                             "uncertainty only, not the model's own error (record more charges with samples)");
  }

  // draws: φ = φ̂ + L·z, L from the covariance (eigen-decomposition, negative eigenvalues dropped)
  const std::vector<double> phi = phi_hat(fit);
  const std::size_t p = phi.size();
  Eigen::MatrixXd S(static_cast<Eigen::Index>(p), static_cast<Eigen::Index>(p));
  for (std::size_t i = 0; i < p; ++i)
    for (std::size_t j = 0; j < p; ++j) S(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j)) = fit.covariance[i][j];
  Eigen::MatrixXd L = Eigen::MatrixXd::Zero(S.rows(), S.cols());
  if (p > 0) {
    Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> es(S);
    L = es.eigenvectors() * es.eigenvalues().cwiseMax(0.0).cwiseSqrt().asDiagonal();
  }
  const int nu = static_cast<int>(out.held_out.size());
  std::vector<double> logs, unit_t;  // ln T per draw, and its Student-t variate t_ν
  for (int i = 0; i < s.draws; ++i) {
    Eigen::VectorXd z(static_cast<Eigen::Index>(p));
    for (std::size_t j = 0; j < p; ++j) z[static_cast<Eigen::Index>(j)] = normal01(s.seed, static_cast<std::uint64_t>(i), j);
    const Eigen::VectorXd d = L * z;
    std::vector<double> x = phi;
    for (std::size_t j = 0; j < p; ++j) x[j] += d[static_cast<Eigen::Index>(j)];
    std::optional<Limit> lim;
    double t = 0;
    try {
      t = interval(with_phi(fit, x), &lim);
    } catch (const InputError&) {
      continue;  // a combination the model refuses (the ranges hold each alone): skipped and counted
    }
    out.ending[static_cast<std::size_t>(lim ? *lim : Limit::max_hours)]++;
    double u = 0;
    if (nu > 0) {  // Student t with ν = the held-out charges
      double chi2 = 0;
      for (int k = 0; k < nu; ++k) chi2 += std::pow(normal01(s.seed, static_cast<std::uint64_t>(i), p + 1 + static_cast<std::size_t>(k)), 2);
      u = normal01(s.seed, static_cast<std::uint64_t>(i), p) / std::sqrt(chi2 / nu);
    }
    logs.push_back(std::log(t));
    unit_t.push_back(u);
  }
  out.draws = static_cast<int>(logs.size());
  if (out.draws < s.draws)
    out.notes.push_back(std::to_string(s.draws - out.draws) + " of " + std::to_string(s.draws) +
                        " draws skipped: parameter combinations the model refuses");
  if (out.draws > 0) {
    double m = 0, v = 0;
    for (double x : logs) m += x / static_cast<double>(logs.size());
    for (double x : logs) v += (x - m) * (x - m) / std::max<double>(1, static_cast<double>(logs.size()) - 1);
    out.parameter_spread = std::sqrt(v);
    // the held-out spread already holds the parameters' own scatter (each charge predicted from
    // fits on fewer samples): only the excess over the parameter spread is the model's form error
    out.model_form_excess = std::sqrt(std::max(0.0, out.model_form_spread * out.model_form_spread - v));
    for (std::size_t i = 0; i < logs.size(); ++i)
      out.intervals.push_back(std::min(c.model.limits.max_hours, std::exp(logs[i] + out.model_form_excess * unit_t[i])));
    out.p5 = percentile(out.intervals, 5);
    out.p50 = percentile(out.intervals, 50);
    out.p95 = percentile(out.intervals, 95);
  } else {
    out.p5 = out.p50 = out.p95 = out.interval;
  }
  if (!s.next_charge) {
    out.remaining_p5 = std::max(0.0, out.p5 - end_oil_hours);
    out.remaining_p50 = std::max(0.0, out.p50 - end_oil_hours);
    out.remaining_p95 = std::max(0.0, out.p95 - end_oil_hours);
  }
  out.warnings.insert(out.warnings.end(), out.current.warnings.begin(), out.current.warnings.end());
  return out;
}

}  // namespace acidload
