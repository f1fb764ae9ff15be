// The registry of case keys: the reader takes kinds and ranges from it, refusals name the key as
// written and its position (also after merging variants and overlays), alternative pairs can be
// swapped by a layer, and the registry's ranges agree with the core's validators: a value at either
// end loads (or meets a relation between keys, never a range refusal), a value just outside is
// refused at its own line.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <algorithm>
#include <map>
#include <set>
#include <string>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/keys.hpp"
#include "acidload/io/lab_file.hpp"
#include "../support/scratch.hpp"

using namespace acidload;

namespace {

// A small complete case (invented data), a section per entry so that a test can add or replace keys.
struct CaseText {
  std::map<std::string, std::map<std::string, std::string>> sections = {
      {"fuel", {{"composition", "{CH4: 55 %, CO2: 45 %}"}, {"h2s", "200 ppmv"}}},
      {"engine", {{"power", "800 kW"}, {"electrical-efficiency", "39 %"}}},
      {"oil", {{"volume", "500 L"}}},
  };
  std::vector<std::string> segments;  // "{hours: 100 h, ...}"
  std::string extra;                  // appended as is
  std::string text() const {
    std::string t = "format-version: 1\n";
    for (const auto& [name, keys] : sections) {
      t += name + ":\n";
      for (const auto& [k, v] : keys) t += "  " + k + ": " + v + "\n";
    }
    if (!segments.empty()) {
      t += "record:\n  segments:\n";
      for (const auto& s : segments) t += "    - " + s + "\n";
    }
    return t + extra;
  }
  // the 1-based line of "  key:" in a section
  int line_of(const std::string& section, const std::string& key) const {
    const std::string t = text();
    const auto sec = t.find("\n" + section + ":\n");
    const auto at = t.find("\n  " + key + ":", sec);
    return 1 + static_cast<int>(std::count(t.begin(), t.begin() + static_cast<std::ptrdiff_t>(at + 1), '\n'));
  }
};

io::CaseFile load(const CaseText& c) { return io::load_case_text(c.text(), "k.yaml", "."); }

std::string show(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.10g", v);
  return buf;
}

// A value of a key written in its documented unit ("%" for fractions, "" for bare numbers).
std::string written(const io::CaseKey& k, double core) {
  const double v = io::from_core_unit(k.kind, k.unit, core);
  return k.unit.empty() ? show(v) : show(v) + " " + k.unit;
}

// Puts a key into a case, with what it needs (a rated power for a load, no efficiency for a flow).
CaseText with(const io::CaseKey& k, const std::string& value) {
  CaseText c;
  const std::string sec = k.section(), key = k.key();
  if (sec == "segment") {
    if (key == "load") c.sections["engine"]["rated-power"] = "1000 kW";
    c.segments.push_back(key == "hours" ? "{hours: " + value + "}" : "{hours: 100 h, " + key + ": " + value + "}");
    return c;
  }
  if (!k.alternative.empty()) c.sections[sec].erase(k.alternative);
  if (sec == "engine" && key == "load") c.sections["engine"]["rated-power"] = "1000 kW";
  if (sec == "engine" && key == "fuel-flow") c.sections["engine"]["power"] = "800 kW";
  c.sections[sec][key] = value;
  return c;
}

bool testable(const io::CaseKey& k) {
  static const std::set<std::string> sections = {"fuel", "engine", "oil", "model", "limits", "run", "segment"};
  return k.type == io::KeyType::quantity && sections.count(k.section()) > 0;
}

}  // namespace

