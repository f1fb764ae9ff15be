#include "acidload/studies/inverse.hpp"

#include <boost/math/tools/toms748_solve.hpp>
#include <algorithm>
#include <cmath>
#include <algorithm>
#include <atomic>
#include <cstdint>
#include <cstdio>
#include <exception>
#include <limits>
#include <thread>

#include "acidload/core/error.hpp"

namespace acidload {

std::string_view name(Lever l) {
  switch (l) {
    case Lever::h2s_ppmv_dry: return "h2s";
    case Lever::fresh_tbn: return "fresh-tbn";
    case Lever::jacket_water_out: return "jacket-water-out";
    case Lever::oil_volume: return "oil-volume";
  }
  return "?";
}

std::optional<Lever> lever_named(std::string_view word) {
  for (Lever l : {Lever::h2s_ppmv_dry, Lever::fresh_tbn, Lever::jacket_water_out, Lever::oil_volume})
    if (name(l) == word) return l;
  return std::nullopt;
}

LeverSearch default_search(const EngineCase& c, Lever l) {
  // The ranges cover the plants the program is meant for (common practice, no source); the
  // tolerances are far below what the inputs are known to.
  switch (l) {
    case Lever::h2s_ppmv_dry: return {0, 3000, 0.01};  // ppmv dry
    case Lever::fresh_tbn: {                           // mg KOH/g: from just above what the oil cannot give up
      const OilProperties& o = c.charge.oil;
      return {std::max(0.5, o.base_floor + o.weak_base(o.fresh_tbn_method) + 0.01), 30, 1e-4};
    }
    case Lever::jacket_water_out: return {333.15, 393.15, 1e-3};  // K: 60 to 120 degC
    case Lever::oil_volume: {                                     // m3: a tenth to ten times the case's
      const double v = lever_value(c, l);
      return {std::max(1e-3, 0.1 * v), std::min(100.0, 10 * v), 1e-6};  // within what with_lever takes
    }
  }
  return {};
}

EngineCase with_lever(const EngineCase& c, Lever l, double v) {
  EngineCase x = c;
  switch (l) {
    case Lever::h2s_ppmv_dry:
      check::in_range("h2s", v, 0.0, 1e5, "ppmv");
      for (Segment& s : x.record) {
        const double lhv_before = lower_heating_value(s.fuel);
        s.fuel = with_h2s(s.fuel, v * 1e-6 * (1 - s.fuel[Gas::H2O]));
        if (s.operation.electrical_power > 0)  // same power and efficiency: the fuel flow follows the LHV
          s.operation.fuel_flow *= lhv_before / lower_heating_value(s.fuel);
      }
      break;
    // The ranges are those the case file accepts for the same keys (docs/case-format.md).
    case Lever::fresh_tbn:
      check::in_range("fresh-tbn", v, 0.5, 80, "mg KOH/g");
      x.charge.oil.fresh_tbn = v;
      break;
    case Lever::jacket_water_out:
      check::in_range("jacket-water-out", v, 273.15, 423.15, "K (0 to 150 degC)");
      for (Segment& s : x.record) s.operation.jacket_water_out = v;
      break;
    case Lever::oil_volume:
      check::in_range("oil-volume", v, 1e-3, 100, "m3 (1 L to 100 m3)");
      x.charge.mass = v * x.charge.oil.density_15;
      break;
  }
  return x;
}

double lever_value(const EngineCase& c, Lever l) {
  const Segment& s = c.record.at(0);
  switch (l) {
    case Lever::h2s_ppmv_dry: return s.fuel[Gas::H2S] / (1 - s.fuel[Gas::H2O]) * 1e6;
    case Lever::fresh_tbn: return c.charge.oil.fresh_tbn;
    case Lever::jacket_water_out: return s.operation.jacket_water_out;
    case Lever::oil_volume: return c.charge.mass / c.charge.oil.density_15;
  }
  return 0;
}

std::optional<double> drain_interval(const EngineCase& c) {
  RunOptions o = c.options;
  o.stop_at_first_limit = true;
  o.output_interval = 0;
  const RunResult r = simulate(c.charge, c.model, c.record, o);
  const ChargeSummary& ch = r.charges.front();
  if (!ch.oil_limit_reached()) return std::nullopt;  // the planned maximum is a horizon, not an interval
  return ch.drain_interval;
}

std::vector<double> sweep_drain_interval(const EngineCase& c, Lever l, const double* values, std::size_t n, int threads,
                                         const std::atomic<bool>* stop) {
  std::vector<double> out(n, 0.0);
  std::size_t workers = threads > 0 ? static_cast<std::size_t>(threads) : std::max(1u, std::thread::hardware_concurrency());
  workers = std::max<std::size_t>(1, std::min(workers, n));
  constexpr std::size_t block = 16;  // values handed out at a time
  std::atomic<std::size_t> next{0};
  std::atomic<std::size_t> first_bad{n};  // lowest refused element so far; later ones are skipped
  std::vector<std::exception_ptr> errors(n == 0 ? 0 : (n + block - 1) / block);
  const auto work = [&] {
    for (std::size_t b; (b = next.fetch_add(block)) < n;) {
      if (stop && stop->load()) break;
      for (std::size_t i = b; i < std::min(n, b + block); ++i) {
        if (i > first_bad.load()) break;
        try {
          out[i] = drain_interval(with_lever(c, l, values[i])).value_or(std::numeric_limits<double>::quiet_NaN());
        } catch (const InputError& e) {  // name the element of the sweep that was refused
          errors[b / block] = std::make_exception_ptr(
              InputError(e.key(), e.value(), e.expected() + " (element " + std::to_string(i) + " of the sweep)", e.where()));
        } catch (...) {
          errors[b / block] = std::current_exception();
        }
        if (errors[b / block]) {
          for (std::size_t f = first_bad.load(); i < f && !first_bad.compare_exchange_weak(f, i);) {}
          break;
        }
      }
    }
  };
  if (workers == 1) {
    work();
  } else {
    std::vector<std::thread> pool;
    for (std::size_t t = 0; t < workers; ++t) pool.emplace_back(work);
    for (auto& th : pool) th.join();
  }
  if (first_bad.load() < n) std::rethrow_exception(errors[first_bad.load() / block]);
  if (stop && stop->load()) throw Error("sweep interrupted");
  return out;
}

namespace {
// An interval in words for a reason: "N h", or "no limit within N h" (the planned maximum).
std::string interval_words(const std::optional<double>& h, double planned_maximum) {
  return h ? format_value(std::round(*h)) + " h" : "no limit within " + format_value(planned_maximum) + " h";
}
}  // namespace

InverseAnswer solve_for_interval(const EngineCase& c, Lever lever, double target, double lo, double hi, double tol) {
  check::positive("target interval", target);
  if (!(lo < hi)) throw InputError("range", format_value(lo) + " to " + format_value(hi), "a low end below the high end");
  check::positive("tolerance", tol);
  const double planned = c.model.limits.max_hours;
  InverseAnswer a;
  const auto interval = [&](double v) {
    ++a.evaluations;
    return drain_interval(with_lever(c, lever, v));
  };
  a.interval_at_low = interval(lo);
  a.interval_at_high = interval(hi);
  if (target >= planned) {
    a.reason = "the target is at or beyond the plant's planned maximum (" + format_value(planned) +
               " h, limits.max-hours): beyond it lies 'no limit within " + format_value(planned) + " h', not an interval";
    return a;
  }
  // For the sign only, "no limit within N h" counts as N h: longer than any target below N h.
  const auto margin = [&](const std::optional<double>& h) { return h.value_or(planned) - target; };
  const double flo = margin(a.interval_at_low), fhi = margin(a.interval_at_high);
  if (flo == 0) return a.found = true, a.value = lo, a.interval_at_value = target, a;
  if (fhi == 0) return a.found = true, a.value = hi, a.interval_at_value = target, a;
  if ((flo > 0) == (fhi > 0)) {
    a.reason = "no answer in the range: the interval is " + interval_words(a.interval_at_low, planned) + " at " +
               format_value(lo) + " and " + interval_words(a.interval_at_high, planned) + " at " + format_value(hi) +
               ", both " + (flo > 0 ? "above" : "below") + " the target of " + format_value(target) + " h";
    return a;
  }
  std::uintmax_t iterations = 100;
  const auto f = [&](double v) { return margin(interval(v)); };
  const auto tolerance = [tol](double x, double y) { return std::fabs(x - y) <= tol; };
  const auto bracket = boost::math::tools::toms748_solve(f, lo, hi, flo, fhi, tolerance, iterations);
  // The interval either side of the final bracket: a continuous crossing differs there by far less
  // than 1 % of the target; a jump over the target (to no limit, or from one limit to another) does not.
  const std::optional<double> left = interval(bracket.first), right = interval(bracket.second);
  const double mid = 0.5 * (bracket.first + bracket.second);
  if (!left || !right || std::fabs(*left - *right) > 0.01 * target) {
    a.jump = true, a.value = mid, a.jump_from = left, a.jump_to = right;
    char near[32];
    std::snprintf(near, sizeof near, "%.4g", mid);  // where, to the digits that matter (the exact figure in `value`)
    a.reason = "no value gives " + format_value(target) + " h: near " + near + " the interval jumps from " +
               interval_words(left, planned) + " to " + interval_words(right, planned) + ", past the target" +
               (!left || !right ? " into the region where no limit is reached" : "");
    return a;
  }
  a.found = true;
  a.value = mid;
  a.interval_at_value = interval(a.value);
  if (!a.interval_at_value) {  // cannot happen between two reached limits a hair apart; said, not hidden
    a.found = false;
    a.reason = "the model run at the answer reaches no limit within " + format_value(planned) + " h";
  }
  return a;
}

}  // namespace acidload
