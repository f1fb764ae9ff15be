// Lab results from CSV, the uncertainty section, and the overlay a fit writes.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "acidload/core/error.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/fitted_overlay.hpp"
#include "acidload/io/lab_file.hpp"
#include "acidload/studies/parameters.hpp"
#include "../support/scratch.hpp"

using namespace acidload;
namespace fs = std::filesystem;

namespace {
fs::path write(const std::string& name, const std::string& text) {
  const fs::path p = acidload::test::scratch_path(name);
  std::ofstream(p) << text;
  return p;
}
}  // namespace

TEST_CASE("lab CSV: units from the header, censored SAN, FTIR per 0.1 mm") {
  const fs::path p = write("acidload-lab-ok.csv",
                           "# invented\ncharge,oil-hours,lab,tbn [mg KOH/g],tbn-method,tan,san,oxidation [A/0.1mm],i-ph\n"
                           "1,250,Lab A,4.5,D2896,1.7 mg KOH/g,<0.1,1.2,5.4\n"
                           "2,500 h,Lab A,3.1,,2.2,0,,\n"
                           "2,700,Lab B,,,,0.4,,\n");
  const auto s = io::read_lab_samples(p.string());
  REQUIRE(s.size() == 3);
  CHECK(s[0].charge == 0);
  CHECK(s[0].oil_hours == 250);
  CHECK(*s[0].tbn == 4.5);
  CHECK(s[0].tbn_method == BaseNumberMethod::d2896);
  CHECK(*s[0].tan == doctest::Approx(1.7));
  CHECK(s[0].san_censored);
  CHECK(*s[0].san == doctest::Approx(0.1));
  CHECK(*s[0].oxidation == doctest::Approx(120.0));  // 1.2 A per 0.1 mm = 120 A per cm (0.1 mm = 0.01 cm)
  CHECK(*s[0].initial_ph == doctest::Approx(5.4));
  CHECK(s[1].tbn_method == BaseNumberMethod::d4739);
  CHECK(s[1].san_censored);  // a reported 0 is below the reporting limit, not an exact zero
  CHECK(!s[2].san_censored);
  CHECK(*s[2].san == doctest::Approx(0.4));
  CHECK(s[2].lab == "Lab B");
  fs::remove(p);
}

TEST_CASE("lab CSV mistakes name the file, line, column and cell") {
  const auto refuse = [](const std::string& text, const std::string& fragment) {
    const fs::path p = write("acidload-lab-bad.csv", text);
    try {
      io::read_lab_samples(p.string());
      FAIL("accepted: " << text);
    } catch (const InputError& e) {
      INFO(e.what());
      CHECK(std::string(e.what()).find("acidload-lab-bad.csv:") != std::string::npos);
      CHECK(std::string(e.what()).find(fragment) != std::string::npos);
    }
    fs::remove(p);
  };
  refuse("charge,oil-hours,oxidation\n1,250,3\n", "100 A/cm");
  refuse("charge,oil-hours,tbm\n1,250,3\n", "closest: 'tbn'");
  refuse("charge,tbn\n1,3\n", "'oil-hours' column");
  refuse("charge,oil-hours,tbn\n0,250,3\n", "charge number");
  refuse("charge,oil-hours,tbn\n1,250,lots\n", "lab[0].tbn");
  refuse("charge,oil-hours,tbn,tbn-method\n1,250,3,D664\n", "D2896 or D4739");
  refuse("charge,oil-hours,tbn\n1,250,\n", "at least one reading");
  refuse("charge,oil-hours,tbn\n1,250,-2\n", "0 or more");
}

