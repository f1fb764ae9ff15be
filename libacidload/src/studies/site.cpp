#include "acidload/studies/site.hpp"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <exception>
#include <string>
#include <thread>

#include "acidload/core/error.hpp"

namespace acidload {

namespace {

double dry_ppmv(const FuelGas& g) { return g[Gas::H2S] / (1 - g[Gas::H2O]) * 1e6; }

double running_hours(const std::vector<Segment>& rec) {
  double h = 0;
  for (const Segment& s : rec) h += s.hours;
  return h;
}

bool same_gas(const FuelGas& a, const FuelGas& b) {
  for (std::size_t k = 0; k < gas_count; ++k)
    if (a.x[k] != b.x[k]) return false;
  return a.other_sulfur == b.other_sulfur && a.chlorine == b.chlorine && a.fluorine == b.fluorine;
}

// A merged segment and the engine segments running in it.
struct Member {
  std::size_t engine, segment;
};

struct Merged {
  std::vector<Segment> record;
  std::vector<std::vector<Member>> members;
};

// The merged timeline (docs/model.md §18.4): breakpoints of every engine's record; a zero-hour segment
// (events only) stays its engine's own.
Merged merge(const std::vector<const EngineCase*>& engines) {
  const std::size_t n = engines.size();
  if (n == 0) throw InputError("site.engines", "(none)", "at least one engine");
  Merged m;
  std::vector<std::size_t> idx(n, 0);
  std::vector<double> rem(n, 0);
  for (std::size_t e = 0; e < n; ++e) {
    if (engines[e]->record.empty()) throw InputError("site.engines[" + std::to_string(e) + "].record", "(empty)", "at least one segment");
    rem[e] = engines[e]->record.front().hours;
  }
  for (std::size_t guard = 0;; ++guard) {
    if (guard > 20'000'000) throw InputError("site.engines", "(records)", "records that merge into under 20 million segments");
    for (std::size_t e = 0; e < n; ++e)
      while (idx[e] < engines[e]->record.size() && engines[e]->record[idx[e]].hours == 0) {
        const Segment& s = engines[e]->record[idx[e]];
        m.record.push_back(s);
        m.members.push_back({{e, idx[e]}});
        if (++idx[e] < engines[e]->record.size()) rem[e] = engines[e]->record[idx[e]].hours;
      }
    double dt = -1;
    std::size_t lead = n;
    for (std::size_t e = 0; e < n; ++e)
      if (idx[e] < engines[e]->record.size() && (lead == n || rem[e] < dt)) dt = rem[e], lead = e;
    if (lead == n) break;
    const Segment& ls = engines[lead]->record[idx[lead]];
    Segment g;
    g.hours = dt;
    g.fuel = ls.fuel;
    g.operation.fuel_flow = 0;
    std::vector<Member> here;
    for (std::size_t e = 0; e < n; ++e) {
      if (idx[e] >= engines[e]->record.size()) continue;
      const Segment& s = engines[e]->record[idx[e]];
      if (!same_gas(s.fuel, ls.fuel))
        throw InputError("site.engines[" + std::to_string(e) + "].record", "(gas at " + format_value(running_hours(m.record)) + " h)",
                         "the same gas as the site's other engines at the same time (one gas supply)");
      g.operation.fuel_flow += s.operation.fuel_flow;  // the bed loads with the sum of the flows (docs/model.md §18.4)
      here.push_back({e, idx[e]});
      rem[e] -= dt;
    }
    m.record.push_back(g);
    m.members.push_back(here);
    for (std::size_t e = 0; e < n; ++e)
      if (idx[e] < engines[e]->record.size() && rem[e] <= 0 && !(engines[e]->record[idx[e]].hours == 0))
        if (++idx[e] < engines[e]->record.size()) rem[e] = engines[e]->record[idx[e]].hours;
  }
  return m;
}

}  // namespace

std::vector<Segment> site_gas_record(const std::vector<const EngineCase*>& engines) { return merge(engines).record; }

bool is_shared_item(CostItem i) {
  return i == CostItem::media || i == CostItem::media_disposal || i == CostItem::changeout_labour ||
         i == CostItem::consumables || i == CostItem::capital;
}

SiteResult run_site(const SiteCase& site, int threads) {
  std::vector<const EngineCase*> cases;
  for (const CostCase& c : site.engines) cases.push_back(&c.engine);
  const Merged m = merge(cases);
  SiteResult out;
  out.name = site.name;
  out.raw = m.record;
  EngineCase gas;  // the site's raw gas: only the record is read by the train
  gas.record = m.record;
  out.scrubbed = scrub(gas, site.train, site.step);
  const ScrubbedRecord& s = out.scrubbed;
  const std::size_t n = site.engines.size();
  // each engine's record re-split onto the gas behind the train
  std::vector<std::vector<Segment>> records(n);
  std::vector<double> raw_gas(n, 0), burnt(n, 0), ppmv_h(n, 0);
  std::vector<std::size_t> last_segment(n, static_cast<std::size_t>(-1));
  for (std::size_t p = 0; p < s.record.size(); ++p) {
    const Segment& piece = s.record[p];
    const Segment& merged = m.record[s.source[p]];
    for (const Member& mb : m.members[s.source[p]]) {
      const Segment& own = site.engines[mb.engine].engine.record[mb.segment];
      const bool first = last_segment[mb.engine] != mb.segment;
      last_segment[mb.engine] = mb.segment;
      Segment e = segment_piece(own, piece.hours, first);
      e.fuel = piece.fuel;
      // its share of the gas behind the train: the train takes from each engine's gas alike
      const double share = merged.operation.fuel_flow > 0 ? own.operation.fuel_flow / merged.operation.fuel_flow : 0;
      e.operation.fuel_flow = merged.operation.fuel_flow > 0 ? piece.operation.fuel_flow * share : own.operation.fuel_flow;
      raw_gas[mb.engine] += own.operation.fuel_flow * piece.hours;
      burnt[mb.engine] += e.operation.fuel_flow * (e.fuel[Gas::H2S] + e.fuel.other_sulfur) * piece.hours;
      ppmv_h[mb.engine] += dry_ppmv(e.fuel) * piece.hours;
      records[mb.engine].push_back(e);
    }
  }
  double raw_total = 0;
  for (double v : raw_gas) raw_total += v;
  // the train's quantities a year, at the site's running hours
  const double site_h = running_hours(m.record);
  check::positive("site record running hours", site_h);
  const double hpy = site.hours_per_year > 0 ? site.hours_per_year : site_h;
  const double factor = hpy / site_h;
  YearQuantities& q = out.shared_quantities;
  q.running_hours = hpy;
  for (std::size_t k = 0; k < site.train.size(); ++k) {
    StageYear y;
    y.kind = site.train[k].stage.kind;
    y.bed_mass = is_media_bed(y.kind) ? site.train[k].stage.bed_mass : 0;
    y.changeouts = is_media_bed(y.kind) ? (s.stages[k].changeouts + s.stages[k].bed_share_used) * factor : 0;
    y.sulfur_removed = s.stages[k].sulfur_removed * factor;
    q.stages.push_back(y);
    q.stage_costs.push_back(site.train[k].costs);
  }
  const CostItems all = cost_items(q, site.prices);
  for (CostItem i : all_cost_items)
    if (is_shared_item(i)) out.shared_per_year[static_cast<std::size_t>(i)] = all[static_cast<std::size_t>(i)];
  // each engine's oil changes on its gas (the bulk of the work), on `threads` threads: independent
  std::vector<OilOverRecord> oils(n);
  {
    std::vector<std::exception_ptr> errors(n);
    std::atomic<std::size_t> next{0};
    const auto work = [&] {
      for (std::size_t e; (e = next.fetch_add(1)) < n;) {
        try {
          oils[e] = oil_over_record(site.engines[e].engine, records[e]);
        } catch (...) {
          errors[e] = std::current_exception();
        }
      }
    };
    std::size_t workers = threads > 0 ? static_cast<std::size_t>(threads) : std::max(1u, std::thread::hardware_concurrency());
    workers = std::max<std::size_t>(1, std::min(workers, n));
    if (workers == 1) {
      work();
    } else {
      std::vector<std::thread> pool;
      for (std::size_t t = 0; t < workers; ++t) pool.emplace_back(work);
      for (auto& th : pool) th.join();
    }
    for (const auto& x : errors)
      if (x) std::rethrow_exception(x);
  }
  double sulfur_engines = 0;
  for (std::size_t e = 0; e < n; ++e) {
    const CostCase& cc = site.engines[e];
    SiteEngine r;
    r.name = cc.engine.name;
    r.record = std::move(records[e]);
    r.gas_share = raw_total > 0 ? raw_gas[e] / raw_total : 1.0 / static_cast<double>(n);
    r.sulfur_burnt = burnt[e];
    const double own_h = running_hours(r.record);
    r.mean_h2s_ppmv = own_h > 0 ? ppmv_h[e] / own_h : dry_ppmv(cc.engine.record.front().fuel);
    sulfur_engines += burnt[e];
    r.oil = std::move(oils[e]);
    // its costs: its own quantities with the site's train (changeout downtime at its own power)
    CostCase mine = cc;
    mine.train = site.train;
    ScrubbedRecord as_seen;
    as_seen.stages = s.stages;
    as_seen.mean_engine_h2s_ppmv = r.mean_h2s_ppmv;
    VariantCosts& v = r.costs;
    v.name = r.name;
    v.currency = cc.currency;
    v.oil = r.oil;
    v.quantities = year_quantities(mine, as_seen, r.oil);
    v.record_hours = running_hours(cc.engine.record);
    v.year_factor = v.quantities.running_hours / v.record_hours;
    v.per_year = cost_items(v.quantities, cc.prices);
    for (CostItem i : all_cost_items)  // shared items: its gas share of the site's (docs/model.md §18.4)
      if (is_shared_item(i)) v.per_year[static_cast<std::size_t>(i)] = r.gas_share * out.shared_per_year[static_cast<std::size_t>(i)];
    v.per_mwh = per_mwh(v.per_year, v.quantities.energy);
    v.total_per_year = total(v.per_year);
    v.total_per_mwh = total(v.per_mwh);
    as_seen.record = r.record;
    as_seen.sulfur.raw = s.sulfur.raw * r.gas_share;
    as_seen.sulfur.engine = burnt[e];
    v.scrubbed = std::move(as_seen);
    out.total_per_year += v.total_per_year;
    out.engines.push_back(std::move(r));
  }
  double stages = 0;
  for (double v : s.sulfur.stages) stages += v;
  out.sulfur_balance_error = s.sulfur.raw > 0 ? std::fabs(s.sulfur.raw - stages - sulfur_engines) / s.sulfur.raw : 0;
  return out;
}

}  // namespace acidload
