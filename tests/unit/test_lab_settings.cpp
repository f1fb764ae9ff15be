// The lab settings of a case (studies/lab_settings.hpp, docs/lab-results.md): the precedence of the
// precision layers, per-lab baselines going to rows that state none, and the registry's documented
// precision defaults being the built-in ones (Precision{}). The figures are the test's own inputs.
#include <doctest/doctest.h>

#include <cstdlib>
#include <string>

#include "acidload/io/case_file.hpp"
#include "acidload/io/keys.hpp"
#include "acidload/studies/lab_settings.hpp"

using namespace acidload;

TEST_CASE("the registry documents the built-in precision as its defaults") {
  const Precision p;
  const std::pair<const char*, double> rows[] = {{"precision.tbn-d2896", p.tbn_d2896}, {"precision.tbn-d4739", p.tbn_d4739},
                                                 {"precision.tan", p.tan},             {"precision.san", p.san},
                                                 {"precision.oxidation", p.oxidation}, {"precision.nitration", p.nitration}};
  for (const auto& row : rows) {  // not a structured binding: clang++-14 cannot capture one in doctest's lambda
    const char* key = row.first;
    CHECK_MESSAGE(std::strtod(io::case_key(key).default_text.c_str(), nullptr) == row.second, key);
  }
}

TEST_CASE("precision: call > the case's lab > the case's default > built-in; a call's lab above the call") {
  LabSettings lab;
  lab.precision.tan = 0.12;
  lab.precision.oxidation = 0.8;
  lab.labs["A"].precision.tan = 0.3;
  lab.labs["B"].oxidation_baseline = 1.0;  // a baseline only: its precision is the default's
  FitSettings fs;
  resolve_precision(fs, lab);
  CHECK(fs.precision.tan == 0.12);
  CHECK(fs.precision.oxidation == 0.8);
  CHECK(fs.precision.tbn_d4739 == Precision{}.tbn_d4739);
  CHECK(fs.lab_precision.at("A").tan == 0.3);
  CHECK(fs.lab_precision.at("A").oxidation == 0.8);
  CHECK(fs.lab_precision.count("B") == 0);
  PrecisionSetting call;
  call.tan = 0.2;
  resolve_precision(fs, lab, call);
  CHECK(fs.precision.tan == 0.2);
  CHECK(fs.lab_precision.at("A").tan == 0.2);  // the call wins over the case's per-lab figure
  PrecisionSetting c_lab;
  c_lab.tan = 0.25;
  resolve_precision(fs, lab, call, {{"C", c_lab}, {"A", c_lab}});
  CHECK(fs.lab_precision.at("C").tan == 0.25);
  CHECK(fs.lab_precision.at("C").oxidation == 0.8);
  CHECK(fs.lab_precision.at("A").tan == 0.25);
  // a row's own figure is above them all (reading_sigma)
  LabSample s;
  s.lab = "A";
  s.sd_tan = 0.05;
  CHECK(reading_sigma(s, "tan", fs.precision, fs.lab_precision) == 0.05);
  s.sd_tan.reset();
  CHECK(reading_sigma(s, "tan", fs.precision, fs.lab_precision) == 0.25);
}

TEST_CASE("a lab's baseline goes to its rows that state none") {
  LabSettings lab;
  lab.labs["A"].oxidation_baseline = 1.5;
  std::vector<LabSample> s(3);
  s[0].lab = "A";
  s[1].lab = "A", s[1].oxidation_baseline = 2.5, s[1].oxidation_baseline_given = true;
  s[2].lab = "B";
  apply_lab_baselines(s, lab);
  CHECK(s[0].oxidation_baseline == 1.5);
  CHECK(s[0].oxidation_baseline_given);
  CHECK(!s[0].nitration_baseline_given);
  CHECK(s[1].oxidation_baseline == 2.5);
  CHECK(!s[2].oxidation_baseline_given);
}

TEST_CASE("the lab section reads into the case file") {
  const std::string text =
      "format-version: 1\nfuel:\n  composition: {CH4: 55 %, CO2: 45 %}\nengine:\n  power: 1 MW\n"
      "  electrical-efficiency: 40 %\noil:\n  volume: 600 L\nlab:\n  precision: {san: 0.05 mg KOH/g}\n"
      "  labs:\n    A: {nitration-baseline: 0.02 A/0.1mm}\n  alarm-levels:\n    i-ph: {caution: 5.5, critical: 4.8}\n";
  const io::CaseFile f = io::load_case_text(text, "l.yaml", ".");
  CHECK(*f.lab.precision.san == 0.05);
  CHECK(*f.lab.labs.at("A").nitration_baseline == doctest::Approx(2.0));  // 1 A/0.1mm = 100 A/cm
  REQUIRE(f.lab.alarm_levels.size() == 1);
  CHECK(f.lab.alarm_levels[0].quantity == "i-ph");
  CHECK(!f.lab.alarm_levels[0].rising);
  CHECK(f.lab.alarm_levels[0].critical == 4.8);
}
