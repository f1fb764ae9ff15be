#include "fit_common.hpp"

#include "acidload/io/lab_file.hpp"
#include "acidload/studies/parameters.hpp"

namespace acidload_cli {

Options& fit_options(Options& p, FitOptions& o) {
  return p.positional("CASE", o.case_file)
      .value("--lab", o.lab, "FILE")
      .value("--parameters", o.parameters, "KEY[,KEY…]")
      .value("--precision", o.precision, "READING=SD[,…]")
      .value("--variant", o.variant, "NAME")
      .values("--overlay", o.overlays, "FILE");
}

void require_fit_options(const char* command, const FitOptions& o) {
  if (o.lab.empty()) throw UsageError(std::string(command) + " needs --lab FILE with the lab results");
}

namespace {
// The figures --precision states (the others fall to the case's lab section and the defaults).
acidload::PrecisionSetting precision_from(const std::string& text) {
  acidload::PrecisionSetting p;
  for (const std::string& item : split_list(text)) {
    const auto eq = item.find('=');
    if (eq == std::string::npos) throw UsageError("--precision '" + item + "': expected READING=SD, e.g. tan=0.1");
    const std::string k = item.substr(0, eq);
    const double v = quantity_option(item.substr(eq + 1), acidload::io::Kind::number, "--precision");
    if (!(v > 0 && v < 1e3)) throw UsageError("--precision '" + item + "': a standard deviation above 0");
    if (k == "tbn") p.tbn_d2896 = p.tbn_d4739 = v;
    else if (k == "tbn-d2896") p.tbn_d2896 = v;
    else if (k == "tbn-d4739") p.tbn_d4739 = v;
    else if (k == "tan") p.tan = v;
    else if (k == "san") p.san = v;
    else if (k == "oxidation") p.oxidation = v;
    else if (k == "nitration") p.nitration = v;
    else throw UsageError("--precision '" + k + "': one of tbn, tbn-d2896, tbn-d4739, tan, san, oxidation, nitration");
  }
  return p;
}
}  // namespace

FitRun fit_case(const FitOptions& o) {
  FitRun r;
  acidload::FitSettings settings;
  settings.parameters = split_list(o.parameters);
  if (!o.parameters.empty() && settings.parameters.empty()) throw UsageError("--parameters '" + o.parameters + "': no key in it");
  const acidload::PrecisionSetting call = o.precision.empty() ? acidload::PrecisionSetting{} : precision_from(o.precision);
  for (const std::string& k : settings.parameters) acidload::parameter(k);  // unknown keys: bad input with the list
  r.file = acidload::io::load_case(o.case_file, o.overlays);
  r.variant = &pick_variant(r.file, o.variant);
  // precedence: a row's *-sd > --precision > the case's lab entry > lab.precision > the defaults
  acidload::resolve_precision(settings, r.file.lab, call);
  std::vector<acidload::LabSample> samples = acidload::io::read_lab_samples(o.lab, &r.lab_notes);
  acidload::apply_lab_baselines(samples, r.file.lab);
  const ProgressLine progress("fitting " + std::to_string(settings.parameters.size()) + " parameter(s)");
  r.fit = acidload::calibrate(*r.variant, samples, settings);
  return r;
}

}  // namespace acidload_cli
