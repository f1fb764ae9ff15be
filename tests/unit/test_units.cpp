// Unit tests of the units face (acidload::units): conversions against exact definitions, Nm³ as an
// amount, °C as an absolute temperature, mg KOH/g round trips, the builders of core inputs.
// What must not compile is tested in tests/compilefail/ (Boost's converting constructor is not
// SFINAE-friendly, so a wrong conversion is a hard error there, not a false trait here).
#include <doctest/doctest.h>

#include <string>
#include <type_traits>

#include <boost/units/is_dimensionless_unit.hpp>

#include "acidload/core/constants.hpp"
#include "acidload/core/species.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/units.hpp"

using namespace acidload;
namespace u = acidload::units;
namespace bu = boost::units;

namespace {
// Relative closeness for values computed through a chain of floating-point conversion factors.
bool close(double a, double b, double rel = 1e-14) { return a == doctest::Approx(b).epsilon(rel).scale(0); }
}  // namespace

// ---- the type system: decided at compile time ------------------------------------------------
static_assert(std::is_same_v<u::normal_m3_unit::dimension_type, bu::amount_dimension>, "Nm³ is an amount");
static_assert(!std::is_same_v<u::normal_m3_unit::dimension_type, bu::volume_dimension>, "Nm³ is no volume");
static_assert(std::is_same_v<u::normal_m3_per_hour_unit::dimension_type, u::molar_flow_dimension>,
              "Nm³/h is a molar flow");
static_assert(!std::is_same_v<u::ppmv_unit::dimension_type, u::ppmw_unit::dimension_type>,
              "mole and mass fractions differ");
static_assert(!bu::is_dimensionless_unit<u::mol_per_mol_unit>::value,
              "a mole fraction is not a plain number");
static_assert(!bu::is_dimensionless_unit<u::kg_per_kg_unit>::value, "a mass fraction is not a plain number");
static_assert(!std::is_convertible_v<double, u::mole_fraction>, "no mole fraction from a raw double");
static_assert(std::is_same_v<u::mg_koh_per_g_unit::dimension_type, u::base_number_dimension>,
              "mg KOH/g is base equivalent per mass");
static_assert(!std::is_same_v<u::base_number_dimension, u::kg_per_kg_unit::dimension_type>,
              "a base number is no mass ratio");

// ---- conversions against exact definitions ---------------------------------------------------
TEST_CASE("SI prefixes and non-SI units convert to the core's units exactly") {
  CHECK(u::to_core(1.2 * u::kilowatts) ==
        doctest::Approx(1200.0).epsilon(1e-15));  // SI Brochure / definition: k = 1e3
  CHECK(u::to_core(1.2 * u::megawatts) ==
        doctest::Approx(1.2e6).epsilon(1e-15));                  // SI Brochure / definition: M = 1e6
  CHECK(close(u::to_core(600.0 * u::litres), 0.6));              // SI Brochure / definition: 1 L = 1e-3 m³
  CHECK(close(u::to_core(2.0 * u::bar), 2e5));                   // SI Brochure / definition: 1 bar = 1e5 Pa
  CHECK(close(u::to_core(101.325 * u::kilopascals), 101325.0));  // SI Brochure / definition: k = 1e3
  CHECK(u::to_core(7200.0 * u::si::seconds) == 2.0);             // SI Brochure / definition: 1 h = 3600 s
  CHECK(u::to_core(2.5 * u::hours) == 2.5);                      // the core's time unit is h (core.hpp)
  CHECK(close(u::to_core(1.0 * u::kilowatt_hours), 3.6e6));      // SI Brochure / definition: 1 kWh = 3.6e6 J
  CHECK(close(u::to_core(3.0 * u::megajoules), 3e6));            // SI Brochure / definition: M = 1e6
  CHECK(close(u::to_core(250.0 * u::grams), 0.25));              // SI Brochure / definition: 1 g = 1e-3 kg
  CHECK(close(u::to_core(2.0 * u::mol_per_hour), 2.0));          // the core's molar-flow unit is mol/h
  CHECK(close(u::to_core(1.0 * u::si::moles / u::si::seconds),
              3600.0));  // SI Brochure / definition: 1 h = 3600 s
  CHECK(close(u::to_core(802.65 * u::joules_per_mol * 1e3), 802650.0));  // SI Brochure / definition: k = 1e3
}

