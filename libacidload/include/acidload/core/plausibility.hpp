#pragma once
// Plausibility warnings: inputs beyond usual engine practice and answers outside it. Warnings, not
// refusals — the run goes on; each says what was seen and why it is questioned. The ranges are common
// practice with no single source (docs/model.md, "Plausibility"); the engine maker's figures govern.
#include <string>
#include <vector>

#include "acidload/core/fuel.hpp"
#include "acidload/core/transfer.hpp"

namespace acidload {

//! A warning on an input or a result.
struct Warning {
  std::string key;     //!< what it is about, as the case file names it ("engine.jacket-water-out")
  std::string value;   //!< the value, with its unit
  std::string reason;  //!< why it is questioned
};

//! The engine maker's fuel-gas limits (engine-specific; the user states them). < 0: not stated.
struct FuelGasLimits {
  double sulfur_per_methane = -1;    //!< total S [kg per Nm³ of CH4]
  double sulfur_per_energy = -1;     //!< total S [kg per J of fuel LHV] (per kWh ÷ 3.6e6)
  double halogens_per_methane = -1;  //!< organic Cl + F [kg per Nm³ of CH4]
  double halogens_per_energy = -1;   //!< organic Cl + F [kg per J of fuel LHV]
};

//! Usual engine practice (common practice, no source).
struct PracticeRanges {
  double jacket_water_low = 343.15, jacket_water_high = 378.15;  //!< jacket-water outlet 70–105 °C [K]
  double blowby_low = 0.002, blowby_high = 0.02;                 //!< blow-by 0.2–2 % of the charge [-]
  double lambda_low = 1.3, lambda_high = 2.3;                    //!< lean-burn excess-air ratio [-]
  double h2s_high = 5000e-6;    //!< H2S [mol/mol dry] above which gas is not run unscrubbed [-]
  double interval_low = 250;    //!< drain interval below which no plant runs an engine [h]
};

//! Total fuel sulfur per Nm³ of methane [kg/Nm³ CH4]: (H2S + other S)·M_S/(x_CH4·V_m,normal).
double sulfur_per_methane(const FuelGas& f);
//! Total fuel sulfur per unit of fuel energy [kg/J LHV]: S·M_S / LHV_molar.
double sulfur_per_energy(const FuelGas& f);
//! Organic Cl + F per Nm³ of methane [kg/Nm³ CH4].
double halogens_per_methane(const FuelGas& f);
//! Organic Cl + F per unit of fuel energy [kg/J LHV].
double halogens_per_energy(const FuelGas& f);

//! Warnings on the gas against the fuel-gas limits and on the operation against usual practice.
std::vector<Warning> input_warnings(const FuelGas& fuel, const Operation& op, const FuelGasLimits& limits,
                                    const PracticeRanges& practice = {});
//! A warning when a drain interval [h] is shorter than any plant runs.
std::vector<Warning> interval_warnings(double drain_interval, const PracticeRanges& practice = {});
//! A warning when a jacket-water outlet [K] found by `solve` lies outside usual practice.
std::vector<Warning> jacket_water_warnings(double jacket_water_out, const PracticeRanges& practice = {});

}  // namespace acidload
