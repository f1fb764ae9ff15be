#pragma once
// Printing the economics of a case: cost items per variant, stages, price sensitivity, the cheapest
// level and Monte Carlo of the totals. Plain text; the figures come from studies/economics.
#include <cstdio>
#include <string>
#include <vector>

#include "acidload/io/economics_results.hpp"

namespace acidload_cli {

//! Items per MWh and per year by variant (one column each), the stages' changeouts and outlets.
void print_costs(std::FILE* out, const std::vector<acidload::VariantCosts>& v);
//! Which price moves the answer, and by how much.
void print_sensitivity(std::FILE* out, const std::vector<acidload::VariantCosts>& v,
                       const std::vector<acidload::PriceSensitivity>& s, double step);
//! The cheapest outlet (changeout) level of one stage, with the forward runs that verify it.
void print_cheapest_level(std::FILE* out, const acidload::CostCase& c, const acidload::CheapestLevel& a);
//! P10/P50/P90 of each variant's total per MWh and the share of draws it is cheapest.
void print_cost_monte_carlo(std::FILE* out, const std::vector<acidload::VariantCosts>& v,
                            const std::vector<acidload::UncertainInput>& in, const acidload::CostMonteCarlo& m,
                            std::uint64_t seed);
//! The cautions of scrubbing: spent iron oxide, caustic, H2S at changeouts, local codes.
void print_scrubbing_caution(std::FILE* out);

}  // namespace acidload_cli
