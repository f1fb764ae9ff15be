#include "acidload/studies/calibration.hpp"

#include <Eigen/Dense>
#include <boost/math/special_functions/gamma.hpp>
#include <cstdio>
#include <optional>
#include <algorithm>
#include <cmath>
#include <optional>
#include <limits>
#include <map>

#include "acidload/core/error.hpp"

namespace acidload {

namespace {

// ---- the forward model at the sample times ---------------------------------------------------

// Engine hours at which each charge of the record starts (an oil-change event opens a charge).
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

double record_hours(const std::vector<Segment>& record) {
  double t = 0;
  for (const Segment& s : record) t += s.hours;
  return t;
}

// The record cut at the sample times, so that every sample falls on a segment end.
std::vector<Segment> split_at(const std::vector<Segment>& record, std::vector<double> times) {
  std::sort(times.begin(), times.end());
  std::vector<Segment> out;
  double t0 = 0;
  std::size_t k = 0;
  for (const Segment& s : record) {
    const double t1 = t0 + s.hours;
    double at = t0;
    bool first = true;
    while (k < times.size() && times[k] <= at + 1e-9) ++k;
    while (k < times.size() && times[k] < t1 - 1e-9) {
      Segment piece = s;
      piece.hours = times[k] - at;
      piece.starts = s.hours > 0 ? s.starts * piece.hours / s.hours : 0;
      piece.calendar_hours = s.calendar_hours < 0 ? -1 : s.calendar_hours * piece.hours / s.hours;
      if (!first) piece.events.clear();
      out.push_back(piece);
      first = false;
      at = times[k];
      ++k;
    }
    Segment last = s;
    last.hours = t1 - at;
    last.starts = s.hours > 0 ? s.starts * last.hours / s.hours : 0;
    last.calendar_hours = s.calendar_hours < 0 ? -1 : s.calendar_hours * last.hours / s.hours;
    if (!first) last.events.clear();
    out.push_back(last);
    t0 = t1;
  }
  return out;
}

double precision_of(const Precision& p, const std::string& reading, BaseNumberMethod m) {
  if (reading == "tbn") return m == BaseNumberMethod::d2896 ? p.tbn_d2896 : p.tbn_d4739;
  if (reading == "tan") return p.tan;
  if (reading == "san") return p.san;
  if (reading == "oxidation") return p.oxidation;
  return p.nitration;
}

}  // namespace

double reading_sigma(const LabSample& s, const std::string& reading, const Precision& fallback,
                     const std::map<std::string, Precision>& by_lab) {
  const std::optional<double>& own = reading == "tbn" ? s.sd_tbn : reading == "tan" ? s.sd_tan : reading == "san" ? s.sd_san
                                     : reading == "oxidation" ? s.sd_oxidation : s.sd_nitration;
  if (own) return *own;
  const auto it = by_lab.find(s.lab);
  return precision_of(it != by_lab.end() ? it->second : fallback, reading, s.tbn_method);
}

std::vector<SampleResidual> predict(const EngineCase& c, const std::vector<LabSample>& samples, const Precision& prec,
                                    const std::map<std::string, Precision>& lab_prec) {
  const std::vector<double> starts = charge_starts(c.record);
  const double end = record_hours(c.record);
  std::vector<double> times;
  for (const LabSample& s : samples) {
    if (s.charge < 0 || s.charge >= static_cast<int>(starts.size()))
      throw InputError("lab sample " + s.where, "charge " + std::to_string(s.charge + 1),
                       "a charge of the record (it has " + std::to_string(starts.size()) + ")");
    const double t = starts[static_cast<std::size_t>(s.charge)] + s.oil_hours;
    const double charge_end = s.charge + 1 < static_cast<int>(starts.size()) ? starts[static_cast<std::size_t>(s.charge) + 1] : end;
    if (s.oil_hours < 0 || t > charge_end + 1e-9)
      throw InputError("lab sample " + s.where, format_value(s.oil_hours) + " h",
                       "oil hours within its charge (0 to " + format_value(charge_end - starts[static_cast<std::size_t>(s.charge)]) + " h)");
    times.push_back(t);
  }
  RunOptions o;
  o.detection_step = 0;
  o.output_interval = 0;
  ModelParameters m = c.model;
  m.limits.enabled.fill(false);
  const RunResult r = simulate(c.charge, m, split_at(c.record, times), o);
  std::vector<SampleResidual> out;
  for (std::size_t i = 0; i < samples.size(); ++i) {
    const LabSample& s = samples[i];
    // the last point of the sample's charge at its time: engine hours never fall along the
    // trajectory, so a binary search finds the points at that time (not a scan per sample)
    const double tol = 1e-6 * (1 + times[i]);
    const auto past = std::upper_bound(r.trajectory.begin(), r.trajectory.end(), times[i] + tol,
                                       [](double t, const TrajectoryPoint& q) { return t < q.engine_hours; });
    const TrajectoryPoint* p = nullptr;
    for (auto q = past; q != r.trajectory.begin() && std::fabs((q - 1)->engine_hours - times[i]) < tol; --q)
      if ((q - 1)->charge == s.charge) {
        p = &*(q - 1);
        break;
      }
    if (!p) throw Error("internal: no trajectory point at the sample " + s.where);
    const auto add = [&](const char* reading, double measured, double predicted, bool censored, BaseNumberMethod) {
      SampleResidual x;
      x.sample = i;
      x.reading = reading;
      x.measured = measured;
      x.predicted = predicted;
      x.sigma = reading_sigma(s, reading, prec, lab_prec);
      x.censored = censored;
      x.standardized = censored ? -std::fmax(0.0, predicted - measured) / x.sigma : (measured - predicted) / x.sigma;
      out.push_back(x);
    };
    if (s.tbn) add("tbn", *s.tbn, tbn(p->state, c.charge.oil, s.tbn_method), false, s.tbn_method);
    if (s.tan) add("tan", *s.tan, p->tan, false, s.tbn_method);
    if (s.san) add("san", *s.san, p->san, s.san_censored, s.tbn_method);
    if (s.oxidation) add("oxidation", *s.oxidation, s.oxidation_baseline + p->state.oxidation, false, s.tbn_method);
    if (s.nitration) add("nitration", *s.nitration, s.nitration_baseline + p->state.nitration, false, s.tbn_method);
  }
  return out;
}

namespace {

bool is_sulfur_parameter(const std::string& k) {
  return k == "model.so3-share" || k == "model.liner-uptake" || k == "model.capture-so2" ||
         k == "model.wet-so2-factor" || k == "model.liner-wall-rise" || k == "fuel.h2s";
}

double record_sulfur(const EngineCase& c) {
  double sulfur = 0;
  for (const Segment& seg : c.record) sulfur += seg.fuel.sulfur();
  return sulfur;
}

std::string method_name(BaseNumberMethod m) { return m == BaseNumberMethod::d2896 ? "D2896" : "D4739"; }

// The fit's problem: the listed parameters, of which `active` are fitted and the rest held at
// their priors; residuals are the standardized readings followed by one prior row per active one.
struct Problem {
  const EngineCase& base;
  const std::vector<LabSample>& samples;
  const FitSettings& s;
  std::vector<const ParameterInfo*> info;
  std::vector<double> prior, prior_sd;  // fit space
  std::vector<std::size_t> active;
  std::vector<std::pair<std::string, std::string>> baselines;  // (lab, reading) fitted, profiled out

