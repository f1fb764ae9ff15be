#pragma once
// A synthetic lab history for calibration tests: five charges of 1200 h on the sanity case, a
// sample every 200 h (TBN by D4739, TAN, oxidation), readings from the model at known parameters
// plus noise from the project's own stream. Invented data.
#include <cmath>
#include <vector>

#include "acidload/studies/calibration.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "sanity_case.hpp"

namespace acidload_test {

inline acidload::EngineCase history_case() {
  using namespace acidload;
  EngineCase c;
  c.name = "history";
  c.charge = sanity_charge();
  for (int k = 0; k < 5; ++k) {
    Segment s = sanity_segment(1200, 250 + 40 * k);  // gas quality differs from charge to charge
    if (k > 0) s.events.push_back({OilEvent::Kind::oil_change, -1});
    c.record.push_back(s);
  }
  return c;
}

inline std::vector<acidload::LabSample> history_samples(const acidload::EngineCase& truth, std::uint64_t seed,
                                                        const acidload::Precision& p, bool oxidation = true) {
  using namespace acidload;
  std::vector<LabSample> s;
  for (int k = 0; k < 5; ++k)
    for (int h = 200; h <= 1200; h += 200) {
      LabSample x;
      x.charge = k;
      x.oil_hours = h;
      x.tbn = 0, x.tan = 0;
      if (oxidation) x.oxidation = 0;
      x.oxidation_baseline_given = x.nitration_baseline_given = true;  // the lab states its FTIR baseline (0): none fitted
      x.where = "synthetic " + std::to_string(k) + "/" + std::to_string(h);
      s.push_back(x);
    }
  const auto pred = predict(truth, s, p);
  for (std::size_t i = 0; i < pred.size(); ++i) {
    const double z = std::sqrt(-2 * std::log(uniform01(seed, i, 0))) * std::cos(6.283185307179586 * uniform01(seed, i, 1));
    const double v = pred[i].predicted + pred[i].sigma * z;
    LabSample& x = s[pred[i].sample];
    if (pred[i].reading == "tbn") x.tbn = v;
    if (pred[i].reading == "tan") x.tan = v;
    if (pred[i].reading == "oxidation") x.oxidation = v;
  }
  return s;
}

}  // namespace acidload_test
