// The case reader: a case loads into exactly the inputs the same values give through the C++ API;
// variants merge over the base; overlays apply; older format versions keep loading.
#include <doctest/doctest.h>

#include <cstring>
#include <filesystem>
#include <fstream>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/site_file.hpp"
#include "../support/scratch.hpp"

using namespace acidload;

namespace {
const char* case_text = R"(format-version: 1
case: equivalence check (invented data)
reference-state: normal
fuel:
  basis: dry
  composition: {CH4: 52 %, CO2: 40 %, N2: 7 %, O2: 1 %}
  water: 3.5 %
  h2s: 300 ppmv
  other-sulfur: 12 mg/Nm3
  halocarbons:
    tetrachloroethene: 9 mg/Nm3
engine:
  power: 1.2 MW
  electrical-efficiency: 41 %
  excess-air-ratio: 1.7
  blow-by: 0.8 %
  jacket-water-out: 92 degC
  coldest-crankcase-surface: 55 degC
  oil-temperature: 87 degC
  nox: 500 mg/Nm3 at 5 % O2
oil:
  volume: 720 L
  density: 885 kg/m3
  fresh-tbn: 6.5 mg KOH/g
  tbn-method: D2896
  fresh-tan: 1.4 mg KOH/g
  consumption: 0.25 g/kWh
model:
  so3-share: 1.5 %
  capture-so2: 12 %
limits:
  max-hours: 6000 h
variants:
  - name: hot
    engine: {jacket-water-out: 98 degC}
)";

// the same values through the API
EngineCase by_api() {
  EngineCase c;
  c.name = "base";
  FuelAnalysis a;
  a.main[static_cast<std::size_t>(Gas::CH4)] = 0.52;
  a.main[static_cast<std::size_t>(Gas::CO2)] = 0.40;
  a.main[static_cast<std::size_t>(Gas::N2)] = 0.07;
  a.main[static_cast<std::size_t>(Gas::O2)] = 0.01;
  a.water_fraction = 0.035;
  a.h2s = {300, ConcentrationUnit::ppmv, Basis::dry};
  a.other_sulfur = {12, ConcentrationUnit::mg_per_m3, Basis::dry};
  a.halocarbons = {{"tetrachloroethene", {9, ConcentrationUnit::mg_per_m3, Basis::dry}}};
  Segment s;
  s.fuel = resolve(a);
  s.operation.electrical_power = 1.2e6;
  s.operation.fuel_flow = fuel_flow_from_power(1.2e6, 0.41, lower_heating_value(s.fuel));
  s.operation.air.excess_air_ratio = 1.7;
  s.operation.blowby_share = 0.008;
  s.operation.jacket_water_out = 92 + 273.15;
  s.operation.coldest_crankcase_surface = 55 + 273.15;
  s.operation.nox = {500, NoxEmission::Unit::mg_per_m3_dry_at_o2_ref, 0.05};
  s.oil_temperature = 87 + 273.15;
  s.oil_consumption = oil_consumption(0.25e-3 / 3.6e6, 1.2e6);
  c.charge.oil.density_15 = 885;
  c.charge.oil.fresh_tbn = 6.5;
  c.charge.oil.fresh_tan = 1.4;
  c.charge.mass = 0.720 * 885;
  c.model.transfer.so3_share = 0.015;
  c.model.transfer.capture_so2 = 0.12;
  c.model.limits.max_hours = 6000;
  s.hours = 6000;
  c.record = {s};
  return c;
}
}  // namespace

TEST_CASE("a case file gives exactly the inputs of the same values through the API") {
  const io::CaseFile f = io::load_case_text(case_text, "equivalence.yaml", ".");
  REQUIRE(f.variants.size() == 2);
  const EngineCase& got = f.variants[0];
  const EngineCase want = by_api();
  CHECK(got.name == "base");
  const Segment &g = got.record.at(0), &w = want.record.at(0);
  for (Gas x : all_gases) CHECK(g.fuel[x] == doctest::Approx(w.fuel[x]).epsilon(1e-15));
  CHECK(g.fuel.other_sulfur == doctest::Approx(w.fuel.other_sulfur).epsilon(1e-15));
  CHECK(g.fuel.chlorine == doctest::Approx(w.fuel.chlorine).epsilon(1e-15));
  CHECK(g.operation.fuel_flow == doctest::Approx(w.operation.fuel_flow).epsilon(1e-15));
  CHECK(g.operation.electrical_power == w.operation.electrical_power);
  CHECK(g.operation.air.excess_air_ratio == w.operation.air.excess_air_ratio);
  CHECK(g.operation.blowby_share == doctest::Approx(w.operation.blowby_share).epsilon(1e-15));
  CHECK(g.operation.jacket_water_out == doctest::Approx(w.operation.jacket_water_out).epsilon(1e-15));
  CHECK(g.operation.coldest_crankcase_surface == doctest::Approx(w.operation.coldest_crankcase_surface).epsilon(1e-15));
  CHECK(g.operation.nox.value == w.operation.nox.value);
  CHECK(g.operation.nox.o2_reference == doctest::Approx(0.05).epsilon(1e-15));
  CHECK(g.oil_temperature == doctest::Approx(w.oil_temperature).epsilon(1e-15));
  CHECK(g.oil_consumption == doctest::Approx(w.oil_consumption).epsilon(1e-14));
  CHECK(g.hours == w.hours);
  CHECK(got.charge.mass == doctest::Approx(want.charge.mass).epsilon(1e-15));
  CHECK(got.charge.oil.fresh_tbn == want.charge.oil.fresh_tbn);
  CHECK(got.charge.oil.fresh_tan == want.charge.oil.fresh_tan);
  CHECK(got.model.transfer.so3_share == doctest::Approx(0.015).epsilon(1e-15));
  CHECK(got.model.transfer.capture_so2 == doctest::Approx(0.12).epsilon(1e-15));
  CHECK(got.model.limits.max_hours == 6000);
  // and therefore the same results
  const VariantSummary a = summarize(got), b = summarize(want);
  CHECK(a.charge.drain_interval == doctest::Approx(b.charge.drain_interval).epsilon(1e-12));
  // the variant changes only what it names
  const EngineCase& hot = f.variants[1];
  CHECK(hot.name == "hot");
  CHECK(hot.record[0].operation.jacket_water_out == doctest::Approx(98 + 273.15).epsilon(1e-15));
  CHECK(hot.record[0].operation.blowby_share == g.operation.blowby_share);
  CHECK(hot.charge.mass == got.charge.mass);
}

