// Sites: several engines on one gas supply and one scrubbing train (docs/model.md §18.4). Checks: a
// site of one engine equals that engine's case (consistency); two identical engines load the bed as
// one engine of twice the flow, and the bed's life is the Thomas closed form (docs/model.md §18.1, [Thomas1944]),
// life ∝ 1/flow; the sulfur balance closes; the cost split sums to the site's total. Invented data.
#include <doctest/doctest.h>

#include <cmath>

#include "../support/sanity_case.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/site.hpp"

using namespace acidload;

namespace {

EngineCase engine(double hours, double h2s, double flow_factor = 1) {
  EngineCase c;
  c.name = "engine";
  c.charge = acidload_test::sanity_charge();
  c.record = {acidload_test::sanity_segment(hours, h2s)};
  for (Segment& s : c.record) s.operation.fuel_flow *= flow_factor;
  return c;
}

TrainStage iron_bed(double mass, double level_ppmv) {
  TrainStage t;
  t.name = "iron oxide bed";
  t.stage.kind = StageKind::iron_oxide;
  t.stage.bed_mass = mass;
  t.stage.capacity = 0.2;
  t.stage.efficiency = 0.99;
  t.stage.changeout = {ChangeoutRule::Kind::outlet_level, level_ppmv, 0};
  t.costs.capital = 60000;
  t.costs.life_years = 10;
  return t;
}

Prices prices() {
  Prices p;
  p.oil = 3000;
  p.oil_change_labour = 400;
  p.oil_change_downtime = 6;
  p.electricity = 90 / 3.6e9;
  p.lab_sample = 50;
  p.sampling_interval = 250;
  p.iron_oxide = 1.5;
  p.disposal = 0.4;
  p.changeout_labour = 800;
  p.changeout_downtime = 8;
  return p;
}

CostCase cost_case(const EngineCase& e, const std::vector<TrainStage>& train) {
  CostCase c;
  c.engine = e;
  c.train = train;
  c.prices = prices();
  c.step = 24;
  return c;
}

SiteCase site_of(const std::vector<EngineCase>& engines, const std::vector<TrainStage>& train) {
  SiteCase s;
  s.name = "site";
  for (const EngineCase& e : engines) s.engines.push_back(cost_case(e, train));
  s.train = train;
  s.prices = prices();
  return s;
}

// A record of several segments: load changes and an oil top-up event on a zero-hour segment.
EngineCase varied_engine(double h2s) {
  EngineCase c = engine(1000, h2s);
  Segment a = c.record.front();
  Segment b = a;
  b.hours = 2500;
  b.operation.fuel_flow *= 0.7;
  Segment z = a;
  z.hours = 0;
  Segment d = a;
  d.hours = 4500;
  d.starts = 3;
  c.record = {a, b, z, d};
  return c;
}

double running_hours_flow(const std::vector<Segment>& rec) {
  double v = 0;
  for (const Segment& s : rec) v += s.operation.fuel_flow * s.hours;
  return v;
}

}  // namespace

TEST_CASE("a site of one engine equals that engine's case exactly (consistency)") {
  const EngineCase e = varied_engine(300);
  const std::vector<TrainStage> train{iron_bed(1500, 50)};
  const CostCase alone = cost_case(e, train);
  const VariantCosts v = costs(alone);
  const SiteResult s = run_site(site_of({e}, train));
  REQUIRE(s.engines.size() == 1);
  const SiteEngine& r = s.engines[0];
  CHECK(r.gas_share == 1.0);
  REQUIRE(r.record.size() == v.scrubbed.record.size());
  for (std::size_t i = 0; i < r.record.size(); ++i) {
    CHECK(r.record[i].hours == v.scrubbed.record[i].hours);
    CHECK(r.record[i].operation.fuel_flow == v.scrubbed.record[i].operation.fuel_flow);
    CHECK(r.record[i].fuel[Gas::H2S] == v.scrubbed.record[i].fuel[Gas::H2S]);
    CHECK(r.record[i].starts == v.scrubbed.record[i].starts);
    CHECK(r.record[i].events.size() == v.scrubbed.record[i].events.size());
  }
  CHECK(r.oil.intervals == v.oil.intervals);
  CHECK(r.oil.changes == v.oil.changes);
  CHECK(s.scrubbed.stages[0].changeouts == v.scrubbed.stages[0].changeouts);
  CHECK(s.scrubbed.stages[0].first_bed_life == v.scrubbed.stages[0].first_bed_life);
  CHECK(r.mean_h2s_ppmv == doctest::Approx(v.scrubbed.mean_engine_h2s_ppmv).epsilon(1e-15));
  for (std::size_t i = 0; i < cost_item_count; ++i) CHECK(r.costs.per_year[i] == doctest::Approx(v.per_year[i]).epsilon(1e-14));
  CHECK(s.total_per_year == doctest::Approx(v.total_per_year).epsilon(1e-14));
}

