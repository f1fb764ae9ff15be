#pragma once
// CSV rows streamed one at a time (internal to acidload::io; not installed): a record is read row
// by row into segments, with no table of cells and no copy of the file's lines kept.
#include <cstddef>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "acidload/io/csv.hpp"

namespace acidload::io::detail {

//! One data row: its cells (trimmed), the 1-based character column of each, its 1-based file line
//! and the line's text (for a caret).
using CsvRowSink = std::function<void(const std::vector<std::string>& cells, const std::vector<int>& columns, int line,
                                      std::string_view line_text)>;

//! Parses `text` as read_csv does, with the same checks and messages, handing each data row to
//! `sink` instead of keeping it. `header` gets the file name, the header, its line and columns, and
//! the file's lines up to the header's (`rows`, `lines`, `columns` stay empty). Returns the number
//! of data rows. A mistake in the file's form is thrown as parse_csv throws it; the sink's own
//! exceptions pass through.
std::size_t stream_csv(const std::string& text, const std::string& file_name, CsvTable& header, const CsvRowSink& sink,
                       std::size_t max_bytes = 64u << 20);

//! A cell's text as its node's scalar: a bare number gets the header's `unit` ("500" → "500 ppmv").
void cell_scalar(const std::string& cell, const std::string& unit, std::string& out);

}  // namespace acidload::io::detail
