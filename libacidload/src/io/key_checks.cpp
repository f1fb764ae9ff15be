// Key validation: see acidload/io/key_checks.hpp.
#include "acidload/io/key_checks.hpp"

#include <algorithm>

#include "acidload/io/suggestions.hpp"
#include "text.hpp"

namespace acidload::io {

void require_keys(const Document& doc, const Node& map, const std::vector<std::string>& allowed) {
  const std::string section = map.path.empty() ? "(top level)" : map.path;
  if (map.type != Node::Type::map)
    throw doc.error(map, detail::describe(map), "a map of the keys of " + section + ": " + detail::join(allowed));
  for (std::size_t i = 0; i < map.entries.size(); ++i) {
    const std::string& key = map.entries[i].first;
    if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
    std::string expected = "one of the keys of " + section + ": " + detail::join(allowed);
    const std::string near = closest(key, allowed);
    if (!near.empty()) expected += " (closest: '" + near + "')";
    const Mark at = i < map.key_marks.size() ? map.key_marks[i] : map.mark;
    throw doc.error(at, map.path.empty() ? key : map.path + "." + key, key, expected);
  }
}

}  // namespace acidload::io
