// libFuzzer harness for the case reader: arbitrary bytes go to the YAML reader, to the quantity
// parsers (every scalar of the tree, as every kind), to the CSV reader and, when the case-file
// reader is in the tree, to load_case_text. acidload::Error is the only exception allowed out of
// the library on bad input; anything else escaping (std::exception or other), a crash, a leak, an
// AddressSanitizer or UndefinedBehaviorSanitizer report, or a hang is a finding.
// Build and run with tests/fuzz/run (see there).
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "acidload/core/error.hpp"
#include "acidload/io/csv.hpp"
#include "acidload/io/document.hpp"
#include "acidload/io/key_checks.hpp"
#include "acidload/io/quantity.hpp"

#if __has_include("acidload/io/case_file.hpp")
#include "acidload/io/case_file.hpp"
#define ACIDLOAD_FUZZ_CASE_FILE 1
#endif

namespace {

using namespace acidload::io;

constexpr Kind kinds[] = {Kind::temperature, Kind::temperature_change, Kind::power, Kind::volume, Kind::mass,
                          Kind::molar_flow, Kind::fraction, Kind::acid_number, Kind::specific_consumption,
                          Kind::duration, Kind::pressure, Kind::density, Kind::per_hour, Kind::oxidation,
                          Kind::oxidation_rate, Kind::molar_energy, Kind::count, Kind::number};

// Reads every scalar as every kind; the messages are built (what()) to exercise their formatting.
std::size_t walk(const Document& doc, const Node& n, int budget) {
  std::size_t chars = n.path.size();
  if (budget <= 0) return chars;
  if (n.type == Node::Type::scalar) {
    for (Kind k : kinds) {
      try {
        quantity(doc, n, k);
      } catch (const acidload::Error& e) {
        chars += std::string_view(e.what()).size();
      }
    }
    try {
      concentration(doc, n, acidload::Basis::dry);
    } catch (const acidload::Error& e) {
      chars += std::string_view(e.what()).size();
    }
  }
  if (n.type == Node::Type::map) {
    try {
      require_keys(doc, n, {"format-version", "engine", "fuel", "oil"});
    } catch (const acidload::Error& e) {
      chars += std::string_view(e.what()).size();
    }
  }
  for (const auto& item : n.items) chars += walk(doc, item, budget - 1);
  for (const auto& entry : n.entries) chars += walk(doc, entry.second, budget - 1);
  return chars;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  volatile std::size_t sink = 0;
  try {
    const Document doc = parse_document(text, "fuzz.yaml");
    sink = sink + walk(doc, doc.root, 64);
  } catch (const acidload::Error& e) {
    sink = sink + std::string_view(e.what()).size();
  }
  try {
    const CsvTable t = parse_csv(text, "fuzz.csv");
    if (!t.rows.empty()) sink = sink + std::string_view(t.error(0, 0, "x").what()).size();
  } catch (const acidload::Error& e) {
    sink = sink + std::string_view(e.what()).size();
  }
#ifdef ACIDLOAD_FUZZ_CASE_FILE
  try {
    const CaseFile c = load_case_text(text, "fuzz.yaml", ".");
    sink = sink + c.variants.size();
  } catch (const acidload::Error& e) {
    sink = sink + std::string_view(e.what()).size();
  }
#endif
  return 0;
}
