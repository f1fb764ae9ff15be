#pragma once
// Result files of a run: trajectories as CSV and a summary as JSON, written atomically into an
// output folder (a failed run leaves an existing folder as it was).
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/io/economics_results.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload::io {

//! The summary as JSON text: every figure of the comparison table, units in the key names; with
//! `economics`, its block under "economics" (economics_results.hpp).
std::string summary_json(const CaseFile& c, const std::vector<VariantSummary>& rows,
                         const EconomicsResults* economics = nullptr);
//! The trajectories of every variant as CSV text (one row per trajectory point).
std::string trajectories_csv(const std::vector<VariantSummary>& rows);

//! Writes summary.json and trajectories.csv into `folder`: first into a fresh sibling folder,
//! then swapped in by renaming, so that readers never see half a result and an existing folder is
//! replaced only by a complete one. Throws acidload::Error (with the path) when it cannot.
void write_results(const std::string& folder, const CaseFile& c, const std::vector<VariantSummary>& rows,
                   const EconomicsResults* economics = nullptr);

}  // namespace acidload::io
