#pragma once
// A YAML document read into our own tree, every node with its 1-based position, with the checks
// yaml-cpp does not make: duplicate keys, nesting depth and file size are errors.
#include <cstddef>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "acidload/core/error.hpp"

namespace acidload::io {

//! A 1-based position in a file.
struct Mark {
  int line = 0;
  int column = 0;
};

//! A node of the tree.
struct Node {
  enum class Type { null, scalar, sequence, map };
  Type type = Type::null;
  std::string scalar;                            //!< the text of a scalar (as written, unquoted)
  bool quoted = false;                           //!< the scalar was quoted in the file (or a | or > block)
  std::vector<Node> items;                       //!< a sequence's items
  std::vector<std::pair<std::string, Node>> entries;  //!< a map's entries in file order (keys are scalars)
  std::vector<Mark> key_marks;                   //!< position of each map key, parallel to `entries`
  Mark mark;                                     //!< position of the node itself
  std::string path;                              //!< key path from the root: "engine.blow-by", "variants[1].name" (list indices 0-based; "" is the root, shown as "(top level)")
  int source = 0;                                //!< which document of a merged tree it came from (set by the merger)
  const Node* find(std::string_view key) const;  //!< a map entry, or nullptr
};

//! Caps that keep a hostile or broken file from exhausting the reader.
struct ReadLimits {
  std::size_t max_bytes = 4 << 20;  //!< larger files are refused [bytes]
  int max_depth = 24;               //!< deeper nesting is refused
  std::size_t max_nodes = 200000;   //!< more nodes are refused
};

//! A parsed file: its name, its lines (for error carets) and its tree.
struct Document {
  std::string file;                //!< as given by the user
  std::vector<std::string> lines;  //!< the text, split into lines (no line ends)
  int first_line = 1;              //!< the file line `lines` starts at (a window of a long file)
  Node root;
  //! An InputError at `at`, naming its key path, the value shown and what was expected, with the
  //! file, line, column and the offending line with a caret.
  InputError error(const Node& at, std::string value, std::string expected) const;
  //! The same at an explicit position and key path.
  InputError error(Mark at, std::string key, std::string value, std::string expected) const;
};

//! Parses YAML text. Syntax errors, duplicate keys (in any map), non-scalar map keys, anchors and
//! aliases, too-deep nesting, too many nodes and oversized text throw InputError with the position;
//! so do explicit tags, a second document, text that is not UTF-8 or holds control characters, and
//! key paths over 512 characters. Empty text (or comments only) gives a root of Type::null: the
//! caller decides whether that is an error.
Document parse_document(std::string_view text, std::string file_name, const ReadLimits& limits = {});
//! Reads and parses a file; a missing or unreadable file is an InputError naming it.
Document read_document(const std::string& path, const ReadLimits& limits = {});

// Spelling suggestions: acidload/io/suggestions.hpp; key validation: acidload/io/key_checks.hpp.

}  // namespace acidload::io