TEST_CASE("the registry lists each key once, and sections are derived from it") {
  std::set<std::string> paths;
  for (const auto& k : io::case_keys()) {
    CHECK_MESSAGE(paths.insert(k.path).second, k.path);
    CHECK_MESSAGE(!k.doc.empty(), k.path);
    CHECK_MESSAGE(!k.default_text.empty(), k.path);
    if (k.type == io::KeyType::quantity) CHECK_MESSAGE(k.low <= k.high, k.path);
    if (k.type == io::KeyType::word) CHECK_MESSAGE(!k.words.empty(), k.path);
  }
  const auto& engine = io::section_keys("engine");
  CHECK(std::find(engine.begin(), engine.end(), "blow-by") != engine.end());
  const auto& variant = io::section_keys("variant");
  CHECK(variant.front() == "name");
  CHECK(std::find(variant.begin(), variant.end(), "variants") == variant.end());
  CHECK(std::find(variant.begin(), variant.end(), "model") != variant.end());
  CHECK_THROWS_AS(io::case_key("engine.blowby"), InputError);
  CHECK(io::case_key("engine.jacket-water-out").range_text() == "from 0 to 150 degC");
  CHECK(io::case_key("engine.jacket-water-out").range_text("K") == "from 273.15 to 423.15 K");
  CHECK(io::case_key("model.liner-subcooling-scale").range_text() == "above 0 K");
}

TEST_CASE("every calibratable key is a parameter fit and uncertainty know") {
  for (const auto& key : io::calibratable_keys()) CHECK_NOTHROW(parameter(key));
  for (const auto& p : parameter_table())
    if (p.key != "oil.consumption")  // fitted in kg/h from a record; the case writes g/kWh
      CHECK_MESSAGE(io::case_key(p.key).calibratable, p.key);
}

TEST_CASE("every value a fit can step to lies in the key's range") {
  // the fit works in log/logit space (studies/parameters.cpp): whatever φ, the value must be one the
  // reader (and the core behind it) accepts, or a step onto a bound is refused mid-fit
  for (const auto& p : parameter_table()) {
    const io::CaseKey& k = io::case_key(p.key);
    if (k.type != io::KeyType::quantity || p.key == "oil.consumption") continue;  // h2s: a contaminant; consumption: kg/h
    for (double phi : {-40.0, -8.0, -1.0, 0.0, 1.0, 8.0, 40.0}) {
      const double x = from_fit_space(p, phi);
      const std::string what = p.key + " at phi " + std::to_string(phi) + ": " + std::to_string(x) + " outside " + k.range_text();
      CHECK_MESSAGE(k.in_range(x), what);
    }
  }
}

TEST_CASE("registry ranges agree with the core: both ends load, just outside is refused at the key") {
  int checked = 0;
  for (const auto& k : io::case_keys()) {
    if (!testable(k)) continue;
    CAPTURE(k.path);
    const std::string sec = k.section() == "segment" ? "record" : k.section();
    std::vector<double> ends;
    if (!k.low_open) ends.push_back(k.low);
    if (std::isfinite(k.high)) ends.push_back(k.high);
    for (double end : ends) {
      CAPTURE(end);
      try {
        load(with(k, written(k, end)));
      } catch (const InputError& e) {  // a relation between keys may refuse it; a range check must not
        CHECK_MESSAGE(std::string(e.what()).find("expected a value from") == std::string::npos, std::string(e.what()));
      } catch (const NotModelledError&) {
      }
    }
    // just outside: a relative step beyond either end (or one unit where the end is 0)
    const auto outside = [](double end, double dir) { return end + dir * std::max(std::fabs(end) * 1e-3, 1e-3); };
    std::vector<double> bad = {outside(k.low, -1)};
    if (std::isfinite(k.high)) bad.push_back(outside(k.high, +1));
    for (double v : bad) {
      CAPTURE(v);
      const CaseText c = with(k, written(k, v));
      try {
        load(c);
        FAIL("accepted");
      } catch (const InputError& e) {
        const std::string m = e.what();
        CHECK_MESSAGE(e.key().find(k.key()) != std::string::npos, m);
        CHECK_MESSAGE(m.find("k.yaml:") == 0, m);
        if (k.section() != "segment") CHECK_MESSAGE(e.where().line == c.line_of(k.section(), k.key()), m);
        ++checked;
      }
    }
  }
  CHECK(checked > 100);
}

