#include "acidload/core/so3_equilibrium.hpp"

#include <cmath>
#include <cstddef>

#include "acidload/core/constants.hpp"
#include "acidload/core/error.hpp"

namespace acidload::so3 {

namespace {
// One Shomate segment: valid up to t_hi [K]; A…E [J/(mol·K)], F [kJ/mol], G [J/(mol·K)].
struct Segment {
  double t_hi;
  double A, B, C, D, E, F, G;
};

// NIST Chemistry WebBook (SRD 69), gas-phase Shomate coefficients, data from Chase 1998 (JANAF,
// 4th ed.). The SO3 page was seen (its cal-unit A = 5.742120 is 24.02503 J/(mol·K) / 4.184); the
// J-unit coefficients were read in several public transcriptions of the WebBook, which agree digit
// for digit. H, the ΔfH° the WebBook lists with each segment, cancels in F − H + ΔfH° and is not
// needed: the enthalpy on the formation basis is the polynomial plus F.
constexpr Segment so2[] = {
    {1200, 21.43049, 74.35094, -57.75217, 16.35534, 0.086731, -305.7688, 254.8872},
    {6000, 57.48188, 1.009328, -0.07629, 0.005174, -4.045401, -324.414, 302.7798},
};
constexpr Segment so3_gas[] = {
    {1200, 24.02503, 119.4607, -94.38686, 26.96237, -0.117517, -407.8526, 253.5186},
    {6000, 81.99008, 0.622236, -0.12244, 0.008294, -6.703688, -437.659, 330.9264},
};
constexpr Segment o2[] = {
    {700, 31.32234, -20.23531, 57.86644, -36.50624, -0.007374, -8.903471, 246.7945},
    {2000, 30.03235, 8.772972, -3.988133, 0.788313, -0.741599, -11.32468, 236.1663},
    {6000, 20.91111, 10.72071, -2.020498, 0.146449, 9.245722, 5.337651, 237.6185},
};

template <std::size_t N>
const Segment& pick(const Segment (&table)[N], double T) {
  for (const Segment& s : table)
    if (T <= s.t_hi) return s;
  return table[N - 1];
}

const Segment& segment(Species sp, double T) {
  check::in_range("temperature", T, t_min, t_max, "K (NIST Shomate fits of SO2, SO3, O2)");
  switch (sp) {
    case Species::SO2: return pick(so2, T);
    case Species::SO3: return pick(so3_gas, T);
    case Species::O2: return pick(o2, T);
  }
  return pick(o2, T);  // not reached
}
}  // namespace

double standard_enthalpy(Species sp, double T) {
  const Segment& c = segment(sp, T);
  const double t = T / 1000;
  return 1e3 * (c.A * t + c.B * t * t / 2 + c.C * t * t * t / 3 + c.D * t * t * t * t / 4 - c.E / t + c.F);
}

double standard_entropy(Species sp, double T) {
  const Segment& c = segment(sp, T);
  const double t = T / 1000;
  return c.A * std::log(t) + c.B * t + c.C * t * t / 2 + c.D * t * t * t / 3 - c.E / (2 * t * t) + c.G;
}

double standard_gibbs_reaction(double T) {
  const auto g = [T](Species sp) { return standard_enthalpy(sp, T) - T * standard_entropy(sp, T); };
  return g(Species::SO3) - g(Species::SO2) - 0.5 * g(Species::O2);
}

double kp(double T) { return std::exp(-standard_gibbs_reaction(T) / (constants::molar_gas_constant * T)); }

double equilibrium_so3_share(double T, double x_o2, double p_total) {
  check::fraction("x_o2", x_o2);
  check::positive("p_total", p_total);
  const double r = kp(T) * std::sqrt(x_o2 * p_total / standard_pressure);
  return r / (1 + r);
}

}  // namespace acidload::so3
