// Scrubbing trains and economics: costs computed by hand, sulfur balances, oil changes over a
// record, the cheapest level verified forward, price sensitivity. Invented data throughout.
#include <doctest/doctest.h>

#include <cmath>

#include "../support/sanity_case.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/economics.hpp"
#include "acidload/studies/inverse.hpp"

using namespace acidload;

namespace {

EngineCase engine(double hours = 8000, double h2s = 300) {
  EngineCase c;
  c.name = "sanity";
  c.charge = acidload_test::sanity_charge();
  c.record = {acidload_test::sanity_segment(hours, h2s)};
  return c;
}

// A case whose oil life is the planned maximum alone: 500 h, so 8000 h hold exactly 16 charges.
EngineCase capped_engine() {
  EngineCase c = engine();
  c.model.limits.enabled.fill(false);
  c.model.limits.enabled[static_cast<std::size_t>(Limit::max_hours)] = true;
  c.model.limits.max_hours = 500;
  return c;
}

TrainStage bed(StageKind kind, double mass, double level_ppmv, double capacity = 0.2) {
  TrainStage t;
  t.name = std::string(name(kind));
  t.stage.kind = kind;
  t.stage.bed_mass = mass;
  t.stage.capacity = capacity;
  t.stage.efficiency = 0.99;
  t.stage.changeout = {ChangeoutRule::Kind::outlet_level, level_ppmv, 0};
  return t;
}

TrainStage fixed_stage(StageKind kind, double efficiency) {
  TrainStage t;
  t.name = std::string(name(kind));
  t.stage.kind = kind;
  t.stage.efficiency = efficiency;
  return t;
}

Prices hand_prices() {
  Prices p;
  p.oil = 3000;                  // 3 per L
  p.oil_change_labour = 400;     // per change
  p.oil_change_downtime = 6;     // h per change
  p.electricity = 90 / 3.6e9;    // 90 per MWh
  p.lab_sample = 50;             // per sample
  p.sampling_interval = 250;     // h
  p.iron_oxide = 1.5;            // per kg
  p.disposal = 0.4;              // per kg
  p.changeout_labour = 800;      // per changeout
  p.changeout_downtime = 8;      // h per changeout
  p.caustic = 0.5;               // per kg NaOH
  p.caustic_excess = 1.2;
  p.discount_rate = 0.06;
  return p;
}

double h2s_flow(const EngineCase& c) { return c.record.front().operation.fuel_flow * c.record.front().fuel[Gas::H2S]; }

}  // namespace

TEST_CASE("the capital recovery factor") {
  CHECK(capital_recovery_factor(0, 10) == doctest::Approx(0.1));
  // i(1+i)^n/((1+i)^n − 1) at 6 %, 15 years: 0.06·2.396558/1.396558 = 0.102963
  CHECK(capital_recovery_factor(0.06, 15) == doctest::Approx(0.06 * std::pow(1.06, 15) / (std::pow(1.06, 15) - 1)).epsilon(1e-14));
  CHECK(capital_recovery_factor(0.06, 15) == doctest::Approx(0.102963).epsilon(1e-5));
  CHECK_THROWS_AS(capital_recovery_factor(-0.1, 10), InputError);
}