TEST_CASE("refusals name the key as written and its position (issue examples)") {
  CaseText c;
  c.sections["model"]["additive-depletion"] = "-1 1/h";
  try {
    load(c);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "model.additive-depletion");
    CHECK(e.value() == "-1 1/h");
    CHECK(e.where().line == c.line_of("model", "additive-depletion"));
    CHECK(e.where().column == 23);
    CHECK(e.expected() == "a value from 0 to 1 1/h");
  }
  CaseText d;
  d.sections["model"]["oxidation-rate"] = "-1 A/cm/h";
  try {
    load(d);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "model.oxidation-rate");
    CHECK(e.where().line == d.line_of("model", "oxidation-rate"));
  }
  // a relation the core checks (the floor above the fresh reactive base) lands at the key too
  CaseText f;
  f.sections["model"]["base-floor"] = "30 mg KOH/g";
  try {
    load(f);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "model.base-floor");
    CHECK(e.where().line == f.line_of("model", "base-floor"));
  }
}

TEST_CASE("a variant's value is refused at the variant's own line, with its key path") {
  CaseText c;
  c.extra = "variants:\n  - name: hot\n    engine: {jacket-water-out: 170 degC}\n";
  try {
    load(c);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "variants[0].engine.jacket-water-out");
    CHECK(e.where().line == 12);
    CHECK(e.expected() == "a value from 0 to 150 degC");
  }
}

TEST_CASE("a variant or an overlay may swap one key of a pair for the other") {
  CaseText c;
  c.sections["engine"]["rated-power"] = "1000 kW";
  c.sections["fuel"]["water"] = "3 %";
  c.extra =
      "variants:\n"
      "  - name: part load\n    engine: {load: 60 %}\n"
      "  - name: wet gas\n    fuel: {water-dew-point: 35 degC}\n";
  const io::CaseFile f = load(c);
  REQUIRE(f.variants.size() == 3);
  CHECK(f.variants[1].record[0].operation.load == doctest::Approx(0.6));
  CHECK(f.variants[1].record[0].operation.electrical_power == doctest::Approx(600e3));
  CHECK(f.variants[0].record[0].operation.electrical_power == doctest::Approx(800e3));
  CHECK(f.variants[2].record[0].fuel[Gas::H2O] == doctest::Approx(water::saturation_pressure(308.15) / 101325));
  // both keys in one layer stay an error, at the layer
  CaseText both = c;
  both.extra = "variants:\n  - name: x\n    engine: {load: 60 %, power: 500 kW}\n";
  CHECK_THROWS_WITH_AS(load(both), doctest::Contains("either 'power' or 'load', not both"), InputError);

  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-test-keys");
  fs::create_directories(dir / "over");
  std::ofstream(dir / "case.yaml") << c.text();
  std::ofstream(dir / "over" / "power.yaml") << "format-version: 1\nengine: {power: 700 kW}\n";
  const io::CaseFile g = io::load_case((dir / "case.yaml").string(), {(dir / "over" / "power.yaml").string()});
  CHECK(g.variants[0].record[0].operation.electrical_power == doctest::Approx(700e3));
  CHECK(g.variants[1].record[0].operation.electrical_power == doctest::Approx(600e3));  // the variant's load wins
  fs::remove_all(dir);
}

TEST_CASE("a record file named in an overlay resolves next to the overlay") {
  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-test-overlay-record");
  fs::create_directories(dir / "over");
  CaseText c;
  std::ofstream(dir / "case.yaml") << c.text();
  std::ofstream(dir / "over" / "rec.yaml") << "format-version: 1\nrecord: {file: rows.csv}\n";
  std::ofstream(dir / "over" / "rows.csv") << "hours [h],h2s [ppmv]\n100,50\n200,80\n";
  const io::CaseFile f = io::load_case((dir / "case.yaml").string(), {(dir / "over" / "rec.yaml").string()});
  CHECK(f.variants[0].record.size() == 2);
  fs::remove_all(dir);
}

