// The acidload program: parse the command line, call the library, print — no physics here.
#include <cstdio>
#include <cstring>
#include <exception>
#include <string>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "report.hpp"

namespace {
constexpr int exit_ok = 0, exit_usage = 2, exit_bad_input = 3, exit_internal = 4;

struct UsageError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

const char* main_help =
    "acidload %s — acid load of sour fuel gas on gas-engine oil: TBN, TAN, SAN and drain intervals\n\n"
    "usage: acidload <command> [options]\n\n"
    "commands:\n"
    "  check CASE   read a case file and report what it found, without running it\n"
    "  run CASE     run a case and print the comparison of its variants\n"
    "  demo         run the bundled demo site (invented data)\n\n"
    "options:\n"
    "  --help       this text (also after a command: acidload run --help)\n"
    "  --version    the version\n\n"
    "exit codes: 0 success, 2 usage error, 3 bad input, 4 internal error\n";

const char* check_help =
    "usage: acidload check CASE [--overlay FILE]...\n\n"
    "Reads the case file CASE (and any overlays, merged over it in order) and prints the inputs as\n"
    "read: gas, engine, oil, limits and record of each variant. Nothing is computed.\n"
    "Exit code 3 with file:line:column and the reason when the case has a mistake.\n";

const char* run_help =
    "usage: acidload run CASE [--overlay FILE]...\n\n"
    "Runs every variant of the case file CASE and prints a comparison: acid into the oil by species,\n"
    "the initial TBN fall, the drain interval and the limit that ends it (or 'not reached'), TBN, TAN\n"
    "and SAN there, and the exhaust sulfuric-acid dew point.\n";

const char* demo_help =
    "usage: acidload demo\n\n"
    "Runs the bundled demo case (cases/demo-site.yaml: Harrowfield landfill, engine 2 — invented data).\n";

struct Args {
  std::string command, case_file;
  std::vector<std::string> overlays;
  bool help = false;
};

Args parse(int argc, char** argv) {
  Args a;
  a.command = argv[1];
  for (int i = 2; i < argc; ++i) {
    const std::string s = argv[i];
    if (s == "--help" || s == "-h") a.help = true;
    else if (s == "--overlay") {
      if (i + 1 >= argc) throw UsageError("--overlay needs a file");
      a.overlays.push_back(argv[++i]);
    } else if (!s.empty() && s[0] == '-') throw UsageError("unknown option '" + s + "'");
    else if (a.case_file.empty()) a.case_file = s;
    else throw UsageError("one case file at a time (got '" + a.case_file + "' and '" + s + "')");
  }
  return a;
}

int run_case(const acidload::io::CaseFile& c) {
  std::vector<acidload::VariantSummary> rows;
  for (const auto& v : c.variants) rows.push_back(acidload::summarize(v));
  acidload_cli::print_comparison(stdout, c, rows);
  acidload_cli::print_caution(stdout);
  return exit_ok;
}
}  // namespace

int main(int argc, char** argv) {
  try {
    if (argc < 2) {
      std::fprintf(stderr, main_help, acidload::version());
      return exit_usage;
    }
    const std::string first = argv[1];
    if (first == "--help" || first == "-h" || first == "help") {
      std::printf(main_help, acidload::version());
      return exit_ok;
    }
    if (first == "--version") {
      std::printf("acidload %s\n", acidload::version());
      return exit_ok;
    }
    const Args a = parse(argc, argv);
    if (a.command == "check" || a.command == "run") {
      if (a.help) return std::printf("%s", a.command == "check" ? check_help : run_help), exit_ok;
      if (a.case_file.empty()) throw UsageError(a.command + " needs a case file");
      const acidload::io::CaseFile c = acidload::io::load_case(a.case_file, a.overlays);
      if (a.command == "check") {
        acidload_cli::print_check(stdout, c);
        std::printf("\n%s: no mistakes found\n", a.case_file.c_str());
        return exit_ok;
      }
      return run_case(c);
    }
    if (a.command == "demo") {
      if (a.help) return std::printf("%s", demo_help), exit_ok;
      if (!a.case_file.empty() || !a.overlays.empty()) throw UsageError("demo takes no case file");
      std::printf("acidload %s — demo: Harrowfield landfill, engine 2 (invented data)\n\n", acidload::version());
      return run_case(acidload::io::load_case(ACIDLOAD_DEMO_CASE));
    }
    throw UsageError("unknown command '" + a.command + "'");
  } catch (const UsageError& e) {
    std::fprintf(stderr, "acidload: %s (try acidload --help)\n", e.what());
    return exit_usage;
  } catch (const acidload::InputError& e) {
    std::fprintf(stderr, "acidload: %s\n", e.what());
    return exit_bad_input;
  } catch (const acidload::NotModelledError& e) {
    std::fprintf(stderr, "acidload: not modelled: %s\n", e.what());
    return exit_bad_input;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "acidload: internal error: %s\n", e.what());
    return exit_internal;
  }
}