TEST_CASE("two identical engines load the bed as one engine of twice the flow; life is Thomas' closed form") {
  const EngineCase one = engine(8000, 300);
  const std::vector<TrainStage> train{iron_bed(2000, 50)};
  const SiteResult pair = run_site(site_of({one, one}, train));
  const SiteResult twice = run_site(site_of({engine(8000, 300, 2)}, train));
  const SiteResult single = run_site(site_of({one}, train));
  CHECK(pair.scrubbed.stages[0].first_bed_life == twice.scrubbed.stages[0].first_bed_life);
  CHECK(pair.scrubbed.stages[0].changeouts == twice.scrubbed.stages[0].changeouts);
  CHECK(pair.scrubbed.sulfur.stages[0] == twice.scrubbed.sulfur.stages[0]);
  // docs/model.md §18.3: life = φ*·q₀M/(η·ṅ_H2S), so at twice the flow half the life (Thomas, constant inlet)
  const Segment& s0 = one.record.front();
  const double dry = 1 - s0.fuel[Gas::H2O];
  const double phi_star = fed_share_at_outlet_ratio(50e-6 * dry / s0.fuel[Gas::H2S], 0.99, thomas_steepness(0.2));
  const double hold = 0.2 * 2000 / (atomic_weight(Element::S) * 1e-3);
  const double life = phi_star * hold / (0.99 * 2 * s0.operation.fuel_flow * s0.fuel[Gas::H2S]);
  CHECK(pair.scrubbed.stages[0].first_bed_life == doctest::Approx(life).epsilon(1e-9));
  CHECK(pair.scrubbed.stages[0].first_bed_life == doctest::Approx(single.scrubbed.stages[0].first_bed_life / 2).epsilon(1e-9));
  CHECK(pair.engines[0].gas_share == 0.5);
  CHECK(pair.engines[0].oil.intervals == pair.engines[1].oil.intervals);
}

TEST_CASE("a site of unequal engines: sulfur balance closes, the cost split sums to the site's total") {
  EngineCase a = varied_engine(300), b = engine(6000, 300, 1.6), c = engine(9000, 300, 0.5);
  const std::vector<TrainStage> train{iron_bed(1800, 40)};
  const SiteResult s = run_site(site_of({a, b, c}, train));
  REQUIRE(s.engines.size() == 3);
  // raw sulfur = taken by the train + burnt by the engines (to exhaust and oil), docs/model.md §18.3
  CHECK(s.sulfur_balance_error < 1e-9);
  double burnt = 0, shares = 0, total = 0, shared = 0, shared_split = 0;
  for (const SiteEngine& e : s.engines) burnt += e.sulfur_burnt, shares += e.gas_share, total += e.costs.total_per_year;
  CHECK(std::fabs(s.scrubbed.sulfur.raw - s.scrubbed.sulfur.stages[0] - burnt) <= 1e-9 * s.scrubbed.sulfur.raw);
  CHECK(shares == doctest::Approx(1).epsilon(1e-14));
  CHECK(total == doctest::Approx(s.total_per_year).epsilon(1e-14));
  for (CostItem i : all_cost_items) {
    if (!is_shared_item(i)) continue;
    shared += s.shared_per_year[static_cast<std::size_t>(i)];
    for (const SiteEngine& e : s.engines) shared_split += e.costs.per_year[static_cast<std::size_t>(i)];
  }
  CHECK(shared > 0);
  CHECK(shared_split == doctest::Approx(shared).epsilon(1e-12));
  // gas share by hand: ∫flow dt of each engine over the sum
  const double fa = running_hours_flow(a.record), fb = running_hours_flow(b.record), fc = running_hours_flow(c.record);
  CHECK(s.engines[1].gas_share == doctest::Approx(fb / (fa + fb + fc)).epsilon(1e-12));
  // the merged timeline ends where the longest record ends
  double h = 0;
  for (const Segment& x : s.raw) h += x.hours;
  CHECK(h == doctest::Approx(9000).epsilon(1e-12));
}

TEST_CASE("a site refuses engines on different gas, and no engines") {
  CHECK_THROWS_AS(run_site(site_of({engine(1000, 300), engine(1000, 200)}, {iron_bed(1000, 50)})), InputError);
  CHECK_THROWS_AS(run_site(site_of({}, {iron_bed(1000, 50)})), InputError);
}

// ---- the site file's gas record (io/site_file.hpp; docs/case-format.md, "Sites")

#include "acidload/io/case_file.hpp"
#include "acidload/io/site_file.hpp"

