#include "acidload/studies/forecast.hpp"

#include <array>
#include <cmath>
#include <limits>

#include "acidload/studies/parameters.hpp"

namespace acidload {

// ---- forecast -------------------------------------------------------------------------------

namespace {
std::array<double, limit_count> remaining_hours(const EngineCase& c) {
  EngineCase x = c;
  Segment future = x.record.back();
  future.events.clear();
  future.hours = x.model.limits.max_hours;
  future.starts = x.record.back().hours > 0 ? x.record.back().starts / x.record.back().hours * future.hours : 0;
  future.calendar_hours = -1;
  x.record.push_back(future);
  RunOptions o;
  o.output_interval = 0;
  const RunResult r = simulate(x.charge, x.model, x.record, o);
  const ChargeSummary& ch = r.charges.back();
  const double at_end = ch.oil_hours - future.hours;  // oil hours at the end of the record
  std::array<double, limit_count> out{};
  for (std::size_t k = 0; k < limit_count; ++k)
    out[k] = ch.reached_at[k] >= 0 ? ch.reached_at[k] - at_end : std::numeric_limits<double>::infinity();
  return out;
}
}  // namespace

std::vector<LimitForecast> forecast(const FitResult& fit) {
  const EngineCase& c = fit.fitted;
  const std::array<double, limit_count> t0 = remaining_hours(c);
  const std::size_t p = fit.parameters.size();
  std::vector<std::array<double, limit_count>> grad(p);
  for (std::size_t j = 0; j < p; ++j) {
    const ParameterInfo& info = parameter(fit.parameters[j].key);
    const double phi = fit.parameters[j].fit_estimate, h = 1e-4 * std::max(1.0, std::fabs(phi));
    EngineCase a = c, b = c;
    set_parameter(a, info.key, from_fit_space(info.bound, phi + h));
    set_parameter(b, info.key, from_fit_space(info.bound, phi - h));
    const auto ta = remaining_hours(a), tb = remaining_hours(b);
    for (std::size_t k = 0; k < limit_count; ++k) grad[j][k] = (ta[k] - tb[k]) / (2 * h);
  }
  std::vector<LimitForecast> out;
  for (std::size_t k = 0; k < limit_count; ++k) {
    LimitForecast f;
    f.limit = all_limits[k];
    f.reached = std::isfinite(t0[k]);
    f.remaining = t0[k];
    if (f.reached && t0[k] <= 0) {
      f.already = true;
      f.remaining = f.low = f.high = 0;
    } else if (f.reached) {
      double var = 0;
      for (std::size_t i = 0; i < p; ++i)
        for (std::size_t j = 0; j < p; ++j)
          if (std::isfinite(grad[i][k]) && std::isfinite(grad[j][k])) var += grad[i][k] * fit.covariance[i][j] * grad[j][k];
      const double half = 1.6448536269514722 * std::sqrt(std::max(0.0, var));  // 90 %: z(0.95)
      f.low = std::max(0.0, t0[k] - half);
      f.high = t0[k] + half;
    }
    out.push_back(f);
  }
  return out;
}

}  // namespace acidload