TEST_CASE("cost items of a case simple enough to compute by hand") {
  // 1 MW for 8000 h a year; oil life = the 500 h cap, so 16 changes; a fixed caustic stage at 90 %
  // and an iron-oxide bed changed on a schedule of every 1000 h (8 changeouts of 500 kg).
  CostCase c;
  c.engine = capped_engine();
  c.prices = hand_prices();
  c.train = {fixed_stage(StageKind::caustic, 0.9), bed(StageKind::iron_oxide, 500, 0)};
  c.train[1].stage.changeout = {ChangeoutRule::Kind::schedule, 0, 1000};
  c.train[0].costs = {100000, 15, 2000};  // capital, life, running per year
  const VariantCosts v = costs(c);
  const auto item = [&](CostItem i) { return v.per_year[static_cast<std::size_t>(i)]; };
  // oil per change: 600 L less the 10 % residual = 0.54 m³; 16 × 0.54 × 3000 = 25 920
  CHECK(v.oil.changes == doctest::Approx(16).epsilon(1e-12));
  CHECK(item(CostItem::oil_changes) == doctest::Approx(25920).epsilon(1e-9));
  // makeup: 0.2 kg/h × 8000 h / 880 kg/m³ = 1.818 18 m³ × 3000 = 5454.55
  CHECK(item(CostItem::makeup_oil) == doctest::Approx(0.2 * 8000 / 880 * 3000).epsilon(1e-9));
  CHECK(item(CostItem::oil_change_labour) == doctest::Approx(16 * 400));
  // downtime: 16 × 6 h × 1 MW × 90 per MWh = 8640
  CHECK(item(CostItem::oil_change_downtime) == doctest::Approx(8640).epsilon(1e-9));
  // lab: 8000 / 250 = 32 samples × 50 = 1600
  CHECK(item(CostItem::lab) == doctest::Approx(1600));
  // media: 8 changeouts × 500 kg × 1.5 = 6000; disposal 8 × 500 × 0.4 = 1600; labour 8 × 800 = 6400;
  // downtime 8 × 8 h × 1 MW × 90 = 5760
  CHECK(v.scrubbed.stages[1].changeouts == 8);
  CHECK(item(CostItem::media) == doctest::Approx(6000).epsilon(1e-9));
  CHECK(item(CostItem::media_disposal) == doctest::Approx(1600).epsilon(1e-9));
  CHECK(item(CostItem::changeout_labour) == doctest::Approx(6400).epsilon(1e-9));
  CHECK(item(CostItem::changeout_downtime) == doctest::Approx(5760).epsilon(1e-9));
  // caustic: 0.9 × H2S flow [mol/h] × 8000 h × M_S = S removed [kg]; × 2.4951 kg NaOH/kg S × 1.2 × 0.5,
  // plus the running cost of 2000
  const double s_kg = 0.9 * h2s_flow(c.engine) * 8000 * atomic_weight(Element::S) * 1e-3;
  CHECK(item(CostItem::consumables) == doctest::Approx(s_kg * caustic_per_sulfur() * 1.2 * 0.5 + 2000).epsilon(1e-4));
  // capital: 100 000 × CRF(6 %, 15 y) = 10 296.3
  CHECK(item(CostItem::capital) == doctest::Approx(10296.28).epsilon(1e-5));
  CHECK(item(CostItem::engine_wear) == 0);
  // per MWh: 8000 MWh a year
  CHECK(v.quantities.energy / 3.6e9 == doctest::Approx(8000).epsilon(1e-12));
  CHECK(v.total_per_mwh == doctest::Approx(v.total_per_year / 8000).epsilon(1e-12));
  CHECK(v.per_mwh[static_cast<std::size_t>(CostItem::lab)] == doctest::Approx(0.2));
}

TEST_CASE("the engine-wear penalty and hours per year") {
  CostCase c;
  c.engine = capped_engine();
  c.prices = hand_prices();
  c.prices.wear_cost = 30000;  // per 1000 h of overhaul brought forward
  c.prices.wear_hours = 0.5;   // h per 1000 running h per ppmv
  c.hours_per_year = 4000;     // the 8000 h record is two years
  const VariantCosts v = costs(c);
  // brought forward: 0.5 × 4000/1000 × 300 ppmv = 600 h a year → 0.6 × 30 000 = 18 000
  CHECK(v.quantities.engine_h2s_ppmv == doctest::Approx(300).epsilon(1e-9));
  CHECK(v.per_year[static_cast<std::size_t>(CostItem::engine_wear)] == doctest::Approx(18000).epsilon(1e-9));
  CHECK(v.quantities.oil_changes == doctest::Approx(8).epsilon(1e-12));
}

TEST_CASE("oil changes over a record follow the drain interval") {
  const EngineCase c = engine(8000, 300);
  const double d = drain_interval(c).value();
  REQUIRE(d < 4000);
  const OilOverRecord o = oil_over_record(c, c.record);
  // the first charge is the fresh one of drain_interval(); later ones start with the 10 % residual
  // of the old oil and so run shorter; the charges' hours add up to the record
  REQUIRE(o.intervals.size() == static_cast<std::size_t>(o.completed) + 1);
  CHECK(o.intervals.front() == doctest::Approx(d).epsilon(1e-9));
  double hours = o.last_share * o.intervals.back();
  for (int i = 0; i < o.completed; ++i) hours += o.intervals[static_cast<std::size_t>(i)];
  CHECK(hours == doctest::Approx(8000).epsilon(1e-9));
  CHECK(o.intervals[1] < o.intervals[0]);
  // no residual: every charge is the same, the count is record hours / interval
  EngineCase clean = c;
  clean.charge.residual_share = 0;
  const OilOverRecord z = oil_over_record(clean, clean.record);
  CHECK(z.changes == doctest::Approx(8000 / d).epsilon(1e-9));
  for (double x : z.intervals) CHECK(x == doctest::Approx(d).epsilon(1e-9));
}

