#pragma once
// Numbers and strings as the result writers put them in JSON and CSV (internal to acidload::io; not
// installed): summary.json, economics.json, fleet summaries, summary.csv and trajectories.csv.
#include <cmath>
#include <cstdio>
#include <string>

namespace acidload::io::detail {

//! A number in JSON: 10 significant figures; null where it is not finite (no limit reached, …).
inline std::string json_number(double v) {
  if (!std::isfinite(v)) return "null";
  char b[32];
  std::snprintf(b, sizeof b, "%.10g", v);
  return b;
}

//! A JSON string: quotes and backslashes escaped, control characters as \u00NN.
inline std::string json_string(const std::string& s) {
  std::string o = "\"";
  for (char ch : s) {
    if (ch == '"' || ch == '\\') o += '\\', o += ch;
    else if (static_cast<unsigned char>(ch) < 0x20) {
      char b[8];
      std::snprintf(b, sizeof b, "\\u%04x", ch);
      o += b;
    } else o += ch;
  }
  return o + "\"";
}

//! A CSV field (RFC 4180): quoted, with doubled quotes, when it holds a comma, a quote or a line end.
inline std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n\r") == std::string::npos) return s;
  std::string o = "\"";
  for (char ch : s) o += ch == '"' ? std::string("\"\"") : std::string(1, ch);
  return o + "\"";
}

//! A number in a CSV cell: 10 significant figures; an empty cell where it is not finite.
inline std::string csv_number(double v) { return std::isfinite(v) ? json_number(v) : std::string(); }

}  // namespace acidload::io::detail
