// Spelling suggestions: see acidload/io/suggestions.hpp.
#include "acidload/io/suggestions.hpp"

#include <algorithm>

namespace acidload::io {

namespace {
std::string to_lower(std::string_view s) {
  std::string r(s);
  for (char& c : r)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  return r;
}
}  // namespace

std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diag = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t up = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diag = up;
    }
  }
  return row[b.size()];
}

std::string closest(std::string_view word, const std::vector<std::string>& candidates) {
  const std::string w = to_lower(word);
  const std::size_t limit = std::max<std::size_t>(2, w.size() / 3);
  std::string best;
  std::size_t best_d = limit + 1;
  for (const auto& c : candidates) {
    const std::size_t d = edit_distance(w, to_lower(c));
    if (d < best_d) {
      best_d = d;
      best = c;
    }
  }
  return best;
}

}  // namespace acidload::io