TEST_CASE("a media bed over a constant inlet: loading, changeout at the outlet level") {
  EngineCase c = engine(8000, 300);
  TrainStage t = bed(StageKind::iron_oxide, 2000, 50);
  const ScrubbedRecord s = scrub(c, {t}, 5);
  // the bed's life: φ* from the level, life = φ*·q₀M/(η·ṅ_H2S)
  const double x_in = c.record.front().fuel[Gas::H2S];
  const double dry = 1 - c.record.front().fuel[Gas::H2O];
  const double beta = thomas_steepness(0.2);
  const double phi_star = fed_share_at_outlet_ratio(50e-6 * dry / x_in, 0.99, beta);
  const double kg_per_mol = atomic_weight(Element::S) * 1e-3;
  const double hold = 0.2 * 2000 / kg_per_mol;  // mol S
  const double life = phi_star * hold / (0.99 * h2s_flow(c));
  REQUIRE(life < 4000);
  CHECK(s.stages[0].first_bed_life == doctest::Approx(life).epsilon(1e-9));
  CHECK(s.stages[0].changeouts == static_cast<int>(8000 / life));
  // sulfur held per bed = q₀M·G(φ*)
  const double per_bed = hold * captured_share(phi_star, beta) * kg_per_mol;
  const double used = 8000 / life - s.stages[0].changeouts;
  const double partial = hold * captured_share(used * phi_star, beta) * kg_per_mol;
  CHECK(s.stages[0].sulfur_removed == doctest::Approx(per_bed * s.stages[0].changeouts + partial).epsilon(1e-9));
  CHECK(s.stages[0].bed_share_used == doctest::Approx(used).epsilon(1e-9));
  // the outlet never exceeds the level by more than a step's breakthrough
  for (const Segment& x : s.record) CHECK(x.fuel[Gas::H2S] / (1 - x.fuel[Gas::H2O]) * 1e6 <= 50.001);
}

TEST_CASE("sulfur balance: raw gas = beds + engine, engine = oil + exhaust + vent, to 1e-9") {
  EngineCase c = engine(3000, 250);
  c.record.front().fuel.other_sulfur = 5e-6;
  c.record.front().fuel.chlorine = 8e-6;
  Segment s2 = acidload_test::sanity_segment(2500, 600);
  s2.fuel.other_sulfur = 2e-6;
  Segment s3 = acidload_test::sanity_segment(2500, 120);
  c.record.push_back(s2);
  c.record.push_back(s3);
  TrainStage carbon = bed(StageKind::activated_carbon, 10, 2, 0.3);
  carbon.stage.other_sulfur_removal = 0.6;
  carbon.stage.halogen_removal = 0.9;
  carbon.stage.breakthrough_width = 0.35;
  const std::vector<TrainStage> train = {fixed_stage(StageKind::biological, 0.8), bed(StageKind::iron_oxide, 800, 40), carbon};
  const ScrubbedRecord s = scrub(c, train, 24);
  double held = 0;
  for (double x : s.sulfur.stages) held += x;
  CHECK(s.stages[1].changeouts > 0);
  CHECK(s.stages[2].changeouts > 0);
  CHECK(std::fabs(s.sulfur.raw - held - s.sulfur.engine) / s.sulfur.raw < 1e-9);
  // raw S from the case's own segments, independently of the train's ledger
  double raw = 0;
  for (const Segment& x : c.record) raw += x.operation.fuel_flow * x.fuel.sulfur() * x.hours;
  CHECK(std::fabs(raw - s.sulfur.raw) / raw < 1e-12);
  // the engine's sulfur leaves with the exhaust, the vented blow-by, or into the oil (fresh-oil uptake)
  double engine_s = 0, out_s = 0;
  for (const Segment& x : s.record) {
    Transfer t;
    segment_rates(x, engine(1).charge, ModelParameters{}, &t);
    const auto up = t.oil_uptake(1.0);
    const auto vent = t.blowby_vented(1.0);
    const auto i = [](Gas g) { return static_cast<std::size_t>(g); };
    const double leaving = t.exhaust[i(Gas::SO2)] + t.exhaust[i(Gas::SO3)] + vent[i(Gas::SO2)] + vent[i(Gas::SO3)] +
                           vent[i(Gas::H2S)] + t.unburnt_sulfur + up[i(Gas::SO2)] + up[i(Gas::SO3)];
    engine_s += t.sulfur_flow * x.hours;
    out_s += leaving * x.hours;
  }
  CHECK(std::fabs(engine_s - s.sulfur.engine) / engine_s < 1e-9);
  CHECK(std::fabs(out_s - engine_s) / engine_s < 1e-9);
}

