// Unit tests: values with units. Each conversion factor is checked against the exact definition
// named beside it; refused numbers and units are checked for the message they give.
#include <doctest/doctest.h>

#include <string>

#include "acidload/core/error.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/quantity.hpp"

using namespace acidload;
using namespace acidload::io;

namespace {

// The value of "x: <text>" read as kind k.
double q(const std::string& text, Kind k) {
  const Document d = parse_document("x: " + text + "\n", "q.yaml");
  return quantity(d, *d.root.find("x"), k);
}

// The message quantity() throws for "x: <text>".
std::string q_error(const std::string& text, Kind k) {
  const Document d = parse_document("x: " + text + "\n", "q.yaml");
  try {
    quantity(d, *d.root.find("x"), k);
  } catch (const InputError& e) {
    return e.what();
  }
  FAIL("no InputError for '" << text << "'");
  return "";
}

Concentration c(const std::string& text, Basis def = Basis::dry) {
  const Document d = parse_document("x: " + text + "\n", "q.yaml");
  return concentration(d, *d.root.find("x"), def);
}

std::string c_error(const std::string& text) {
  const Document d = parse_document("x: " + text + "\n", "q.yaml");
  try {
    concentration(d, *d.root.find("x"), Basis::dry);
  } catch (const InputError& e) {
    return e.what();
  }
  FAIL("no InputError for '" << text << "'");
  return "";
}

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("temperature and temperature change") {
  // SI Brochure (9th ed.), 2.3.1: t/°C = T/K − 273.15; a Celsius difference equals a kelvin difference.
  CHECK(q("92 degC", Kind::temperature) == doctest::Approx(365.15).epsilon(1e-15));
  CHECK(q("0 degC", Kind::temperature) == 273.15);
  CHECK(q("300 K", Kind::temperature) == 300);
  CHECK(q("-40 degC", Kind::temperature) == doctest::Approx(233.15).epsilon(1e-15));
  CHECK(q("15 degC", Kind::temperature_change) == 15);
  CHECK(q("-5 K", Kind::temperature_change) == -5);
  // Absolute zero is 0 K (SI Brochure, definition of the kelvin): nothing at or below it.
  CHECK(contains(q_error("-300 degC", Kind::temperature), "above absolute zero"));
  CHECK(contains(q_error("-273.15 degC", Kind::temperature), "above absolute zero"));
  CHECK(contains(q_error("0 K", Kind::temperature), "above absolute zero"));
  CHECK(q("92 °C", Kind::temperature) == q("92 degC", Kind::temperature));  // everyday spellings of degC
  CHECK(q("92 C", Kind::temperature) == q("92 degC", Kind::temperature));
  CHECK(contains(q_error("92 degF", Kind::temperature), "'degF' is not one of them"));
}

TEST_CASE("power, volume, mass, duration: SI prefixes and units accepted for use with the SI") {
  // SI Brochure (9th ed.), Table 7: k = 1e3, M = 1e6, m = 1e-3.
  CHECK(q("1.2 MW", Kind::power) == doctest::Approx(1.2e6).epsilon(1e-15));
  CHECK(q("850 kW", Kind::power) == doctest::Approx(850e3).epsilon(1e-15));
  CHECK(q("10 W", Kind::power) == 10);
  // SI Brochure (9th ed.), Table 8: 1 L = 1 dm³ = 1e-3 m³; 1 t = 1e3 kg; 1 min = 60 s, 1 h = 3600 s,
  // 1 d = 86 400 s.
  CHECK(q("600 L", Kind::volume) == doctest::Approx(0.6).epsilon(1e-15));
  CHECK(q("2 m3", Kind::volume) == 2);
  CHECK(q("1.5 t", Kind::mass) == 1500);
  CHECK(q("250 g", Kind::mass) == doctest::Approx(0.25).epsilon(1e-15));
  CHECK(q("3 kg", Kind::mass) == 3);
  CHECK(q("2 d", Kind::duration) == 48);
  CHECK(q("90 min", Kind::duration) == doctest::Approx(1.5).epsilon(1e-15));
  CHECK(q("1000 h", Kind::duration) == 1000);
  CHECK(q("600 l", Kind::volume) == q("600 L", Kind::volume));  // everyday spellings
  CHECK(q("600 m³", Kind::volume) == 600);
  CHECK(q("1400 kWe", Kind::power) == 1400e3);
  CHECK(contains(q_error("600 dl", Kind::volume), "a volume with one of the units: L, m3"));
  CHECK(contains(q_error("1400 kw", Kind::power), "did you mean 'kW'?"));
}

TEST_CASE("pressure: absolute, the bar by definition") {
  // Definition of the bar: 1 bar = 1e5 Pa exactly (SI Brochure, 8th ed., Table 8; ISO 80000-4).
  CHECK(q("1.01325 bar", Kind::pressure) == doctest::Approx(101325).epsilon(1e-15));
  CHECK(q("1013.25 mbar", Kind::pressure) == doctest::Approx(101325).epsilon(1e-15));
  CHECK(q("101.325 kPa", Kind::pressure) == doctest::Approx(101325).epsilon(1e-15));
  CHECK(q("0.101325 MPa", Kind::pressure) == doctest::Approx(101325).epsilon(1e-15));
  CHECK(q("5 Pa", Kind::pressure) == 5);
  CHECK(contains(q_error("-1 bar", Kind::pressure), "an absolute pressure"));
}

TEST_CASE("molar flow: Nm³ is an amount at 0 °C and 101.325 kPa") {
  // CODATA 2018: molar volume of an ideal gas at 273.15 K and 101.325 kPa,
  // V_m = 22.413 969 54... × 10⁻³ m³/mol (exact, from the exact R of the 2019 SI).
  const double Vm = 22.41396954e-3;
  CHECK(q("1 Nm3/h", Kind::molar_flow) == doctest::Approx(1 / Vm).epsilon(1e-9));
  CHECK(q("500 Nm³/h", Kind::molar_flow) == doctest::Approx(500 / Vm).epsilon(1e-9));
  CHECK(q("2 Nm3/min", Kind::molar_flow) == doctest::Approx(120 / Vm).epsilon(1e-9));  // 1 h = 60 min
  CHECK(q("3 kmol/h", Kind::molar_flow) == 3000);
  CHECK(q("7 mol/h", Kind::molar_flow) == 7);
  CHECK(contains(q_error("500 m3/h", Kind::molar_flow),
                 "a molar flow with one of the units: Nm3/h, mol/h, kmol/h, Nm3/min"));
}

TEST_CASE("density, specific consumption, molar energy, per hour, oxidation") {
  // 1 kg/L = 1 kg / 1e-3 m³ and 1 g/cm³ = 1e-3 kg / 1e-6 m³ (SI Brochure Tables 7 and 8).
  CHECK(q("0.89 kg/L", Kind::density) == doctest::Approx(890).epsilon(1e-15));
  CHECK(q("0.89 g/cm3", Kind::density) == doctest::Approx(890).epsilon(1e-15));
  CHECK(q("890 kg/m3", Kind::density) == 890);
  // 1 kWh = 1e3 W × 3600 s = 3.6e6 J (SI: 1 W = 1 J/s), so 1 g/kWh = 1e-3 kg / 3.6e6 J.
  CHECK(q("0.3 g/kWh", Kind::specific_consumption) == doctest::Approx(0.3e-3 / 3.6e6).epsilon(1e-15));
  CHECK(q("802.3 kJ/mol", Kind::molar_energy) == doctest::Approx(802300).epsilon(1e-15));
  CHECK(q("5 J/mol", Kind::molar_energy) == 5);
  CHECK(q("0.01 1/h", Kind::per_hour) == 0.01);
  // Absorbance scales with path length: 0.1 mm = 0.01 cm (SI prefixes), so A per 0.1 mm × 100 = A per cm.
  CHECK(q("0.2 A/0.1mm", Kind::oxidation) == doctest::Approx(20).epsilon(1e-15));
  CHECK(q("18 A/cm", Kind::oxidation) == 18);
  CHECK(q("0.02 A/cm/h", Kind::oxidation_rate) == 0.02);
  CHECK(q("3.5 mg KOH/g", Kind::acid_number) == 3.5);
  CHECK(q("3.5 mg  KOH/g", Kind::acid_number) == 3.5);  // runs of spaces are one
  CHECK(contains(q_error("3.5 mgKOH/g", Kind::acid_number), "acid or base number with one of the units: mg KOH/g"));
}

TEST_CASE("fraction, count and number take bare numbers") {
  // Definition of the percent: 1 % = 0.01 (ISO 80000-1).
  CHECK(q("40 %", Kind::fraction) == doctest::Approx(0.4).epsilon(1e-15));
  CHECK(q("0.4", Kind::fraction) == 0.4);
  CHECK(q("140 %", Kind::fraction) == doctest::Approx(1.4).epsilon(1e-15));  // range is the caller's
  CHECK(contains(q_error("40%", Kind::fraction), "put a space between the number and the unit: '40 %'"));
  CHECK(q("3", Kind::count) == 3);
  CHECK(contains(q_error("-1", Kind::count), "a count: a bare number >= 0"));
  CHECK(contains(q_error("3 pcs", Kind::count), "no unit is taken"));
  CHECK(q("-2.5e3", Kind::number) == -2500);
  CHECK(q("+7", Kind::number) == 7);
  CHECK(contains(q_error("12", Kind::power), "the unit is missing"));
}

TEST_CASE("numbers: plain decimal or exponent form only") {
  for (const char* bad : {"nan", "NaN", "inf", "-inf", ".inf", "1e400", "-1e301", "12,5", "0x10", "1_000", "5.",
                          ".5", "1e", "1.2.3", "--1", "e5", "\"\""}) {
    CAPTURE(bad);
    const Document d = parse_document(std::string("x: ") + bad + "\n", "q.yaml");
    CHECK_THROWS_AS(quantity(d, *d.root.find("x"), Kind::number), InputError);
  }
  CHECK(contains(q_error("1e400", Kind::number), "out of range"));
  CHECK(contains(q_error("12,5 MW", Kind::power), "'12,5' is not a number such as 12, -0.5 or 1.2e-3"));
  CHECK(contains(q_error("\"\"", Kind::power), "the value is empty"));
  CHECK(contains(q_error("", Kind::power), "the value is empty"));  // a null node
  CHECK(contains(q_error("[1, 2]", Kind::power), "found a list"));
  CHECK(contains(q_error("{a: 1}", Kind::power), "found a map"));
  CHECK(q("1e300", Kind::number) == 1e300);
  CHECK(q("'1.5 MW'", Kind::power) == 1.5e6);  // quoted is fine
  CHECK(q("1.5\tMW", Kind::power) == 1.5e6);   // a tab separates too
}

TEST_CASE("the message names the file, line, column, key, value and the accepted units") {
  const Document d = parse_document("engine:\n  power: 1.2 GW\n", "e.yaml");
  const Node& power = *d.root.find("engine")->find("power");
  try {
    quantity(d, power, Kind::power);
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()) ==
          "e.yaml:2:10: 'engine.power' = '1.2 GW': expected a power with one of the units: W, kW, MW "
          "('GW' is not one of them)\n"
          "    power: 1.2 GW\n"
          "           ^");
  }
}

