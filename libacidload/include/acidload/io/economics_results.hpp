#pragma once
// The economics block of summary.json: per variant the cost items per year and per MWh, the total
// per MWh and the rank, the currency; the price sensitivity and, when asked, the cheapest level.
// Its layout is documented in docs/case-format.md ("The economics block of summary.json").
#include <optional>
#include <string>
#include <vector>

#include "acidload/studies/economics.hpp"

namespace acidload::io {

//! Everything the block shows.
struct EconomicsResults {
  std::vector<VariantCosts> variants;
  std::vector<PriceSensitivity> sensitivity;
  double sensitivity_step = 0.2;
  std::optional<CheapestLevel> cheapest;  //!< the cheapest-level question, if it was asked
  std::string cheapest_variant;           //!< the variant it was asked of
  std::optional<CostMonteCarlo> monte_carlo;
};

//! The block as a JSON object (no trailing newline), indented by `indent` spaces.
std::string economics_json(const EconomicsResults& r, int indent = 2);

}  // namespace acidload::io
