#include "acidload/studies/calibration.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <optional>
#include <limits>

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

double sigma_of(const Precision& p, const std::string& reading, BaseNumberMethod m) {
  if (reading == "tbn") return m == BaseNumberMethod::d2896 ? p.tbn_d2896 : p.tbn_d4739;
  if (reading == "tan") return p.tan;
  if (reading == "san") return p.san;
  if (reading == "oxidation") return p.oxidation;
  return p.nitration;
}

}  // namespace

std::vector<SampleResidual> predict(const EngineCase& c, const std::vector<LabSample>& samples, const Precision& prec) {
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
    const auto add = [&](const char* reading, double measured, double predicted, bool censored, BaseNumberMethod mth) {
      SampleResidual x;
      x.sample = i;
      x.reading = reading;
      x.measured = measured;
      x.predicted = predicted;
      x.sigma = sigma_of(prec, reading, mth);
      x.censored = censored;
      x.standardized = censored ? -std::fmax(0.0, predicted - measured) / x.sigma : (measured - predicted) / x.sigma;
      out.push_back(x);
    };
    if (s.tbn) add("tbn", *s.tbn, tbn(p->state, c.charge.oil, s.tbn_method), false, s.tbn_method);
    if (s.tan) add("tan", *s.tan, p->tan, false, s.tbn_method);
    if (s.san) add("san", *s.san, p->san, s.san_censored, s.tbn_method);
    if (s.oxidation) add("oxidation", *s.oxidation, p->state.oxidation, false, s.tbn_method);
    if (s.nitration) add("nitration", *s.nitration, p->state.nitration, false, s.tbn_method);
  }
  return out;
}

namespace {

bool is_sulfur_parameter(const std::string& k) {
  return k == "model.so3-share" || k == "model.liner-uptake" || k == "model.capture-so2" ||
         k == "model.wet-so2-factor" || k == "model.liner-wall-rise" || k == "fuel.h2s";
}

struct Problem {
  const EngineCase& base;
  const std::vector<LabSample>& samples;
  const FitSettings& s;
  std::vector<Bound> bounds;