TEST_CASE("an engine's record is laid on the gas record by running hours: split at each gas change") {
  Segment s = acidload_test::sanity_segment(1500, 0);
  s.starts = 15;
  s.calendar_hours = 3000;
  s.events = {OilEvent{}};
  FuelGas low = acidload_test::sanity_segment(1, 100).fuel, high = acidload_test::sanity_segment(1, 400).fuel;
  const std::vector<Segment> rec = io::on_gas_record({s, acidload_test::sanity_segment(500, 0)}, {1000, 1000}, {low, high}, "rec");
  // hand: 1500 h across the change at 1000 h → 1000 h + 500 h (starts 10 + 5, calendar 2000 + 1000, the
  // event on the first piece only), then the second segment's 500 h all in the second stretch
  REQUIRE(rec.size() == 3);
  CHECK(rec[0].hours == 1000);
  CHECK(rec[1].hours == 500);
  CHECK(rec[2].hours == 500);
  CHECK(rec[0].starts == doctest::Approx(10));
  CHECK(rec[1].starts == doctest::Approx(5));
  CHECK(rec[0].calendar_hours == doctest::Approx(2000));
  CHECK(rec[0].events.size() == 1);
  CHECK(rec[1].events.empty());
  CHECK(rec[0].fuel[Gas::H2S] == low[Gas::H2S]);
  CHECK(rec[1].fuel[Gas::H2S] == high[Gas::H2S]);
  CHECK(rec[2].fuel[Gas::H2S] == high[Gas::H2S]);
  CHECK(rec[0].operation.fuel_flow == s.operation.fuel_flow);  // the flow as read (docs/case-format.md, "Sites")
  // a record past the gas record's end is refused
  CHECK_THROWS_AS(io::on_gas_record({acidload_test::sanity_segment(2001, 0)}, {1000, 1000}, {low, high}, "rec"), InputError);
  // exactly the gas record's length is fine, and no gas record leaves the record as it is
  CHECK(io::on_gas_record({acidload_test::sanity_segment(2000, 0)}, {1000, 1000}, {low, high}, "rec").size() == 2);
  CHECK(io::on_gas_record({s}, {}, {}, "rec").size() == 1);
}

TEST_CASE("a site file: engines merged over the file's sections, the site's gas, train and prices") {
  const std::string text = R"(format-version: 1
fuel: {composition: {CH4: 55 %, CO2: 45 %}, h2s: 200 ppmv}
engine: {rated-power: 1 MW, electrical-efficiency: 40 %, load: 100 %}
oil: {volume: 600 L}
scrubbing: {stages: [{name: bed, kind: iron-oxide, bed-mass: 1 t, changeout-every: 1000 h}]}
economics: {currency: EUR, iron-oxide-price: 2 per kg, oil-price: 3 per L}
site:
  engines:
    - {name: a}
    - {name: b, engine: {load: 50 %}, oil: {volume: 400 L}, economics: {oil-price: 4 per L}}
)";
  const io::SiteFile f = io::load_site_text(text, "site.yaml", ".");
  REQUIRE(f.site.engines.size() == 2);
  CHECK(f.site.name == "site");  // no name, no case title: the file's stem
  CHECK(f.currency == "EUR");
  CHECK(f.site.train.size() == 1);
  CHECK(f.site.prices.iron_oxide == doctest::Approx(2));
  const EngineCase& a = f.site.engines[0].engine;
  const EngineCase& b = f.site.engines[1].engine;
  CHECK(b.record.front().operation.fuel_flow == doctest::Approx(a.record.front().operation.fuel_flow / 2));
  CHECK(b.charge.mass == doctest::Approx(a.charge.mass * 400 / 600));
  CHECK(f.site.engines[1].prices.oil == doctest::Approx(4000));  // per m³
  CHECK(f.site.engines[0].prices.oil == doctest::Approx(3000));
  CHECK_THROWS_AS(io::load_case_text(text, "site.yaml", "."), InputError);  // a site file is no case
}

TEST_CASE("a site's engines give the same result on one thread and on several") {
  SiteCase s;
  s.train = {iron_bed(1500, 50)};
  for (double f : {1.0, 0.6, 0.8, 1.1}) {
    CostCase c;
    c.engine = engine(6000, 300, f);
    s.engines.push_back(c);
  }
  const SiteResult one = run_site(s, 1), three = run_site(s, 3);
  REQUIRE(one.engines.size() == three.engines.size());
  for (std::size_t e = 0; e < one.engines.size(); ++e) {
    CHECK(one.engines[e].oil.changes == three.engines[e].oil.changes);
    CHECK(one.engines[e].oil.intervals == three.engines[e].oil.intervals);
    CHECK(one.engines[e].costs.total_per_year == three.engines[e].costs.total_per_year);
  }
}
