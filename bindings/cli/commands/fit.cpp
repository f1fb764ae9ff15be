// acidload fit CASE --lab FILE --parameters KEYS: calibrate parameters to the plant's lab history.
#include "../report.hpp"
#include "acidload/io/fitted_overlay.hpp"
#include "acidload/io/lab_file.hpp"
#include "fit_common.hpp"

namespace acidload_cli {
namespace {

FitOptions parse(const std::vector<std::string>& args) {
  FitOptions o;
  Options p("fit");
  fit_options(p, o).value("--write-overlay", o.write_overlay, "FILE").parse(args);
  require_fit_options("fit", o);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const FitOptions o = parse(args);
  const FitRun r = fit_case(o);
  if (!o.write_overlay.empty()) acidload::io::write_overlay(o.write_overlay, r.fit, o.case_file, o.lab, o.overlays);
  for (const std::string& n : r.lab_notes) std::fprintf(out, "note: %s\n", n.c_str());
  print_fit(out, *r.variant, r.fit);
  if (!o.write_overlay.empty())
    std::fprintf(out, "\nOverlay written to %s: acidload run %s --overlay %s\n", o.write_overlay.c_str(),
                 o.case_file.c_str(), o.write_overlay.c_str());
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command fit_command{
    "fit", "fit CASE", "calibrate parameters to the plant's lab history (--lab FILE)",
    "usage: acidload fit CASE --lab FILE [--parameters KEY[,KEY…]] [--precision R=SD,…] [--write-overlay FILE]\n"
    "                    [--variant NAME] [--overlay FILE]...\n\n"
    "Fits parameters of CASE (keys as in the case file, e.g. model.liner-uptake, model.oxidation-rate;\n"
    "without --parameters a set matched to what the lab reports) to the lab results in FILE by weighted\n"
    "least squares with a weak prior per parameter (Levenberg-Marquardt, weights from each reading's\n"
    "precision; no step leaves a parameter's range). Prints estimates with standard errors, their\n"
    "correlations, the residual of every reading, the reduced chi-square (with a warning when the model\n"
    "does not describe the plant) and flags for outliers, lab changes and parameters held at their prior\n"
    "because the samples do not respond to them. Fewer readings than parameters are refused (exit code 3).\n"
    "  --write-overlay FILE  write the estimates as an overlay for 'acidload run CASE --overlay FILE';\n"
    "                        refused for the files the fit read and for an existing file that is not\n"
    "                        an overlay acidload wrote (exit code 3)\n"
    "  --precision R=SD,…  one standard deviation per reading, in its unit: tbn (both methods), tbn-d2896,\n"
    "                      tbn-d4739, tan, san [mg KOH/g], oxidation, nitration [A/cm]; a lab file's *-sd\n"
    "                      columns win over these\n",
    run};

}  // namespace acidload_cli