TEST_CASE("specific consumption: g/kWh against 1 kWh = 3.6e6 J") {
  // 1 g/kWh = 1000 mg / 3.6 MJ = 277.78 mg/MJ (SI Brochure / definition: 1 kWh = 3.6e6 J).
  CHECK(close(bu::quantity<u::mg_per_megajoule_unit>(1.0 * u::g_per_kwh).value(), 1000.0 / 3.6));
  // 0.2 g/kWh at 1 MW: 0.2 g × 1000 kWh/h = 200 g/h = 0.2 kg/h (SI Brochure / definition: 1 kWh = 3.6e6 J).
  CHECK(close(u::oil_consumption(0.2 * u::g_per_kwh, 1.0 * u::megawatts), 0.2));
  CHECK(close(u::oil_consumption(0.2 * u::g_per_kwh, 1000.0 * u::kilowatts), 0.2));
}

TEST_CASE("celsius gives an absolute temperature: 92 °C is 365.15 K") {
  CHECK(u::to_core(u::celsius(92.0)) ==
        doctest::Approx(365.15).epsilon(1e-15));  // SI Brochure / definition: 0 °C = 273.15 K
  CHECK(u::to_core(u::celsius(0.0)) ==
        doctest::Approx(273.15).epsilon(1e-15));  // SI Brochure / definition: 0 °C = 273.15 K
  CHECK(u::to_core(u::celsius(-273.15)) ==
        doctest::Approx(0.0));  // SI Brochure / definition: 0 K = −273.15 °C
  CHECK(u::to_core(u::kelvin(365.15)) == 365.15);
  // A temperature difference stays a difference, in any unit of it: 10 K = 10 °C of difference.
  CHECK(u::to_core(10.0 * u::si::kelvin) == 10.0);
  CHECK(u::to_core(10.0 * bu::celsius::degrees) ==
        10.0);  // SI Brochure / definition: 1 °C = 1 K as an interval
  // The trap celsius() avoids: Boost's plain celsius unit is a difference, so 92 "°C" would be 92 K.
  CHECK(bu::quantity<u::si::temperature>(92.0 * bu::celsius::degrees).value() == 92.0);
}

// ---- Nm³ is an amount ------------------------------------------------------------------------
TEST_CASE("Nm³ is an amount of substance: 1 Nm³ = p_n/(R·T_n) mol") {
  // 101325 / (8.314462618 × 273.15) = 44.615033406… mol, from CODATA 2018 R (exact) and the normal
  // state 273.15 K, 101.325 kPa (SI Brochure / definition); computed by hand outside acidload.
  CHECK(close(u::to_core(1.0 * u::normal_m3), 44.61503340629259));
  // CODATA 2018 recommended value: molar volume of ideal gas (273.15 K, 101.325 kPa)
  // 22.413 969 54… L/mol (from memory).
  CHECK(u::normal_molar_volume == doctest::Approx(22.41396954e-3).epsilon(1e-9));
  // The core's own molar volume at the normal state is the same V_m.
  CHECK(close(u::normal_molar_volume, molar_volume(ReferenceState::normal()), 1e-15));
}

TEST_CASE("one Nm³: the typed face and the case reader's units share core/constants.hpp's V_m exactly") {
  // Not a check of the value (the case above does that against CODATA) but of there being one
  // definition: units.hpp's V_m is the core constant itself, and the reader's factor is its inverse.
  CHECK(u::normal_molar_volume == constants::normal_molar_volume);
  for (const char* text : {"1 Nm3/h", "503 Nm3/h", "2.2e4 Nm3/h"}) {
    double read = 0;
    std::string why;
    REQUIRE(io::parse_quantity_text(text, io::Kind::molar_flow, read, why));
    const double flow = std::stod(text);
    CHECK(read == flow * (1.0 / constants::normal_molar_volume));  // bit-identical: the reader's factor is 1/V_m
    CHECK(close(read, u::to_core(flow * u::normal_m3_per_hour)));  // Boost's chain of factors: last bits only
  }
}