TEST_CASE("the uncertainty section and the overlay a fit writes load back") {
  const char* text = R"(format-version: 1
fuel: {composition: {CH4: 55 %, CO2: 45 %}, h2s: 300 ppmv}
engine: {power: 1 MW, electrical-efficiency: 40 %}
oil: {volume: 600 L}
uncertainty:
  draws: 500
  seed: 3
  inputs:
    - {parameter: fuel.h2s, distribution: lognormal, median: 300 ppmv, sigma-log: 0.2}
    - {parameter: engine.jacket-water-out, distribution: normal, mean: 90 degC, sd: 2 K}
    - {parameter: model.so3-share, distribution: triangular, low: 1 %, mode: 2 %, high: 3 %}
)";
  const io::CaseFile c = io::load_case_text(text, "u.yaml", ".");
  REQUIRE(c.uncertainty.inputs.size() == 3);
  CHECK(c.uncertainty.draws == 500);
  CHECK(c.uncertainty.seed == 3);
  CHECK(c.uncertainty.inputs[0].distribution.a == 300);
  CHECK(c.uncertainty.inputs[1].distribution.a == doctest::Approx(363.15));
  CHECK(c.uncertainty.inputs[1].distribution.b == doctest::Approx(2.0));
  CHECK(c.uncertainty.inputs[2].distribution.c == doctest::Approx(0.03));
  CHECK_THROWS_AS(io::load_case_text(std::string(text) + "    - {parameter: model.so3-share, distribution: uniform, low: 3 %, high: 1 %}\n", "u.yaml", "."), InputError);
  CHECK_THROWS_AS(io::load_case_text(std::string(text) + "    - {parameter: model.so3-shar, distribution: uniform, low: 1 %, high: 3 %}\n", "u.yaml", "."), InputError);
  {  // oil.consumption varies as the fit varies it: an oil flow in kg/h (or g/h), not g/kWh
    const io::CaseFile oc = io::load_case_text(
        std::string(text) + "    - {parameter: oil.consumption, distribution: uniform, low: 40 g/h, high: 0.08 kg/h}\n", "u.yaml", ".");
    CHECK(oc.uncertainty.inputs[3].distribution.a == doctest::Approx(0.04));
    CHECK(oc.uncertainty.inputs[3].distribution.b == doctest::Approx(0.08));
    CHECK(oc.uncertainty.inputs[3].unit == "kg/h");
    CHECK_THROWS_WITH_AS(io::load_case_text(std::string(text) + "    - {parameter: oil.consumption, distribution: uniform, low: 0.1 g/kWh, high: 0.3 g/kWh}\n",
                                            "u.yaml", "."),
                         doctest::Contains("an oil flow in kg/h or g/h"), InputError);
  }

  FitResult fit;
  fit.s2 = 1.1;
  fit.degrees_of_freedom = 20;
  fit.parameters = {{"model.liner-uptake", 2.5e-4, 3.1e-4, 2e-5, 0, 0}, {"model.oxidation-rate", 0.008, 0.0102, 6e-4, 0, 0},
                    {"model.organic-acid-yield", 0.08, 0.09, 0.01, 0, 0}, {"engine.blow-by", 0.01, 0.012, 0.001, 0, 0}};
  const fs::path ov = acidload::test::scratch_path("acidload-overlay.yaml");
  const fs::path cs = write("acidload-overlay-case.yaml", text);
  io::write_overlay(ov.string(), fit, cs.string(), "lab.csv");
  const io::CaseFile with = io::load_case(cs.string(), {ov.string()});
  const EngineCase& e = with.variants[0];
  CHECK(e.model.transfer.liner_uptake == doctest::Approx(3.1e-4).epsilon(1e-8));
  CHECK(e.model.oxidation.rate_at_reference == doctest::Approx(0.0102).epsilon(1e-8));
  CHECK(e.model.oxidation.organic_acid_yield == doctest::Approx(0.09).epsilon(1e-8));
  CHECK(e.record[0].operation.blowby_share == doctest::Approx(0.012).epsilon(1e-8));
  fs::remove(ov);
  fs::remove(cs);
}

