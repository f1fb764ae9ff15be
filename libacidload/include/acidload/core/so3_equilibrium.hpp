#pragma once
// Equilibrium of SO2 + ½ O2 ⇌ SO3 from standard-state thermochemistry of the ideal gases (NIST
// Chemistry WebBook Shomate fits of the JANAF tables, Chase 1998; standard pressure 1 bar).
// The equilibrium share is a bound, never the model: in engines the SO3 share is kinetically
// limited, far below equilibrium at exhaust temperatures.

namespace acidload::so3 {

inline constexpr double t_min = 298.0;          //!< lowest temperature of the fits [K]
inline constexpr double t_max = 6000.0;         //!< highest temperature of the fits [K]
inline constexpr double standard_pressure = 1e5;  //!< p° of the data [Pa]

//! The species the data cover.
enum class Species { SO2, SO3, O2 };

//! Standard enthalpy [J/mol] on the formation basis, ΔfH°(298.15 K) + H°(T) − H°(298.15 K), from
//! the NIST Shomate fit: A·t + B·t²/2 + C·t³/3 + D·t⁴/4 − E/t + F, t = T/1000 [kJ/mol];
//! T in [t_min, t_max] K else InputError.
double standard_enthalpy(Species s, double temperature);
//! Standard entropy S°(T) at 1 bar [J/(mol·K)] from the NIST Shomate fit:
//! A·ln t + B·t + C·t²/2 + D·t³/3 − E/(2t²) + G, t = T/1000; T in [t_min, t_max] K else InputError.
double standard_entropy(Species s, double temperature);
//! ΔG° of SO2 + ½ O2 ⇌ SO3 [J/mol]: Σν(H° − T·S°) over the species (NIST/JANAF data, above).
double standard_gibbs_reaction(double temperature);
//! Kp = exp(−ΔG°/(R·T)) = (p_SO3/p°)/((p_SO2/p°)·(p_O2/p°)^½) [bar^-½], p° = 1 bar.
double kp(double temperature);
//! Equilibrium fraction SO3/(SO2 + SO3) [mol/mol] of a gas with O2 mole fraction x_o2 [mol/mol] at
//! p_total [Pa], sulfur treated as a trace (O2 not depleted): r = x_SO3/x_SO2 = Kp·√(x_O2·p/p°),
//! share = r/(1 + r). T in [t_min, t_max] K else InputError.
double equilibrium_so3_share(double temperature, double x_o2, double p_total);

}  // namespace acidload::so3
