#pragma once
// The acidload program's shell: exit codes, the command table and a small option parser each command
// uses for its own options struct. No physics here; commands call the library and print.
#include <cstdint>
#include <cstdio>
#include <stdexcept>
#include <string>
#include <vector>

#include "acidload/io/case_file.hpp"
#include "acidload/io/quantity.hpp"

namespace acidload_cli {

// ---- exit codes: one rule for every command (shown in --help and README.md) -------------------
constexpr int exit_ok = 0;
constexpr int exit_usage = 2;      //!< the command line cannot be parsed
constexpr int exit_bad_input = 3;  //!< a file or a well-formed value that is not acceptable
constexpr int exit_internal = 4;   //!< a bug in acidload
extern const char* const exit_code_help;

//! The command line cannot be parsed (exit code 2).
struct UsageError : std::runtime_error {
  using std::runtime_error::runtime_error;
};
//! --help was given after a command.
struct HelpRequested {};

//! One command of the program. To add one: a file in commands/ defining `const Command NAME_command`
//! and one line in commands/list.hpp.
struct Command {
  const char* name;      //!< as typed: "run"
  const char* synopsis;  //!< for the main help: "run CASE"
  const char* summary;   //!< one line for the main help
  const char* help;      //!< the command's --help text (starts with "usage: acidload NAME")
  //! Runs the command on the arguments after its name, printing its result to `out` (which the
  //! program copies to standard output only when the command succeeds).
  int (*run)(const std::vector<std::string>& args, std::FILE* out);
};
const std::vector<const Command*>& commands();

//! The options of one command, bound to the fields of that command's options struct. Anything the
//! command does not declare is refused (UsageError naming it). Values may start with '-' (for
//! '-5 degC'); `--opt=value` works; `--` ends the options.
class Options {
 public:
  explicit Options(const char* command) : command_(command) {}
  //! A positional argument (required unless `optional`).
  Options& positional(const char* name, std::string& into, bool optional = false);
  //! One or more positional arguments (after any single positionals), collected in order.
  Options& positionals(const char* name, std::vector<std::string>& into);
  //! `--name VALUE`, at most once.
  Options& value(const char* option, std::string& into, const char* meta);
  //! `--name VALUE`, any number of times.
  Options& values(const char* option, std::vector<std::string>& into, const char* meta);
  //! `--name A B`, at most once.
  Options& pair(const char* option, std::string& a, std::string& b, const char* meta);
  //! `--name` without a value.
  Options& flag(const char* option, bool& into);
  //! Parses; throws HelpRequested on --help/-h, UsageError on anything the command does not take.
  void parse(const std::vector<std::string>& args);

 private:
  struct Spec {
    std::string name, meta;
    int arity;  // 0 flag, 1 value, 2 pair
    bool repeat;
    std::string* one = nullptr;
    std::string* two = nullptr;
    std::vector<std::string>* many = nullptr;
    bool* set = nullptr;
    bool seen = false;
  };
  struct Positional {
    std::string name;
    std::string* into;
    bool optional;
  };
  std::string taken() const;
  std::string command_;
  std::vector<Spec> specs_;
  std::vector<Positional> positionals_;
  std::vector<std::string>* rest_ = nullptr;  // positionals(): one or more
  std::string rest_name_;
};

//! A progress line on standard error, only when it is a terminal: after the first second of work,
//! "acidload: WHAT … N s" refreshed twice a second from a thread of its own (the library's loops
//! are not touched), cleared when the work ends.
class ProgressLine {
 public:
  explicit ProgressLine(std::string what);
  ~ProgressLine();
  ProgressLine(const ProgressLine&) = delete;
  ProgressLine& operator=(const ProgressLine&) = delete;

 private:
  struct State;
  State* state_ = nullptr;
};

// ---- values from the command line ----------------------------------------------------------
//! A quantity option ("4000 h"): a value that does not parse is a UsageError (2); one that parses
//! but lies outside what the kind allows (e.g. '-300 degC') is an InputError (3).
double quantity_option(const std::string& text, acidload::io::Kind k, const char* option);
//! A whole-number option: digits (or an exponent form of a whole number); a fraction or other text
//! is a UsageError (2); a whole number outside [lo, hi] is an InputError (3).
std::uint64_t count_option(const std::string& text, const char* option, double lo, double hi);
//! An H2S figure for --range in any contaminant unit and basis ('0 ppmv', '50 ppmv wet', '700 mg/Nm3')
//! as ppmv dry in the gas of the case's first segment (solve's h2s lever, costs' changeout level);
//! a figure that does not parse is a UsageError (2) naming `option`.
double h2s_ppmv_dry_option(const std::string& text, const acidload::EngineCase& c, const char* option);
//! --draws, --seed and --threads of a Monte Carlo command, read before the case so that a malformed
//! number is a usage error whatever the file holds; where not given, the case's own draws and seed.
struct DrawOptions {
  bool draws_given = false, seed_given = false;
  std::uint64_t draws = 0, seed = 0;
  int threads = 0;  //!< 0: as many as the machine has
  int draws_or(int from_case) const { return draws_given ? static_cast<int>(draws) : from_case; }
  std::uint64_t seed_or(std::uint64_t from_case) const { return seed_given ? seed : from_case; }
};
DrawOptions draw_options(const std::string& draws, const std::string& seed, const std::string& threads, double max_draws);
//! The variant named (the first when `name` is empty); an InputError (3) listing the case's
//! variants when there is none of that name.
const acidload::EngineCase& pick_variant(const acidload::io::CaseFile& c, const std::string& name);
//! Text for a terminal: control characters other than newline and tab (ESC, CR, BEL, DEL, the C1
//! controls U+0080–U+009F) shown as \xNN or \u00NN, so names in a case cannot drive the terminal.
std::string terminal_safe(const std::string& text);
//! A comma-separated list ("a,b,c"), empty items dropped.
std::vector<std::string> split_list(const std::string& text);

}  // namespace acidload_cli
