// The acidload program: parse the command line, call the library, print — no physics here.
#include <cstdio>
#include <cstring>
#include <exception>
#include <string>
#include <vector>

#include "acidload/acidload.hpp"
#include "acidload/io/case_file.hpp"
#include "acidload/io/lab_file.hpp"
#include "acidload/io/quantity.hpp"
#include "acidload/io/report.hpp"
#include "acidload/io/results.hpp"
#include "acidload/studies/inverse.hpp"
#include "demo_case.hpp"
#include "report.hpp"

#include <chrono>
#include <unistd.h>

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
    "  run CASE     run a case and print the comparison of its variants (and write result files)\n"
    "  solve CASE   an inverse question: the H2S, fresh TBN, jacket water or oil volume for a target interval\n"
    "  convert FIG  a contaminant figure in every unit, for the gas of a case\n"
    "  fit CASE     calibrate parameters to the plant's lab history (--lab FILE --parameters …)\n"
    "  forecast CASE  remaining hours of the current charge to each limit, with a band (after a fit)\n"
    "  report CASE  one self-contained HTML page with the comparison, plots, inputs and cautions\n"
    "  uncertainty CASE  Monte Carlo over the case's uncertain inputs: P10/P50/P90 of the interval\n"
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
    "usage: acidload run CASE [--overlay FILE]... [--out FOLDER] [--summary-csv FILE]\n\n"
    "Runs every variant of the case file CASE and prints a comparison: acid into the oil by species,\n"
    "the initial TBN fall, the drain interval and the limit that ends it (or 'not reached'), TBN, TAN\n"
    "and SAN there, and the exhaust sulfuric-acid dew point.\n\n"
    "  --out FOLDER   also write FOLDER/summary.json (every figure, units in the key names) and\n"
    "                 FOLDER/trajectories.csv (TBN, TAN, SAN, oxidation, nitration against hours per\n"
    "                 variant). Written to a new folder and swapped in: a failed run leaves an\n"
    "                 existing FOLDER as it was.\n"
    "  --summary-csv FILE  also write the comparison table as CSV: one row per variant and charge\n"
    "                 (charges numbered from 1), units in the header; written atomically.\n";

const char* report_help =
    "usage: acidload report CASE [--lab FILE [--parameters KEY[,KEY…]]] [--overlay FILE]... --out REPORT.html\n\n"
    "Writes one self-contained HTML page (inline CSS and SVG, no scripts, nothing fetched: it opens from a\n"
    "USB stick and prints on A4): cautions and warnings, the comparison of the variants, TBN, TAN, SAN and\n"
    "oxidation against oil hours with the limits and each drain interval, the drain interval against H2S,\n"
    "acid into the oil by species, every input marked given, default, fitted or overlay, the model's\n"
    "assumptions, the acidload version and the SHA-256 of each input file.\n"
    "  --lab FILE         also the lab readings of FILE against the model: fitted to them (parameters\n"
    "                     model.liner-uptake,model.oxidation-rate unless --parameters names others) with a\n"
    "                     90 %% band; a fit the data cannot support is reported, not drawn\n"
    "  --out REPORT.html  the page; written to a temporary file and renamed. An existing file is replaced\n"
    "                     only if it is an acidload report.\n";

const char* solve_help =
    "usage: acidload solve CASE --for LEVER --target HOURS [--range LOW HIGH] [--variant NAME] [--overlay FILE]...\n\n"
    "Finds the value of one lever at which the drain interval equals the target, by bracketing\n"
    "root-finding on the forward model, and checks it by running the model at the answer.\n"
    "LEVER and its unit:\n"
    "  h2s                highest H2S [ppmv, dry] that still reaches the target (default range 0 to 3000 ppmv)\n"
    "  fresh-tbn          fresh-oil TBN needed [mg KOH/g] (default range: just above the floor to 30 mg KOH/g)\n"
    "  jacket-water-out   lowest jacket-water outlet temperature [degC] (default range 60 to 120 degC)\n"
    "  oil-volume         oil in circulation needed [L] (default range: a tenth to ten times the case's)\n"
    "HOURS as '4000 h'. LOW and HIGH with units, e.g. --range '0 ppmv' '800 ppmv'.\n"
    "'No answer in the range' is a plain answer: the model is not extrapolated.\n";

