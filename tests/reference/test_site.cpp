// A site's shared train against the Thomas closed form and its balances (docs/model.md §18.4).
// Invented engines and bed.
#include <cmath>

#include "../support/reference_check.hpp"
#include "../support/sanity_case.hpp"
#include "acidload/core/scrubber.hpp"
#include "acidload/studies/site.hpp"

using namespace acidload;

namespace {

EngineCase engine(double hours, double flow_factor) {
  EngineCase c;
  c.name = "engine";
  c.charge = acidload_test::sanity_charge();
  c.record = {acidload_test::sanity_segment(hours, 300)};
  c.record.front().operation.fuel_flow *= flow_factor;
  return c;
}

SiteCase site_of(const std::vector<EngineCase>& engines) {
  TrainStage t;
  t.name = "iron oxide bed";
  t.stage.kind = StageKind::iron_oxide;
  t.stage.bed_mass = 2000;
  t.stage.capacity = 0.2;
  t.stage.efficiency = 0.99;
  t.stage.changeout = {ChangeoutRule::Kind::outlet_level, 50, 0};
  t.costs.capital = 60000;
  t.costs.life_years = 10;
  Prices p;
  p.oil = 3000, p.oil_change_labour = 400, p.oil_change_downtime = 6, p.electricity = 90 / 3.6e9;
  p.iron_oxide = 1.5, p.disposal = 0.4, p.changeout_labour = 800, p.changeout_downtime = 8;
  SiteCase s;
  s.train = {t};
  s.prices = p;
  for (const EngineCase& e : engines) {
    CostCase c;
    c.engine = e;
    c.prices = p;
    s.engines.push_back(c);
  }
  return s;
}

}  // namespace

TEST_CASE("a site's bed: two identical engines against Thomas' closed form (life ∝ 1/flow)") {
  const EngineCase one = engine(8000, 1);
  const SiteResult pair = run_site(site_of({one, one}));
  const Segment& s0 = one.record.front();
  const double dry = 1 - s0.fuel[Gas::H2O];
  const double phi_star = fed_share_at_outlet_ratio(50e-6 * dry / s0.fuel[Gas::H2S], 0.99, thomas_steepness(0.2));
  const double hold = 0.2 * 2000 / (atomic_weight(Element::S) * 1e-3);
  const double life = phi_star * hold / (0.99 * 2 * s0.operation.fuel_flow * s0.fuel[Gas::H2S]);
  REFERENCE_CHECK("site bed life, 2 identical engines", pair.scrubbed.stages[0].first_bed_life, life, relative, 1e-9, "h",
                  "Thomas 1944 constant-inlet life phi*.q0.M/(eta.sum of H2S flows), docs/model.md §18.1, §18.4, analytic");
}

TEST_CASE("a site's balances: sulfur and the cost split (unequal engines)") {
  const SiteResult s = run_site(site_of({engine(8000, 1), engine(6000, 1.6), engine(9000, 0.5)}));
  REFERENCE_CHECK("site sulfur balance raw = beds + engines' exhaust and oil", s.sulfur_balance_error, 0.0, absolute, 1e-9, "-",
                  "conservation of sulfur atoms, docs/model.md §18.4");
  double split = 0;
  for (const SiteEngine& e : s.engines) split += e.costs.total_per_year;
  REFERENCE_CHECK("site cost split: sum of the engines' totals / site total", split / s.total_per_year, 1.0, absolute, 1e-12, "-",
                  "shared items split by gas share sum to the whole (arithmetic), docs/model.md §18.4");
  double shared = 0, shared_split = 0;
  for (CostItem i : all_cost_items)
    if (is_shared_item(i)) {
      shared += s.shared_per_year[static_cast<std::size_t>(i)];
      for (const SiteEngine& e : s.engines) shared_split += e.costs.per_year[static_cast<std::size_t>(i)];
    }
  REFERENCE_CHECK("site shared items: sum of the engines' shares / site's", shared_split / shared, 1.0, absolute, 1e-12, "-",
                  "gas shares sum to 1 (arithmetic), docs/model.md §18.4");
}

TEST_CASE("a site of one engine equals the engine's own case (consistency, not a reference)") {
  CostCase c = site_of({engine(8000, 1)}).engines[0];
  c.train = site_of({}).train;
  const VariantCosts v = costs(c);
  const SiteResult s = run_site(site_of({engine(8000, 1)}));
  REFERENCE_CHECK("site of one engine: total per year / the engine's", s.total_per_year / v.total_per_year, 1.0, absolute, 1e-14, "-",
                  "consistency with the single-engine economics (docs/model.md §18.4), not a reference");
}

#include "acidload/io/site_file.hpp"

TEST_CASE("a site file's gas record laid on an engine's running hours: the time-weighted mean by hand") {
  // docs/case-format.md, "Sites": engine hour t meets the gas record's hour t. No train: the engine
  // burns the raw gas, so its running-hours mean H2S over 1000 h at 100 ppmv and 1000 h at 400 ppmv
  // is (1000·100 + 1000·400)/2000 = 250 ppmv (arithmetic), and one of 1000 h sees 100 ppmv.
  const io::SiteFile f = io::load_site_text(R"(format-version: 1
fuel: {composition: {CH4: 55 %, CO2: 45 %}, h2s: 200 ppmv}
engine: {rated-power: 1 MW, electrical-efficiency: 40 %, load: 100 %}
oil: {volume: 600 L}
site:
  gas-record: {segments: [{hours: 1000 h, h2s: 100 ppmv}, {hours: 1000 h, h2s: 400 ppmv}]}
  engines:
    - {name: a, record: {segments: [{hours: 1500 h}, {hours: 500 h, load: 80 %}]}}
    - {name: b, record: {segments: [{hours: 1000 h}]}}
)", "site.yaml", ".");
  const SiteResult r = run_site(f.site);
  REFERENCE_CHECK("site engine H2S on the gas record, 2000 h", r.engines[0].mean_h2s_ppmv, 250, relative, 1e-9, "ppmv",
                  "time-weighted mean by hand (docs/case-format.md, Sites: one running-hours clock), arithmetic");
  REFERENCE_CHECK("site engine H2S on the gas record, 1000 h", r.engines[1].mean_h2s_ppmv, 100, relative, 1e-9, "ppmv",
                  "the first stretch's gas (docs/case-format.md, Sites), arithmetic");
}
