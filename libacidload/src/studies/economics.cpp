#include "acidload/studies/economics.hpp"

#include <algorithm>
#include <boost/math/tools/minima.hpp>
#include <cmath>
#include <exception>
#include <limits>
#include <thread>

#include "acidload/core/error.hpp"
#include "acidload/studies/parameters.hpp"

namespace acidload {

Segment segment_piece(const Segment& s, double hours, bool first) {
  Segment e = s;
  const double share = s.hours > 0 ? hours / s.hours : 1;
  e.hours = hours;
  e.starts = s.starts * share;
  e.calendar_hours = s.calendar_hours < 0 ? -1 : s.calendar_hours * share;
  if (!first) e.events.clear();
  return e;
}

namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

double dry_ppmv(const FuelGas& g) { return g[Gas::H2S] / (1 - g[Gas::H2O]) * 1e6; }

// The record split after `hours` of running: (head, tail).
std::pair<std::vector<Segment>, std::vector<Segment>> split(const std::vector<Segment>& rec, double hours) {
  std::vector<Segment> head, tail;
  double t = 0;
  for (const Segment& s : rec) {
    if (t >= hours) {
      tail.push_back(s);
    } else if (t + s.hours <= hours) {
      head.push_back(s);
    } else {
      const double a = hours - t;
      head.push_back(segment_piece(s, a, true));
      tail.push_back(segment_piece(s, s.hours - a, false));
    }
    t += s.hours;
  }
  return {head, tail};
}

double running_hours(const std::vector<Segment>& rec) {
  double h = 0;
  for (const Segment& s : rec) h += s.hours;
  return h;
}

}  // namespace

