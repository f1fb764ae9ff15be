// acidload report CASE --out REPORT.html: one self-contained HTML page of the case's results.
#include "../cli.hpp"
#include "../report.hpp"
#include "acidload/io/report.hpp"
#include "acidload/studies/parameters.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload_cli {
namespace {

struct ReportOptions {
  std::string case_file, out, lab, parameters;
  std::vector<std::string> overlays;
};

ReportOptions parse(const std::vector<std::string>& args) {
  ReportOptions o;
  Options("report")
      .positional("CASE", o.case_file)
      .values("--overlay", o.overlays, "FILE")
      .value("--lab", o.lab, "FILE")
      .value("--parameters", o.parameters, "KEY[,KEY…]")
      .value("--out", o.out, "REPORT.html")
      .parse(args);
  if (o.out.empty()) throw UsageError("report needs --out REPORT.html");
  if (!o.parameters.empty() && o.lab.empty()) throw UsageError("--parameters goes with --lab FILE");
  return o;
}

int run(const std::vector<std::string>& args, std::FILE* out) {
  const ReportOptions o = parse(args);
  const acidload::io::CaseFile c = acidload::io::load_case(o.case_file, o.overlays);
  acidload::io::ReportOptions ro;
  ro.lab_file = o.lab;
  if (!o.parameters.empty()) {
    ro.parameters = split_list(o.parameters);
    for (const std::string& k : ro.parameters) acidload::parameter(k);  // unknown keys: bad input with the list
  }
  std::vector<acidload::VariantSummary> rows;
  for (const auto& v : c.variants) rows.push_back(acidload::summarize(v));
  const acidload::io::ReportData d = acidload::io::gather_report(c, rows, ro);
  acidload::io::write_report(o.out, acidload::io::report_html(d), acidload::io::report_inputs(c, o.lab));  // built whole before anything is replaced
  std::fprintf(out, "Report written to %s (%zu variant(s)%s)\n", o.out.c_str(), rows.size(),
               d.lab ? ", with the lab results" : "");
  print_caution(out);
  return exit_ok;
}

}  // namespace

extern const Command report_command{
    "report", "report CASE", "one self-contained HTML page: comparison, plots, inputs, cautions (--out FILE)",
    "usage: acidload report CASE --out REPORT.html [--lab FILE [--parameters KEY[,KEY…]]] [--overlay FILE]...\n\n"
    "Writes one self-contained HTML page (inline CSS and SVG, no scripts, nothing fetched: it opens from a\n"
    "USB stick and prints on A4): cautions and warnings, the comparison of the variants, TBN, TAN, SAN and\n"
    "oxidation against oil hours with the limits and each drain interval, the drain interval against H2S,\n"
    "acid into the oil by species, every input marked given, default, fitted or overlay, the model's\n"
    "assumptions, the acidload version and the SHA-256 of each input file (docs/report.md).\n"
    "  --lab FILE         also the lab readings of FILE against the model fitted to them (parameters\n"
    "                     model.liner-uptake,model.oxidation-rate unless --parameters names others), with\n"
    "                     a 90 % band; a fit the data cannot support is reported on the page, not drawn\n"
    "  --out REPORT.html  the page; written to a temporary file and renamed. An existing file is replaced\n"
    "                     only if it is an acidload report (exit code 3 otherwise, the file left as it was).\n",
    run};

}  // namespace acidload_cli