  EngineCase at(const Eigen::VectorXd& phi) const {
    EngineCase c = base;
    for (std::size_t j = 0; j < s.parameters.size(); ++j)
      set_parameter(c, s.parameters[j], from_fit_space(bounds[j], phi[static_cast<Eigen::Index>(j)]));
    return c;
  }
  Eigen::VectorXd residuals(const Eigen::VectorXd& phi) const {
    const auto r = predict(at(phi), samples, s.precision);
    Eigen::VectorXd v(static_cast<Eigen::Index>(r.size()));
    for (std::size_t i = 0; i < r.size(); ++i) v[static_cast<Eigen::Index>(i)] = r[i].standardized;
    return v;
  }
  // central differences in fit space; at the edge of the range the model accepts, one-sided
  // toward the inside (a fit that steps past a bound is not aborted)
  Eigen::MatrixXd jacobian(const Eigen::VectorXd& phi, Eigen::Index n, const Eigen::VectorXd& r0) const {
    Eigen::MatrixXd J(n, phi.size());
    for (Eigen::Index j = 0; j < phi.size(); ++j) {
      const double h = 1e-5 * std::max(1.0, std::fabs(phi[j]));
      Eigen::VectorXd a = phi, b = phi;
      a[j] += h;
      b[j] -= h;
      std::optional<Eigen::VectorXd> ra, rb;
      std::optional<InputError> why;
      try {
        ra = residuals(a);
      } catch (const InputError& e) {
        why = e;
      }
      try {
        rb = residuals(b);
      } catch (const InputError& e) {
        why = e;
      }
      if (ra && rb) J.col(j) = (*ra - *rb) / (2 * h);
      else if (ra) J.col(j) = (*ra - r0) / h;
      else if (rb) J.col(j) = (r0 - *rb) / h;
      else throw stepped_out(j, *why);
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

void check_identifiable(const Eigen::MatrixXd& J, const std::vector<std::string>& names, const char* when) {
  const Eigen::VectorXd norms = J.colwise().norm();
  for (Eigen::Index j = 0; j < J.cols(); ++j)
    if (!(norms[j] > 1e-9 * std::max(1.0, norms.maxCoeff())) || norms[j] < 1e-12)
      throw FitRefusedError("cannot fit " + names[static_cast<std::size_t>(j)] + ": the samples do not depend on it " + when +
                            " (a flat direction; fix it or add samples that respond to it)");
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(J * norms.cwiseInverse().asDiagonal(), Eigen::ComputeThinV);
  const Eigen::VectorXd sv = svd.singularValues();
  if (sv.size() > 1 && sv[sv.size() - 1] < 1e-7 * sv[0]) {
    const Eigen::VectorXd v = svd.matrixV().col(sv.size() - 1).cwiseAbs();
    Eigen::Index a = 0, b = 0;
    v.maxCoeff(&a);
    double best = -1;
    for (Eigen::Index j = 0; j < v.size(); ++j)
      if (j != a && v[j] > best) best = v[j], b = j;
    throw FitRefusedError("cannot fit " + names[static_cast<std::size_t>(a)] + " and " + names[static_cast<std::size_t>(b)] +
                          " together: the samples cannot tell them apart " + when +
                          " (rank-deficient; fix one, or add readings that separate them)");
  }
}

}  // namespace

FitResult calibrate(const EngineCase& c, const std::vector<LabSample>& samples, const FitSettings& s) {
  if (s.parameters.empty()) throw InputError("fit parameters", "(none)", "at least one parameter to fit");
  Problem pr{c, samples, s, {}};
  Eigen::VectorXd phi(static_cast<Eigen::Index>(s.parameters.size()));
  double sulfur = 0;
  for (const Segment& seg : c.record) sulfur += seg.fuel.sulfur();
  for (std::size_t j = 0; j < s.parameters.size(); ++j) {
    const ParameterInfo& info = parameter(s.parameters[j]);
    for (std::size_t k = 0; k < j; ++k)
      if (s.parameters[k] == s.parameters[j]) throw InputError("fit parameters", s.parameters[j], "each parameter once");
    if (is_sulfur_parameter(info.key) && sulfur == 0)
      throw FitRefusedError("cannot fit " + info.key + ": no contaminant signal (the record's gas carries no sulfur)");
    pr.bounds.push_back(info.bound);
    const double x0 = get_parameter(c, info.key);
    if ((info.bound == Bound::positive && !(x0 > 0)) || (info.bound == Bound::share && !(x0 > 0 && x0 < 1)))
      throw InputError(info.key, format_value(x0),
                       std::string("a starting value inside the parameter's bounds (") +
                           (info.bound == Bound::share ? "between 0 and 1" : "above 0") +
                           ") — set one in the case's model section before fitting");
    phi[static_cast<Eigen::Index>(j)] = to_fit_space(info.bound, x0);
  }
  Eigen::VectorXd r = pr.residuals(phi);
  const Eigen::Index n = r.size(), p = phi.size();
  if (n <= p)
    throw FitRefusedError("cannot fit " + std::to_string(p) + " parameter(s) to " + std::to_string(n) +
                          " reading(s): a fit needs more readings than parameters");
  Eigen::MatrixXd J = pr.jacobian(phi, n, r);
  check_identifiable(J, s.parameters, "at the starting values");

  // Levenberg–Marquardt with Marquardt's diagonal scaling
  FitResult out;
  double cost = r.squaredNorm(), mu = 1e-3;
  for (out.iterations = 0; out.iterations < s.max_iterations; ++out.iterations) {
    const Eigen::MatrixXd A = J.transpose() * J;
    const Eigen::VectorXd g = J.transpose() * r;
    bool improved = false;
    for (int tries = 0; tries < 30 && !improved; ++tries) {
      Eigen::MatrixXd M = A;
      M.diagonal() += mu * A.diagonal().cwiseMax(1e-12);
      const Eigen::VectorXd step = M.ldlt().solve(-g);
      const Eigen::VectorXd trial = phi + step;
      Eigen::VectorXd rt;
      try {
        rt = pr.residuals(trial);
      } catch (const InputError&) {  // a step outside what the model accepts: shorten it
        mu *= 10;
        continue;
      }
      const double ct = rt.squaredNorm();
      if (ct < cost) {
        const double drop = cost - ct;
        phi = trial, r = rt;
        cost = ct;
        mu = std::max(mu / 10, 1e-12);
        improved = true;
        if (step.norm() < 1e-11 * (1 + phi.norm()) || drop < 1e-15 * (1 + cost)) out.converged = true;
      } else {
        mu *= 10;
      }
    }
    if (!improved) {  // no step lowers the cost: a minimum to within rounding
      out.converged = g.norm() < 1e-6 * (1 + cost) || mu > 1e10;
      break;
    }
    J = pr.jacobian(phi, n, r);
    if (out.converged) break;
  }
  check_identifiable(J, s.parameters, "at the optimum");

  out.observations = static_cast<int>(n);
  out.degrees_of_freedom = static_cast<int>(n - p);
  out.sum_of_squares = cost;
  out.s2 = cost / static_cast<double>(n - p);
  const Eigen::MatrixXd cov = out.s2 * (J.transpose() * J).inverse();
  out.covariance.assign(static_cast<std::size_t>(p), std::vector<double>(static_cast<std::size_t>(p)));
  out.correlation = out.covariance;
  for (Eigen::Index i = 0; i < p; ++i)
    for (Eigen::Index k = 0; k < p; ++k) {
      out.covariance[static_cast<std::size_t>(i)][static_cast<std::size_t>(k)] = cov(i, k);
      out.correlation[static_cast<std::size_t>(i)][static_cast<std::size_t>(k)] = cov(i, k) / std::sqrt(cov(i, i) * cov(k, k));
    }
  for (Eigen::Index j = 0; j < p; ++j) {
    FittedParameter f;
    f.key = s.parameters[static_cast<std::size_t>(j)];
    f.initial = get_parameter(c, f.key);
    f.fit_estimate = phi[j];
    f.fit_standard_error = std::sqrt(cov(j, j));
    f.estimate = from_fit_space(pr.bounds[static_cast<std::size_t>(j)], phi[j]);
    f.standard_error = dx_dphi(pr.bounds[static_cast<std::size_t>(j)], phi[j]) * f.fit_standard_error;  // delta method
    out.parameters.push_back(f);
  }
  out.fitted = pr.at(phi);
  out.residuals = predict(out.fitted, samples, s.precision);
  const double s_fit = std::sqrt(out.s2);
  for (SampleResidual& x : out.residuals) {
    x.outlier = std::fabs(x.standardized) > s.outlier_threshold * std::max(1.0, s_fit);
    if (x.outlier)
      out.flags.push_back("outlier: " + x.reading + " of the sample " + samples[x.sample].where + " is " +
                          format_value(std::round(x.standardized * 10) / 10) + " sigma from the fit");
  }
  for (std::size_t i = 1; i < samples.size(); ++i) {
    if (!samples[i].lab.empty() && !samples[i - 1].lab.empty() && samples[i].lab != samples[i - 1].lab)
      out.flags.push_back("lab change between " + samples[i - 1].where + " (" + samples[i - 1].lab + ") and " +
                          samples[i].where + " (" + samples[i].lab + "): compare their fresh-oil references");
    if (samples[i].tbn && samples[i - 1].tbn && samples[i].tbn_method != samples[i - 1].tbn_method)
      out.flags.push_back("TBN method change between " + samples[i - 1].where + " and " + samples[i].where);
  }
  return out;
}


}  // namespace acidload