ScrubbedRecord scrub(const EngineCase& c, const std::vector<TrainStage>& train, double step) {
  check::in_range("scrubbing.step", step, 0.01, 1e5, "h");
  for (const TrainStage& t : train) validate(t.stage);
  const std::size_t n = train.size();
  ScrubbedRecord out;
  out.stages.assign(n, {});
  out.sulfur.stages.assign(n, 0);
  std::vector<double> phi(n, 0), since(n, 0), beta(n, 0), outlet_h(n, 0);
  for (std::size_t k = 0; k < n; ++k)
    if (is_media_bed(train[k].stage.kind)) beta[k] = thomas_steepness(train[k].stage.breakthrough_width);
  double hours = 0, engine_ppmv_h = 0;
  std::size_t pieces = 0;
  for (const Segment& s : c.record) {
    const FuelGas& g = s.fuel;
    const double flow = s.operation.fuel_flow;
    const double in_h2s = flow * g[Gas::H2S], in_os = flow * g.other_sulfur, in_cl = flow * g.chlorine,
                 in_f = flow * g.fluorine;
    const double dry = 1 - g[Gas::H2O];
    double done = 0;
    bool first = true;
    do {
      if (++pieces > 20'000'000)
        throw InputError("scrubbing.step", format_value(step), "a step that keeps the record under 20 million pieces");
      double dt = std::fmin(step, s.hours - done);
      std::vector<StageStep> st(n);
      std::vector<double> phi_star(n, inf), inlet(n, 0);
      double gas_flow = flow;
      // stages in order; a changeout inside the step shortens it (at most a few passes)
      for (int pass = 0; pass < 6; ++pass) {
        double h = in_h2s, os = in_os, cl = in_cl, f = in_f;
        gas_flow = flow;
        double t_first = inf;
        for (std::size_t k = 0; k < n; ++k) {
          const ScrubStage& sg = train[k].stage;
          inlet[k] = h;
          st[k] = stage_step(sg, phi[k], h, os, cl, f, dt);
          if (is_media_bed(sg.kind)) {
            double t_c = inf;
            if (sg.changeout.kind == ChangeoutRule::Kind::schedule) {
              t_c = sg.changeout.every_hours - since[k];
            } else {
              const double x_in = h / gas_flow;
              const double x_set = sg.changeout.outlet_h2s * 1e-6 * dry;
              phi_star[k] = inf;
              if (x_in > 0 && x_set < x_in) {
                try {
                  phi_star[k] = fed_share_at_outlet_ratio(x_set / x_in, sg.efficiency, beta[k]);
                } catch (const InputError& e) {
                  throw InputError("scrubbing." + train[k].name + ".changeout-at",
                                   format_value(sg.changeout.outlet_h2s) + " ppmv",
                                   "a level above what the fresh bed lets through at an inlet of " +
                                       format_value(x_in / dry * 1e6) + " ppmv (" + e.expected() + ")");
                }
                t_c = hours_to_fed_share(sg, phi[k], phi_star[k], h);
              }
            }
            t_first = std::fmin(t_first, std::fmax(t_c, 0.0));
          }
          h -= st[k].h2s_removed;
          os -= st[k].other_sulfur_removed;
          cl -= st[k].chlorine_removed;
          f -= st[k].fluorine_removed;
          gas_flow -= st[k].h2s_removed + st[k].other_sulfur_removed + st[k].chlorine_removed + st[k].fluorine_removed;
        }
        if (pass == 5 || !(t_first < dt * (1 - 1e-12))) break;  // st[] always belongs to this dt
        dt = t_first;
      }
      // the gas behind the train over this piece
      double removed_h2s = 0, removed_os = 0, removed_cl = 0, removed_f = 0;
      for (std::size_t k = 0; k < n; ++k) {
        removed_h2s += st[k].h2s_removed, removed_os += st[k].other_sulfur_removed;
        removed_cl += st[k].chlorine_removed, removed_f += st[k].fluorine_removed;
      }
      double engine_flow = flow;
      const FuelGas eg = n ? after_removal(g, flow, removed_h2s, removed_os, removed_cl, removed_f, engine_flow) : g;
      if (dt > 0 || (s.hours == 0 && first)) {
        Segment e = segment_piece(s, dt, first);
        e.fuel = eg;
        e.operation.fuel_flow = engine_flow;
        out.record.push_back(e);
        out.source.push_back(static_cast<std::size_t>(&s - c.record.data()));
        first = false;
      }
      // ledgers and outlet means
      out.sulfur.raw += (in_h2s + in_os) * dt;
      out.sulfur.engine += engine_flow * (eg[Gas::H2S] + eg.other_sulfur) * dt;
      {
        double h = in_h2s, fl = flow;
        for (std::size_t k = 0; k < n; ++k) {
          const double removed = st[k].h2s_removed + st[k].other_sulfur_removed;
          out.sulfur.stages[k] += removed * dt;
          out.stages[k].sulfur_removed += removed * dt * atomic_weight(Element::S) * 1e-3;
          h -= st[k].h2s_removed;
          fl -= st[k].h2s_removed + st[k].other_sulfur_removed + st[k].chlorine_removed + st[k].fluorine_removed;
          const double x_water = g[Gas::H2O] * flow / fl;
          outlet_h[k] += h / fl / (1 - x_water) * 1e6 * dt;
        }
      }
      engine_ppmv_h += dry_ppmv(eg) * dt;
      hours += dt;
      done += dt;
      // beds move on; changeouts
      for (std::size_t k = 0; k < n; ++k) {
        const ScrubStage& sg = train[k].stage;
        if (!is_media_bed(sg.kind)) continue;
        phi[k] = st[k].fed_share_after;
        since[k] += dt;
        const bool due = sg.changeout.kind == ChangeoutRule::Kind::schedule
                             ? since[k] >= sg.changeout.every_hours * (1 - 1e-12)
                             : phi[k] >= phi_star[k] * (1 - 1e-12);
        if (due) {
          StageRecord& r = out.stages[k];
          if (r.changeouts == 0) r.first_bed_life = hours;
          ++r.changeouts;
          phi[k] = 0;
          since[k] = 0;
        }
        out.stages[k].bed_share_used = sg.changeout.kind == ChangeoutRule::Kind::schedule
                                           ? since[k] / sg.changeout.every_hours
                                           : (std::isfinite(phi_star[k]) ? phi[k] / phi_star[k] : 0.0);
      }
    } while (done < s.hours);
  }
  for (std::size_t k = 0; k < n; ++k) out.stages[k].mean_outlet_ppmv = hours > 0 ? outlet_h[k] / hours : 0;
  out.mean_engine_h2s_ppmv = hours > 0 ? engine_ppmv_h / hours : dry_ppmv(c.record.front().fuel);
  return out;
}

