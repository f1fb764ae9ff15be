// Merging overlays and variants over a case tree (case_reader.hpp).
#include <algorithm>

#include "case_reader.hpp"

namespace acidload::io::detail {

void set_source(Node& n, int source) {
  n.source = source;
  for (auto& i : n.items) set_source(i, source);
  for (auto& e : n.entries) set_source(e.second, source);
}

void merge_layer(Node& into, const Node& from, const std::string& section) {
  if (into.type != Node::Type::map || from.type != Node::Type::map) {
    into = from;
    return;
  }
  for (std::size_t i = 0; i < from.entries.size(); ++i) {
    const auto& [key, value] = from.entries[i];
    const std::string path = section.empty() ? key : section + "." + key;
    // the layer names one key of a pair: the base's partner goes (unless the layer sets both,
    // which the section reader refuses as usual)
    if (const CaseKey* k = find_case_key(path); k && !k->alternative.empty() && !from.find(k->alternative)) {
      for (std::size_t j = 0; j < into.entries.size(); ++j)
        if (into.entries[j].first == k->alternative) {
          into.entries.erase(into.entries.begin() + static_cast<std::ptrdiff_t>(j));
          if (j < into.key_marks.size()) into.key_marks.erase(into.key_marks.begin() + static_cast<std::ptrdiff_t>(j));
          break;
        }
    }
    bool found = false;
    for (auto& [k, v] : into.entries)
      if (k == key) {
        merge_layer(v, value, path);
        found = true;
        break;
      }
    if (!found) {
      into.entries.emplace_back(key, value);
      into.key_marks.push_back(from.key_marks.size() > i ? from.key_marks[i] : value.mark);
    }
  }
}

}  // namespace acidload::io::detail