const char* convert_help =
    "usage: acidload convert FIGURE --case CASE [--as SPECIES] [--variant NAME]\n\n"
    "Shows a contaminant FIGURE ('300 ppmv', '450 mg/Nm3 dry', '25 mg/MJ', …) in every unit for the\n"
    "fuel gas of CASE: ppmv and mg/Nm3 dry and wet, mg/MJ of LHV, mg per Nm3 of CH4, mol/h at the\n"
    "case's fuel flow. SPECIES: H2S (default), S (as sulfur), Cl, F, or a halocarbon by name or\n"
    "formula (then also its Cl and F content).\n";

const char* demo_help =
    "usage: acidload demo\n\n"
    "Runs the bundled demo case (a copy of cases/demo-site.yaml built into the program: Harrowfield\n"
    "landfill, engine 2 — invented data).\n";

const char* fit_help =
    "usage: acidload fit CASE --lab FILE --parameters KEY[,KEY…] [--write-overlay FILE] [--overlay FILE]...\n\n"
    "Fits the named parameters of CASE (keys as in the case file, e.g. model.liner-uptake,\n"
    "model.capture-so2, model.oxidation-rate) to the lab results in FILE (CSV; columns in\n"
    "docs/lab-results.md) by weighted least squares (Levenberg-Marquardt, weights from each method's\n"
    "precision, bounded parameters in log/logit space). Prints estimates with standard errors, their\n"
    "correlations, the residual of every reading, the reduced chi-square and flags for outliers and\n"
    "lab changes. A fit the data cannot identify is refused with the reason (exit code 3).\n"
    "  --write-overlay FILE  write the estimates as an overlay for 'acidload run CASE --overlay FILE'\n";

const char* forecast_help =
    "usage: acidload forecast CASE --lab FILE --parameters KEY[,KEY…] [--overlay FILE]...\n\n"
    "Fits as 'acidload fit' does, then runs the current (last) charge of CASE's record on under its last\n"
    "segment and prints the remaining hours to each limit, with a 90 %% band from the parameter\n"
    "covariance. Confirm with a lab sample before acting on it.\n";

const char* uncertainty_help =
    "usage: acidload uncertainty CASE [--draws N] [--seed N] [--threads N] [--variant NAME]\n\n"
    "Monte Carlo over the uncertain inputs declared in CASE's 'uncertainty' section (normal, lognormal,\n"
    "uniform, triangular): P10, P50 and P90 of the drain interval and of the time to the first free\n"
    "strong acid. Every draw has its own counter-based random stream, so the result is the same for\n"
    "any number of threads (default: every core).\n";

struct Args {
  std::string command, case_file;
  std::vector<std::string> overlays;
  std::string out, lever, target, low, high, variant, species = "H2S", convert_case, lab, parameters, write_overlay;
  std::string draws, seed, threads, summary_csv;
  bool help = false;
};

Args parse(int argc, char** argv) {
  Args a;
  a.command = argv[1];
  for (int i = 2; i < argc; ++i) {
    const std::string s = argv[i];
    if (s == "--help" || s == "-h") a.help = true;
    else if (s == "--overlay" || s == "--out" || s == "--for" || s == "--target" || s == "--variant" ||
             s == "--as" || s == "--case" || s == "--lab" || s == "--parameters" || s == "--write-overlay" ||
             s == "--draws" || s == "--seed" || s == "--threads" || s == "--summary-csv") {
      if (i + 1 >= argc) throw UsageError(s + " needs a value");
      const std::string v = argv[++i];
      if (s == "--overlay") a.overlays.push_back(v);
      else if (s == "--out") a.out = v;
      else if (s == "--for") a.lever = v;
      else if (s == "--target") a.target = v;
      else if (s == "--variant") a.variant = v;
      else if (s == "--as") a.species = v;
      else if (s == "--lab") a.lab = v;
      else if (s == "--parameters") a.parameters = v;
      else if (s == "--write-overlay") a.write_overlay = v;
      else if (s == "--draws") a.draws = v;
      else if (s == "--seed") a.seed = v;
      else if (s == "--threads") a.threads = v;
      else if (s == "--summary-csv") a.summary_csv = v;
      else a.convert_case = v;
    } else if (s == "--range") {
      if (i + 2 >= argc) throw UsageError("--range needs LOW and HIGH");
      a.low = argv[++i];
      a.high = argv[++i];
    } else if (!s.empty() && s[0] == '-') throw UsageError("unknown option '" + s + "'");
    else if (a.case_file.empty()) a.case_file = s;
    else throw UsageError("one case file at a time (got '" + a.case_file + "' and '" + s + "')");
  }
  return a;
}

