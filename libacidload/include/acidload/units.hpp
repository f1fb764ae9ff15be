#pragma once
// acidload::units — Boost.Units quantities for the core's inputs, converted once, here, to the plain
// SI doubles of the core (the units table in acidload/core.hpp). Not a core header: it includes
// Boost. Link acidload::units and include this header yourself: the umbrella (acidload/acidload.hpp,
// acidload::acidload) leaves it out, so the program and the Python module never compile Boost.Units.
//
//   fuel.h2s = units::concentration(450.0 * units::ppmv, Basis::dry);
//   Operation op = units::operation(503.0 * units::normal_m3_per_hour, 1.0 * units::megawatts,
//                                   units::celsius(92.0));
//   OilProperties oil = units::oil_properties(6.0 * units::mg_koh_per_g);
//   double mass = units::oil_mass(600.0 * units::litres, oil);  // [kg]
//
// Three choices make mistakes fail to compile:
//  - Nm³ is a unit of AMOUNT OF SUBSTANCE, not of volume: 1 Nm³ is the amount of ideal gas that
//    fills 1 m³ at the normal state (273.15 K, 101.325 kPa), i.e. 1/V_m mol with V_m = R·T/p and
//    CODATA R. A volume of actual gas (m³, L) becomes an amount only with its temperature and
//    pressure (amount_of_gas). Nm³/h is a molar flow.
//  - Base equivalents have a base dimension of their own, measured in g KOH. An acid or base number
//    (mg KOH/g) is base equivalent per mass of oil and cannot be mixed with a plain mass ratio.
//  - Mole fraction and mass fraction are base dimensions of their own (the way Boost.Units treats
//    plane angle), so neither is a dimensionless double and one cannot stand for the other;
//    ppmv = 1e-6 mol/mol, ppmw = 1e-6 kg/kg. mole_fraction() is the one route from mass fractions.
//
// Functions accept a quantity of the right dimension in any unit of it (W, kW or MW alike); a raw
// double, or a quantity of another dimension, matches no overload.
//
// Temperatures: celsius(t) and kelvin(t) give an ABSOLUTE temperature (Boost's absolute<>), e.g.
// celsius(92.0) is 365.15 K. A plain `92.0 * boost::units::celsius::degrees` is a temperature
// DIFFERENCE of 92 K and converts to 92 K, not 365.15 K; functions that want a temperature take the
// absolute type, so a difference passed there does not compile.
#include <boost/units/absolute.hpp>
#include <boost/units/base_dimension.hpp>
#include <boost/units/base_unit.hpp>
#include <boost/units/base_units/cgs/gram.hpp>
#include <boost/units/base_units/metric/bar.hpp>
#include <boost/units/base_units/metric/hour.hpp>
#include <boost/units/base_units/metric/liter.hpp>
#include <boost/units/conversion.hpp>
#include <boost/units/derived_dimension.hpp>
#include <boost/units/make_scaled_unit.hpp>
#include <boost/units/quantity.hpp>
#include <boost/units/scale.hpp>
#include <boost/units/static_constant.hpp>
#include <boost/units/static_rational.hpp>
#include <boost/units/systems/si.hpp>
#include <boost/units/systems/temperature/celsius.hpp>
#include <boost/units/unit.hpp>
// After the kelvin and celsius base units: defines the offset between them (273.15 K).
#include <boost/units/base_units/temperature/conversions.hpp>

#include "acidload/core/combustion.hpp"
#include "acidload/core/constants.hpp"
#include "acidload/core/gas.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/core/transfer.hpp"

