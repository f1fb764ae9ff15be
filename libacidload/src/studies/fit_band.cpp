#include "acidload/studies/fit_band.hpp"

#include <algorithm>
#include <cmath>

#include "acidload/studies/parameters.hpp"

namespace acidload {

namespace {
struct Readings {
  std::vector<double> hours, tbn_d2896, tbn_d4739, tan, san, oxidation;
  std::vector<int> charge;
};

Readings readings(const EngineCase& c) {
  const RunResult r = simulate(c.charge, c.model, c.record, c.options);
  Readings o;
  for (const TrajectoryPoint& p : r.trajectory) {
    o.hours.push_back(p.engine_hours);
    o.charge.push_back(p.charge);
    o.tbn_d2896.push_back(p.tbn_d2896);
    o.tbn_d4739.push_back(p.tbn_d4739);
    o.tan.push_back(p.tan);
    o.san.push_back(p.san);
    o.oxidation.push_back(p.state.oxidation);
  }
  return o;
}

// The value of a perturbed run at the base run's point i: the same point when the runs share their
// points (they do, for the same record and options), else linear in engine hours.
double at(const Readings& r, const std::vector<double>& y, double hours, std::size_t i) {
  if (r.hours.size() == y.size() && i < r.hours.size() && r.hours[i] == hours) return y[i];
  const auto it = std::lower_bound(r.hours.begin(), r.hours.end(), hours);
  if (it == r.hours.begin()) return y.front();
  if (it == r.hours.end()) return y.back();
  const std::size_t k = static_cast<std::size_t>(it - r.hours.begin());
  const double t = (hours - r.hours[k - 1]) / (r.hours[k] - r.hours[k - 1]);
  return y[k - 1] + t * (y[k] - y[k - 1]);
}
}  // namespace

TrajectoryBand trajectory_band(const FitResult& fit, double z) {
  const EngineCase& c = fit.fitted;
  const Readings base = readings(c);
  const std::size_t p = fit.parameters.size(), n = base.hours.size();
  std::vector<Readings> plus(p), minus(p);
  std::vector<double> step(p);
  for (std::size_t j = 0; j < p; ++j) {
    const ParameterInfo& info = parameter(fit.parameters[j].key);
    const double phi = fit.parameters[j].fit_estimate;
    step[j] = 1e-4 * std::max(1.0, std::fabs(phi));
    EngineCase a = c, b = c;
    set_parameter(a, info.key, from_fit_space(info.bound, phi + step[j]));
    set_parameter(b, info.key, from_fit_space(info.bound, phi - step[j]));
    plus[j] = readings(a);
    minus[j] = readings(b);
  }
  TrajectoryBand out;
  out.engine_hours = base.hours;
  out.charge = base.charge;
  out.z = z;
  const auto band = [&](std::vector<double> Readings::*reading, ReadingBand& into) {
    const std::vector<double>& y = base.*reading;
    into.value = y;
    into.low.resize(n);
    into.high.resize(n);
    std::vector<double> g(p);
    for (std::size_t i = 0; i < n; ++i) {
      for (std::size_t j = 0; j < p; ++j)
        g[j] = (at(plus[j], plus[j].*reading, base.hours[i], i) - at(minus[j], minus[j].*reading, base.hours[i], i)) /
               (2 * step[j]);
      double var = 0;
      for (std::size_t a = 0; a < p; ++a)
        for (std::size_t b = 0; b < p; ++b) var += g[a] * fit.covariance[a][b] * g[b];
      const double half = z * std::sqrt(std::max(0.0, var));
      into.low[i] = std::max(0.0, y[i] - half);
      into.high[i] = y[i] + half;
    }
  };
  band(&Readings::tbn_d2896, out.tbn_d2896);
  band(&Readings::tbn_d4739, out.tbn_d4739);
  band(&Readings::tan, out.tan);
  band(&Readings::san, out.san);
  band(&Readings::oxidation, out.oxidation);
  return out;
}

}  // namespace acidload
