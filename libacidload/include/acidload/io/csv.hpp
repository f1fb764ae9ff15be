#pragma once
// CSV tables (operating records, lab results): a header row, then data rows; comma-separated,
// double quotes for fields with commas; lines starting with '#' are comments.
#include <cstddef>
#include <string>
#include <vector>

#include "acidload/core/error.hpp"
#include "acidload/io/document.hpp"

namespace acidload::io {

struct CsvTable {
  std::string file;                              //!< as given
  std::vector<std::string> header;               //!< column names, trimmed
  int header_line = 0;                           //!< 1-based file line of the header
  std::vector<int> header_columns;               //!< 1-based character column of each header cell
  std::vector<std::vector<std::string>> rows;    //!< cells, trimmed; every row has header.size() cells
  std::vector<int> lines;                        //!< 1-based file line of each row
  std::vector<std::vector<int>> columns;         //!< 1-based character column where each cell starts
  std::vector<std::string> text;                 //!< the file's lines, for carets
  //! Index of a column by name, or −1.
  int column(const std::string& name) const;
  //! An InputError at a cell: file:line:col, key = the column's header, the cell's text, the expectation.
  InputError error(std::size_t row, std::size_t col, std::string expected) const;
};

//! Column names and units of a table whose headers may carry a unit in brackets ("h2s [ppmv]").
struct NamedColumns {
  std::vector<std::string> names;  //!< the names, without the unit
  std::vector<std::string> units;  //!< the units, "" where the header gives none
};
//! Splits every header; a name not in `allowed` throws at the header line, listing the names and
//! the closest one; so does a name given twice, in other units ("h2s [ppmv]" and "h2s [mg/Nm3]"). `what` names the table in the message ("record column", "lab column").
NamedColumns named_columns(const CsvTable& t, const std::vector<std::string>& allowed, const std::string& what);
//! A cell as a scalar node (position, key path `path_prefix[row].name`); a bare number gets `unit`.
Node cell_node(const CsvTable& t, std::size_t row, std::size_t col, const std::string& name, const std::string& unit,
               const std::string& path_prefix);

//! Reads a CSV file. Missing file, empty file, no data rows, a row with the wrong number of cells,
//! an unterminated quote, a duplicate column name or a file over `max_bytes` throw InputError with
//! the file, line and column.
CsvTable read_csv(const std::string& path, std::size_t max_bytes = 64u << 20);
//! Parses CSV text (as read_csv, without the file system).
CsvTable parse_csv(const std::string& text, const std::string& file_name, std::size_t max_bytes = 64u << 20);

}  // namespace acidload::io
