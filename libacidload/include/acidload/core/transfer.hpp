#pragma once
// The two paths of acid into the oil (docs/model.md §5): condensation on the cylinder liner, scraped into
// the sump, and blow-by gas into the crankcase. Rates per hour for one operating state.
#include <array>

#include "acidload/core/combustion.hpp"
#include "acidload/core/fuel.hpp"

namespace acidload {

//! The calibratable transfer parameters. Defaults reproduce the sanity range of docs/model.md §5.5 (0.1–0.5 % of
//! fuel sulfur into the oil for a 1 MW engine at 300 ppmv H2S); fit them to lab data (docs/model.md §12).
struct TransferParameters {
  double so3_share = 0.02;              //!< ε, fuel S to SO3 in the cylinder [-]; 0.5–2.4 % measured (Cordtz 2013)
  double liner_uptake = 2.5e-4;         //!< λ_L, share of fuel S taken up by the liner per 10 K of subcooling [-]
  double liner_subcooling_scale = 5;    //!< ΔT_s, softplus width of the liner uptake [K]
  double liner_wall_rise = 40;          //!< ΔT_liner at full load, liner wall over jacket-water outlet [K]
  double liner_wall_rise_load_exponent = 1;  //!< ΔT_liner = rise · load^exponent [-]
  double liner_pressure = 30e5;         //!< cylinder pressure at which acid condenses on the liner [Pa]
  double cylinder_dew_point_offset = 0; //!< added to the correlation's in-cylinder acid dew point [K]
  double burnt_share_of_blowby = 0.7;   //!< share of blow-by that is burnt gas; the rest is unburnt mixture [-]
  double capture_so3 = 1;               //!< κ, share of blow-by SO3 taken up by the oil [-]
  double capture_hcl = 1;               //!< κ, share of blow-by HCl taken up [-]
  double capture_hf = 1;                //!< κ, share of blow-by HF taken up [-]
  double capture_so2 = 0.1;             //!< κ_SO2, share of blow-by SO2 taken up by fresh oil in a dry crankcase [-]
  double wet_so2_factor = 3;            //!< m_wet, SO2 uptake in a wet crankcase over a dry one [-]
  double wetness_width = 15;            //!< 10–90 % width of the crankcase condensation step [K]: the spread of the
                                        //!< temperatures of the surfaces the blow-by wets above the coldest one (no source)
  double warmup_hours = 0.5;            //!< warm-up after a start: jacket water and load reach their running values,
                                        //!< the crankcase stays wet [h] (tens of minutes, from memory)
  double warmup_start_load = 0.3;       //!< load when the engine takes load after a start, share of the running load [-] (no source)
  double load_ramp_hours = 0.1;         //!< time to reach the running load after a start [h] (minutes, from memory)
  double capture_no2 = 0.01;            //!< κ_N, share of blow-by NO2 taken up (nitric acid, nitration) [-]
};
//! Validates the parameters (shares in [0,1], scales > 0); throws InputError naming the field.
void validate(const TransferParameters& p);

//! One operating state of the engine.
struct Operation {
  double fuel_flow = 0;              //!< wet fuel gas [mol/h]
  double electrical_power = 0;       //!< output [W]; used for NOx in g/kWh
  double load = 1;                   //!< output over rated output [-]
  Air air;                           //!< excess-air ratio and humidity
  double blowby_share = 0.01;        //!< blow-by as a share of the charge [-] (used when blowby_flow is 0)
  double blowby_flow = 0;            //!< blow-by [mol/h]; overrides the share when > 0
  double jacket_water_out = 363.15;  //!< jacket-water outlet temperature [K]
  double coldest_crankcase_surface = 333.15;  //!< coldest surface the blow-by wets (breather, covers) [K]
  double crankcase_pressure = 101325;         //!< [Pa]
  double exhaust_pressure = 101325;           //!< at the heat-recovery exchanger [Pa]
  double starts_per_hour = 0;        //!< engine starts per operating hour [1/h]
  double jacket_water_at_start = 323.15;  //!< jacket water when the engine starts (preheated standby) [K] (40–60 °C, common practice)
  NoxEmission nox;                   //!< engine-out NOx
};
//! Validates an operating state; throws InputError naming the field.
void validate(const Operation& op);

//! Acid reaching the oil, per species [mol/h], and as base equivalents [g KOH/h].
struct AcidInflow {
  double sulfuric_liner = 0;      //!< S condensed on the liner, as H2SO4 [mol/h] (running and warm-up)
  double sulfuric_warmup = 0;     //!< of which the extra condensed on the colder liner while warming up after starts [mol/h]
  double sulfuric_blowby = 0;     //!< SO3 of the blow-by taken up, as H2SO4 [mol/h]
  double sulfurous_fresh = 0;     //!< SO2 of the blow-by taken up by fresh oil [mol/h]; scales with (b − b_min)/(b_fresh − b_min)
  double hydrochloric = 0;        //!< HCl [mol/h]
  double hydrofluoric = 0;        //!< HF [mol/h]
  double nitric = 0;              //!< NO2 taken up, as HNO3 [mol/h]
  double strong_koh() const;      //!< everything but SO2, as KOH [g KOH/h]: R_strong of docs/model.md §5.4
  //! A figure per acid: H2SO4 (liner + blow-by SO3), SO2 at fresh oil, HCl, HF, HNO3.
  struct PerAcid {
    double sulfuric = 0, sulfurous_fresh = 0, hydrochloric = 0, hydrofluoric = 0, nitric = 0;
  };
  //! Each acid as the KOH it neutralises [g KOH/h].
  PerAcid as_koh() const;
  //! Each acid as its own mass reaching the oil [g/h]: H2SO4, SO2 at fresh oil, HCl, HF, HNO3.
  PerAcid as_mass() const;
  double sulfurous_fresh_koh() const;  //!< SO2 uptake by fresh oil, 2 equivalents per S [g KOH/h]
};

//! What one operating state sends where.
struct Transfer {
  Combustion combustion;             //!< per mole of fuel, NOx included
  double fuel_flow = 0;              //!< [mol/h]
  double sulfur_flow = 0;            //!< fuel S [mol/h]
  double charge_flow = 0;            //!< fuel + air [mol/h]
  double blowby_flow = 0;            //!< [mol/h]
  double cylinder_acid_dew_point = 0;  //!< in-cylinder H2SO4 dew point at liner_pressure [K] (0 without S)
  double liner_temperature = 0;      //!< lower liner wall, running [K]
  double liner_temperature_at_start = 0;  //!< lower liner wall at the start of the warm-up [K]
  double warmup_liner_per_start = 0;  //!< extra liner uptake per start over running, as hours of running liner share [h]
  double liner_subcooling = 0;       //!< dew point − liner wall [K]
  double liner_share = 0;            //!< share of fuel S taken up on the liner [-]
  double blowby_water_dew_point = 0; //!< water dew point of the blow-by at crankcase pressure [K]
  double wetness = 0;                //!< w, crankcase wetness [0–1]
  AcidInflow inflow;                 //!< acid into the oil
  std::array<double, gas_count> exhaust{};  //!< exhaust leaving the cylinders, after liner uptake [mol/h]
  std::array<double, gas_count> blowby_burnt{};    //!< burnt part of the blow-by, before uptake [mol/h]
  std::array<double, gas_count> blowby_unburnt{};  //!< unburnt part of the blow-by [mol/h]
  double unburnt_sulfur = 0, unburnt_chlorine = 0, unburnt_fluorine = 0;  //!< trace atoms (other S, organic Cl, F) in the unburnt blow-by [mol/h]
  //! Species taken up by the oil (SO2, SO3, HCl, HF, NO2) at base ratio r = (b − b_min)/(b_fresh − b_min) [mol/h].
  std::array<double, gas_count> oil_uptake(double base_ratio) const;
  //! Blow-by vented from the crankcase at base ratio r [mol/h].
  std::array<double, gas_count> blowby_vented(double base_ratio) const;
  //! Share of the fuel sulfur reaching the oil at base ratio r [-].
  double sulfur_share_to_oil(double base_ratio) const;
};

//! Smooth liner uptake factor g(Δ) = (ΔT_s/10 K)·ln(1 + e^{Δ/ΔT_s}): ~0 well above the dew point,
//! ≈ Δ/10 K well below it (softplus; docs/model.md §5.2) [-].
double liner_uptake_factor(double subcooling, double scale);
//! Crankcase wetness w = 1 − (1 − w_s)(1 − f_w): w_s = 1/(1 + e^{−2 ln 9 (T_dp − T_cold)/W}), the share of the
//! wetted surface below the blow-by dew point when surface temperatures spread logistically over a 10–90 %
//! width W [K] about the coldest-surface figure; f_w = min(1, starts per hour · warm-up hours) [0–1].
double crankcase_wetness(double blowby_dew_point, double coldest_surface, double width,
                         double starts_per_hour, double warmup_hours);
//! Liner wall [K] at `t` hours after a start: T_j(t) + ΔT_rise·l(t)^e, jacket water rising linearly from its
//! start to its running value over t_w, load l(t) = l·min(1, σ + (1 − σ)·t/t_r) over the load ramp t_r.
double warmup_liner_wall(double t, double jacket_start, double jacket_running, double warmup_hours, double rise,
                         double exponent, double load, double start_load_share, double ramp_hours);
//! Panels of the warm-up quadrature for a ramp piece whose liner wall goes from `wall_start` to `wall_end` [K]:
//! one per ΔT_s (`scale`) of the wall's rise, from 16 to 1024 — the softplus changes over ΔT_s, so a fixed 16
//! missed a small ΔT_s by up to 85 % (tests/reference/test_cold_running.cpp).
int warmup_panels(double wall_start, double wall_end, double scale);
//! Extra liner uptake of one start over the same time running [h of the liner uptake factor]:
//! E = ∫₀^max(t_w,t_r) [l(t)/l · g(T_dp − T_w(t)) − g(T_dp − T_w,run)] dt, g the softplus liner factor and the
//! sulfur flow following the load; λ_L·ṅ_S·E is the extra sulfur per start [mol]. Gauss–Legendre, 5 points
//! on each of warmup_panels() panels per ramp piece.
double warmup_liner_extra(double cylinder_dew_point, double jacket_start, double jacket_running, double warmup_hours,
                          double rise, double exponent, double load, double start_load_share, double ramp_hours,
                          double scale);
//! An upper bound of warmup_liner_extra() (same arguments): S·g(T_dp − T_w(0)) − T·g(T_dp − T_w,run),
//! T = max(t_w, t_r), S = ∫₀ᵀ l(t)/l dt = T − t_r(1 − σ)/2 — the wall is never colder than at the start.
double warmup_liner_extra_bound(double cylinder_dew_point, double jacket_start, double jacket_running,
                                double warmup_hours, double rise, double exponent, double load, double start_load_share,
                                double ramp_hours, double scale);

//! The transfer of one operating state. `check_parameters` false skips validate(p), for a caller
//! that has validated the parameters once for a whole record (the operation is always validated).
Transfer transfer(const FuelGas& fuel, const Operation& op, const TransferParameters& p, bool check_parameters = true);
//! transfer()'s refusals alone: throws exactly where transfer() throws, with the same error, but its
//! figures are not for use — the warm-up liner integral is replaced by an upper bound wherever the bound
//! already keeps the liner-uptake check passing (a record's check of every row's operation).
Transfer transfer_checks(const FuelGas& fuel, const Operation& op, const TransferParameters& p);

}  // namespace acidload