OilOverRecord oil_over_record(const EngineCase& c, const std::vector<Segment>& record) {
  if (record.empty()) throw InputError("record", "(empty)", "at least one segment of operation");
  RunOptions stop = c.options;
  stop.output_interval = 0;
  stop.keep_segment_ends = false;
  RunOptions through = stop;
  stop.stop_at_first_limit = true;
  OilOverRecord out;
  std::vector<Segment> rest = record;
  std::optional<OilState> state;
  for (;;) {
    const RunResult r = simulate(c.charge, c.model, rest, stop, state, 0);
    const ChargeSummary& ch = r.charges.front();
    const double left = running_hours(rest);
    if (!ch.first || ch.drain_interval >= left) {
      // the last charge: its interval continued under the last segment to its limit (the cap at most)
      std::vector<Segment> more = rest;
      if (left < c.model.limits.max_hours) {
        more.push_back(segment_piece(rest.back(), c.model.limits.max_hours - left, false));
      }
      const RunResult m = simulate(c.charge, c.model, more, stop, state, 0);
      const ChargeSummary& mc = m.charges.front();
      const double interval = mc.first ? mc.drain_interval : c.model.limits.max_hours;
      out.intervals.push_back(interval);
      out.last_share = interval > 0 ? std::fmin(1.0, left / interval) : 1;
      break;
    }
    const double d = ch.drain_interval;
    if (!(d > 1e-6)) throw NotModelledError("a fresh charge is at a limit at once: no oil life to cost");
    out.intervals.push_back(d);
    auto [head, tail] = split(rest, d);
    RunResult h = simulate(c.charge, c.model, head, through, state, 0);
    OilState s = h.final_state;
    OilLedger ledger;
    oil_change(s, c.charge.oil, c.charge.residual_share, c.charge.mass, ledger);
    state = s;
    ++out.completed;
    rest = std::move(tail);
    if (rest.empty() || running_hours(rest) <= 0) break;
    if (out.completed > 1'000'000) throw InputError("record", "(oil changes)", "fewer than a million oil changes");
  }
  out.changes = out.completed + out.last_share;
  return out;
}

YearQuantities year_quantities(const CostCase& c, const ScrubbedRecord& s, const OilOverRecord& oil) {
  const EngineCase& e = c.engine;
  const double record_h = running_hours(e.record);
  check::positive("record running hours", record_h);
  const double hpy = c.hours_per_year > 0 ? c.hours_per_year : record_h;
  const double factor = hpy / record_h;
  YearQuantities q;
  q.running_hours = hpy;
  double energy = 0, burnt = 0;  // [W·h], [kg]
  for (const Segment& x : e.record) energy += x.operation.electrical_power * x.hours, burnt += x.oil_consumption * x.hours;
  q.energy = energy * 3600 * factor;
  q.power = energy / record_h;
  q.oil_changes = oil.changes * factor;
  q.oil_per_change = c.oil_per_change >= 0 ? c.oil_per_change
                                           : e.charge.mass / e.charge.oil.density_15 * (1 - e.charge.residual_share);
  q.makeup_oil = burnt / e.charge.oil.density_15 * factor;
  q.engine_h2s_ppmv = s.mean_engine_h2s_ppmv;
  for (std::size_t k = 0; k < c.train.size(); ++k) {
    StageYear y;
    y.kind = c.train[k].stage.kind;
    y.bed_mass = is_media_bed(y.kind) ? c.train[k].stage.bed_mass : 0;
    y.changeouts = is_media_bed(y.kind) ? (s.stages[k].changeouts + s.stages[k].bed_share_used) * factor : 0;
    y.sulfur_removed = s.stages[k].sulfur_removed * factor;
    q.stages.push_back(y);
    q.stage_costs.push_back(c.train[k].costs);
  }
  return q;
}

VariantCosts costs(const CostCase& c) {
  VariantCosts v;
  v.name = c.engine.name;
  v.currency = c.currency;
  v.scrubbed = scrub(c.engine, c.train, c.step);
  v.oil = oil_over_record(c.engine, v.scrubbed.record);
  v.quantities = year_quantities(c, v.scrubbed, v.oil);
  v.record_hours = running_hours(c.engine.record);
  v.year_factor = v.quantities.running_hours / v.record_hours;
  v.per_year = cost_items(v.quantities, c.prices);
  v.per_mwh = per_mwh(v.per_year, v.quantities.energy);
  v.total_per_year = total(v.per_year);
  v.total_per_mwh = total(v.per_mwh);
  return v;
}