int run_case(const acidload::io::CaseFile& c, const std::string& out, const std::string& summary_csv = "") {
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  const bool terminal = isatty(STDERR_FILENO);
  bool shown = false;
  std::vector<acidload::VariantSummary> rows;
  for (std::size_t i = 0; i < c.variants.size(); ++i) {
    if (terminal && std::chrono::duration<double>(clock::now() - start).count() > 1.0) {
      std::fprintf(stderr, "\racidload: running variant %zu of %zu …", i + 1, c.variants.size());
      shown = true;
    }
    rows.push_back(acidload::summarize(c.variants[i]));
  }
  if (shown) std::fprintf(stderr, "\r%60s\r", "");
  if (!out.empty()) acidload::io::write_results(out, c, rows);  // before printing: a failed write prints no table
  if (!summary_csv.empty()) acidload::io::write_text_file(summary_csv, acidload::io::summary_csv(c, rows));
  acidload_cli::print_comparison(stdout, c, rows);
  if (!out.empty()) std::printf("\nResults written to %s/summary.json and %s/trajectories.csv\n", out.c_str(), out.c_str());
  if (!summary_csv.empty()) std::printf("Comparison table written to %s\n", summary_csv.c_str());
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

int report(const Args& a) {
  if (a.case_file.empty()) throw UsageError("report needs a case file");
  if (a.out.empty()) throw UsageError("report needs --out REPORT.html");
  if (!a.parameters.empty() && a.lab.empty()) throw UsageError("--parameters goes with --lab");
  const acidload::io::CaseFile c = acidload::io::load_case(a.case_file, a.overlays);
  std::vector<acidload::VariantSummary> rows;
  for (const auto& v : c.variants) rows.push_back(acidload::summarize(v));
  acidload::io::ReportOptions o;
  o.lab_file = a.lab;
  if (!a.parameters.empty()) {
    o.parameters.clear();
    for (std::size_t start = 0; start <= a.parameters.size();) {
      const auto comma = a.parameters.find(',', start);
      const std::string key = a.parameters.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
      if (!key.empty()) o.parameters.push_back(key);
      if (comma == std::string::npos) break;
      start = comma + 1;
    }
    for (const std::string& k : o.parameters) acidload::parameter(k);  // unknown keys: bad input with the list
  }
  const acidload::io::ReportData d = acidload::io::gather_report(c, rows, o);
  acidload::io::write_report(a.out, acidload::io::report_html(d));  // complete before anything is replaced
  std::printf("Report written to %s (%zu variant(s)%s)\n", a.out.c_str(), rows.size(), d.lab ? ", with the lab results" : "");
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

const acidload::EngineCase& pick_variant(const acidload::io::CaseFile& c, const std::string& name) {
  if (name.empty()) return c.variants.front();
  std::string names;
  for (const auto& v : c.variants) {
    if (v.name == name) return v;
    names += (names.empty() ? "" : ", ") + v.name;
  }
  throw UsageError("no variant named '" + name + "' (the case has: " + names + ")");
}

double parse_cli_quantity(const std::string& text, acidload::io::Kind k, const char* option) {
  double v = 0;
  std::string why;
  if (!acidload::io::parse_quantity_text(text, k, v, why))
    throw UsageError(std::string(option) + " '" + text + "': " + why);
  return v;
}

int solve(const Args& a) {
  using namespace acidload;
  if (a.case_file.empty()) throw UsageError("solve needs a case file");
  if (a.lever.empty()) throw UsageError("solve needs --for h2s|fresh-tbn|jacket-water-out|oil-volume");
  if (a.target.empty()) throw UsageError("solve needs --target, e.g. --target '4000 h'");
  const io::CaseFile file = io::load_case(a.case_file, a.overlays);
  const EngineCase& c = pick_variant(file, a.variant);
  const double target = parse_cli_quantity(a.target, io::Kind::duration, "--target");
  Lever lever;
  io::Kind kind;
  double lo, hi, tol, shown_offset = 0, shown_scale = 1;
  const char* unit;
  if (a.lever == "h2s") lever = Lever::h2s_ppmv_dry, kind = io::Kind::number, lo = 0, hi = 3000, tol = 0.01, unit = "ppmv";
  else if (a.lever == "fresh-tbn") {
    lever = Lever::fresh_tbn, kind = io::Kind::acid_number, unit = "mg KOH/g", tol = 1e-4;
    lo = c.charge.oil.base_floor + c.charge.oil.weak_base(c.charge.oil.fresh_tbn_method) + 0.01, hi = 30;
  } else if (a.lever == "jacket-water-out") {
    lever = Lever::jacket_water_out, kind = io::Kind::temperature, unit = "degC", tol = 1e-3;
    lo = 333.15, hi = 393.15, shown_offset = -273.15;
  } else if (a.lever == "oil-volume") {
    lever = Lever::oil_volume, kind = io::Kind::volume, unit = "L", tol = 1e-6, shown_scale = 1e3;
    const double v = lever_value(c, lever);
    lo = 0.1 * v, hi = 10 * v;
  } else {
    throw UsageError("--for '" + a.lever + "': one of h2s, fresh-tbn, jacket-water-out, oil-volume");
  }
  if (!a.low.empty()) {
    if (lever == Lever::h2s_ppmv_dry) {
      const auto strip = [](std::string t) {
        const auto p = t.find("ppmv");
        if (p == std::string::npos) throw UsageError("--range for h2s in ppmv, e.g. '0 ppmv' '800 ppmv'");
        return t.substr(0, p);
      };
      lo = parse_cli_quantity(strip(a.low), io::Kind::number, "--range");
      hi = parse_cli_quantity(strip(a.high), io::Kind::number, "--range");
    } else {
      lo = parse_cli_quantity(a.low, kind, "--range");
      hi = parse_cli_quantity(a.high, kind, "--range");
    }
  }
  const InverseAnswer r = solve_for_interval(c, lever, target, lo, hi, tol);
  const auto show = [&](double v) { return (v + shown_offset) * shown_scale; };
  std::printf("%s — variant '%s': %s for a drain interval of %.0f h\n", file.title.c_str(), c.name.c_str(),
              a.lever.c_str(), target);
  std::printf("range searched: %.4g to %.4g %s (interval %.0f h and %.0f h at its ends)\n", show(lo), show(hi), unit,
              r.interval_at_low, r.interval_at_high);
  if (r.found)
    std::printf("answer: %.4f %s — the model run at the answer gives %.1f h (%d runs)\n", show(r.value), unit,
                r.interval_at_value, r.evaluations);
  else if (target >= c.model.limits.max_hours)
    std::printf("no answer: %s\n", r.reason.c_str());
  else
    std::printf("no answer in the range: the interval is %.0f h at %.4g %s and %.0f h at %.4g %s, both %s the target\n",
                r.interval_at_low, show(lo), unit, r.interval_at_high, show(hi), unit,
                r.interval_at_low > target ? "above" : "below");
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

acidload::FitResult fit_case(const Args& a, acidload::io::CaseFile& file, const acidload::EngineCase*& c) {
  using namespace acidload;
  if (a.case_file.empty()) throw UsageError(a.command + " needs a case file");
  if (a.lab.empty()) throw UsageError(a.command + " needs --lab FILE with the lab results");
  if (a.parameters.empty()) throw UsageError(a.command + " needs --parameters, e.g. model.liner-uptake,model.oxidation-rate");
  file = io::load_case(a.case_file, a.overlays);
  c = &pick_variant(file, a.variant);
  FitSettings fs;
  std::string p = a.parameters;
  for (std::size_t start = 0; start <= p.size();) {
    const auto comma = p.find(',', start);
    const std::string key = p.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    if (!key.empty()) fs.parameters.push_back(key);
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  for (const std::string& k : fs.parameters) parameter(k);  // unknown keys: bad input with the list
  return calibrate(*c, io::read_lab_samples(a.lab), fs);
}

int fit(const Args& a) {
  acidload::io::CaseFile file;
  const acidload::EngineCase* c = nullptr;
  const acidload::FitResult f = fit_case(a, file, c);
  if (!a.write_overlay.empty()) acidload::io::write_overlay(a.write_overlay, f, a.case_file, a.lab);
  acidload_cli::print_fit(stdout, *c, f);
  if (!a.write_overlay.empty())
    std::printf("\nOverlay written to %s: acidload run %s --overlay %s\n", a.write_overlay.c_str(), a.case_file.c_str(),
                a.write_overlay.c_str());
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

int forecast(const Args& a) {
  acidload::io::CaseFile file;
  const acidload::EngineCase* c = nullptr;
  const acidload::FitResult f = fit_case(a, file, c);
  acidload_cli::print_forecast(stdout, f, acidload::forecast(f));
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

int uncertainty(const Args& a) {
  using namespace acidload;
  if (a.case_file.empty()) throw UsageError("uncertainty needs a case file");
  const io::CaseFile file = io::load_case(a.case_file, a.overlays);
  const EngineCase& c = pick_variant(file, a.variant);
  if (file.uncertainty.inputs.empty())
    throw InputError("uncertainty", "(no section)", "an 'uncertainty' section with inputs in " + a.case_file,
                     InputWhere{a.case_file, 1, 1, ""});
  const auto count = [](const std::string& text, const char* option, double lo, double hi) {
    const double v = parse_cli_quantity(text, io::Kind::count, option);
    if (!(v >= lo && v <= hi)) throw UsageError(std::string(option) + " '" + text + "': out of range");
    return v;
  };
  const int draws = a.draws.empty() ? file.uncertainty.draws : static_cast<int>(count(a.draws, "--draws", 1, 1e7));
  const std::uint64_t seed = a.seed.empty() ? file.uncertainty.seed : static_cast<std::uint64_t>(count(a.seed, "--seed", 0, 9e15));
  const int threads = a.threads.empty() ? 0 : static_cast<int>(count(a.threads, "--threads", 1, 256));
  const MonteCarloResult r = monte_carlo(c, file.uncertainty.inputs, draws, seed, threads);
  acidload_cli::print_monte_carlo(stdout, c, file.uncertainty.inputs, r, seed);
  acidload_cli::print_caution(stdout);
  return exit_ok;
}

int convert(const Args& a) {
  using namespace acidload;
  if (a.case_file.empty()) throw UsageError("convert needs a figure, e.g. acidload convert '300 ppmv' --case CASE");
  if (a.convert_case.empty()) throw UsageError("convert needs --case CASE for the gas the figure belongs to");
  const io::CaseFile file = io::load_case(a.convert_case, a.overlays);
  const EngineCase& c = pick_variant(file, a.variant);
  acidload_cli::print_conversion(stdout, c, a.case_file, a.species);
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
      return run_case(c, a.out, a.summary_csv);
    }
    if (a.command == "report") {
      if (a.help) return std::printf(report_help), exit_ok;
      return report(a);
    }
    if (a.command == "solve") {
      if (a.help) return std::printf("%s", solve_help), exit_ok;
      return solve(a);
    }
    if (a.command == "fit") {
      if (a.help) return std::printf("%s", fit_help), exit_ok;
      return fit(a);
    }
    if (a.command == "forecast") {
      if (a.help) return std::printf("%s", forecast_help), exit_ok;
      return forecast(a);
    }
    if (a.command == "uncertainty") {
      if (a.help) return std::printf("%s", uncertainty_help), exit_ok;
      return uncertainty(a);
    }
    if (a.command == "convert") {
      if (a.help) return std::printf("%s", convert_help), exit_ok;
      return convert(a);
    }
    if (a.command == "demo") {
      if (a.help) return std::printf("%s", demo_help), exit_ok;
      if (!a.case_file.empty() || !a.overlays.empty()) throw UsageError("demo takes no case file");
      std::printf("acidload %s — demo: Harrowfield landfill, engine 2 (invented data)\n\n", acidload::version());
      return run_case(acidload::io::load_case_text(demo_case_text, "demo-site.yaml (bundled)", "."), "");
    }
    throw UsageError("unknown command '" + a.command + "'");
  } catch (const UsageError& e) {
    std::fprintf(stderr, "acidload: %s (try acidload --help)\n", e.what());
    return exit_usage;
  } catch (const acidload::InputError& e) {
    std::fprintf(stderr, "acidload: %s\n", e.what());
    return exit_bad_input;
  } catch (const acidload::FitRefusedError& e) {
    std::fprintf(stderr, "acidload: fit refused: %s\n", e.what());
    return exit_bad_input;
  } catch (const acidload::NoAnswerError& e) {
    std::fprintf(stderr, "acidload: no answer: %s\n", e.what());
    return exit_bad_input;
  } catch (const acidload::NotModelledError& e) {
    std::fprintf(stderr, "acidload: not modelled: %s\n", e.what());
    return exit_bad_input;
  } catch (const acidload::Error& e) {
    std::fprintf(stderr, "acidload: %s\n", e.what());
    return exit_bad_input;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "acidload: internal error: %s\n", e.what());
    return exit_internal;
  }
}
