#pragma once
/// Numeric tables from CSV files (profiles along x, tabulated drive waveforms).
///
/// Format: an optional block of comment lines starting with '#' and blank lines, then a
/// header line of column names separated by commas, then one row of numbers per line, the
/// same count as the header. Spaces around fields are ignored; '#' starts a comment
/// anywhere. Numbers are plain decimal or exponent forms ("1.5e18"); anything else (a word,
/// an empty field, inf, nan) is rejected.
///
/// Every error is a ConfigError (exit code 2) located at the file, line and column of the
/// offending field, naming the run-file key that referred to the table and, for data, the
/// row number (1 = first data row) and the column name.
#include <string>
#include <vector>

#include "core/types.hpp"
#include "io/runfile.hpp"

namespace tw::io {

class CsvTable {
 public:
  /// Read `path`. `key_path` (the run-file key naming the file) goes into messages.
  static CsvTable read(const std::string& path, const std::string& key_path);

  [[nodiscard]] const std::string& file() const { return file_; }
  [[nodiscard]] const std::string& key_path() const { return key_; }
  [[nodiscard]] const std::vector<std::string>& names() const { return names_; }
  [[nodiscard]] std::size_t rows() const { return lines_.size(); }
  /// Index of a column, or -1.
  [[nodiscard]] int find(const std::string& name) const;
  /// The values of a column; ConfigError (at the header) naming the missing column and the
  /// columns present if there is none of that name.
  [[nodiscard]] const std::vector<real>& column(const std::string& name) const;

  /// ConfigError unless the column increases strictly from row to row (names the row).
  void require_increasing(const std::string& name) const;
  /// ConfigError at the first negative (or, with `strict`, non-positive) value.
  void require_non_negative(const std::string& name, bool strict = false) const;
  /// ConfigError unless there are at least n rows.
  void require_rows(std::size_t n) const;

  /// Throw a ConfigError located at a data row (0-based) and column.
  [[noreturn]] void fail_row(std::size_t row, int col, const std::string& reason) const;
  /// Throw a ConfigError located at the header line.
  [[noreturn]] void fail_header(const std::string& reason) const;

 private:
  std::string file_, key_;
  std::vector<std::string> names_;
  std::vector<std::vector<real>> columns_;
  std::vector<int> lines_;                ///< file line of each data row
  std::vector<std::vector<int>> cols_;    ///< column (1-based character) of each field
  int header_line_ = 0;
};

/// Linear interpolation in a table of increasing x (at least two points); x outside the
/// range is clamped to the end values (callers check coverage first).
real interpolate(const std::vector<real>& xs, const std::vector<real>& ys, real x);

/// `file` as written in a run file, relative to the directory of the run file
/// `run_file_name` (absolute paths are kept).
std::string path_beside(const std::string& run_file_name, const std::string& file);

}  // namespace tw::io