std::vector<VariantCosts> compare_costs(const std::vector<CostCase>& cases) {
  std::vector<VariantCosts> out;
  for (const CostCase& c : cases) out.push_back(costs(c));
  std::vector<std::size_t> order(out.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return out[a].total_per_mwh < out[b].total_per_mwh; });
  for (std::size_t r = 0; r < order.size(); ++r) out[order[r]].rank = static_cast<int>(r) + 1;
  return out;
}

std::size_t level_stage(const CostCase& c) {
  for (std::size_t k = c.train.size(); k-- > 0;) {
    const StageKind kind = c.train[k].stage.kind;
    if (kind != StageKind::caustic && kind != StageKind::biological) return k;
  }
  throw InputError("scrubbing", "(no media bed or fixed stage)",
                   "a train with a media bed or a fixed-efficiency stage for the cheapest-level question");
}

namespace {
// The running-hours mean H2S entering stage k [ppmv dry].
double mean_inlet_ppmv(const CostCase& c, std::size_t k) {
  if (k == 0) {
    double h = 0, sum = 0;
    for (const Segment& s : c.engine.record) sum += dry_ppmv(s.fuel) * s.hours, h += s.hours;
    return h > 0 ? sum / h : dry_ppmv(c.engine.record.front().fuel);
  }
  std::vector<TrainStage> upstream(c.train.begin(), c.train.begin() + static_cast<std::ptrdiff_t>(k));
  return scrub(c.engine, upstream, c.step).mean_engine_h2s_ppmv;
}
}  // namespace

LevelRange default_level_range(const CostCase& c, std::size_t k) {
  if (k >= c.train.size()) throw InputError("stage", std::to_string(k + 1), "a stage of the train (1 to " + std::to_string(c.train.size()) + ")");
  const double inlet = mean_inlet_ppmv(c, k);
  const ScrubStage& s = c.train[k].stage;
  if (!is_media_bed(s.kind)) return {0, inlet};
  const double low = std::fmax(0.5, 1.5 * (1 - s.efficiency) * inlet);
  return {std::fmin(low, 0.5 * inlet), 0.95 * inlet};
}

CostCase with_outlet_level(const CostCase& c, std::size_t k, double level) {
  if (k >= c.train.size()) throw InputError("stage", std::to_string(k + 1), "a stage of the train (1 to " + std::to_string(c.train.size()) + ")");
  check::in_range("outlet level", level, 0.0, 1e5, "ppmv");
  CostCase x = c;
  ScrubStage& s = x.train[k].stage;
  if (is_media_bed(s.kind)) {
    s.changeout.kind = ChangeoutRule::Kind::outlet_level;
    s.changeout.outlet_h2s = level;
    return x;
  }
  // a fixed-efficiency stage: removal from its mean inlet (the outlet of the stage before, or the raw gas)
  const double inlet = mean_inlet_ppmv(c, k);
  s.efficiency = inlet > 0 ? std::clamp(1 - level / inlet, 0.0, 1.0) : 0;
  return x;
}

double total_per_mwh_at(const CostCase& c, std::size_t stage, double level) {
  return costs(with_outlet_level(c, stage, level)).total_per_mwh;
}

