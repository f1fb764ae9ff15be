#pragma once
// The oil balance (docs/model.md §8): reactive base, free strong acid, organic acids, oxidation, nitration,
// additive acidity, neutralised salts and the antioxidant reserve, solved in closed form over a segment of
// constant rates (each regime linear; the switches between regimes found exactly).
#include <array>

namespace acidload {

//! Base-number titration methods.
enum class BaseNumberMethod { d2896, d4739 };

//! What the oil product is and how it behaves (all concentrations [mg KOH/g]).
struct OilProperties {
  double fresh_tbn = 6.0;                               //!< fresh-oil base number by `fresh_tbn_method` [mg KOH/g]
  BaseNumberMethod fresh_tbn_method = BaseNumberMethod::d2896;  //!< method of `fresh_tbn`
  double weak_base_d2896 = 0.6;  //!< weak base D2896 titrates that neutralises no acid [mg KOH/g] (calibratable)
  double weak_base_d4739 = 0.0;  //!< the same for D4739 [mg KOH/g] (calibratable)
  double base_floor = 1.0;       //!< b_min, reactive base below which strong acid stays free [mg KOH/g] (calibratable)
  double fresh_tan = 1.5;        //!< fresh-oil acid number, mostly anti-wear additive (D664) [mg KOH/g]
  double additive_depletion = 2e-4;   //!< k_d, first-order loss of additive acidity [1/h] (calibratable)
  double salt_titration_share = 0.2;  //!< β, share of neutralised salts still titrating in TAN [-] (calibratable)
  double organic_neutralised_share = 0.5;  //!< φ_B, share of organic acids neutralised by reactive base [-] (calibratable)
  double density_15 = 880;       //!< density at 15 °C [kg/m³]
  double viscosity_per_oxidation = 0.008;  //!< c_o, relative rise of kinematic viscosity at 100 °C per A/cm of oxidation [-] (from memory; calibratable)
  double viscosity_per_nitration = 0.004;  //!< c_n, the same per A/cm of nitration [-] (from memory; calibratable)
  //! Reactive base of the fresh oil b_fresh = fresh TBN − weak base of its method [mg KOH/g].
  double fresh_reactive_base() const;
  //! Weak base a method reads [mg KOH/g].
  double weak_base(BaseNumberMethod m) const { return m == BaseNumberMethod::d2896 ? weak_base_d2896 : weak_base_d4739; }
};
//! Validates the oil; throws InputError naming the field.
void validate(const OilProperties& oil);

//! Oxidation of the oil at its effective ring-zone temperature.
struct OxidationLaw {
  enum class Kind { doubling, arrhenius };
  Kind kind = Kind::doubling;          //!< "doubles per interval" rule (common practice) or Arrhenius
  double rate_at_reference = 0.008;    //!< k_ox at the reference temperature [A/cm per h] (calibratable)
  double reference_temperature = 393.15;  //!< [K], of the ring zone
  double doubling_interval = 10;       //!< temperature rise that doubles the rate [K] (common practice: 10 K)
  double activation_energy = 80e3;     //!< E_a for the Arrhenius kind [J/mol]
  double ring_zone_offset = 30;        //!< ring-zone temperature over the sump oil temperature [K] (calibratable)
  double organic_acid_yield = 0.08;    //!< α, organic acid per unit oxidation [mg KOH/g per A/cm] (calibratable)
  double nitration_yield = 1500;       //!< nitration per NO2 taken up [A/cm per mol/kg] (calibratable)
  double induction_hours = 1500;       //!< τ_A, hours a fresh charge's antioxidant lasts without makeup at the
                                       //!< reference temperature (zero-order depletion, same temperature law as k_ox)
                                       //!< [h] (no source: a calibratable assumption; voltammetry readings fit it)
  double depleted_factor = 5;          //!< m, oxidation rate with the antioxidant spent over the protected rate [-]
                                       //!< (5–20 from memory; calibratable)
};
void validate(const OxidationLaw& law);
//! k_ox(T) [A/cm per h]: k_ref·2^((T − T_ref)/ΔT_2) or k_ref·exp(−E_a/R·(1/T − 1/T_ref)); T [K] ring zone.
double oxidation_rate(const OxidationLaw& law, double ring_zone_temperature);
//! The temperature factor of that law, k_ox(T)/k_ref [-]: 2^((T − T_ref)/ΔT_2) or exp(−E_a/R·(1/T − 1/T_ref)).
double oxidation_temperature_factor(const OxidationLaw& law, double ring_zone_temperature);
//! k_A(T) = k_ox(T)/k_ref / τ_A, zero-order antioxidant depletion [share of fresh per h]: the radicals the
//! antioxidant intercepts scale with the oxidation rate (induction period τ_A at T_ref without makeup).
double antioxidant_depletion_rate(const OxidationLaw& law, double ring_zone_temperature);
//! f = m − (m − 1)·min(1, k/k_A): oxidation rate over the protected rate once the reserve is spent, when makeup
//! at k = c/M [1/h] brings fresh antioxidant that intercepts a share k/k_A of the radicals [-].
double depleted_oxidation_factor(double depleted_factor, double makeup_rate, double depletion_rate);

//! The oil's state. Concentrations [mg KOH/g] unless stated.
struct OilState {
  double mass = 0;              //!< oil in circulation [kg]
  double base = 0;              //!< b, reactive base
  double strong_acid = 0;       //!< s, free strong acid (= SAN)
  double weak_acid = 0;         //!< a_w, free organic acids
  double salts = 0;             //!< c_n, neutralised-acid salts [mg KOH/g equivalent]
  double oxidation = 0;         //!< o [A/cm]
  double nitration = 0;         //!< n [A/cm]
  double additive_acidity = 0;  //!< t_add, acidity of the anti-wear additive
  double antioxidant = 1;       //!< A, antioxidant reserve as a share of the fresh oil's [0–1]
};
//! The state of a fresh charge of `mass` [kg].
OilState fresh_oil(const OilProperties& oil, double mass);

//! Lab readings from the state (inline: simulate reads them for every watched limit at every step and
//! for every trajectory point; one definition here, so every caller computes the same expression).
//! b + b_weak,m [mg KOH/g]
inline double tbn(const OilState& s, const OilProperties& oil, BaseNumberMethod m) { return s.base + oil.weak_base(m); }
//! t_add + a_w + s + β·c_n (D664) [mg KOH/g]
inline double tan(const OilState& s, const OilProperties& oil) {
  return s.additive_acidity + s.weak_acid + s.strong_acid + oil.salt_titration_share * s.salts;
}
//! s (D664 strong acid number) [mg KOH/g]
inline double san(const OilState& s) { return s.strong_acid; }
//! Relative rise of kinematic viscosity at 100 °C over fresh, ν/ν₀ − 1 = c_o·o + c_n·n [-] (linear in
//! the FTIR readings; soot and insolubles are not modelled).
inline double viscosity_rise(const OilState& s, const OilProperties& oil) {
  return oil.viscosity_per_oxidation * s.oxidation + oil.viscosity_per_nitration * s.nitration;
}
//! Anti-wear additive remaining, t_add / t_add,fresh [-] (1 when the fresh oil has no additive acidity).
inline double anti_wear_remaining(const OilState& s, const OilProperties& oil) {
  return oil.fresh_tan > 0 ? s.additive_acidity / oil.fresh_tan : 1.0;
}

//! Rates that are constant over a segment.
struct OilRates {
  double strong_acid = 0;    //!< R_strong, strong acid reaching the oil [g KOH/h]
  double sulfurous_fresh = 0;  //!< SO2 uptake of fresh oil [g KOH/h]; scales with (b − b_min)/(b_fresh − b_min)
  double nitration = 0;      //!< nitration inflow [A/cm · kg/h] (÷ oil mass gives A/cm per h)
  double oxidation = 0;      //!< k_ox [A/cm per h]
  double organic_acid = 0;   //!< α·k_ox, organic acids formed [mg KOH/g per h]
  double antioxidant_depletion = 0;  //!< k_A, zero-order antioxidant use while any is left [share of fresh per h]
  double depleted_factor = 1;  //!< m, oxidation and organic acids over the protected rates once it is spent [-]
  double consumption = 0;    //!< oil burnt or lost [kg/h]
  bool continuous_makeup = true;  //!< makeup equals consumption (mass constant), else mass falls until a top-up
};
void validate(const OilRates& r);

//! Running totals for the two conservation ledgers [g KOH].
struct OilLedger {
  double base_added = 0;        //!< reactive base brought by fresh oil (makeup, top-ups, refills)
  double base_removed = 0;      //!< reactive base carried out with consumed or drained oil
  double base_consumed = 0;     //!< reactive base used up neutralising acid
  double acid_entered = 0;      //!< strong acid, SO2 and organic acid that entered the oil
  double acid_removed = 0;      //!< free acid carried out with consumed or drained oil
  double sulfurous_taken_up = 0;  //!< of the acid entered, SO2 taken up by the reactive base (2 equivalents per S)
};

//! What the oil did during a segment.
enum class Regime { above_floor, floor_acid, floor_weak };
struct SegmentOutcome {
  double floor_reached_at = -1;   //!< hours into the segment when b reached b_min, −1 if not
  double acid_cleared_at = -1;    //!< hours into the segment when free strong acid was neutralised, −1 if not
  double antioxidant_spent_at = -1;  //!< hours into the segment when the antioxidant reserve ran out, −1 if not
  Regime end_regime = Regime::above_floor;
};

//! Constants of the oil balance derived from the oil and the rates.
struct OilBalance {
  double fresh_base = 0;       //!< b_fresh [mg KOH/g]
  double base_floor = 0;       //!< b_min [mg KOH/g]
  double fresh_additive = 0;   //!< t_add of fresh oil [mg KOH/g]
  double additive_depletion = 0;  //!< k_d [1/h]
  double organic_neutralised_share = 0;  //!< φ_B [-]
};
OilBalance balance_constants(const OilProperties& oil);

//! Advances the state over `hours` of constant rates, exactly (closed form per regime; the floor
//! crossing and the clearing of free acid found inside the segment). Adds to the ledger.
SegmentOutcome advance(OilState& state, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger);

namespace detail {
//! What advance()'s one-piece step (continuous makeup, one regime) takes from the balance's constants,
//! the rates, the oil mass, the step's length and whether the antioxidant reserve is out: the
//! equations' coefficients (dy/dt = A − Λ·y), the series E(−Λt) and φ2(Λt), and the ledger's parts that
//! do not depend on the state. Filled and read by advance() only.
struct SteadyCoefficients {
  double makeup_base = 0, organic = 0, so2_coeff = 0;
  double Ab = 0, Lb = 0, Eb = 0, phi2b = 0;  // the reactive base
  double Lk = 0, Ek = 0, phi2k = 0;          // every equation with the makeup rate alone as Λ
  double Aa = 0, Aw = 0, Au = 0, Ao = 0, An = 0, Ad = 0, Ld = 0, Ed = 0;
  double base_added = 0, consumed_fixed = 0, entered_fixed = 0, floor_t = 0;
  bool spent = false, depletion_above_makeup = false;
};
}  // namespace detail

//! The one-piece step's coefficients kept across segments: where the mass, the step's length and
//! whether the antioxidant is out repeat (hourly segments of one operating state), advance() with a memo
//! skips recomputing them. Belongs to one OilBalance and one OilRates: clear() it when either changes.
struct StepMemo {
  void clear() { filled = false; }
  bool filled = false;
  double mass = 0, hours = 0;
  bool antioxidant_out = false;
  detail::SteadyCoefficients c{};
};

//! advance() reusing `memo`'s coefficients where they apply (refilling them where not): the same
//! results bit for bit. `memo` must have been used with these k and r only.
SegmentOutcome advance(OilState& state, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger,
                       StepMemo& memo);

//! Values of the states a segment of constant rates would settle to (continuous makeup), or the
//! state after `hours` when the mass falls (no steady state without makeup).
OilState steady_state(const OilState& state, const OilBalance& k, const OilRates& r);

//! Rate of change of the reactive base at this state [mg KOH/g per h] (negative while it falls).
double base_rate(const OilState& s, const OilBalance& k, const OilRates& r);

//! The regime the oil is in at this state under these rates.
Regime regime_of(const OilState& s, const OilBalance& k, const OilRates& r);
//! Whether the antioxidant reserve is spent (A = 0 and makeup cannot refill it) at this state.
bool antioxidant_spent(const OilState& s, const OilRates& r);
//! Oxidation rate at this state [A/cm per h]: k_ox while antioxidant is left, k_ox·f once it is spent.
double oxidation_rate_now(const OilState& s, const OilRates& r);

//! Events that change the charge at an instant.
//! Adds fresh oil of `mass` [kg], mixing it in; free strong acid meets the fresh base at once.
void top_up(OilState& s, const OilProperties& oil, double mass, OilLedger& ledger);
//! Drains a share of the oil and refills to `full_mass` [kg] with fresh oil.
void partial_drain(OilState& s, const OilProperties& oil, double drained_share, double full_mass, OilLedger& ledger);
//! Oil change: drains all but `residual_share` of `full_mass` (hold-up in cooler, filters, galleries)
//! and fills with fresh oil to `full_mass` [kg].
void oil_change(OilState& s, const OilProperties& oil, double residual_share, double full_mass, OilLedger& ledger);

//! Numerical helpers of the closed forms (exposed for tests).
namespace detail {
double expm1_over_x(double x);                   //!< E(x) = (eˣ − 1)/x, 1 at 0 (a short series for |x| < 2⁻⁶)
double phi2(double x);                           //!< φ2(x) = (x − 1 + e^{−x})/x² = E[0, −x], 1/2 at 0 (series for |x| < 0.1)
double divided_expm1_over_x(double x, double y); //!< (E(x) − E(y))/(x − y) for E = expm1_over_x, stable as x → y
//! advance() without its one-piece path for the common segment: every segment by pieces (the state checks
//! are advance()'s; call it with a state and rates that advance() accepts). For the test that holds the
//! one-piece path to it bit for bit.
SegmentOutcome advance_by_pieces(OilState& state, const OilBalance& k, const OilRates& r, double hours, OilLedger& ledger);
}  // namespace detail

}  // namespace acidload
