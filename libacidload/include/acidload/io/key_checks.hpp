#pragma once
// Key validation for a map of a parsed YAML document: only the keys a section takes.
#include <string>
#include <vector>

#include "acidload/io/document.hpp"

namespace acidload::io {

//! Checks that a map holds only `allowed` keys; an unknown key throws at its position, listing the
//! valid keys and the closest one. A non-map node throws "expected a map of …".
void require_keys(const Document& doc, const Node& map, const std::vector<std::string>& allowed);

}  // namespace acidload::io