TEST_CASE("fuel-gas limits per kWh of fuel heat read as per MJ") {
  // 1 kWh = 1e3 W × 3600 s = 3.6 MJ (SI Brochure, 9th ed., Table 8: 1 h = 3600 s)
  std::string text = case_text;
  const std::string at = "  nox: 500 mg/Nm3 at 5 % O2\n";
  text.replace(text.find(at), at.size(), at + "  fuel-gas-sulfur-limit: 720 mg/kWh\n  fuel-gas-halogen-limit: 36 mg/kWh\n");
  const io::CaseFile f = io::load_case_text(text, "limits.yaml", ".");
  const FuelGasLimits& l = f.variants.at(0).fuel_gas_limits;
  CHECK(l.sulfur_per_energy == doctest::Approx(200e-12).epsilon(1e-14));   // 200 mg/MJ in kg/J
  CHECK(l.halogens_per_energy == doctest::Approx(10e-12).epsilon(1e-14));  // 10 mg/MJ
  CHECK(l.sulfur_per_methane < 0);
  // a per-volume figure of the gas is not a fuel-gas limit: refused, naming the units that are
  std::string bad = case_text;
  bad.replace(bad.find(at), at.size(), at + "  fuel-gas-sulfur-limit: 40 mg/Nm3\n");
  try {
    io::load_case_text(bad, "limits.yaml", ".");
    FAIL("a fuel-gas limit in mg/Nm3 was accepted");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("mg/kWh") != std::string::npos);
  }
}

TEST_CASE("an overlay merges over the base before the variants") {
  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-overlay-test");
  fs::create_directories(dir);
  { std::ofstream(dir / "case.yaml") << case_text; }
  { std::ofstream(dir / "fit.yaml") << "format-version: 1\nmodel:\n  so3-share: 3 %\n"; }
  const io::CaseFile f = io::load_case((dir / "case.yaml").string(), {(dir / "fit.yaml").string()});
  CHECK(f.overlays.size() == 1);
  CHECK(f.variants[0].model.transfer.so3_share == doctest::Approx(0.03).epsilon(1e-15));
  CHECK(f.variants[1].model.transfer.so3_share == doctest::Approx(0.03).epsilon(1e-15));
  CHECK(f.variants[0].model.transfer.capture_so2 == doctest::Approx(0.12).epsilon(1e-15));  // untouched
  { std::ofstream(dir / "bad.yaml") << "format-version: 1\nvariants: []\n"; }
  CHECK_THROWS_AS(io::load_case((dir / "case.yaml").string(), {(dir / "bad.yaml").string()}), InputError);
  fs::remove_all(dir);
}

TEST_CASE("files of every format version load") {
  int n = 0;
  for (const auto& e : std::filesystem::recursive_directory_iterator(ACIDLOAD_SOURCE_DIR "/tests/cases")) {
    if (e.path().extension() != ".yaml") continue;
    INFO(e.path().string());
    CHECK_NOTHROW(io::load_case(e.path().string()));
    ++n;
  }
  for (const auto& e : std::filesystem::directory_iterator(ACIDLOAD_SOURCE_DIR "/cases")) {
    if (e.path().extension() != ".yaml") continue;
    INFO(e.path().string());
    if (io::is_site_file(e.path().string())) CHECK_NOTHROW(io::load_site(e.path().string()));  // a site file (site_file.hpp)
    else CHECK_NOTHROW(io::load_case(e.path().string()));
    ++n;
  }
  CHECK(n >= 3);
}

TEST_CASE("an inline record with events becomes segments with events") {
  const io::CaseFile f = io::load_case(ACIDLOAD_SOURCE_DIR "/tests/cases/format-v1/record-inline.yaml");
  const EngineCase& c = f.variants[0];
  REQUIRE(c.record.size() == 4);
  CHECK(!c.charge.continuous_makeup);
  CHECK(c.record[0].starts == 2);
  CHECK(c.record[1].events.size() == 1);
  CHECK(c.record[1].events[0].kind == OilEvent::Kind::top_up);
  CHECK(c.record[2].fuel[Gas::H2S] > c.record[1].fuel[Gas::H2S]);
  CHECK(c.record[3].fuel[Gas::H2S] == c.record[2].fuel[Gas::H2S]);  // carried forward
  CHECK(c.record[3].events[0].kind == OilEvent::Kind::oil_change);
  CHECK(c.record[3].events[0].amount == doctest::Approx(0.08).epsilon(1e-15));
  CHECK(c.record[0].operation.nox.unit == NoxEmission::Unit::g_per_kWh);
  const RunResult r = simulate(c.charge, c.model, c.record, c.options);
  CHECK(r.charges.size() == 2);
}
