#include "acidload/core/water.hpp"

#include <cmath>

#include "acidload/core/error.hpp"

namespace acidload::water {

namespace {
// IAPWS-IF97 region 4 coefficients n1…n10 (R7-97(2012), Table 34).
constexpr double n[11] = {0,
                          0.11670521452767e4,
                          -0.72421316703206e6,
                          -0.17073846940092e2,
                          0.12020824702470e5,
                          -0.32325550322333e7,
                          0.14915108613530e2,
                          -0.48232657361591e4,
                          0.40511340542057e6,
                          -0.23855557567849,
                          0.65017534844798e3};
}  // namespace

double saturation_pressure(double T) {
  check::in_range("temperature", T, if97_t_min, if97_t_crit, "K (IAPWS-IF97 region 4)");
  const double th = T + n[9] / (T - n[10]);  // ϑ, T* = 1 K
  const double A = th * th + n[1] * th + n[2];
  const double B = n[3] * th * th + n[4] * th + n[5];
  const double C = n[6] * th * th + n[7] * th + n[8];
  const double r = 2 * C / (-B + std::sqrt(B * B - 4 * A * C));  // eq. 30
  return r * r * r * r * 1e6;                                    // p* = 1 MPa
}

double saturation_temperature(double p) {
  check::in_range("pressure", p, if97_p_min, if97_p_crit, "Pa (IAPWS-IF97 region 4)");
  const double beta = std::pow(p * 1e-6, 0.25);  // β = (p/p*)^¼
  const double E = beta * beta + n[3] * beta + n[6];
  const double F = n[1] * beta * beta + n[4] * beta + n[7];
  const double G = n[2] * beta * beta + n[5] * beta + n[8];
  const double D = 2 * G / (-F - std::sqrt(F * F - 4 * E * G));
  return (n[10] + D - std::sqrt((n[10] + D) * (n[10] + D) - 4 * (n[9] + n[10] * D))) / 2;  // eq. 31
}

double dew_point(double water_fraction, double total_pressure) {
  check::fraction("water-fraction", water_fraction);
  check::positive("pressure", total_pressure);
  const double pw = water_fraction * total_pressure;
  if (pw < if97_p_min)
    throw InputError("water partial pressure", format_value(pw) + " Pa",
                     "at least 611.213 Pa: the dew point lies below 0 °C (a frost point), "
                     "outside IAPWS-IF97 region 4");
  return saturation_temperature(pw);
}

double water_fraction_at_humidity(double phi, double T, double p) {
  check::fraction("relative-humidity", phi);
  check::positive("pressure", p);
  const double x = phi * saturation_pressure(T) / p;
  if (x >= 1) throw InputError("relative-humidity", format_value(phi), "a humidity whose vapour pressure is below the total pressure");
  return x;
}

}  // namespace acidload::water
