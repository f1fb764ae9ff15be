// Scrubber beds and cost arithmetic against analytic solutions, stoichiometry and published tables.
#include <cmath>

#include "../support/reference_check.hpp"
#include "../support/sanity_case.hpp"
#include "acidload/core/economics.hpp"
#include "acidload/core/scrubber.hpp"
#include "acidload/studies/economics.hpp"

using namespace acidload;

TEST_CASE("Thomas breakthrough: the throughput form equals the published time form") {
  // Thomas (J. Am. Chem. Soc. 66, 1664, 1944), as usually written for a fixed bed:
  //   C/C0 = 1 / (1 + exp(k_T q0 M / Q − k_T C0 t))
  // Invented bed: k_T 0.05 m³/(kg·h)… in consistent units below; the identity holds for any values.
  const double kT = 2.0e3;   // [m³/(kg S·h)]
  const double q0 = 0.2;     // [kg S/kg]
  const double M = 1500;     // [kg]
  const double Q = 500;      // [m³/h]
  const double C0 = 4.3e-4;  // [kg S/m³] (about 300 ppmv H2S at 0 °C)
  const double beta = kT * q0 * M / Q;
  for (double t : {0.0, 500.0, 1000.0, 1395.0, 1800.0, 3000.0}) {
    const double phi = Q * C0 * t / (q0 * M);
    const double published = 1 / (1 + std::exp(kT * q0 * M / Q - kT * C0 * t));
    REFERENCE_CHECK("Thomas C/C0 (throughput form)", breakthrough_share(phi, beta), published, absolute, 1e-14, "-",
                    "Thomas 1944 time form, analytic");
  }
  // half breakthrough at the stoichiometric time t = q0 M / (Q C0)
  REFERENCE_CHECK("Thomas C/C0 at the stoichiometric time", breakthrough_share(1.0, beta), 0.5, absolute, 1e-15, "-",
                  "Thomas 1944: C/C0 = 1/2 at t = q0 M/(Q C0), analytic");
}

TEST_CASE("Thomas loading: the closed-form integral against quadrature") {
  // G(φ) = ∫0^φ (1 − F) dφ' by composite Simpson with 20 000 intervals (independent of the closed form)
  for (double beta : {5.0, 21.97, 80.0})
    for (double phi : {0.3, 1.0, 1.4}) {
      const int n = 20000;
      const double h = phi / n;
      double sum = 0;
      for (int i = 0; i <= n; ++i) {
        const double w = (i == 0 || i == n) ? 1 : (i % 2 ? 4 : 2);
        sum += w * (1 - 1 / (1 + std::exp(beta * (1 - i * h))));
      }
      REFERENCE_CHECK("Thomas bed loading G(phi)", captured_share(phi, beta), sum * h / 3, relative, 1e-10, "-",
                      "Simpson quadrature of 1 - F, analytic");
    }
}

TEST_CASE("breakthrough width: 10 % to 90 % over the stated share of the bed life") {
  const double beta = thomas_steepness(0.2);
  const double span = fed_share_at_outlet_ratio(0.9, 1.0, beta) - fed_share_at_outlet_ratio(0.1, 1.0, beta);
  REFERENCE_CHECK("logistic 10-90 % span", span, 0.2, relative, 1e-12, "-", "logistic: span = 2 ln 9 / beta, analytic");
}

TEST_CASE("the train over a constant inlet loads the bed as the analytic Thomas solution") {
  // One bed, fine steps: the sulfur removed until a time t before the first changeout equals
  // q0 M G(φ(t)), whatever the step.
  EngineCase c;
  c.charge = acidload_test::sanity_charge();
  c.record = {acidload_test::sanity_segment(600, 300)};
  TrainStage t;
  t.name = "bed";
  t.stage.kind = StageKind::iron_oxide;
  t.stage.bed_mass = 2000;
  t.stage.efficiency = 1;
  t.stage.changeout = {ChangeoutRule::Kind::outlet_level, 299, 0};
  const ScrubbedRecord s = scrub(c, {t}, 7);
  const double n_h2s = c.record.front().operation.fuel_flow * c.record.front().fuel[Gas::H2S];
  const double hold = 0.2 * 2000 / (atomic_weight(Element::S) * 1e-3);
  const double analytic = hold * captured_share(n_h2s * 600 / hold, thomas_steepness(0.2));
  REFERENCE_CHECK("bed sulfur over 600 h (stepwise vs analytic)", s.sulfur.stages[0], analytic, relative, 1e-12, "mol",
                  "Thomas 1944 integrated, analytic");
}

TEST_CASE("stoichiometric capacities") {
  // 3 × 32.06 / (2 × 55.845 + 3 × 15.999) = 96.18 / 159.687 = 0.60230 kg S per kg Fe2O3
  REFERENCE_CHECK("iron oxide theoretical capacity", iron_oxide_theoretical_capacity(), 0.60230, relative, 2e-4,
                  "kg S/kg Fe2O3", "[derived] Fe2O3 + 3 H2S -> Fe2S3 + 3 H2O, IUPAC atomic weights");
  // 2 × (22.990 + 15.999 + 1.008) / 32.06 = 2.4951 kg NaOH per kg S
  REFERENCE_CHECK("caustic NaOH per sulfur", caustic_per_sulfur(), 2.4951, relative, 2e-4, "kg NaOH/kg S",
                  "[derived] H2S + 2 NaOH -> Na2S + 2 H2O, IUPAC atomic weights");
}

TEST_CASE("capital recovery factor against compound-interest tables") {
  REFERENCE_CHECK("CRF 10 %, 10 years", capital_recovery_factor(0.10, 10), 0.16275, relative, 5e-5, "1/year",
                  "(A/P, 10 %, 10) compound-interest table, from memory");
  REFERENCE_CHECK("CRF 5 %, 20 years", capital_recovery_factor(0.05, 20), 0.08024, relative, 5e-5, "1/year",
                  "(A/P, 5 %, 20) compound-interest table, from memory");
  REFERENCE_CHECK("CRF 0 %, 8 years", capital_recovery_factor(0.0, 8), 0.125, relative, 1e-15, "1/year",
                  "1/n at zero interest, analytic");
}