TEST_CASE("iron oxide lets other sulfur and halogens pass; a level below the fresh outlet is refused") {
  TrainStage t = bed(StageKind::iron_oxide, 500, 50);
  t.stage.other_sulfur_removal = 0.5;
  CHECK_THROWS_AS(validate(t.stage), InputError);
  EngineCase c = engine(1000, 300);
  TrainStage low = bed(StageKind::iron_oxide, 500, 2);  // 1 % bypass of 300 ppmv is 3 ppmv: never met
  CHECK_THROWS_AS(scrub(c, {low}, 24), InputError);
}

TEST_CASE("the cheapest changeout level is verified by forward runs either side") {
  CostCase c;
  c.engine = engine(8000, 400);
  c.prices = hand_prices();
  c.prices.iron_oxide = 0.8;
  c.prices.changeout_downtime = 0;
  c.prices.oil = 6000;
  c.train = {bed(StageKind::iron_oxide, 4000, 50)};
  c.train[0].stage.breakthrough_width = 1.0;  // a wide front: the outlet rises over the whole bed life
  // the acid limits alone: with the antioxidant reserve's ageing on, the oil caps the interval near
  // 2000 h whatever the H2S, and scrubbing below that buys nothing
  c.engine.model.oxidation.depleted_factor = 1;
  c.engine.model.limits.enabled[static_cast<std::size_t>(Limit::antioxidant)] = false;
  c.engine.model.limits.enabled[static_cast<std::size_t>(Limit::viscosity)] = false;
  const CheapestLevel a = cheapest_level(c, 0, 10, 380, 11, 0.5);
  REQUIRE(a.found);
  CHECK(a.level_ppmv > 10);
  CHECK(a.level_ppmv < 300);
  CHECK(a.total_per_mwh <= a.verified_low + 1e-9);
  CHECK(a.total_per_mwh <= a.verified_high + 1e-9);
  for (double g : a.grid_total) CHECK(a.total_per_mwh <= g + 1e-9);
  CHECK(total_per_mwh_at(c, 0, a.level_ppmv) == doctest::Approx(a.total_per_mwh).epsilon(1e-12));
}

TEST_CASE("price sensitivity is linear and finds the break-even factor") {
  CostCase raw;
  raw.engine = engine(8000, 300);
  raw.engine.name = "raw";
  raw.prices = hand_prices();
  CostCase scrubbed = raw;
  scrubbed.engine.name = "bed";
  scrubbed.train = {bed(StageKind::iron_oxide, 2000, 30)};
  const auto v = compare_costs({raw, scrubbed});
  const auto sens = price_sensitivity(v, 0.2);
  for (const PriceSensitivity& s : sens) {
    if (s.break_even_factor < 0) continue;
    // at the break-even factor the two totals are equal, recomputed from the items
    std::vector<double> t;
    for (const VariantCosts& x : v) {
      double sum = 0;
      for (CostItem i : all_cost_items)
        sum += x.per_mwh[static_cast<std::size_t>(i)] * (price_of(i) == s.price ? s.break_even_factor : 1.0);
      t.push_back(sum);
    }
    CHECK(t[0] == doctest::Approx(t[1]).epsilon(1e-9));
  }
  // ranks
  CHECK(v[0].rank + v[1].rank == 3);
}

TEST_CASE("Monte Carlo over prices: identical with 1 and 2 threads, percentiles in order") {
  CostCase raw;
  raw.engine = engine(4000, 300);
  raw.prices = hand_prices();
  CostCase b = raw;
  b.engine.name = "bed";
  b.train = {bed(StageKind::iron_oxide, 2000, 30)};
  UncertainInput oil{"economics.oil-price", {Distribution::Kind::uniform, 2000, 4000, 0}};
  UncertainInput h2s{"fuel.h2s", {Distribution::Kind::uniform, 200, 400, 0}};
  const auto one = cost_monte_carlo({raw, b}, {oil}, 200, 7, 1);
  const auto two = cost_monte_carlo({raw, b}, {oil}, 200, 7, 2);
  CHECK(one.total_per_mwh == two.total_per_mwh);
  CHECK(one.p10[0] <= one.p50[0]);
  CHECK(one.p50[0] <= one.p90[0]);
  CHECK(one.cheapest_share[0] + one.cheapest_share[1] == doctest::Approx(1));
  const auto gas = cost_monte_carlo({raw, b}, {oil, h2s}, 8, 7, 2);
  CHECK(gas.p10[0] < gas.p90[0]);
}
