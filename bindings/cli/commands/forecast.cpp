// acidload forecast CASE --lab FILE --parameters KEYS: remaining hours of the current charge, with a band.
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
  const auto fc = (ProgressLine("forecast: running the current charge on"), acidload::forecast(r.fit));
  print_forecast(out, r.fit, fc);
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command forecast_command{
    "forecast", "forecast CASE", "remaining hours of the current charge to each limit, with a band (after a fit)",
    "usage: acidload forecast CASE --lab FILE --parameters KEY[,KEY…] [--variant NAME] [--overlay FILE]...\n\n"
    "Fits as 'acidload fit' does, then runs the current (last) charge of CASE's record on under its last\n"
    "segment and prints the remaining hours to each limit, with a 90 % band from the parameter\n"
    "covariance. Confirm with a lab sample before acting on it.\n",
    run};

}  // namespace acidload_cli
