#pragma once
// Acid dew points of a gas from the partial pressures of water and of the acid (published
// correlations). Inputs in Pa, results in K; each correlation's own units are converted inside.
// A zero acid partial pressure has no acid dew point: the functions throw InputError and the
// caller decides what that case means.

namespace acidload::dew_point {

//! The range of partial pressures a correlation is taken to be fitted over [Pa].
struct FittedRange {
  double p_h2o_min;   //!< lowest water partial pressure [Pa]
  double p_h2o_max;   //!< highest water partial pressure [Pa]
  double p_acid_min;  //!< lowest acid (SO3 or HCl) partial pressure [Pa]
  double p_acid_max;  //!< highest acid partial pressure [Pa]
};

//! Sulfuric-acid dew point [K]: 1/T = 2.276e-3 − 2.943e-5·ln pH2O − 8.58e-5·ln pSO3
//! + 6.2e-6·ln pH2O·ln pSO3 (Verhoff & Banchero, Chem. Eng. Prog. 70(8), 1974) [T in K, p in mmHg].
double sulfuric_verhoff_banchero(double p_h2o, double p_so3);
//! Sulfuric-acid dew point [K]: T = 203.25 + 27.6·log10 pH2O + 10.83·log10 pSO3
//! + 1.06·(log10 pSO3 + 8)^2.19 (Okkes, Hydrocarbon Processing, July 1987) [T in °C, p in atm];
//! needs pSO3 > 1e-8 atm, below which the power term is undefined.
double sulfuric_okkes(double p_h2o, double p_so3);
//! Sulfuric-acid dew point [K]: T = 150 + 11.664·ln pSO3 + 8.1328·ln pH2O
//! − 0.383226·ln pSO3·ln pH2O (ZareNezhad, Oil & Gas Journal, 2009) [T in °C, p in mmHg].
double sulfuric_zarenezhad(double p_h2o, double p_so3);
//! Hydrochloric-acid dew point [K]: 1000/T = 3.7368 − 0.1591·ln pH2O − 0.0326·ln pHCl
//! + 0.00269·ln pH2O·ln pHCl (Kiang, Chemical Engineering, Feb. 1981) [T in K, p in mmHg].
double hydrochloric_kiang(double p_h2o, double p_hcl);

// Fitted ranges. The papers' own statements of the data range were not found; the ranges below
// are the flue-gas conditions (about 1 atm) these correlations are applied to, from memory:
//   Verhoff–Banchero, ZareNezhad: H2O 0.01–0.30 atm, SO3 1e-7–1e-4 atm (0.1–100 ppmv at 1 atm);
//   Okkes: H2O 0.05–0.15 atm, SO3 1e-6–1e-4 atm (1–100 ppmv at 1 atm);
//   Kiang: H2O 0.01–0.30 atm, HCl 1e-6–1e-2 atm (1–10 000 ppmv at 1 atm).
// Cylinder pressures lie far outside them: a dew point there is an extrapolation.

//! The range taken for Verhoff–Banchero [Pa] (from memory, see above).
FittedRange fitted_range_verhoff_banchero();
//! The range taken for Okkes [Pa] (from memory, see above).
FittedRange fitted_range_okkes();
//! The range taken for ZareNezhad [Pa] (from memory, see above).
FittedRange fitted_range_zarenezhad();
//! The range taken for Kiang's HCl correlation [Pa] (from memory, see above).
FittedRange fitted_range_kiang();

//! Whether p_h2o and p_so3 [Pa] lie in fitted_range_verhoff_banchero().
bool in_fitted_range_verhoff_banchero(double p_h2o, double p_so3);
//! Whether p_h2o and p_so3 [Pa] lie in fitted_range_okkes().
bool in_fitted_range_okkes(double p_h2o, double p_so3);
//! Whether p_h2o and p_so3 [Pa] lie in fitted_range_zarenezhad().
bool in_fitted_range_zarenezhad(double p_h2o, double p_so3);
//! Whether p_h2o and p_hcl [Pa] lie in fitted_range_kiang().
bool in_fitted_range_kiang(double p_h2o, double p_hcl);

}  // namespace acidload::dew_point