  std::vector<double> full(const Eigen::VectorXd& a) const {
    std::vector<double> phi = prior;
    for (std::size_t j = 0; j < active.size(); ++j) phi[active[j]] = a[static_cast<Eigen::Index>(j)];
    return phi;
  }
  EngineCase at(const Eigen::VectorXd& a) const {
    EngineCase c = base;
    const std::vector<double> phi = full(a);
    for (std::size_t j = 0; j < info.size(); ++j) set_parameter(c, info[j]->key, from_fit_space(*info[j], phi[j]));
    return c;
  }
  Eigen::VectorXd data_residuals(const Eigen::VectorXd& a) const {
    auto r = predict(at(a), samples, s.precision, s.lab_precision);
    profile_baselines(r, samples, baselines);
    Eigen::VectorXd v(static_cast<Eigen::Index>(r.size()));
    for (std::size_t i = 0; i < r.size(); ++i) v[static_cast<Eigen::Index>(i)] = r[i].standardized;
    return v;
  }
  Eigen::VectorXd residuals(const Eigen::VectorXd& a) const {
    const Eigen::VectorXd d = data_residuals(a);
    if (!s.priors) return d;
    Eigen::VectorXd v(d.size() + a.size());
    v << d, Eigen::VectorXd::Zero(a.size());
    for (std::size_t j = 0; j < active.size(); ++j)
      v[d.size() + static_cast<Eigen::Index>(j)] = (a[static_cast<Eigen::Index>(j)] - prior[active[j]]) / prior_sd[active[j]];
    return v;
  }
  // Central differences in fit space; one-sided where the model refuses one side.
  Eigen::MatrixXd jacobian(const Eigen::VectorXd& a, const Eigen::VectorXd& r0, bool data_only) const {
    const auto f = [&](const Eigen::VectorXd& x) { return data_only ? data_residuals(x) : residuals(x); };
    const Eigen::Index n = data_only ? r0.size() : r0.size();
    Eigen::MatrixXd J = Eigen::MatrixXd::Zero(n, a.size());
    for (Eigen::Index j = 0; j < a.size(); ++j) {
      const double h = 1e-5 * std::max(1.0, std::fabs(a[j]));
      Eigen::VectorXd up = a, down = a;
      up[j] += h;
      down[j] -= h;
      std::optional<Eigen::VectorXd> ru, rd;
      try { ru = f(up); } catch (const InputError&) {}
      try { rd = f(down); } catch (const InputError&) {}
      for (Eigen::Index i = 0; i < n; ++i)
        J(i, j) = detail::finite_difference(ru ? &(*ru)[i] : nullptr, rd ? &(*rd)[i] : nullptr, r0[i], h);
    }
    return J;
  }
  // A refusal naming the parameter, the value the fit reached and the range the model accepts.
  FitRefusedError stepped_out(Eigen::Index j, const InputError& e) const {
    return FitRefusedError("cannot fit " + s.parameters[static_cast<std::size_t>(j)] + ": the fit reached " + e.key() +
                           " = " + e.value() + ", outside what the model accepts (" + e.expected() +
                           "); fix the parameter or fit fewer at once");
  }
};

std::string rounded(double v, int digits = 2) {
  char b[32];
  std::snprintf(b, sizeof b, "%.*g", digits, v);
  return b;
}

}  // namespace

std::vector<std::pair<std::string, std::string>> baseline_groups(const std::vector<LabSample>& samples, const FitSettings& s) {
  std::vector<std::pair<std::string, std::string>> out;
  if (!s.fit_ftir_baseline) return out;
  std::map<std::pair<std::string, std::string>, std::pair<int, bool>> seen;  // readings, disqualified
  for (const LabSample& x : samples)
    for (const char* r : {"oxidation", "nitration"}) {
      const bool ox = std::string(r) == "oxidation";
      if (!(ox ? x.oxidation : x.nitration)) continue;
      auto& g = seen[{x.lab, r}];
      g.first++;
      g.second |= (ox ? x.oxidation_baseline_given : x.nitration_baseline_given) || x.oil_hours <= s.fresh_sample_hours;
    }
  for (const auto& [k, g] : seen)
    if (g.first >= 3 && !g.second) out.push_back(k);
  return out;
}

std::vector<std::pair<double, double>> profile_baselines(std::vector<SampleResidual>& r, const std::vector<LabSample>& samples,
                                                         const std::vector<std::pair<std::string, std::string>>& groups) {
  std::vector<std::pair<double, double>> b(groups.size(), {0.0, 0.0});
  std::vector<int> group_of(r.size(), -1);
  for (std::size_t i = 0; i < r.size(); ++i)
    for (std::size_t g = 0; g < groups.size(); ++g)
      if (r[i].reading == groups[g].second && samples[r[i].sample].lab == groups[g].first) group_of[i] = static_cast<int>(g);
  std::vector<double> num(groups.size(), 0.0);
  for (std::size_t i = 0; i < r.size(); ++i)
    if (group_of[i] >= 0) {
      const double w = 1 / (r[i].sigma * r[i].sigma);
      num[static_cast<std::size_t>(group_of[i])] += w * (r[i].measured - r[i].predicted);
      b[static_cast<std::size_t>(group_of[i])].second += w;
    }
  for (std::size_t g = 0; g < groups.size(); ++g) b[g].first = b[g].second > 0 ? num[g] / b[g].second : 0;
  for (std::size_t i = 0; i < r.size(); ++i)
    if (group_of[i] >= 0) {
      r[i].predicted += b[static_cast<std::size_t>(group_of[i])].first;
      r[i].standardized = (r[i].measured - r[i].predicted) / r[i].sigma;
    }
  return b;
}

double chi2_upper_tail(double x, int k) {
  if (k <= 0) return 1;
  if (!(x > 0)) return 1;
  return boost::math::gamma_q(0.5 * k, 0.5 * x);
}

std::vector<std::string> default_parameters(const EngineCase& c, const std::vector<LabSample>& samples,
                                            std::vector<std::string>& why, std::vector<std::string>& warnings) {
  bool tbn = false, tan = false, ox = false, nitr = false, method_differs = false;
  BaseNumberMethod lab_method = c.model.limits.tbn_method;
  for (const LabSample& s : samples) {
    tbn |= s.tbn.has_value(), tan |= s.tan.has_value(), ox |= s.oxidation.has_value(), nitr |= s.nitration.has_value();
    if (s.tbn && s.tbn_method != c.model.limits.tbn_method) method_differs = true, lab_method = s.tbn_method;
  }
  std::vector<std::string> keys;
  if ((tbn || tan) && record_sulfur(c) > 0) {
    keys.push_back("model.liner-uptake");
    why.push_back("model.liner-uptake: the acid load from the gas's sulfur, which sets how fast TBN falls");
  }
  if (ox) {
    keys.push_back("model.oxidation-rate");
    why.push_back("model.oxidation-rate: the lab reports oxidation");
  }
  if (ox && tan) {
    keys.push_back("model.organic-acid-yield");
    why.push_back("model.organic-acid-yield: the lab reports TAN and oxidation, whose ratio it is");
  }
  if (nitr) {
    keys.push_back("model.nitration-yield");
    why.push_back("model.nitration-yield: the lab reports nitration (a charge can end by it)");
  }
  if (method_differs) {
    const std::string m = method_name(lab_method), l = method_name(c.model.limits.tbn_method);
    keys.push_back(lab_method == BaseNumberMethod::d2896 ? "model.weak-base-d2896" : "model.weak-base-d4739");
    why.push_back(keys.back() + ": the lab titrates TBN by " + m + ", the limit is set by " + l);
    warnings.push_back("the lab's TBN method (" + m + ") differs from the limit's (" + l +
                       "): the weak-base offset between them is fitted and can take up part of the TBN fall; "
                       "a fresh-oil sample titrated by both methods pins it down");
  }
  if (keys.empty()) throw FitRefusedError("cannot choose parameters to fit: the samples report no TBN, TAN, oxidation or nitration");
  return keys;
}

FitResult calibrate(const EngineCase& c, const std::vector<LabSample>& samples, const FitSettings& s0) {
  FitSettings s = s0;
  FitResult out;
  if (s.parameters.empty()) {
    s.parameters = default_parameters(c, samples, out.notes, out.warnings);
    out.notes.insert(out.notes.begin(), "parameters chosen for what the lab reports (name them to choose yourself):");
  }
  Problem pr{c, samples, s, {}, {}, {}, {}, baseline_groups(samples, s)};
  const double sulfur = record_sulfur(c);
  for (std::size_t j = 0; j < s.parameters.size(); ++j) {
    const ParameterInfo& info = parameter(s.parameters[j]);
    for (std::size_t k = 0; k < j; ++k)
      if (s.parameters[k] == s.parameters[j]) throw InputError("fit parameters", s.parameters[j], "each parameter once");
    pr.info.push_back(&info);
    pr.prior.push_back(to_fit_space(info, inside_range(info, get_parameter(c, info.key))));
    pr.prior_sd.push_back(info.prior_sd);
    if (is_sulfur_parameter(info.key) && sulfur == 0)
      out.flags.push_back(info.key + " held at its prior: no contaminant signal (the record's gas carries no sulfur)");
    else
      pr.active.push_back(j);
    if ((info.key == "model.weak-base-d2896" || info.key == "model.weak-base-d4739") && s0.parameters.size()) {
      const BaseNumberMethod m = info.key == "model.weak-base-d2896" ? BaseNumberMethod::d2896 : BaseNumberMethod::d4739;
      bool differs = false;
      for (const LabSample& x : samples) differs |= x.tbn && x.tbn_method == m && m != c.model.limits.tbn_method;
      if (differs)
        out.warnings.push_back(info.key + " is fitted while the limit's TBN method differs from the lab's: the offset can "
                               "take up part of the TBN fall; a fresh-oil sample titrated by both methods pins it down");
    }
  }
  const std::size_t p_listed = s.parameters.size();
  Eigen::VectorXd a(static_cast<Eigen::Index>(pr.active.size()));
  for (std::size_t j = 0; j < pr.active.size(); ++j) a[static_cast<Eigen::Index>(j)] = pr.prior[pr.active[j]];
  {
    const Eigen::VectorXd r = pr.data_residuals(a);
    if (static_cast<std::size_t>(r.size()) <= p_listed + pr.baselines.size())
      throw FitRefusedError("cannot fit " + std::to_string(p_listed) + " parameter(s)" +
                            (pr.baselines.empty() ? std::string() : " and " + std::to_string(pr.baselines.size()) + " FTIR baseline(s)") +
                            " to " + std::to_string(r.size()) +
                            " reading(s): a fit needs more readings than parameters");
  }
  // Hold what the samples do not respond to: its data alone would leave it 20 prior widths wide.
  const auto hold_flat = [&](const Eigen::VectorXd& a, const char* when) {
    const Eigen::VectorXd r = pr.data_residuals(a);
    const Eigen::MatrixXd J = pr.jacobian(a, r, true);
    std::vector<std::size_t> keep;
    Eigen::VectorXd kept_a(a.size());
    Eigen::Index m = 0;
    for (std::size_t j = 0; j < pr.active.size(); ++j) {
      const std::size_t k = pr.active[j];
      if (J.col(static_cast<Eigen::Index>(j)).norm() * pr.prior_sd[k] < 0.05) {
        out.flags.push_back(s.parameters[k] + " held at its prior value (" + format_value(from_fit_space(*pr.info[k], pr.prior[k])) +
                            "): the samples do not respond to it " + when + "; add readings that do, or fix it");
      } else {
        keep.push_back(k);
        kept_a[m++] = a[static_cast<Eigen::Index>(j)];
      }
    }
    pr.active = keep;
    return Eigen::VectorXd(kept_a.head(m));
  };
  a = hold_flat(a, "at the starting values");

  // Levenberg–Marquardt with Marquardt's diagonal scaling, on the readings and the prior rows
  Eigen::VectorXd r = pr.residuals(a);
  Eigen::MatrixXd J = pr.jacobian(a, r, false);
  double cost = r.squaredNorm(), mu = 1e-3;
  for (out.iterations = 0; a.size() > 0 && out.iterations < s.max_iterations; ++out.iterations) {
    const Eigen::MatrixXd A = J.transpose() * J;
    const Eigen::VectorXd g = J.transpose() * r;
    bool improved = false;
    for (int tries = 0; tries < 30 && !improved; ++tries) {
      Eigen::MatrixXd M = A;
      M.diagonal() += mu * A.diagonal().cwiseMax(1e-12);
      const Eigen::VectorXd step = M.ldlt().solve(-g);
      const Eigen::VectorXd trial = a + step;
      Eigen::VectorXd rt;
      try {
        rt = pr.residuals(trial);
      } catch (const InputError&) {  // a combination the model refuses: shorten the step
        mu *= 10;
        continue;
      }
      const double ct = rt.squaredNorm();
      if (ct < cost) {
        const double drop = cost - ct;
        a = trial, r = rt;
        cost = ct;
        mu = std::max(mu / 10, 1e-12);
        improved = true;
        if (step.norm() < 1e-11 * (1 + a.norm()) || drop < 1e-15 * (1 + cost)) out.converged = true;
      } else {
        mu *= 10;
      }
    }
    if (!improved) {  // no step lowers the cost: a minimum to within rounding
      out.converged = g.norm() < 1e-6 * (1 + cost) || mu > 1e10;
      break;
    }
    J = pr.jacobian(a, r, false);
    if (out.converged) break;
  }
  if (a.size() == 0) out.converged = true;

  const Eigen::VectorXd rd = pr.data_residuals(a);
  const Eigen::Index n = rd.size(), p = a.size(), nb = static_cast<Eigen::Index>(pr.baselines.size());
  out.observations = static_cast<int>(n);
  out.degrees_of_freedom = static_cast<int>(n - p - nb);
  out.sum_of_squares = rd.squaredNorm();
  out.s2 = out.sum_of_squares / static_cast<double>(n - p - nb);
  out.chi2_p = chi2_upper_tail(out.sum_of_squares, out.degrees_of_freedom);
  // posterior covariance of the active ones, widened by the reduced χ² when the fit is worse than
  // the lab precisions say (never narrowed below them)
  Eigen::MatrixXd H = J.transpose() * J;
  if (!s.priors) H = pr.jacobian(a, rd, true).transpose() * pr.jacobian(a, rd, true);
  const Eigen::MatrixXd cov = p > 0 ? Eigen::MatrixXd(std::max(1.0, out.s2) * H.inverse()) : Eigen::MatrixXd(0, 0);
  const std::vector<double> phi = pr.full(a);
  out.covariance.assign(p_listed, std::vector<double>(p_listed, 0.0));
  out.correlation.assign(p_listed, std::vector<double>(p_listed, 0.0));
  std::vector<int> slot(p_listed, -1);
  for (std::size_t j = 0; j < pr.active.size(); ++j) slot[pr.active[j]] = static_cast<int>(j);
  for (std::size_t i = 0; i < p_listed; ++i)
    for (std::size_t k = 0; k < p_listed; ++k) {
      double v = 0;
      if (slot[i] >= 0 && slot[k] >= 0) v = cov(slot[i], slot[k]);
      else if (i == k) v = pr.prior_sd[i] * pr.prior_sd[i];  // held: its prior's spread
      out.covariance[i][k] = v;
    }
  for (std::size_t i = 0; i < p_listed; ++i)
    for (std::size_t k = 0; k < p_listed; ++k)
      out.correlation[i][k] = out.covariance[i][k] / std::sqrt(out.covariance[i][i] * out.covariance[k][k]);
  for (std::size_t j = 0; j < p_listed; ++j) {
    FittedParameter f;
    f.key = s.parameters[j];
    f.initial = get_parameter(c, f.key);
    f.fit_estimate = phi[j];
    f.fit_standard_error = std::sqrt(out.covariance[j][j]);
    f.estimate = from_fit_space(*pr.info[j], phi[j]);
    f.standard_error = dx_dphi(*pr.info[j], phi[j]) * f.fit_standard_error;  // delta method
    f.prior = pr.prior[j];
    f.prior_sd = pr.prior_sd[j];
    f.held = slot[j] < 0;
    out.parameters.push_back(f);
  }
  for (std::size_t i = 0; i < pr.active.size(); ++i)
    for (std::size_t k = i + 1; k < pr.active.size(); ++k) {
      const double rho = out.correlation[pr.active[i]][pr.active[k]];
      if (std::fabs(rho) > 0.95)
        out.flags.push_back(s.parameters[pr.active[i]] + " and " + s.parameters[pr.active[k]] +
                            ": the samples can hardly tell them apart (correlation " + rounded(rho, 3) +
                            "); their split rests on the priors — fix one, or add readings that separate them");
    }
  // a fitted parameter the data barely constrain: its estimate is mostly its prior's
  for (std::size_t j = 0; j < pr.active.size(); ++j) {
    const std::size_t k = pr.active[j];
    if (out.parameters[k].fit_standard_error > 0.7 * pr.prior_sd[k])
      out.flags.push_back(s.parameters[k] + ": the samples say little about it (its error is " +
                          rounded(out.parameters[k].fit_standard_error / pr.prior_sd[k]) +
                          " of the prior's width); its estimate is mostly the prior's");
  }
  out.fitted = pr.at(a);
  out.samples = samples;
  out.precision = s.precision;
  out.lab_precision = s.lab_precision;
  out.residuals = predict(out.fitted, samples, s.precision, s.lab_precision);
  const auto fitted_b = profile_baselines(out.residuals, samples, pr.baselines);
  // Var b̂ = max(1, s²)/Σ(1/σ²) + dᵀ·C·d, d = ∂b̂/∂φ over the fitted parameters (the mean of the
  // readings' noise is independent of the projected residuals that set φ̂)
  std::vector<Eigen::VectorXd> d_b(pr.baselines.size(), Eigen::VectorXd::Zero(a.size()));
  for (Eigen::Index j = 0; j < a.size() && !pr.baselines.empty(); ++j) {
    const double h = 1e-5 * std::max(1.0, std::fabs(a[j]));
    Eigen::VectorXd up = a, down = a;
    up[j] += h, down[j] -= h;
    auto ru = predict(pr.at(up), samples, s.precision, s.lab_precision), rdn = predict(pr.at(down), samples, s.precision, s.lab_precision);
    const auto bu = profile_baselines(ru, samples, pr.baselines), bd = profile_baselines(rdn, samples, pr.baselines);
    for (std::size_t g = 0; g < pr.baselines.size(); ++g) d_b[g][j] = (bu[g].first - bd[g].first) / (2 * h);
  }
  for (std::size_t g = 0; g < pr.baselines.size(); ++g) {
    const double var = std::max(1.0, out.s2) / fitted_b[g].second + (a.size() > 0 ? double(d_b[g].transpose() * cov * d_b[g]) : 0.0);
    FittedBaseline fb{pr.baselines[g].first, pr.baselines[g].second, fitted_b[g].first, std::sqrt(var), 0};
    for (LabSample& x : out.samples)
      if (x.lab == fb.lab) {
        const bool ox = fb.reading == "oxidation";
        if (ox ? x.oxidation.has_value() : x.nitration.has_value()) fb.readings++;
        (ox ? x.oxidation_baseline : x.nitration_baseline) += fb.value;
        (ox ? x.oxidation_baseline_given : x.nitration_baseline_given) = true;
      }
    out.baselines.push_back(fb);
    out.notes.push_back("FTIR " + fb.reading + " baseline of " + (fb.lab.empty() ? std::string("the lab") : fb.lab) + " fitted: " +
                        rounded(fb.value, 3) + " ± " + rounded(fb.standard_error, 2) +
                        " A/cm (no fresh-oil sample or baseline given; give the lab's fresh-oil reading to fix it)");
  }
  const double s_fit = std::sqrt(out.s2);
  for (SampleResidual& x : out.residuals) {
    x.outlier = std::fabs(x.standardized) > s.outlier_threshold * std::max(1.0, s_fit);
    if (x.outlier)
      out.flags.push_back("outlier: " + x.reading + " of sample " + std::to_string(x.sample + 1) + " (" + samples[x.sample].where +
                          ") is " + format_value(std::round(x.standardized * 10) / 10) + " sigma from the fit");
  }
  for (std::size_t i = 1; i < samples.size(); ++i) {
    if (!samples[i].lab.empty() && !samples[i - 1].lab.empty() && samples[i].lab != samples[i - 1].lab)
      out.flags.push_back("lab change between sample " + std::to_string(i) + " (" + samples[i - 1].where + ", " + samples[i - 1].lab +
                          ") and sample " + std::to_string(i + 1) + " (" + samples[i].where + ", " + samples[i].lab +
                          "): compare their fresh-oil references (an FTIR baseline per lab can be set)");
    if (samples[i].tbn && samples[i - 1].tbn && samples[i].tbn_method != samples[i - 1].tbn_method)
      out.flags.push_back("TBN method change between sample " + std::to_string(i) + " (" + samples[i - 1].where + ") and sample " +
                          std::to_string(i + 1) + " (" + samples[i].where + ")");
  }
  if (out.degrees_of_freedom > 0 && out.chi2_p < 0.001 && out.s2 > 1.5)
    out.warnings.push_back("the model does not describe this plant's samples within the lab precisions (reduced chi-square " +
                           rounded(out.s2, 3) + " on " + std::to_string(out.degrees_of_freedom) +
                           " degrees of freedom, p < 0.001): the errors and bands are widened by it, but check the "
                           "precisions, outliers and lab changes, and treat forecasts with care");
  return out;
}


}  // namespace acidload
