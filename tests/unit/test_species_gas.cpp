// Unit tests: formula parser, conversions (round trips), halocarbons, input validation.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>

#include "acidload/core/error.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/core/halocarbons.hpp"
#include "acidload/core/species.hpp"
#include "acidload/core/water.hpp"

using namespace acidload;

TEST_CASE("formula parser") {
  const Formula f = parse_formula("C2HCl3");
  CHECK(f[Element::C] == 2);
  CHECK(f[Element::H] == 1);
  CHECK(f[Element::Cl] == 3);
  const Formula g = parse_formula("CH3(CH2)2SH");  // propanethiol
  CHECK(g[Element::C] == 3);
  CHECK(g[Element::H] == 8);
  CHECK(g[Element::S] == 1);
  CHECK_THROWS_AS(parse_formula("Xy2"), InputError);
  CHECK_THROWS_AS(parse_formula("C2(H"), InputError);
  CHECK_THROWS_AS(parse_formula("C2)"), InputError);
  CHECK_THROWS_AS(parse_formula(""), InputError);
  CHECK_THROWS_AS(parse_formula("h2s"), InputError);
  CHECK_THROWS_AS(parse_formula("C0"), InputError);
  try {
    parse_formula("CH2Qz");
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.key() == "formula");
    CHECK(e.value() == "CH2Qz");
    CHECK(std::string(e.what()).find("character 4") != std::string::npos);
  }
}

TEST_CASE("gas species table is consistent with the parser") {
  for (Gas g : all_gases) CHECK(molar_mass(g) == molar_mass(formula_text(g)));
  CHECK(gas_from_formula("SO3") == Gas::SO3);
  CHECK_THROWS_AS(gas_from_formula("XeF2"), InputError);
}

TEST_CASE("the KOH molar mass held once equals the formula's sum of standard atomic weights") {
  // K 39.0983, O 15.9994, H 1.00794 g/mol (IUPAC 2007 standard atomic weights, as the element
  // table of libacidload/src/core/species.cpp uses): 56.10564 g/mol = 0.05610564 kg/mol
  CHECK(koh_molar_mass() == doctest::Approx(0.05610564).epsilon(1e-12));
  CHECK(koh_molar_mass() == molar_mass("KOH"));  // the cached value is the parser's, bit for bit
}

TEST_CASE("round trips between every pair of bases and units to 1e-12") {
  GasContext gas;
  gas.reference = ReferenceState::standard();
  gas.water_fraction = 0.045;
  gas.methane_fraction = 0.52;
  gas.lhv_molar = 0.52 * 802.65e3;
  gas.molar_flow = 22000;
  const ConcentrationUnit units[] = {ConcentrationUnit::ppmv, ConcentrationUnit::mg_per_m3, ConcentrationUnit::mg_per_MJ,
                                     ConcentrationUnit::mg_per_m3_methane, ConcentrationUnit::mol_per_h};
  const Basis bases[] = {Basis::dry, Basis::wet};
  const double M = molar_mass(Gas::H2S);
  for (auto u1 : units)
    for (auto b1 : bases)
      for (auto u2 : units)
        for (auto b2 : bases) {
          const Concentration c{437.5, u1, b1};
          const double there = convert(c, u2, b2, M, gas);
          const double back = convert({there, u2, b2}, u1, b1, M, gas);
          INFO(name(u1) << " -> " << name(u2));
          CHECK(std::fabs(back - c.value) <= 1e-12 * c.value);
        }
}

TEST_CASE("dry and wet basis differ by (1 - x_H2O)") {
  GasContext gas;
  gas.water_fraction = 0.05;
  const double wet = convert({1000, ConcentrationUnit::ppmv, Basis::dry}, ConcentrationUnit::ppmv, Basis::wet, 0.034, gas);
  CHECK(wet == doctest::Approx(950).epsilon(1e-14));
}

TEST_CASE("per-compound halocarbon analysis summed to Cl and F by formula") {
  // 2 ppm C2Cl4 + 1 ppm CCl2F2 + 3 ppm C2H3Cl: Cl = 2·4 + 1·2 + 3·1 = 13 ppm, F = 1·2 = 2 ppm
  const HalogenTotals t = halogen_totals({{"tetrachloroethene", 2e-6}, {"CCl2F2", 1e-6}, {"chloroethene", 3e-6}});
  CHECK(t.chlorine == doctest::Approx(13e-6).epsilon(1e-14));
  CHECK(t.fluorine == doctest::Approx(2e-6).epsilon(1e-14));
  CHECK_THROWS_AS(halogen_totals({{"unobtainium", 1e-6}}), InputError);
  for (const auto& h : halocarbon_table()) {
    const Formula f = parse_formula(h.formula);
    CHECK(f[Element::Cl] + f[Element::F] > 0);
  }
}

TEST_CASE("invalid values name the field, the value and the accepted range") {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  CHECK_THROWS_AS(molar_volume({-1, 101325}), InputError);
  CHECK_THROWS_AS(molar_volume({nan, 101325}), InputError);
  CHECK_THROWS_AS(water::saturation_pressure(200), InputError);
  CHECK_THROWS_AS(water::saturation_pressure(nan), InputError);
  CHECK_THROWS_AS(water::dew_point(1.5, 101325), InputError);
  CHECK_THROWS_AS(water::dew_point(1e-6, 101325), InputError);  // frost point
  GasContext gas;
  CHECK_THROWS_AS(to_wet_mole_fraction({-5, ConcentrationUnit::ppmv, Basis::dry}, 0.034, gas), InputError);
  try {
    check::fraction("engine.blow-by", 1.2);
    FAIL("no throw");
  } catch (const InputError& e) {
    CHECK(e.key() == "engine.blow-by");
    CHECK(e.value() == "1.2");
    CHECK(e.expected().find("0 to 1") != std::string::npos);
  }
  try {
    water::saturation_pressure(200);
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find("273.15") != std::string::npos);
  }
}

TEST_CASE("InputError shows file, line, column and a caret") {
  InputError e("fuel.h2s", "450 ppmw", "a figure in ppmv, mg/Nm3, mg/MJ", {"site.yaml", 7, 8, "  h2s: 450 ppmw"});
  const std::string m = e.what();
  CHECK(m.find("site.yaml:7:8:") == 0);
  CHECK(m.find("\n  " + std::string("  h2s: 450 ppmw") + "\n         ^") != std::string::npos);
}

TEST_CASE("water dew point and humidity are inverse") {
  const double x = water::water_fraction_at_humidity(1.0, 313.15, 101325);
  CHECK(water::dew_point(x, 101325) == doctest::Approx(313.15).epsilon(1e-12));
}

TEST_CASE("a halocarbon's formula and molar mass made once are those of its formula's text") {
  // the cache resolve uses against parsing the table's text anew, bit for bit
  for (const Halocarbon& h : halocarbon_table()) {
    const Formula f = parse_formula(h.formula);
    CHECK(halocarbon_formula(h).atoms == f.atoms);
    CHECK(halocarbon_molar_mass(h) == molar_mass(f));
  }
  Halocarbon stranger{"x", "CCl4"};
  CHECK_THROWS_AS(halocarbon_molar_mass(stranger), Error);
}