TEST_CASE("Nm³/h becomes mol/h: flow / V_m(normal)") {
  for (double flow : {1.0, 503.0, 2.2e4}) {
    const double expected = flow / molar_volume(ReferenceState::normal());  // ṅ = V̇_n / V_m (ideal gas)
    CHECK(close(u::to_core(flow * u::normal_m3_per_hour), expected));
  }
}

TEST_CASE("actual gas volumes become amounts only with their temperature and pressure") {
  // 1 m³ at the normal state is 1 Nm³ (definition of the normal cubic metre).
  CHECK(close(u::amount_of_gas(1.0 * u::si::cubic_meters, u::celsius(0.0), 101.325 * u::kilopascals),
              u::to_core(1.0 * u::normal_m3)));
  // 2.5 m³ at 35 °C, 1.05 bar: n = pV/(RT) = 1.05e5 × 2.5 / (8.314462618 × 308.15) = 102.4549… mol
  // (ideal-gas law with CODATA 2018 R; computed by hand outside acidload).
  CHECK(close(u::amount_of_gas(2500.0 * u::litres, u::celsius(35.0), 1.05 * u::bar), 102.45495115786944));
  CHECK(close(u::molar_flow_of_gas(2.5 * u::cubic_metres_per_hour, u::celsius(35.0), 1.05 * u::bar),
              102.45495115786944));
}

// ---- base equivalents ------------------------------------------------------------------------
TEST_CASE("mg KOH/g round trip and g KOH/kg") {
  const auto tbn = 6.0 * u::mg_koh_per_g;
  const double core = u::to_core(tbn);
  CHECK(core == 6.0);  // the core's base-number unit is mg KOH/g (core.hpp)
  const auto back = core * u::mg_koh_per_g;
  CHECK(back.value() == tbn.value());
  // 1 g KOH/kg = 1 mg KOH/g (SI Brochure / definition: m = 1e-3, k = 1e3).
  CHECK(close(u::to_core(6.0 * u::grams_koh / u::si::kilograms), 6.0));
  // Base-equivalent flow: 56 g KOH/h stays 56 in the core's g KOH/h; per second × 3600 (1 h = 3600 s).
  CHECK(close(u::to_core(56.0 * u::g_koh_per_hour), 56.0));
  CHECK(close(u::to_core(1.0 * u::grams_koh / u::si::seconds), 3600.0));
}

// ---- fractions and contaminant figures -------------------------------------------------------
TEST_CASE("mole fractions: ppmv = 1e-6 mol/mol, mol % = 1e-2 mol/mol") {
  CHECK(close(u::to_core(450.0 * u::ppmv), 4.5e-4));       // docs/model.md §2.5: ppmv = mole fraction × 1e6
  CHECK(close(u::to_core(52.0 * u::mole_percent), 0.52));  // definition of per cent
  CHECK(close(u::to_core(0.1 * u::mass_percent), 1e-3));   // definition of per cent
  CHECK(close(u::to_core(25.0 * u::ppmw), 2.5e-5));        // definition: ppmw = mass fraction × 1e6
  // x_i = w_i·M_mix/M_i (definitions of mole and mass fraction): w = 1e-3, M_i = 34 g/mol,
  // M_mix = 17 g/mol gives x = 5e-4.
  const auto x = u::mole_fraction_of(1e-3 * u::kg_per_kg, 34.0 * u::g_per_mol, 17.0 * u::g_per_mol);
  CHECK(close(u::to_core(x), 5e-4));
}