CheapestLevel cheapest_level(const CostCase& c, std::size_t stage, double lo, double hi, int points, double tol) {
  if (!(lo >= 0 && lo < hi)) throw InputError("range", format_value(lo) + " to " + format_value(hi), "0 <= low < high [ppmv]");
  check::in_range("points", points, 3, 1000, "");
  check::positive("tolerance", tol);
  CheapestLevel a;
  a.stage = stage;
  const auto f = [&](double level) {
    ++a.evaluations;
    try {
      return total_per_mwh_at(c, stage, level);
    } catch (const InputError&) {
      return inf;  // a level the bed cannot hold (below its fresh outlet)
    }
  };
  std::size_t best = 0;
  for (int i = 0; i < points; ++i) {
    const double x = lo + (hi - lo) * i / (points - 1);
    a.grid_ppmv.push_back(x);
    a.grid_total.push_back(f(x));
    if (a.grid_total.back() < a.grid_total[best]) best = static_cast<std::size_t>(i);
  }
  if (!std::isfinite(a.grid_total[best])) {
    a.reason = "no level in the range can be held: each is at or below what the fresh bed lets through";
    return a;
  }
  const double x0 = a.grid_ppmv[best > 0 ? best - 1 : 0];
  const double x1 = a.grid_ppmv[std::min(best + 1, a.grid_ppmv.size() - 1)];
  double x = a.grid_ppmv[best], fx = a.grid_total[best];
  if (x1 > x0) {
    std::uintmax_t iterations = 60;
    const int bits = std::max(4, static_cast<int>(std::ceil(-std::log2(tol / (x1 - x0)))));
    // Brent's parabolic steps need finite values: an infeasible level is a large cost rising to the left
    const auto g = [&](double level) {
      const double v = f(level);
      return std::isfinite(v) ? v : 1e30 * (1 + hi - level);
    };
    const auto m = boost::math::tools::brent_find_minima(g, x0, x1, std::min(bits, 40), iterations);
    if (m.second < fx) x = m.first, fx = m.second;
  }
  a.level_ppmv = x;
  a.total_per_mwh = f(x);
  const double d = std::fmax(4 * tol, 0.01 * (hi - lo));
  a.verified_low = x - d >= lo ? f(x - d) : a.total_per_mwh;
  a.verified_high = x + d <= hi ? f(x + d) : a.total_per_mwh;
  const double slack = 1e-9 * std::fabs(a.total_per_mwh);
  a.found = a.total_per_mwh <= a.verified_low + slack && a.total_per_mwh <= a.verified_high + slack &&
            a.total_per_mwh <= a.grid_total[best] + slack;
  if (!a.found) a.reason = "the forward runs either side of the answer are cheaper: the cost has no clear minimum here";
  else if (x <= lo + d || x >= hi - d)
    a.reason = "the cheapest level is at the end of the range: it may lie beyond";
  return a;
}

std::vector<PriceSensitivity> price_sensitivity(const std::vector<VariantCosts>& v, double step) {
  check::in_range("sensitivity step", step, 1e-6, 0.99, "(share)");
  std::vector<PriceSensitivity> out;
  if (v.empty()) return out;
  const auto cheapest = [](const std::vector<double>& t) {
    return static_cast<std::size_t>(std::min_element(t.begin(), t.end()) - t.begin());
  };
  std::vector<double> base;
  for (const VariantCosts& x : v) base.push_back(x.total_per_mwh);
  const std::size_t c0 = cheapest(base);
  for (Price p : all_prices) {
    PriceSensitivity s;
    s.price = p;
    std::vector<double> share(v.size(), 0);  // B: the part of each total proportional to this price
    for (std::size_t i = 0; i < v.size(); ++i)
      for (CostItem it : all_cost_items)
        if (price_of(it) == p) share[i] += v[i].per_mwh[static_cast<std::size_t>(it)];
    for (std::size_t i = 0; i < v.size(); ++i) {
      s.total_low.push_back(base[i] - step * share[i]);
      s.total_high.push_back(base[i] + step * share[i]);
      s.swing = std::fmax(s.swing, step * share[i]);
    }
    s.cheapest_low = cheapest(s.total_low);
    s.cheapest_high = cheapest(s.total_high);
    // total_i(f) = base_i + (f − 1)·B_i: the first crossing of the cheapest by another variant
    double best_distance = inf;
    for (std::size_t w = 0; w < v.size(); ++w) {
      if (w == c0 || share[w] == share[c0]) continue;
      const double f = 1 + (base[w] - base[c0]) / (share[c0] - share[w]);
      if (!(f >= 0 && f <= 10) || f == 1) continue;
      const double dist = std::fabs(std::log(std::fmax(f, 1e-300)));
      if (dist < best_distance) best_distance = dist, s.break_even_factor = f, s.break_even_to = w;
    }
    out.push_back(s);
  }
  return out;
}

const std::vector<std::string>& price_keys() {
  static const std::vector<std::string> k = {
      "economics.oil-price",         "economics.electricity-price", "economics.iron-oxide-price",
      "economics.carbon-price",      "economics.disposal-price",    "economics.caustic-price",
      "economics.biological-consumables", "economics.oil-change-labour", "economics.changeout-labour",
      "economics.lab-cost",          "economics.wear-cost"};
  return k;
}

