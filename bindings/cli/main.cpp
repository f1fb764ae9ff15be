// The acidload program: parse, call, print — no physics here.
#include <cstdio>
#include <cstring>
#include <exception>
#include <string>

#include "acidload/acidload.hpp"
#include "demo.hpp"

namespace {
constexpr int exit_ok = 0, exit_usage = 2, exit_bad_input = 3, exit_internal = 4;

void print_help() {
  std::printf(
      "acidload %s — acid load of sour fuel gas on gas-engine oil\n\n"
      "usage: acidload <command> [options]\n\n"
      "commands:\n"
      "  demo        run the bundled demo site (invented data) and print the results\n\n"
      "options:\n"
      "  --help      this text\n"
      "  --version   the version\n\n"
      "exit codes: 0 success, 2 usage error, 3 bad input, 4 internal error\n",
      acidload::version());
}
}  // namespace

int main(int argc, char** argv) {
  try {
    if (argc < 2) {
      print_help();
      return exit_usage;
    }
    const std::string cmd = argv[1];
    if (cmd == "--help" || cmd == "-h") {
      print_help();
      return exit_ok;
    }
    if (cmd == "--version") {
      std::printf("acidload %s\n", acidload::version());
      return exit_ok;
    }
    if (cmd == "demo") return acidload_cli::run_demo(stdout);
    std::fprintf(stderr, "acidload: unknown command '%s' (try acidload --help)\n", cmd.c_str());
    return exit_usage;
  } catch (const acidload::InputError& e) {
    std::fprintf(stderr, "acidload: bad input: %s\n", e.what());
    return exit_bad_input;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "acidload: internal error: %s\n", e.what());
    return exit_internal;
  }
}
