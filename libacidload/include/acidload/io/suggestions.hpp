#pragma once
// Spelling suggestions for a name the user mistyped (a key, a column, a unit): the edit distance
// and the closest of the accepted names.
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace acidload::io {

//! Levenshtein distance: insertions, deletions and substitutions, one each (case-sensitive).
std::size_t edit_distance(std::string_view a, std::string_view b);

//! The candidate closest to `word` by edit distance (case-insensitive), or "" when none is close
//! (distance more than a third of the word's length, at least 2).
std::string closest(std::string_view word, const std::vector<std::string>& candidates);

}  // namespace acidload::io