void set_price(CostCase& c, std::string_view key, double v) {
  if (!(std::isfinite(v) && v >= 0)) throw InputError(std::string(key), format_value(v), "a price of 0 or more");
  Prices& p = c.prices;
  if (key == "economics.oil-price") p.oil = v;
  else if (key == "economics.electricity-price") p.electricity = v;
  else if (key == "economics.iron-oxide-price") p.iron_oxide = v;
  else if (key == "economics.carbon-price") p.carbon = v;
  else if (key == "economics.disposal-price") p.disposal = v;
  else if (key == "economics.caustic-price") p.caustic = v;
  else if (key == "economics.biological-consumables") p.biological = v;
  else if (key == "economics.oil-change-labour") p.oil_change_labour = v;
  else if (key == "economics.changeout-labour") p.changeout_labour = v;
  else if (key == "economics.lab-cost") p.lab_sample = v;
  else if (key == "economics.wear-cost") p.wear_cost = v;
  else {
    std::string all;
    for (const auto& k : price_keys()) all += (all.empty() ? "" : ", ") + k;
    throw InputError("parameter", std::string(key), "one of: " + all);
  }
}

std::vector<UncertainInput> without_prices(const std::vector<UncertainInput>& inputs) {
  std::vector<UncertainInput> out;
  for (const UncertainInput& in : inputs)
    if (std::find(price_keys().begin(), price_keys().end(), in.key) == price_keys().end()) out.push_back(in);
  return out;
}

CostMonteCarlo cost_monte_carlo(const std::vector<CostCase>& cases, const std::vector<UncertainInput>& inputs, int draws,
                                std::uint64_t seed, int threads) {
  check::in_range("draws", draws, 1, 1e7, "");
  if (cases.empty()) throw InputError("variants", "(none)", "at least one variant");
  bool physics = false;  // does any input change what the engine or the beds do?
  for (const UncertainInput& in : inputs) {
    const bool price = std::find(price_keys().begin(), price_keys().end(), in.key) != price_keys().end();
    if (!price) parameter(in.key), physics = true;
  }
  // the quantities once, when only prices vary
  std::vector<VariantCosts> fixed;
  if (!physics)
    for (const CostCase& c : cases) fixed.push_back(costs(c));
  CostMonteCarlo out;
  out.draws = draws;
  out.total_per_mwh.assign(cases.size(), std::vector<double>(static_cast<std::size_t>(draws), 0));
  const auto one = [&](int i) {
    for (std::size_t v = 0; v < cases.size(); ++v) {
      CostCase x = cases[v];
      for (std::size_t k = 0; k < inputs.size(); ++k) {
        // the same numbers for every variant in a draw: common random numbers, so rankings compare fairly
        const double u1 = uniform01(seed, static_cast<std::uint64_t>(i), 2 * k);
        const double u2 = uniform01(seed, static_cast<std::uint64_t>(i), 2 * k + 1);
        const double value = sample(inputs[k].distribution, u1, u2);
        const auto& pk = price_keys();
        if (std::find(pk.begin(), pk.end(), inputs[k].key) != pk.end()) set_price(x, inputs[k].key, std::fmax(0.0, value));
        else set_parameter(x.engine, inputs[k].key, value);
      }
      double t = 0;
      if (physics) {
        t = costs(x).total_per_mwh;
      } else {
        t = total(per_mwh(cost_items(fixed[v].quantities, x.prices), fixed[v].quantities.energy));
      }
      out.total_per_mwh[v][static_cast<std::size_t>(i)] = t;
    }
  };
  int nt = threads > 0 ? threads : static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  nt = std::min(nt, draws);
  std::vector<std::thread> pool;
  std::vector<std::exception_ptr> errors(static_cast<std::size_t>(nt));
  for (int t = 0; t < nt; ++t)
    pool.emplace_back([&, t] {
      try {
        for (int i = t; i < draws; i += nt) one(i);
      } catch (...) {
        errors[static_cast<std::size_t>(t)] = std::current_exception();
      }
    });
  for (auto& th : pool) th.join();
  for (auto& e : errors)
    if (e) std::rethrow_exception(e);
  out.cheapest_share.assign(cases.size(), 0);
  for (int i = 0; i < draws; ++i) {
    std::size_t best = 0;
    for (std::size_t v = 1; v < cases.size(); ++v)
      if (out.total_per_mwh[v][static_cast<std::size_t>(i)] < out.total_per_mwh[best][static_cast<std::size_t>(i)]) best = v;
    out.cheapest_share[best] += 1.0 / draws;
  }
  for (const auto& t : out.total_per_mwh) {
    out.p10.push_back(percentile(t, 10));
    out.p50.push_back(percentile(t, 50));
    out.p90.push_back(percentile(t, 90));
  }
  return out;
}

}  // namespace acidload
