#pragma once
// Gas cleaning before the engine: a train of stages (iron-oxide and impregnated-carbon media beds,
// biological removal, caustic scrubbing, a fixed-efficiency stage). A media bed loads by the Thomas
// breakthrough form written in its throughput variable (docs/model.md §18.1):
//   F(φ) = 1 / (1 + exp(β·(1 − φ))),   φ = sulfur fed to the bed / (q₀·M),   β = k_T·q₀·M / Q,
// which is the logistic C/C₀ = 1/(1 + exp(k_T·q₀·M/Q − k_T·C₀·t)) of Thomas (J. Am. Chem. Soc. 66,
// 1664, 1944) for a constant inlet, and stays exact when the inlet changes from segment to segment.
// A share (1 − η) of the gas passes the bed untreated (channelling, a bypass). Other sulfur
// (COS, mercaptans, sulfides) passes iron oxide. Pure functions, SI and core units (core.hpp).
#include <string_view>

#include "acidload/core/fuel.hpp"

namespace acidload {

//! What a stage is.
enum class StageKind {
  iron_oxide,        //!< iron-oxide media bed: H2S only
  activated_carbon,  //!< impregnated activated carbon bed: H2S; other sulfur and halogens at stated shares
  biological,        //!< biotrickling filter or air dosing into the digester: fixed H2S removal
  caustic,           //!< caustic (NaOH) scrubber: fixed H2S removal, NaOH by stoichiometry
  fixed,             //!< a stage of stated removal shares
};
inline constexpr StageKind all_stage_kinds[] = {StageKind::iron_oxide, StageKind::activated_carbon,
                                                StageKind::biological, StageKind::caustic, StageKind::fixed};
std::string_view name(StageKind k);  //!< "iron-oxide", "activated-carbon", "biological", "caustic", "fixed"
//! A media bed (loads and is changed out) or a fixed-efficiency stage.
bool is_media_bed(StageKind k);

//! When a media bed is changed out.
struct ChangeoutRule {
  enum class Kind { outlet_level, schedule };
  Kind kind = Kind::outlet_level;
  double outlet_h2s = 0;   //!< outlet_level: H2S at the bed's outlet that triggers it [ppmv dry]
  double every_hours = 0;  //!< schedule: running hours between changeouts [h]
};

//! One stage of the train, physics only (its prices live in the economics inputs).
struct ScrubStage {
  StageKind kind = StageKind::fixed;
  double efficiency = 0.99;      //!< η: media bed, share of the gas the bed treats; other stages, H2S removed [-]
  double capacity = 0.2;         //!< q₀, sulfur a media bed holds at exhaustion [kg S per kg media]
  double bed_mass = 0;           //!< M, media in the bed [kg]
  double breakthrough_width = 0.2;  //!< share of a bed's life from 10 % to 90 % breakthrough [-] (assumed, no source)
  ChangeoutRule changeout;       //!< media beds only
  double other_sulfur_removal = 0;  //!< share of other sulfur removed (carbon and fixed stages; iron oxide: 0) [-]
  double halogen_removal = 0;       //!< share of organic Cl and F removed (carbon and fixed stages) [-]
};
//! Validates a stage; throws InputError naming the field.
void validate(const ScrubStage& s);

//! Thomas steepness β from the breakthrough width w (share of the life between F = 0.1 and 0.9):
//! β = 2·ln 9 / w [-] (the logistic's 10–90 % span is 2·ln 9 / β).
double thomas_steepness(double width);
//! Breakthrough share F(φ) = 1/(1 + exp(β(1 − φ))) of the treated gas leaving unscrubbed [-]
//! (Thomas 1944, throughput form); φ = sulfur fed / (q₀·M) [-].
double breakthrough_share(double fed_share, double steepness);
//! Sulfur held by the bed as a share of q₀·M after φ was fed: G(φ) = ∫₀^φ (1 − F) dφ'
//! = [softplus(β) − softplus(β(1 − φ))]/β, softplus(x) = ln(1 + eˣ) [-]. G → 1 as φ → ∞.
double captured_share(double fed_share, double steepness);
//! Outlet H2S over inlet of a bed at φ: (1 − η) + η·F(φ) [-].
double bed_outlet_ratio(double fed_share, double efficiency, double steepness);
//! φ at which the outlet ratio reaches `ratio` (inverse of bed_outlet_ratio); throws InputError if
//! `ratio` is at or below the fresh bed's ratio at φ = 0 or at or above 1.
double fed_share_at_outlet_ratio(double ratio, double efficiency, double steepness);

//! Sulfur per kilogram of Fe2O3 for Fe2O3 + 3 H2S → Fe2S3 + 3 H2O: 3·M_S / M_Fe2O3 [kg S/kg]
//! (stoichiometry; IUPAC atomic weights).
double iron_oxide_theoretical_capacity();
//! NaOH per kilogram of H2S sulfur absorbed as Na2S (H2S + 2 NaOH → Na2S + 2 H2O):
//! 2·M_NaOH / M_S [kg NaOH/kg S] (stoichiometry; IUPAC atomic weights).
double caustic_per_sulfur();

//! What one stage does to a constant inlet over `hours`, the bed starting at `fed_share` (φ₀).
struct StageStep {
  double h2s_removed = 0;          //!< [mol/h], averaged over the step
  double other_sulfur_removed = 0; //!< [mol/h]
  double chlorine_removed = 0;     //!< [mol/h]
  double fluorine_removed = 0;     //!< [mol/h]
  double fed_share_after = 0;      //!< φ at the end of the step [-] (0 for stages that do not load)
};
//! One stage over a step of constant inlet flows [mol/h]: a media bed removes
//! q₀·M·(G(φ₁) − G(φ₀))/hours with φ₁ = φ₀ + η·h2s·hours/(q₀·M) (sulfur as S, M_S); a fixed stage
//! removes η·h2s. Other sulfur and halogens at their stated shares.
StageStep stage_step(const ScrubStage& s, double fed_share, double h2s, double other_sulfur, double chlorine,
                     double fluorine, double hours);
//! The gas leaving a stage: `flow` [mol/h] of `gas` less the H2S [mol/h] and trace atoms [mol/h] taken
//! out; every other component keeps its flow, so each element balances exactly. Returns the gas and
//! sets `flow_out` = flow − h2s − other S − Cl − F removed [mol/h] (traces count as moles, as in FuelGas).
FuelGas after_removal(const FuelGas& gas, double flow, double h2s_removed, double other_sulfur_removed,
                      double chlorine_removed, double fluorine_removed, double& flow_out);

//! Hours of a constant inlet `h2s` [mol/h] until a bed at φ₀ reaches φ₁ [h] (∞ for a zero inlet).
double hours_to_fed_share(const ScrubStage& s, double fed_share, double target_fed_share, double h2s);

}  // namespace acidload
