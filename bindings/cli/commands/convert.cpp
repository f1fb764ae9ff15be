// acidload convert FIGURE --case CASE: a contaminant figure in every unit for the gas of a case.
#include "../cli.hpp"
#include "../report.hpp"

namespace acidload_cli {
namespace {

struct ConvertOptions {
  std::string figure, case_file, species = "H2S", variant;
  std::vector<std::string> overlays;
};

ConvertOptions parse(const std::vector<std::string>& args) {
  ConvertOptions o;
  Options("convert")
      .positional("FIGURE", o.figure)
      .value("--case", o.case_file, "CASE")
      .value("--as", o.species, "SPECIES")
      .value("--variant", o.variant, "NAME")
      .values("--overlay", o.overlays, "FILE")
      .parse(args);
  if (o.case_file.empty()) throw UsageError("convert needs --case CASE for the gas the figure belongs to");
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const ConvertOptions o = parse(args);
  const acidload::io::CaseFile file = acidload::io::load_case(o.case_file, o.overlays);
  print_conversion(out, pick_variant(file, o.variant), o.figure, o.species);
  return exit_ok;
}

}  // namespace

extern const Command convert_command{
    "convert", "convert FIGURE", "a contaminant figure in every unit, for the gas of a case",
    "usage: acidload convert FIGURE --case CASE [--as SPECIES] [--variant NAME] [--overlay FILE]...\n\n"
    "Shows a contaminant FIGURE ('300 ppmv', '450 mg/Nm3 dry', '25 mg/MJ', …) in every unit for the\n"
    "fuel gas of CASE: ppmv and mg/Nm3 dry and wet, mg/MJ of LHV, mg per Nm3 of CH4, mol/h at the\n"
    "case's fuel flow. SPECIES: H2S (default), S (as sulfur), Cl, F, or a halocarbon by name or\n"
    "formula (then also its Cl and F content).\n",
    run};

}  // namespace acidload_cli