TEST_CASE("parse_quantity_text for CSV cells") {
  double v = 0;
  std::string why;
  CHECK(parse_quantity_text("85 degC", Kind::temperature, v, why));
  CHECK(v == doctest::Approx(358.15).epsilon(1e-15));  // SI Brochure 2.3.1, as above
  CHECK_FALSE(parse_quantity_text("85 F", Kind::temperature, v, why));
  CHECK(why == "a temperature with one of the units: degC, K ('F' is not one of them)");
  CHECK_FALSE(parse_quantity_text("", Kind::number, v, why));
  CHECK(why == "a number such as 12, -0.5 or 1.2e-3 (the value is empty)");
}

TEST_CASE("accepted units and names") {
  CHECK(accepted_units(Kind::temperature) == std::vector<std::string>{"degC", "K"});
  CHECK(accepted_units(Kind::molar_flow) == std::vector<std::string>{"Nm3/h", "mol/h", "kmol/h", "Nm3/min"});
  CHECK(accepted_units(Kind::number).empty());
  CHECK(kind_name(Kind::molar_energy) == "molar energy");
}

TEST_CASE("concentrations: unit, basis, and what is refused") {
  Concentration a = c("450 ppmv");
  CHECK(a.value == 450);
  CHECK(a.unit == ConcentrationUnit::ppmv);
  CHECK(a.basis == Basis::dry);
  a = c("450 ppm wet");  // ppm is read as ppmv
  CHECK(a.unit == ConcentrationUnit::ppmv);
  CHECK(a.basis == Basis::wet);
  CHECK(c("450 ppmv", Basis::wet).basis == Basis::wet);  // the default basis
  CHECK(c("12 mg/Nm3 dry", Basis::wet).basis == Basis::dry);
  CHECK(c("12 mg/Nm3").unit == ConcentrationUnit::mg_per_m3);
  CHECK(c("12 mg/Nm³").unit == ConcentrationUnit::mg_per_m3);
  CHECK(c("12 mg/m3").unit == ConcentrationUnit::mg_per_m3);
  CHECK(c("3 mg/MJ").unit == ConcentrationUnit::mg_per_MJ);
  // 1 kWh = 1e3 W × 3600 s = 3.6 MJ (SI Brochure, 9th ed., Table 8: 1 h = 3600 s): 36 mg/kWh is 10 mg/MJ
  CHECK(c("36 mg/kWh").unit == ConcentrationUnit::mg_per_MJ);
  CHECK(c("36 mg/kWh").value == doctest::Approx(10.0).epsilon(1e-15));
  CHECK(contains(c_error("36 mg/kWh wet"), "dry or wet applies to ppmv and mg/Nm3 only"));
  CHECK(c("40 mg/Nm3 CH4").unit == ConcentrationUnit::mg_per_m3_methane);
  CHECK(c("0.5 mol/h").unit == ConcentrationUnit::mol_per_h);
  CHECK(c("0 ppmv").value == 0);
  CHECK(contains(c_error("3 mg/MJ dry"), "dry or wet applies to ppmv and mg/Nm3 only"));
  CHECK(contains(c_error("-1 ppmv"), "not negative"));
  CHECK(contains(c_error("450"), "the unit is missing"));
  CHECK(contains(c_error("450 ppb"), "'ppb' is not one of them"));
  CHECK(contains(c_error("450 ppmv moist"), "'ppmv moist' is not one of them"));
  CHECK(contains(c_error("nan ppmv"), "is not a number"));
  CHECK(contains(c_error("450ppmv"), "put a space"));
}