TEST_CASE("an overlay a fit writes sets every fit parameter back to its estimate, in the registry's unit") {
  // The writer takes each key's unit from the registry (io/keys): a round trip through the case
  // reader for every parameter of fit and uncertainty, oil.consumption (kg/h) and fuel.h2s included.
  const char* text = R"(format-version: 1
fuel: {composition: {CH4: 55 %, CO2: 45 %}, h2s: 300 ppmv}
engine: {power: 1 MW, electrical-efficiency: 40 %}
oil: {volume: 600 L, fresh-tbn: 30 mg KOH/g, consumption: 0.2 g/kWh}
)";
  const fs::path cs = write("acidload-overlay-all-case.yaml", text);
  const EngineCase base = io::load_case(cs.string(), {}).variants[0];
  FitResult fit;
  fit.s2 = 1;
  fit.degrees_of_freedom = 10;
  for (const ParameterInfo& p : parameter_table()) {
    // a value away from the default and inside both the fit's range and the registry's
    double v = p.bound == Bound::interval ? p.low + 0.37 * (p.high - p.low)
               : p.bound == Bound::share  ? 0.037
                                          : get_parameter(base, p.key) * 1.3;
    if (p.key == "model.base-floor") v = 2.5;  // below the fresh TBN of 30 mg KOH/g
    fit.parameters.push_back({p.key, get_parameter(base, p.key), v, 0.1 * v, 0, 0});
  }
  const fs::path ov = acidload::test::scratch_path("acidload-overlay-all.yaml");
  io::write_overlay(ov.string(), fit, cs.string(), "lab.csv");
  const EngineCase e = io::load_case(cs.string(), {ov.string()}).variants[0];
  for (const FittedParameter& p : fit.parameters) {
    INFO(p.key);
    CHECK(get_parameter(e, p.key) == doctest::Approx(p.estimate).epsilon(1e-7));
  }
  fs::remove(ov);
  fs::remove(cs);
}

TEST_CASE("lab CSV: trended columns with units, unknown columns carried with a note, hour meter, dates, precision, baseline") {
  const fs::path p = write("acidload-lab-extra.csv",
                           "charge,hour-meter,changed-at,date,tbn,fe [ppm],si,viscosity-100 [mm2/s],water [ppm],colour,"
                           "tbn-sd,oxidation [A/cm],oxidation-baseline [A/cm]\n"
                           "1,45210,45000,2026-03-14,4.5,12,3,13.5,500,amber,0.3,4,1.5\n"
                           "1,45410 h,45000,2026-03-22 08:30,4.0,,4,14.1,,dark,,6,1.5\n");
  std::vector<std::string> notes;
  const auto s = io::read_lab_samples(p.string(), &notes);
  REQUIRE(s.size() == 2);
  CHECK(s[0].oil_hours == 210);
  CHECK(s[1].oil_hours == 410);
  CHECK(s[0].date == "2026-03-14");
  CHECK(s[0].trended.at("fe") == 12);
  CHECK(s[1].trended.count("fe") == 0);
  CHECK(s[0].trended.at("si") == 3);  // no unit in the header: the column's own (ppm)
  CHECK(s[0].trended.at("viscosity-100") == doctest::Approx(13.5));
  CHECK(s[0].trended.at("water") == doctest::Approx(0.05));  // 500 ppm = 0.05 %
  CHECK(s[0].other.at("colour") == "amber");
  CHECK(*s[0].sd_tbn == doctest::Approx(0.3));
  CHECK(!s[1].sd_tbn);
  CHECK(s[0].oxidation_baseline == doctest::Approx(1.5));
  REQUIRE(notes.size() == 1);
  CHECK(notes[0].find("'colour'") != std::string::npos);
  fs::remove(p);
  const auto refuse = [](const std::string& text, const std::string& fragment) {
    const fs::path q = write("acidload-lab-bad2.csv", text);
    try {
      io::read_lab_samples(q.string());
      FAIL("accepted: " << text);
    } catch (const InputError& e) {
      INFO(e.what());
      CHECK(std::string(e.what()).find(fragment) != std::string::npos);
    }
    fs::remove(q);
  };
  refuse("charge,oil-hours,fe [ppb]\n1,250,3\n", "ppm, mg/kg");
  refuse("charge,oil-hours,fe\n1,250,lots\n", "fe reading");
  refuse("charge,oil-hours,date,tbn\n1,250,14/03/2026,3\n", "YYYY-MM-DD");
  refuse("charge,oil-hours,date,tbn\n1,250,2026-13-01,3\n", "YYYY-MM-DD");
  refuse("charge,hour-meter,changed-at,tbn\n1,100,200,3\n", "at or after the oil change");
  refuse("charge,hour-meter,tbn\n1,100,3\n", "'oil-hours' column");
  refuse("charge,oil-hours,tbn,tbn-sd\n1,250,3,0\n", "above 0");
}

