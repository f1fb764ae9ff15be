// The acidload program: find the command, let it parse its own options and call the library, copy
// its output to standard output once it has succeeded, and turn errors into the exit-code rule.
// No physics here.
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <string>
#include <vector>

#include "acidload/core/error.hpp"
#include "acidload/core/version.hpp"
#include "cli.hpp"
#include "commands/list.hpp"

namespace acidload_cli {

#define ACIDLOAD_CLI_DECLARE(name) extern const Command name##_command;
ACIDLOAD_CLI_COMMANDS(ACIDLOAD_CLI_DECLARE)
#undef ACIDLOAD_CLI_DECLARE

const std::vector<const Command*>& commands() {
#define ACIDLOAD_CLI_ENTRY(name) &name##_command,
  static const std::vector<const Command*> table{ACIDLOAD_CLI_COMMANDS(ACIDLOAD_CLI_ENTRY)};
#undef ACIDLOAD_CLI_ENTRY
  return table;
}

namespace {

void print_main_help(std::FILE* f) {
  std::fprintf(f, "acidload %s — acid load of sour fuel gas on gas-engine oil: TBN, TAN, SAN and drain intervals\n\n",
               acidload::version());
  std::fprintf(f, "usage: acidload <command> [options]\n\ncommands:\n");
  for (const Command* c : commands()) {
    const std::string s = c->synopsis;
    std::fprintf(f, "  %-18s %s\n", s.c_str(), c->summary);
  }
  std::fprintf(f, "\noptions:\n  --help       this text (also after a command: acidload run --help)\n"
                  "  --version    the version\n\n%s", exit_code_help);
}

const char* const short_exit_codes =
    "\nexit codes: 0 success, 2 the command line cannot be parsed, 3 a file or value that is not\n"
    "acceptable, 4 internal error (acidload --help says which is which)\n";

// The command's output is gathered here and copied to standard output only when it succeeds, so a
// failing command never leaves half a result on standard output.
struct Gathered {
  char* data = nullptr;
  std::size_t size = 0;
  std::FILE* f = open_memstream(&data, &size);
  ~Gathered() {
    if (f) std::fclose(f);
    std::free(data);
  }
  void copy_to_stdout() {
    std::fflush(f);
    const std::string text = terminal_safe(std::string(data, size));
    std::fwrite(text.data(), 1, text.size(), stdout);
    std::fflush(stdout);
  }
};

int dispatch(int argc, char** argv) {
  if (argc < 2) {
    print_main_help(stderr);
    return exit_usage;
  }
  const std::string first = argv[1];
  if (first == "--help" || first == "-h" || first == "help") {
    print_main_help(stdout);
    return exit_ok;
  }
  if (first == "--version") {
    std::printf("acidload %s\n", acidload::version());
    return exit_ok;
  }
  const Command* command = nullptr;
  for (const Command* c : commands())
    if (first == c->name) command = c;
  if (!command) {
    std::string names;
    for (const Command* c : commands()) names += (names.empty() ? "" : ", ") + std::string(c->name);
    throw UsageError("unknown command '" + first + "' (the commands: " + names + ")");
  }
  const std::vector<std::string> args(argv + 2, argv + argc);
  try {
    Gathered out;
    if (!out.f) throw std::runtime_error("cannot gather the output (out of memory)");
    const int code = command->run(args, out.f);
    out.copy_to_stdout();
    return code;
  } catch (const HelpRequested&) {
    std::printf("%s%s", command->help, short_exit_codes);
    return exit_ok;
  }
}

}  // namespace
}  // namespace acidload_cli

int main(int argc, char** argv) {
  using namespace acidload_cli;
  try {
    return dispatch(argc, argv);
  } catch (const UsageError& e) {
    std::fprintf(stderr, "acidload: %s (try acidload --help)\n", terminal_safe(e.what()).c_str());
    return exit_usage;
  } catch (const acidload::InputError& e) {
    std::fprintf(stderr, "acidload: %s\n", terminal_safe(e.what()).c_str());
    return exit_bad_input;
  } catch (const acidload::FitRefusedError& e) {
    std::fprintf(stderr, "acidload: fit refused: %s\n", terminal_safe(e.what()).c_str());
    return exit_bad_input;
  } catch (const acidload::NoAnswerError& e) {
    std::fprintf(stderr, "acidload: no answer: %s\n", terminal_safe(e.what()).c_str());
    return exit_bad_input;
  } catch (const acidload::NotModelledError& e) {
    std::fprintf(stderr, "acidload: not modelled: %s\n", terminal_safe(e.what()).c_str());
    return exit_bad_input;
  } catch (const acidload::Error& e) {
    std::fprintf(stderr, "acidload: %s\n", terminal_safe(e.what()).c_str());
    return exit_bad_input;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "acidload: internal error: %s\n", terminal_safe(e.what()).c_str());
    return exit_internal;
  }
}