namespace acidload::units {

namespace bu = boost::units;
namespace si = boost::units::si;

// ---- dimensions beyond SI ------------------------------------------------------------------
// Ordinals 7101–7104 are ours; Boost.Units uses negative ones and a few below 100.

//! Base equivalents: acid neutralised or base available, measured as the KOH it equals.
struct base_equivalent_base_dimension : bu::base_dimension<base_equivalent_base_dimension, 7101> {};
//! Amount of a component per amount of mixture (its own dimension, not dimensionless).
struct mole_fraction_base_dimension : bu::base_dimension<mole_fraction_base_dimension, 7102> {};
//! Mass of a component per mass of mixture (its own dimension, not dimensionless).
struct mass_fraction_base_dimension : bu::base_dimension<mass_fraction_base_dimension, 7103> {};

using base_equivalent_dimension = base_equivalent_base_dimension::dimension_type;  //!< [g KOH]
using mole_fraction_dimension = mole_fraction_base_dimension::dimension_type;      //!< [mol/mol]
using mass_fraction_dimension = mass_fraction_base_dimension::dimension_type;      //!< [kg/kg]
//! Acid or base number: base equivalent per mass of oil [mg KOH/g].
using base_number_dimension =
    bu::derived_dimension<base_equivalent_base_dimension, 1, bu::mass_base_dimension, -1>::type;
//! Base-equivalent flow, acid inflow as KOH [g KOH/h].
using base_equivalent_flow_dimension =
    bu::derived_dimension<base_equivalent_base_dimension, 1, bu::time_base_dimension, -1>::type;
//! Molar flow [mol/h]; Nm³/h is one of its units.
using molar_flow_dimension =
    bu::derived_dimension<bu::amount_base_dimension, 1, bu::time_base_dimension, -1>::type;
//! Mass flow [kg/h].
using mass_flow_dimension =
    bu::derived_dimension<bu::mass_base_dimension, 1, bu::time_base_dimension, -1>::type;
//! Mass per amount [kg/mol]: molar masses, and contaminant figures in mg/Nm³.
using mass_per_amount_dimension =
    bu::derived_dimension<bu::mass_base_dimension, 1, bu::amount_base_dimension, -1>::type;
//! Energy per amount, a molar heating value [J/mol].
using molar_energy_dimension =
    bu::derived_dimension<bu::length_base_dimension, 2, bu::mass_base_dimension, 1, bu::time_base_dimension,
                          -2, bu::amount_base_dimension, -1>::type;
//! Mass per energy [kg/J]; mg/MJ (contaminant per fuel heat) and g/kWh (specific consumption).
using mass_per_energy_dimension =
    bu::derived_dimension<bu::length_base_dimension, -2, bu::time_base_dimension, 2>::type;
//! Volume flow of actual gas [m³/h].
using volume_flow_dimension =
    bu::derived_dimension<bu::length_base_dimension, 3, bu::time_base_dimension, -1>::type;

// ---- base units beyond SI ------------------------------------------------------------------

//! One gram of KOH-equivalent base (or of acid that neutralises it).
struct gram_koh_base_unit : bu::base_unit<gram_koh_base_unit, base_equivalent_dimension, 7101> {
  static const char* name() { return "gram of KOH"; }  //!< [-]
  static const char* symbol() { return "g KOH"; }      //!< [-]
};
//! Mole fraction, mol of component per mol of mixture.
struct mole_per_mole_base_unit : bu::base_unit<mole_per_mole_base_unit, mole_fraction_dimension, 7102> {
  static const char* name() { return "mole per mole"; }  //!< [-]
  static const char* symbol() { return "mol/mol"; }      //!< [-]
};
//! Mass fraction, kg of component per kg of mixture.
struct kilogram_per_kilogram_base_unit
    : bu::base_unit<kilogram_per_kilogram_base_unit, mass_fraction_dimension, 7103> {
  static const char* name() { return "kilogram per kilogram"; }  //!< [-]
  static const char* symbol() { return "kg/kg"; }                //!< [-]
};
//! Normal cubic metre: the amount of ideal gas in 1 m³ at 273.15 K and 101.325 kPa.
struct normal_cubic_metre_base_unit
    : bu::base_unit<normal_cubic_metre_base_unit, bu::amount_dimension, 7104> {
  static const char* name() { return "normal cubic metre"; }  //!< [-]
  static const char* symbol() { return "Nm^3"; }              //!< [-]
};

//! Ideal-gas molar volume at the normal state [m³/mol]: the core's one definition of the Nm³.
using constants::normal_molar_volume;

}  // namespace acidload::units

