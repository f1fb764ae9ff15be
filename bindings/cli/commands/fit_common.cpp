#include "fit_common.hpp"

#include "acidload/io/lab_file.hpp"
#include "acidload/studies/parameters.hpp"

namespace acidload_cli {

Options& fit_options(Options& p, FitOptions& o) {
  return p.positional("CASE", o.case_file)
      .value("--lab", o.lab, "FILE")
      .value("--parameters", o.parameters, "KEY[,KEY…]")
      .value("--variant", o.variant, "NAME")
      .values("--overlay", o.overlays, "FILE");
}

void require_fit_options(const char* command, const FitOptions& o) {
  if (o.lab.empty()) throw UsageError(std::string(command) + " needs --lab FILE with the lab results");
  if (o.parameters.empty())
    throw UsageError(std::string(command) + " needs --parameters, e.g. model.liner-uptake,model.oxidation-rate");
}

FitRun fit_case(const FitOptions& o) {
  FitRun r;
  acidload::FitSettings settings;
  settings.parameters = split_list(o.parameters);
  if (settings.parameters.empty()) throw UsageError("--parameters '" + o.parameters + "': no key in it");
  for (const std::string& k : settings.parameters) acidload::parameter(k);  // unknown keys: bad input with the list
  r.file = acidload::io::load_case(o.case_file, o.overlays);
  r.variant = &pick_variant(r.file, o.variant);
  const ProgressLine progress("fitting " + std::to_string(settings.parameters.size()) + " parameter(s)");
  r.fit = acidload::calibrate(*r.variant, acidload::io::read_lab_samples(o.lab), settings);
  return r;
}

}  // namespace acidload_cli