TEST_CASE("a variant named '' is refused at its line") {
  CaseText c;
  c.extra = "variants:\n  - name: ''\n    engine: {power: 700 kW}\n";
  CHECK_THROWS_WITH_AS(load(c), doctest::Contains("k.yaml:11:"), InputError);
  CHECK_THROWS_WITH_AS(load(c), doctest::Contains("not empty"), InputError);
}

TEST_CASE("lab files: a SAN limit below zero and an initial pH outside 0-14 are refused at the cell") {
  namespace fs = std::filesystem;
  const fs::path dir = acidload::test::scratch_path("acidload-test-lab-refusals");
  fs::create_directories(dir);
  const auto refused = [&](const std::string& san, const std::string& ph, const std::string& fragment) {
    const fs::path p = dir / "lab.csv";
    std::ofstream(p) << "charge,oil-hours,tbn [mg KOH/g],san,i-ph\n1,250,5.1," << san << "," << ph << "\n";
    try {
      io::read_lab_samples(p.string());
      return false;
    } catch (const InputError& e) {
      const std::string m = e.what();
      return e.where().line == 2 && m.find(fragment) != std::string::npos;
    }
  };
  CHECK(refused("<-1", "5.5", "reporting limit above 0"));
  CHECK(refused("<0", "5.5", "reporting limit above 0"));
  CHECK(refused("<0.1", "-50", "pH from 0 to 14"));
  CHECK(refused("<0.1", "1e300", "pH from 0 to 14"));
  CHECK(refused("<0.1", "14.5", "pH from 0 to 14"));
  CHECK_FALSE(refused("<0.1", "14", ""));  // the ends are accepted
  CHECK_FALSE(refused("0.3", "0", ""));
  fs::remove_all(dir);
}

TEST_CASE("H2S of 20 % or more is refused on every path, and a high real value is read as given") {
  CaseText c;
  for (const std::string v : {"250000 ppmv", "2e6 ppmv", "1e7 mg/Nm3", "200000 ppmv"}) {
    CAPTURE(v);
    c.sections["fuel"]["h2s"] = v;
    try {
      load(c);
      FAIL("accepted");
    } catch (const InputError& e) {
      CHECK(e.key() == "fuel.h2s");
      CHECK(e.where().line == c.line_of("fuel", "h2s"));
    }
  }
  // 15 % (dry, no water): the wet fraction is the figure itself (definition of ppmv on a dry basis)
  c.sections["fuel"]["h2s"] = "150000 ppmv";
  const io::CaseFile f = load(c);
  CHECK(f.variants[0].record[0].fuel[Gas::H2S] == doctest::Approx(0.15).epsilon(1e-12));
  // the same in a record row: refused at the row's own key
  CaseText r;
  r.segments = {"{hours: 100 h}", "{hours: 100 h, h2s: 250000 ppmv}"};
  try {
    load(r);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "record.segments[1].h2s");
  }
}

TEST_CASE("a Monte Carlo draw outside its parameter's range is clipped into it and counted, not an abort") {
  CaseText c;
  c.extra = "uncertainty:\n  draws: 50\n  inputs:\n    - {parameter: model.so3-share, distribution: normal, mean: 2 %, sd: 5 %}\n";
  const io::CaseFile f = load(c);
  const MonteCarloResult r = monte_carlo(f.variants[0], f.uncertainty.inputs, 50, 1, 1);
  CHECK(r.clipped > 0);  // a normal(2 %, 5 %) share is below 0 in about a third of the draws
  CHECK(r.clipped < 50);
}

