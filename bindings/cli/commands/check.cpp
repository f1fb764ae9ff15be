// acidload check CASE: read a case and show what was read, computing nothing.
#include "../cli.hpp"
#include "../report.hpp"
#include "../site_report.hpp"
#include "acidload/io/site_file.hpp"

namespace acidload_cli {
namespace {

struct CheckOptions {
  std::string case_file;
  std::vector<std::string> overlays;
};

CheckOptions parse(const std::vector<std::string>& args) {
  CheckOptions o;
  Options("check").positional("CASE", o.case_file).values("--overlay", o.overlays, "FILE").parse(args);
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const CheckOptions o = parse(args);
  if (acidload::io::is_site_file(o.case_file)) {
    if (!o.overlays.empty()) throw UsageError("a site file takes no --overlay");
    return check_site_file(out, o.case_file);
  }
  const acidload::io::CaseFile c = acidload::io::load_case(o.case_file, o.overlays, acidload::io::RecordReading::stream);
  print_check(out, c);
  print_oil_cautions(out, c);
  std::fprintf(out, "\n%s: no mistakes found\n", o.case_file.c_str());
  return exit_ok;
}

}  // namespace

extern const Command check_command{
    "check", "check CASE", "read a case file and report what it found, without running it",
    "usage: acidload check CASE [--overlay FILE]...\n\n"
    "Reads the case file CASE (and any overlays, merged over it in order) and prints the inputs as\n"
    "read: gas, engine, oil, limits and record of each variant. Nothing is computed.\n"
    "Exit code 3 with file:line:column and the reason when the case has a mistake.\n"
    "A site file (a 'site' section) is read as a site: its gas, train and engines.\n",
    run};

}  // namespace acidload_cli