//! 1 Nm³ = 1/V_m(273.15 K, 101.325 kPa) mol.
BOOST_UNITS_DEFINE_CONVERSION_FACTOR(acidload::units::normal_cubic_metre_base_unit,
                                     boost::units::si::mole_base_unit, double,
                                     1.0 / acidload::units::normal_molar_volume);
BOOST_UNITS_DEFAULT_CONVERSION(acidload::units::normal_cubic_metre_base_unit, boost::units::si::amount);

namespace acidload::units {

// ---- units ---------------------------------------------------------------------------------
namespace detail {
template <class Unit, long Exponent>
using scaled = typename bu::make_scaled_unit<Unit, bu::scale<10, bu::static_rational<Exponent>>>::type;
template <class A, class B>
using per = typename bu::divide_typeof_helper<A, B>::type;
template <class A, class B>
using times = typename bu::multiply_typeof_helper<A, B>::type;
}  // namespace detail

using hour_unit = bu::metric::hour_base_unit::unit_type;                    //!< [h] = 3600 s
using litre_unit = bu::metric::liter_base_unit::unit_type;                  //!< [L] = 1e-3 m³
using bar_unit = bu::metric::bar_base_unit::unit_type;                      //!< [bar] = 1e5 Pa
using kilopascal_unit = detail::scaled<si::pressure, 3>;                    //!< [kPa]
using kilowatt_unit = detail::scaled<si::power, 3>;                         //!< [kW]
using megawatt_unit = detail::scaled<si::power, 6>;                         //!< [MW]
using megajoule_unit = detail::scaled<si::energy, 6>;                       //!< [MJ]
using kilowatt_hour_unit = detail::times<kilowatt_unit, hour_unit>;         //!< [kWh] = 3.6e6 J
using gram_unit = bu::cgs::gram_base_unit::unit_type;                       //!< [g]
using milligram_unit = detail::scaled<gram_unit, -3>;                       //!< [mg]
using normal_m3_unit = normal_cubic_metre_base_unit::unit_type;             //!< [Nm³], an amount
using normal_m3_per_hour_unit = detail::per<normal_m3_unit, hour_unit>;     //!< [Nm³/h], a molar flow
using mol_per_hour_unit = detail::per<si::amount, hour_unit>;               //!< [mol/h]
using kg_per_mol_unit = detail::per<si::mass, si::amount>;                  //!< [kg/mol]
using g_per_mol_unit = detail::per<gram_unit, si::amount>;                  //!< [g/mol]
using joule_per_mol_unit = detail::per<si::energy, si::amount>;             //!< [J/mol]
using kg_per_hour_unit = detail::per<si::mass, hour_unit>;                  //!< [kg/h]
using cubic_metre_per_hour_unit = detail::per<si::volume, hour_unit>;       //!< [m³/h] of actual gas
using mg_per_normal_m3_unit = detail::per<milligram_unit, normal_m3_unit>;  //!< [mg/Nm³], mass per amount
using mg_per_megajoule_unit = detail::per<milligram_unit, megajoule_unit>;  //!< [mg/MJ]
using g_per_kwh_unit = detail::per<gram_unit, kilowatt_hour_unit>;          //!< [g/kWh]
using gram_koh_unit = gram_koh_base_unit::unit_type;                        //!< [g KOH]
using milligram_koh_unit = detail::scaled<gram_koh_unit, -3>;               //!< [mg KOH]
using mg_koh_per_g_unit = detail::per<milligram_koh_unit, gram_unit>;       //!< [mg KOH/g], acid/base number
using g_koh_per_hour_unit = detail::per<gram_koh_unit, hour_unit>;          //!< [g KOH/h]
using mol_per_mol_unit = mole_per_mole_base_unit::unit_type;                //!< [mol/mol]
using mole_percent_unit = detail::scaled<mol_per_mol_unit, -2>;             //!< [mol %]
using ppmv_unit = detail::scaled<mol_per_mol_unit, -6>;                     //!< [ppmv] = 1e-6 mol/mol
using kg_per_kg_unit = kilogram_per_kilogram_base_unit::unit_type;          //!< [kg/kg]
using mass_percent_unit = detail::scaled<kg_per_kg_unit, -2>;               //!< [mass %]
using ppmw_unit = detail::scaled<kg_per_kg_unit, -6>;                       //!< [ppmw] = 1e-6 kg/kg

BOOST_UNITS_STATIC_CONSTANT(hours, hour_unit);                                  //!< [h]
BOOST_UNITS_STATIC_CONSTANT(litres, litre_unit);                                //!< [L]
BOOST_UNITS_STATIC_CONSTANT(bar, bar_unit);                                     //!< [bar]
BOOST_UNITS_STATIC_CONSTANT(kilopascals, kilopascal_unit);                      //!< [kPa]
BOOST_UNITS_STATIC_CONSTANT(kilowatts, kilowatt_unit);                          //!< [kW]
BOOST_UNITS_STATIC_CONSTANT(megawatts, megawatt_unit);                          //!< [MW]
BOOST_UNITS_STATIC_CONSTANT(megajoules, megajoule_unit);                        //!< [MJ]
BOOST_UNITS_STATIC_CONSTANT(kilowatt_hours, kilowatt_hour_unit);                //!< [kWh]
BOOST_UNITS_STATIC_CONSTANT(grams, gram_unit);                                  //!< [g]
BOOST_UNITS_STATIC_CONSTANT(milligrams, milligram_unit);                        //!< [mg]
BOOST_UNITS_STATIC_CONSTANT(normal_m3, normal_m3_unit);                         //!< [Nm³], an amount
BOOST_UNITS_STATIC_CONSTANT(normal_m3_per_hour, normal_m3_per_hour_unit);       //!< [Nm³/h]
BOOST_UNITS_STATIC_CONSTANT(mol_per_hour, mol_per_hour_unit);                   //!< [mol/h]
BOOST_UNITS_STATIC_CONSTANT(kg_per_hour, kg_per_hour_unit);                     //!< [kg/h]
BOOST_UNITS_STATIC_CONSTANT(g_per_mol, g_per_mol_unit);                         //!< [g/mol]
BOOST_UNITS_STATIC_CONSTANT(joules_per_mol, joule_per_mol_unit);                //!< [J/mol]
BOOST_UNITS_STATIC_CONSTANT(cubic_metres_per_hour, cubic_metre_per_hour_unit);  //!< [m³/h] actual
BOOST_UNITS_STATIC_CONSTANT(mg_per_normal_m3, mg_per_normal_m3_unit);           //!< [mg/Nm³]
BOOST_UNITS_STATIC_CONSTANT(mg_per_megajoule, mg_per_megajoule_unit);           //!< [mg/MJ]
BOOST_UNITS_STATIC_CONSTANT(g_per_kwh, g_per_kwh_unit);                         //!< [g/kWh]
BOOST_UNITS_STATIC_CONSTANT(grams_koh, gram_koh_unit);                          //!< [g KOH]
BOOST_UNITS_STATIC_CONSTANT(mg_koh_per_g, mg_koh_per_g_unit);                   //!< [mg KOH/g]
BOOST_UNITS_STATIC_CONSTANT(g_koh_per_hour, g_koh_per_hour_unit);               //!< [g KOH/h]
BOOST_UNITS_STATIC_CONSTANT(mol_per_mol, mol_per_mol_unit);                     //!< [mol/mol]
BOOST_UNITS_STATIC_CONSTANT(mole_percent, mole_percent_unit);                   //!< [mol %]
BOOST_UNITS_STATIC_CONSTANT(ppmv, ppmv_unit);                                   //!< [ppmv]
BOOST_UNITS_STATIC_CONSTANT(kg_per_kg, kg_per_kg_unit);                         //!< [kg/kg]
BOOST_UNITS_STATIC_CONSTANT(mass_percent, mass_percent_unit);                   //!< [mass %]
BOOST_UNITS_STATIC_CONSTANT(ppmw, ppmw_unit);                                   //!< [ppmw]

//! A quantity of dimension Dim in any unit system; functions below deduce System and Y.
template <class Dim, class System, class Y>
using quantity_of = bu::quantity<bu::unit<Dim, System>, Y>;
//! An absolute (thermodynamic) temperature in any unit system.
template <class System, class Y>
using absolute_temperature_of = bu::quantity<bu::absolute<bu::unit<bu::temperature_dimension, System>>, Y>;

using thermodynamic_temperature = bu::quantity<bu::absolute<si::temperature>>;  //!< absolute [K]
using mole_fraction = bu::quantity<mol_per_mol_unit>;                           //!< [mol/mol]
using mass_fraction = bu::quantity<kg_per_kg_unit>;                             //!< [kg/kg]
using base_number = bu::quantity<mg_koh_per_g_unit>;                            //!< [mg KOH/g]

// ---- temperatures --------------------------------------------------------------------------

//! Absolute temperature from degrees Celsius: t + 273.15 [°C → K].
inline thermodynamic_temperature celsius(double t) {
  return thermodynamic_temperature(t * bu::absolute<bu::celsius::temperature>());
}
//! Absolute temperature from kelvin [K].
inline thermodynamic_temperature kelvin(double t) { return t * bu::absolute<si::temperature>(); }

// ---- to_core: one per row of the core's units table, returning the core's unit -------------
// (Convert, then read the value: the quantity's own unit never leaks into the double.)

//! Amount of substance, Nm³ included [mol].
template <class S, class Y>
double to_core(const quantity_of<bu::amount_dimension, S, Y>& q) {
  return bu::quantity<si::amount, double>(q).value();
}
//! Molar flow, Nm³/h included [mol/h].
template <class S, class Y>
double to_core(const quantity_of<molar_flow_dimension, S, Y>& q) {
  return bu::quantity<mol_per_hour_unit, double>(q).value();
}
//! Mass [kg].
template <class S, class Y>
double to_core(const quantity_of<bu::mass_dimension, S, Y>& q) {
  return bu::quantity<si::mass, double>(q).value();
}
//! Mass flow [kg/h].
template <class S, class Y>
double to_core(const quantity_of<mass_flow_dimension, S, Y>& q) {
  return bu::quantity<kg_per_hour_unit, double>(q).value();
}
//! Volume of actual (not normal) gas or liquid [m³].
template <class S, class Y>
double to_core(const quantity_of<bu::volume_dimension, S, Y>& q) {
  return bu::quantity<si::volume, double>(q).value();
}
//! Absolute temperature [K].
template <class S, class Y>
double to_core(const absolute_temperature_of<S, Y>& q) {
  return thermodynamic_temperature(q).value();
}
//! Temperature difference [K].
template <class S, class Y>
double to_core(const quantity_of<bu::temperature_dimension, S, Y>& q) {
  return bu::quantity<si::temperature, double>(q).value();
}
//! Pressure [Pa].
template <class S, class Y>
double to_core(const quantity_of<bu::pressure_dimension, S, Y>& q) {
  return bu::quantity<si::pressure, double>(q).value();
}
//! Power [W].
template <class S, class Y>
double to_core(const quantity_of<bu::power_dimension, S, Y>& q) {
  return bu::quantity<si::power, double>(q).value();
}
//! Energy [J].
template <class S, class Y>
double to_core(const quantity_of<bu::energy_dimension, S, Y>& q) {
  return bu::quantity<si::energy, double>(q).value();
}
//! Time [h].
template <class S, class Y>
double to_core(const quantity_of<bu::time_dimension, S, Y>& q) {
  return bu::quantity<hour_unit, double>(q).value();
}
//! Molar heating value [J/mol].
template <class S, class Y>
double to_core(const quantity_of<molar_energy_dimension, S, Y>& q) {
  return bu::quantity<joule_per_mol_unit, double>(q).value();
}
//! Mass density [kg/m³].
template <class S, class Y>
double to_core(const quantity_of<bu::mass_density_dimension, S, Y>& q) {
  return bu::quantity<si::mass_density, double>(q).value();
}
//! Mole fraction, ppmv and mol % included [mol/mol].
template <class S, class Y>
double to_core(const quantity_of<mole_fraction_dimension, S, Y>& q) {
  return bu::quantity<mol_per_mol_unit, double>(q).value();
}
//! Mass fraction, ppmw and mass % included [kg/kg].
template <class S, class Y>
double to_core(const quantity_of<mass_fraction_dimension, S, Y>& q) {
  return bu::quantity<kg_per_kg_unit, double>(q).value();
}
//! Acid or base number [mg KOH/g].
template <class S, class Y>
double to_core(const quantity_of<base_number_dimension, S, Y>& q) {
  return bu::quantity<mg_koh_per_g_unit, double>(q).value();
}
//! Base-equivalent flow, acid inflow as KOH [g KOH/h].
template <class S, class Y>
double to_core(const quantity_of<base_equivalent_flow_dimension, S, Y>& q) {
  return bu::quantity<g_koh_per_hour_unit, double>(q).value();
}

// ---- fractions -----------------------------------------------------------------------------

//! Mole fraction from a mass fraction: x_i = w_i·M_mixture/M_i [mol/mol] (definitions of x and w).
template <class S1, class Y1, class S2, class Y2, class S3, class Y3>
mole_fraction mole_fraction_of(const quantity_of<mass_fraction_dimension, S1, Y1>& w,
                               const quantity_of<mass_per_amount_dimension, S2, Y2>& molar_mass,
                               const quantity_of<mass_per_amount_dimension, S3, Y3>& mixture_molar_mass) {
  const double m_i = bu::quantity<kg_per_mol_unit, double>(molar_mass).value();
  const double m_mix = bu::quantity<kg_per_mol_unit, double>(mixture_molar_mass).value();
  return (to_core(w) * m_mix / m_i) * mol_per_mol;
}

// ---- contaminant figures (acidload::Concentration) -----------------------------------------

//! A figure as a mole fraction, held as ppmv on `basis` [mol/mol → ppmv].
template <class S, class Y>
Concentration concentration(const quantity_of<mole_fraction_dimension, S, Y>& x, Basis basis = Basis::dry) {
  return {bu::quantity<ppmv_unit, double>(x).value(), ConcentrationUnit::ppmv, basis};
}
//! A figure as mass per amount of gas (mg/Nm³), held as mg per m³ at `reference` — the state the
//! fuel analysis quotes its m³ at — on `basis` [mg/Nm³ → mg/m³ at reference].
template <class S, class Y>
Concentration concentration(const quantity_of<mass_per_amount_dimension, S, Y>& c, Basis basis = Basis::dry,
                            const ReferenceState& reference = ReferenceState::normal()) {
  // mass per mol ÷ molar volume at the reference = mass per m³ there; at the normal state this is
  // the mg/Nm³ figure itself.
  const double mg_per_mol = bu::quantity<detail::per<milligram_unit, si::amount>, double>(c).value();
  return {mg_per_mol / molar_volume(reference), ConcentrationUnit::mg_per_m3, basis};
}
//! A figure per fuel heat (LHV), basis-free [mg/MJ].
template <class S, class Y>
Concentration concentration(const quantity_of<mass_per_energy_dimension, S, Y>& c) {
  return {bu::quantity<mg_per_megajoule_unit, double>(c).value(), ConcentrationUnit::mg_per_MJ, Basis::dry};
}
//! A figure as the flow the gas carries, basis-free [mol/h].
template <class S, class Y>
Concentration concentration(const quantity_of<molar_flow_dimension, S, Y>& n) {
  return {to_core(n), ConcentrationUnit::mol_per_h, Basis::dry};
}

//! Engine-out NOx as NO2, dry at a reference O2 [mg/Nm³; O2 mol/mol].
template <class S1, class Y1, class S2, class Y2>
NoxEmission nox(const quantity_of<mass_per_amount_dimension, S1, Y1>& c,
                const quantity_of<mole_fraction_dimension, S2, Y2>& o2_reference) {
  NoxEmission e;
  e.value = bu::quantity<mg_per_normal_m3_unit, double>(c).value();
  e.unit = NoxEmission::Unit::mg_per_m3_dry_at_o2_ref;
  e.o2_reference = to_core(o2_reference);
  return e;
}
//! Engine-out NOx as NO2 per electrical energy [g/kWh].
template <class S, class Y>
NoxEmission nox(const quantity_of<mass_per_energy_dimension, S, Y>& specific) {
  NoxEmission e;
  e.value = bu::quantity<g_per_kwh_unit, double>(specific).value();
  e.unit = NoxEmission::Unit::g_per_kWh;
  return e;
}

// ---- gas volumes -------------------------------------------------------------------------

//! Amount in a volume of actual gas at temperature T and pressure p: n = p·V/(R·T) [mol].
template <class S1, class Y1, class S2, class Y2, class S3, class Y3>
double amount_of_gas(const quantity_of<bu::volume_dimension, S1, Y1>& volume,
                     const absolute_temperature_of<S2, Y2>& t,
                     const quantity_of<bu::pressure_dimension, S3, Y3>& p) {
  return to_core(volume) / molar_volume(ReferenceState{to_core(t), to_core(p)});
}
//! Molar flow of an actual-gas volume flow at temperature T and pressure p: ṅ = p·V̇/(R·T) [mol/h].
template <class S1, class Y1, class S2, class Y2, class S3, class Y3>
double molar_flow_of_gas(const quantity_of<volume_flow_dimension, S1, Y1>& flow,
                         const absolute_temperature_of<S2, Y2>& t,
                         const quantity_of<bu::pressure_dimension, S3, Y3>& p) {
  const double m3_per_hour = bu::quantity<cubic_metre_per_hour_unit, double>(flow).value();
  return m3_per_hour / molar_volume(ReferenceState{to_core(t), to_core(p)});
}

// ---- builders of core inputs -------------------------------------------------------------

//! An operating state: fuel flow [Nm³/h → mol/h], electrical output [kW, MW → W], jacket-water
//! outlet [°C → K]; every other field keeps its default.
template <class S1, class Y1, class S2, class Y2, class S3, class Y3>
Operation operation(const quantity_of<molar_flow_dimension, S1, Y1>& fuel_flow,
                    const quantity_of<bu::power_dimension, S2, Y2>& electrical_power,
                    const absolute_temperature_of<S3, Y3>& jacket_water_out) {
  Operation op;
  op.fuel_flow = to_core(fuel_flow);
  op.electrical_power = to_core(electrical_power);
  op.jacket_water_out = to_core(jacket_water_out);
  return op;
}

//! An oil product with its fresh base number by `method` [mg KOH/g]; every other field keeps its default.
template <class S, class Y>
OilProperties oil_properties(const quantity_of<base_number_dimension, S, Y>& fresh_tbn,
                             BaseNumberMethod method = BaseNumberMethod::d2896) {
  OilProperties oil;
  oil.fresh_tbn = to_core(fresh_tbn);
  oil.fresh_tbn_method = method;
  return oil;
}

//! Mass of oil in circulation from its volume at 15 °C and the oil's density at 15 °C [L → kg].
template <class S, class Y>
double oil_mass(const quantity_of<bu::volume_dimension, S, Y>& volume_15, const OilProperties& oil) {
  return to_core(volume_15) * oil.density_15;
}

//! Oil consumed from a specific consumption and the electrical output: c = sfc·P [g/kWh, kW → kg/h].
template <class S1, class Y1, class S2, class Y2>
double oil_consumption(const quantity_of<mass_per_energy_dimension, S1, Y1>& specific,
                       const quantity_of<bu::power_dimension, S2, Y2>& electrical_power) {
  const double kg_per_joule = bu::quantity<detail::per<si::mass, si::energy>, double>(specific).value();
  return kg_per_joule * to_core(electrical_power) * constants::seconds_per_hour;
}

}  // namespace acidload::units