TEST_CASE("lab CSV: antioxidant remaining [% of fresh] and the fresh oil's viscosity at 100 degC, good and bad") {
  // invented readings; the columns as ASTM D6971/D7590 (antioxidant, % of the fresh oil's) and D445
  // (kinematic viscosity, mm2/s = cSt) report them
  const fs::path p = write("acidload-lab-oil-life.csv",
                           "charge,oil-hours,viscosity-100 [mm2/s],viscosity-100-fresh [cSt],antioxidant-remaining [%],water\n"
                           "1,250,13.9,13.2,82,0.04\n"
                           "1,500,15.1,,31,\n");
  std::vector<std::string> notes;
  const auto s = io::read_lab_samples(p.string(), &notes);
  fs::remove(p);
  REQUIRE(s.size() == 2);
  CHECK(notes.empty());  // read columns, not carried through
  CHECK(s[0].trended.at("viscosity-100-fresh") == doctest::Approx(13.2));
  CHECK(s[0].trended.at("antioxidant-remaining") == doctest::Approx(82));
  CHECK(s[1].trended.count("viscosity-100-fresh") == 0);
  CHECK(s[1].trended.at("antioxidant-remaining") == doctest::Approx(31));
  const auto refuse = [](const std::string& text, const std::string& where, const std::string& fragment) {
    const fs::path q = write("acidload-lab-oil-life-bad.csv", text);
    try {
      io::read_lab_samples(q.string());
      FAIL("accepted: " << text);
    } catch (const InputError& e) {
      INFO(e.what());
      CHECK(std::string(e.what()).find("acidload-lab-oil-life-bad.csv:" + where) != std::string::npos);
      CHECK(std::string(e.what()).find(fragment) != std::string::npos);
    }
    fs::remove(q);
  };
  // file:line:column of the cell, the column as written, the value and what was expected
  refuse("charge,oil-hours,viscosity-100-fresh\n1,250,0\n", "2:7", "viscosity-100-fresh reading above 0");
  refuse("charge,oil-hours,viscosity-100-fresh\n1,250,-13\n", "2:7", "'-13'");
  refuse("charge,oil-hours,viscosity-100-fresh\n1,250,20000\n", "2:7", "at most 10000 cSt");
  refuse("charge,oil-hours,viscosity-100-fresh [cP]\n1,250,13\n", "1:18:", "cSt, mm2/s");
  refuse("charge,oil-hours,antioxidant-remaining\n1,250,lots\n", "2:7", "antioxidant-remaining reading of 0 or more");
  refuse("charge,oil-hours,antioxidant-remaining [%]\n1,250,250\n", "2:7", "at most 200 %");
  refuse("charge,oil-hours,antioxidant-remaining [ppm]\n1,250,25\n", "1:18:", "among: %");
  refuse("charge,oil-hours,antioxidant-remainig\n1,250,25\n", "1:18:", "closest: 'antioxidant-remaining'");
  refuse("charge,oil-hours,water [%]\n1,250,101\n", "2:7", "at most 100 %");
}
