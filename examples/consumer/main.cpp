// Uses the installed library: the version, and the H2S content of a gas in mg/Nm³.
#include <acidload/acidload.hpp>

#include <cstdio>

int main() {
  using namespace acidload;
  const GasContext gas{ReferenceState::normal(), 0.0, 0.55};
  const double mg = convert({300, ConcentrationUnit::ppmv, Basis::dry}, ConcentrationUnit::mg_per_m3,
                            Basis::dry, molar_mass(Gas::H2S), gas);
  std::printf("acidload %s: 300 ppmv H2S = %.1f mg/Nm3\n", version(), mg);
  return mg > 450 && mg < 460 ? 0 : 1;
}