TEST_CASE("everyday notations are read as their accepted spelling") {
  const auto first = [](const CaseText& c) { return load(c).variants[0].record[0]; };
  const auto with_key = [](const std::string& sec, const std::string& key, const std::string& v) {
    CaseText c;
    c.sections[sec][key] = v;
    return c;
  };
  const double jacket = first(with_key("engine", "jacket-water-out", "90 degC")).operation.jacket_water_out;
  CHECK(first(with_key("engine", "jacket-water-out", "90 \xC2\xB0" "C")).operation.jacket_water_out == jacket);
  CHECK(first(with_key("engine", "jacket-water-out", "90 C")).operation.jacket_water_out == jacket);
  CHECK(load(with_key("oil", "volume", "900 l")).variants[0].charge.mass == load(with_key("oil", "volume", "900 L")).variants[0].charge.mass);
  CHECK(first(with_key("engine", "power", "1400 kWe")).operation.electrical_power == 1400e3);
  CHECK(first(with_key("fuel", "chlorine", "60 mg Cl/Nm3 CH4")).fuel.chlorine ==
        first(with_key("fuel", "chlorine", "60 mg/Nm3 CH4")).fuel.chlorine);
  CHECK_THROWS_WITH_AS(load(with_key("fuel", "chlorine", "60 mg F/Nm3")), doctest::Contains("counts as Cl"), InputError);
  // NOx: '@' and a glued '%'; ppm (dry, as NO2) converted with M(NO2) = 46.0055 g/mol (IUPAC 2021
  // standard atomic weights, from memory) and V_m = R·273.15 K / 101325 Pa = 22.41396954 L/mol (CODATA 2018 R)
  const NoxEmission a = first(with_key("engine", "nox", "500 mg/Nm3 at 5 % O2")).operation.nox;
  const NoxEmission b = first(with_key("engine", "nox", "500 mg/Nm3 @ 5% O2")).operation.nox;
  CHECK(a.value == b.value);
  CHECK(a.o2_reference == b.o2_reference);
  const NoxEmission p = first(with_key("engine", "nox", "250 ppm at 5 % O2")).operation.nox;
  CHECK(p.value == doctest::Approx(250 * 46.0055 / 22.41396954).epsilon(1e-4));
  CHECK(p.o2_reference == doctest::Approx(0.05));
  // blow-by as measured, at the case's reference state (normal: 0 degC, 101.325 kPa)
  CaseText bb = with_key("engine", "blow-by", "60 L/min");
  CHECK(first(bb).operation.blowby_flow == doctest::Approx(3.6 / 22.41396954e-3).epsilon(1e-9));
  CHECK(first(with_key("engine", "blow-by-flow", "3.6 m3/h")).operation.blowby_flow == doctest::Approx(3.6 / 22.41396954e-3).epsilon(1e-9));
  // oil consumption from top-up logs: 0.3 L/h of 880 kg/m3 oil at 800 kW = 0.264 kg/h = 0.33 g/kWh
  CHECK(first(with_key("oil", "consumption", "0.3 L/h")).oil_consumption ==
        doctest::Approx(first(with_key("oil", "consumption", "0.33 g/kWh")).oil_consumption).epsilon(1e-12));
  // starts per week: every 168/3 = 56 running hours
  CaseText sw = with_key("engine", "start-every", "3 per week");
  CaseText sh = with_key("engine", "start-every", "56 h");
  CHECK(first(sw).starts == doctest::Approx(first(sh).starts));
  CHECK(first(with_key("engine", "start-every", "3/week")).starts == doctest::Approx(first(sh).starts));  // no space
  CHECK(first(with_key("engine", "start-every", "2 per day")).starts == doctest::Approx(first(with_key("engine", "start-every", "12 h")).starts));
  // not accepted: a suggestion of the accepted spelling
  CHECK_THROWS_WITH_AS(load(with_key("engine", "power", "1400 kw")), doctest::Contains("did you mean 'kW'"), InputError);
}
