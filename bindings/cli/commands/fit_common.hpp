#pragma once
// What `fit` and `forecast` share: their options and the fit itself.
#include <string>
#include <vector>

#include "../cli.hpp"
#include "acidload/studies/calibration.hpp"

namespace acidload_cli {

struct FitOptions {
  std::string case_file, lab, parameters, variant, write_overlay;
  std::vector<std::string> overlays;
};

//! Declares the options both commands take (CASE, --lab, --parameters, --variant, --overlay).
Options& fit_options(Options& p, FitOptions& o);
//! Checks that the options both need are there.
void require_fit_options(const char* command, const FitOptions& o);

//! The case as loaded and the fit of the chosen variant (library defaults of FitSettings).
struct FitRun {
  acidload::io::CaseFile file;
  const acidload::EngineCase* variant = nullptr;
  acidload::FitResult fit;
};
FitRun fit_case(const FitOptions& o);

}  // namespace acidload_cli
