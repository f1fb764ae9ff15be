// acidload forecast CASE --lab FILE: the lab-first forecast of the current charge.
#include "../report.hpp"
#include "fit_common.hpp"

namespace acidload_cli {
namespace {

FitOptions parse(const std::vector<std::string>& args) {
  FitOptions o;
  Options p("forecast");
  fit_options(p, o).parse(args);
  require_fit_options("forecast", o);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const FitRun r = fit_case(parse(args));
  for (const std::string& n : r.lab_notes) std::fprintf(out, "note: %s\n", n.c_str());
  const auto fc = (ProgressLine("forecast: running the current charge on"), acidload::forecast_current(r.fit));
  print_forecast(out, r.fit, fc);
  print_trend(out, r.fit, acidload::trend(r.fit, r.file.lab.alarm_levels));  // the case's lab.alarm-levels over the defaults
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command forecast_command{
    "forecast", "forecast CASE", "the current charge from its latest sample: limits passed, hours left, next sample",
    "usage: acidload forecast CASE --lab FILE [--parameters KEY[,KEY…]] [--precision R=SD,…] [--variant NAME]\n"
    "                         [--overlay FILE]...\n\n"
    "Fits as 'acidload fit' does, moves the model state toward the latest sample of the current charge\n"
    "(a Kalman-type update weighted by the readings' precision), flags every limit that sample has\n"
    "already passed ('change the oil now', with the reading against the case's limit: TBN, TAN, SAN,\n"
    "FTIR, and from lab columns the viscosity change over fresh, antioxidant remaining, water and i-pH\n"
    "against limits.viscosity-change, antioxidant-remaining, water and initial-ph), then runs the charge\n"
    "on under the record's last segment: the hours left to each limit with a 90 % band from the\n"
    "parameter covariance, and when the next sample is due. Then the trend: the latest sample against the\n"
    "model's band, the current charge's TBN slope against the model's (and the H2S it implies), and wear\n"
    "metals, silicon, sodium, potassium, water, viscosity, antioxidant and i-pH against their alarm levels\n"
    "(for the last four the critical level is the case's limit, the caution level before it). Confirm with a\n"
    "lab sample before acting on it.\n"
    "  --precision R=SD,…  one standard deviation per reading, in its unit: tbn (both methods), tbn-d2896,\n"
    "                      tbn-d4739, tan, san [mg KOH/g], oxidation, nitration [A/cm]; a lab file's *-sd\n"
    "                      columns win over these\n",
    run};

}  // namespace acidload_cli
