// acidload fit CASE --lab FILE --parameters KEYS: calibrate parameters to the plant's lab history.
#include "../report.hpp"
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
  print_fit(out, *r.variant, r.fit);
  if (!o.write_overlay.empty())
    std::fprintf(out, "\nOverlay written to %s: acidload run %s --overlay %s\n", o.write_overlay.c_str(),
                 o.case_file.c_str(), o.write_overlay.c_str());
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command fit_command{
    "fit", "fit CASE", "calibrate parameters to the plant's lab history (--lab FILE --parameters …)",
    "usage: acidload fit CASE --lab FILE --parameters KEY[,KEY…] [--write-overlay FILE] [--variant NAME]\n"
    "                    [--overlay FILE]...\n\n"
    "Fits the named parameters of CASE (keys as in the case file, e.g. model.liner-uptake,\n"
    "model.capture-so2, model.oxidation-rate) to the lab results in FILE (CSV; columns in\n"
    "docs/lab-results.md) by weighted least squares (Levenberg-Marquardt, weights from each method's\n"
    "precision, bounded parameters in log/logit space). Prints estimates with standard errors, their\n"
    "correlations, the residual of every reading, the reduced chi-square and flags for outliers and\n"
    "lab changes. A fit the data cannot identify is refused with the reason (exit code 3).\n"
    "  --write-overlay FILE  write the estimates as an overlay for 'acidload run CASE --overlay FILE';\n"
    "                        refused for the files the fit read and for an existing file that is not\n"
    "                        an overlay acidload wrote (exit code 3)\n",
    run};

}  // namespace acidload_cli