TEST_CASE("concentrations") {
  const Concentration a = u::concentration(450.0 * u::ppmv, Basis::wet);
  CHECK(a.unit == ConcentrationUnit::ppmv);
  CHECK(a.basis == Basis::wet);
  CHECK(close(a.value, 450.0));
  CHECK(close(u::concentration(0.045 * u::mole_percent).value, 450.0));  // 1 mol % = 1e4 ppmv (definitions)

  // mg/Nm³ at the normal reference state: the figure itself.
  const Concentration b = u::concentration(120.0 * u::mg_per_normal_m3);
  CHECK(b.unit == ConcentrationUnit::mg_per_m3);
  CHECK(b.basis == Basis::dry);
  CHECK(close(b.value, 120.0));
  // The same gas quoted per m³ at 15 °C: a standard m³ holds 273.15/288.15 of a normal m³'s amount
  // (ideal gas at equal pressure; the reference temperatures are definitions).
  const Concentration c =
      u::concentration(120.0 * u::mg_per_normal_m3, Basis::dry, ReferenceState::standard());
  CHECK(close(c.value, 120.0 * 273.15 / 288.15));

  // mg/Nm³ = ppmv × M / V_m[L/mol] (docs/model.md §2.5): the mg/Nm³ figure of 450 ppmv H2S is the same gas.
  const double m_h2s = molar_mass(Gas::H2S);  // [kg/mol]
  const double mg_per_nm3 = 450.0 * (m_h2s * 1e3) / (u::normal_molar_volume * 1e3);
  GasContext gas;  // normal reference, dry gas
  const double x = to_wet_mole_fraction(u::concentration(mg_per_nm3 * u::mg_per_normal_m3), m_h2s, gas);
  CHECK(close(x, 450e-6, 1e-12));

  const Concentration d = u::concentration(12.5 * u::mg_per_megajoule);
  CHECK(d.unit == ConcentrationUnit::mg_per_MJ);
  CHECK(close(d.value, 12.5));
  const Concentration e = u::concentration(6.7 * u::mol_per_hour);
  CHECK(e.unit == ConcentrationUnit::mol_per_h);
  CHECK(close(e.value, 6.7));
}

TEST_CASE("NOx figures") {
  const NoxEmission a = u::nox(500.0 * u::mg_per_normal_m3, 5.0 * u::mole_percent);
  CHECK(a.unit == NoxEmission::Unit::mg_per_m3_dry_at_o2_ref);
  CHECK(close(a.value, 500.0));
  CHECK(close(a.o2_reference, 0.05));  // definition of per cent
  const NoxEmission b = u::nox(1.1 * u::g_per_kwh);
  CHECK(b.unit == NoxEmission::Unit::g_per_kWh);
  CHECK(close(b.value, 1.1));
  // 1.1 g/kWh given in mg/MJ: 1.1 × 1000/3.6 mg/MJ (SI Brochure / definition: 1 kWh = 3.6e6 J).
  CHECK(close(u::nox(1.1 * 1000.0 / 3.6 * u::mg_per_megajoule).value, 1.1));
}

// ---- builders of core inputs -----------------------------------------------------------------
TEST_CASE("operation: Nm³/h → mol/h, MW → W, °C → K") {
  const Operation op = u::operation(503.0 * u::normal_m3_per_hour, 1.0 * u::megawatts, u::celsius(92.0));
  CHECK(close(op.fuel_flow, 503.0 / molar_volume(ReferenceState::normal())));  // ṅ = V̇_n / V_m
  CHECK(op.electrical_power == doctest::Approx(1e6).epsilon(1e-15));  // SI Brochure / definition: M = 1e6
  CHECK(op.jacket_water_out ==
        doctest::Approx(365.15).epsilon(1e-15));  // SI Brochure / definition: 0 °C = 273.15 K
  const Operation defaults;
  CHECK(op.load == defaults.load);
  CHECK(op.blowby_share == defaults.blowby_share);
}

TEST_CASE("oil: fresh TBN and oil mass from litres at 15 °C") {
  OilProperties oil = u::oil_properties(6.0 * u::mg_koh_per_g, BaseNumberMethod::d4739);
  CHECK(oil.fresh_tbn == 6.0);
  CHECK(oil.fresh_tbn_method == BaseNumberMethod::d4739);
  CHECK(u::oil_properties(8.0 * u::mg_koh_per_g).fresh_tbn_method == BaseNumberMethod::d2896);
  oil.density_15 = 880.0;
  // 600 L × 880 kg/m³ = 528 kg (SI Brochure / definition: 1 L = 1e-3 m³).
  CHECK(close(u::oil_mass(600.0 * u::litres, oil), 528.0));
  CHECK(close(u::to_core(880.0 * u::si::kilograms / u::si::cubic_meters), 880.0));
}
