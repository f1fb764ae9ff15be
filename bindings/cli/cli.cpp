#include "cli.hpp"

#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include <unistd.h>

#include <chrono>
#include <condition_variable>
#include <mutex>
#include <thread>

#include "acidload/core/error.hpp"
#include "acidload/core/fuel.hpp"
#include "acidload/core/species.hpp"
#include "acidload/io/document.hpp"

namespace acidload_cli {

const char* const exit_code_help =
    "exit codes (every command):\n"
    "  0  success\n"
    "  2  the command line cannot be parsed: an unknown command or option, an option the command does\n"
    "     not take, a missing argument, a value not of the expected form (a quantity or number that\n"
    "     does not parse, a fraction where a whole number is needed, an empty name, a --for word not\n"
    "     in its list)\n"
    "  3  a file or a well-formed value that is not acceptable: a case, overlay or lab file with a\n"
    "     mistake or that cannot be read, a value outside its range or physically impossible, a\n"
    "     variant the case does not have, an output that would replace what acidload did not write,\n"
    "     a fit the data cannot identify\n"
    "  4  an internal error (a bug in acidload)\n";

Options& Options::positional(const char* name, std::string& into, bool optional) {
  positionals_.push_back({name, &into, optional});
  return *this;
}
Options& Options::positionals(const char* name, std::vector<std::string>& into) {
  rest_ = &into;
  rest_name_ = name;
  return *this;
}

Options& Options::value(const char* option, std::string& into, const char* meta) {
  specs_.push_back({option, meta, 1, false, &into});
  return *this;
}
Options& Options::values(const char* option, std::vector<std::string>& into, const char* meta) {
  Spec s{option, meta, 1, true};
  s.many = &into;
  specs_.push_back(s);
  return *this;
}
Options& Options::pair(const char* option, std::string& a, std::string& b, const char* meta) {
  specs_.push_back({option, meta, 2, false, &a, &b});
  return *this;
}
Options& Options::flag(const char* option, bool& into) {
  Spec s{option, "", 0, false};
  s.set = &into;
  specs_.push_back(s);
  return *this;
}

std::string Options::taken() const {
  std::string t;
  for (const Spec& s : specs_) t += (t.empty() ? "" : ", ") + s.name + (s.meta.empty() ? "" : " " + s.meta);
  return t.empty() ? "no options" : t;
}

namespace {
// A token is an option when it starts with "--", or is a single-dash word that is not a number
// ('-5 degC' and '-.5' are values).
bool looks_like_option(const std::string& s) {
  if (s.size() >= 2 && s[0] == '-' && s[1] == '-') return true;
  if (s.size() >= 2 && s[0] == '-') return !(std::isdigit(static_cast<unsigned char>(s[1])) || s[1] == '.');
  return false;
}
}  // namespace

void Options::parse(const std::vector<std::string>& args) {
  std::size_t next_positional = 0;
  bool options_ended = false;
  const auto take_positional = [&](const std::string& s) {
    if (next_positional >= positionals_.size() && rest_) {
      if (s.empty()) throw UsageError(command_ + ": " + rest_name_ + " is empty");
      rest_->push_back(s);
      return;
    }
    if (next_positional >= positionals_.size()) {
      if (positionals_.empty()) throw UsageError(command_ + " takes no arguments (got '" + s + "')");
      throw UsageError(command_ + " takes one " + positionals_.back().name + " (got '" + *positionals_.back().into +
                       "' and '" + s + "')");
    }
    const Positional& p = positionals_[next_positional++];
    if (s.empty()) throw UsageError(command_ + ": " + p.name + " is empty");
    *p.into = s;
  };
  for (std::size_t i = 0; i < args.size(); ++i) {
    const std::string& s = args[i];
    if (options_ended || !looks_like_option(s)) {
      take_positional(s);
      continue;
    }
    if (s == "--") {
      options_ended = true;
      continue;
    }
    if (s == "--help" || s == "-h") throw HelpRequested{};
    std::string name = s, inline_value;
    bool has_inline = false;
    if (const auto eq = s.find('='); eq != std::string::npos && s.rfind("--", 0) == 0) {
      name = s.substr(0, eq);
      inline_value = s.substr(eq + 1);
      has_inline = true;
    }
    Spec* spec = nullptr;
    for (Spec& x : specs_)
      if (x.name == name) spec = &x;
    if (!spec) throw UsageError("acidload " + command_ + " does not take '" + name + "' (it takes: " + taken() + ")");
    if (spec->seen && !spec->repeat) throw UsageError(name + " given twice");
    spec->seen = true;
    const auto next = [&](const char* what) -> std::string {
      if (has_inline) {
        has_inline = false;
        return inline_value;
      }
      if (i + 1 >= args.size()) throw UsageError(name + " needs " + what);
      return args[++i];
    };
    const auto non_empty = [&](std::string v) {
      if (v.empty()) throw UsageError(name + " '': expected " + spec->meta + ", not an empty text");
      return v;
    };
    if (spec->arity == 0) {
      if (has_inline) throw UsageError(name + " takes no value");
      *spec->set = true;
    } else if (spec->arity == 1) {
      std::string v = non_empty(next(spec->meta.c_str()));
      if (spec->many) spec->many->push_back(std::move(v));
      else *spec->one = std::move(v);
    } else {
      if (has_inline) throw UsageError(name + " takes two values: " + name + " " + spec->meta);
      *spec->one = non_empty(next(spec->meta.c_str()));
      *spec->two = non_empty(next(spec->meta.c_str()));
    }
  }
  for (std::size_t k = next_positional; k < positionals_.size(); ++k)
    if (!positionals_[k].optional) throw UsageError(command_ + " needs " + positionals_[k].name);
  if (rest_ && rest_->empty()) throw UsageError(command_ + " needs " + rest_name_);
}

namespace {
// The number and unit of "<number> <unit>" when the number parses; false otherwise.
bool split_number(const std::string& text, double& v, std::string& unit) {
  const char* begin = text.c_str();
  while (*begin == ' ') ++begin;
  char* end = nullptr;
  errno = 0;
  v = std::strtod(begin, &end);
  if (end == begin || !std::isfinite(v)) return false;
  std::string rest(end);
  const auto b = rest.find_first_not_of(' ');
  const auto e = rest.find_last_not_of(' ');
  unit = b == std::string::npos ? "" : rest.substr(b, e - b + 1);
  return true;
}
}  // namespace

double quantity_option(const std::string& text, acidload::io::Kind k, const char* option) {
  double v = 0;
  std::string why;
  if (acidload::io::parse_quantity_text(text, k, v, why)) return v;
  double number = 0;
  std::string unit;
  bool well_formed = split_number(text, number, unit);
  if (well_formed) {
    const auto& units = acidload::io::accepted_units(k);
    bool known = false;
    for (const std::string& u : units) known = known || u == unit;
    well_formed = known;
  }
  if (well_formed) throw acidload::InputError(option, text, why);  // parses, but not acceptable: 3
  throw UsageError(std::string(option) + " '" + text + "': " + why);
}

namespace {
// A whole-number bound as the user types it: 1000000, not 1e+06 (bounds up to 9e15 are exact in a double).
std::string whole_number(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.0f", v);
  return b;
}
}  // namespace

std::uint64_t count_option(const std::string& text, const char* option, double lo, double hi) {
  double v = 0;
  std::string unit;
  const bool digits = !text.empty() && text.find_first_not_of("+-0123456789eE.") == std::string::npos;
  if (!digits || !split_number(text, v, unit) || !unit.empty())
    throw UsageError(std::string(option) + " '" + text + "': expected a whole number");
  if (v != std::floor(v)) throw UsageError(std::string(option) + " '" + text + "': expected a whole number, not a fraction");
  if (!(v >= lo && v <= hi))
    throw acidload::InputError(option, text, "a whole number from " + whole_number(lo) + " to " + whole_number(hi));
  return static_cast<std::uint64_t>(v);
}

double h2s_ppmv_dry_option(const std::string& text, const acidload::EngineCase& c, const char* option) {
  using namespace acidload;
  io::Document doc;
  doc.file = "(command line)";
  doc.lines = {text};
  io::Node n;
  n.type = io::Node::Type::scalar;
  n.scalar = text;
  n.mark = {1, 1};
  n.path = option;
  Concentration given;
  try {
    given = io::concentration(doc, n, Basis::dry);
  } catch (const InputError& e) {
    throw UsageError(std::string(option) + " '" + text + "' for h2s: " + e.expected());
  }
  const Segment& s = first_segment(c);
  const GasContext ctx = context(s.fuel, s.operation.fuel_flow);
  const double m = molar_mass(Gas::H2S);
  return from_wet_mole_fraction(to_wet_mole_fraction(given, m, ctx), ConcentrationUnit::ppmv, Basis::dry, m, ctx);
}

DrawOptions draw_options(const std::string& draws, const std::string& seed, const std::string& threads, double max_draws) {
  DrawOptions o;
  if (!draws.empty()) o.draws_given = true, o.draws = count_option(draws, "--draws", 1, max_draws);
  if (!seed.empty()) o.seed_given = true, o.seed = count_option(seed, "--seed", 0, 9e15);
  if (!threads.empty()) o.threads = static_cast<int>(count_option(threads, "--threads", 1, 256));
  return o;
}

const acidload::EngineCase& pick_variant(const acidload::io::CaseFile& c, const std::string& name) {
  if (name.empty()) return c.variants.front();
  std::string names;
  for (const auto& v : c.variants) {
    if (v.name == name) return v;
    names += (names.empty() ? "" : ", ") + v.name;
  }
  throw acidload::InputError("--variant", name, "a variant of " + c.file + ": " + names);
}

struct ProgressLine::State {
  std::string what;
  std::mutex m;
  std::condition_variable cv;
  bool done = false;
  std::thread worker;
};

ProgressLine::ProgressLine(std::string what) {
  if (!isatty(STDERR_FILENO)) return;
  state_ = new State;
  state_->what = terminal_safe(what);
  state_->worker = std::thread([s = state_] {
    using clock = std::chrono::steady_clock;
    const auto start = clock::now();
    bool shown = false;
    std::unique_lock<std::mutex> lock(s->m);
    while (!s->cv.wait_for(lock, std::chrono::milliseconds(500), [s] { return s->done; })) {
      const double t = std::chrono::duration<double>(clock::now() - start).count();
      if (t < 1) continue;
      std::fprintf(stderr, "\racidload: %s … %.0f s ", s->what.c_str(), t);
      std::fflush(stderr);
      shown = true;
    }
    if (shown) std::fprintf(stderr, "\r%*s\r", static_cast<int>(s->what.size() + 24), "");
  });
}

ProgressLine::~ProgressLine() {
  if (!state_) return;
  {
    std::lock_guard<std::mutex> lock(state_->m);
    state_->done = true;
  }
  state_->cv.notify_one();
  state_->worker.join();
  delete state_;
}

std::string terminal_safe(const std::string& text) {
  std::string o;
  o.reserve(text.size());
  for (std::size_t i = 0; i < text.size(); ++i) {
    const unsigned char ch = static_cast<unsigned char>(text[i]);
    char b[16];
    if ((ch < 0x20 && ch != '\n' && ch != '\t') || ch == 0x7f) {
      std::snprintf(b, sizeof b, "\\x%02x", ch);
      o += b;
    } else if (ch == 0xc2 && i + 1 < text.size() && static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
               static_cast<unsigned char>(text[i + 1]) <= 0x9f) {
      std::snprintf(b, sizeof b, "\\u%04x", static_cast<unsigned char>(text[++i]));
      o += b;
    } else {
      o += static_cast<char>(ch);
    }
  }
  return o;
}

std::vector<std::string> split_list(const std::string& text) {
  std::vector<std::string> items;
  for (std::size_t start = 0; start <= text.size();) {
    const auto comma = text.find(',', start);
    std::string item = text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    if (!item.empty()) items.push_back(std::move(item));
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  return items;
}

}  // namespace acidload_cli
