#pragma once
/// Writing a table of columns to a new HDF5 file, atomically: the file is written as
/// "PATH.tmp.<pid>" and renamed over PATH when complete, so a reader sees the old table or
/// the new one, never half of one (used for sweep summaries).
///
/// Each column is a 1-D dataset at an absolute path ("/cases/status",
/// "/measured/velocity_y/phase_speed"); missing groups are created with their link
/// creation order tracked, so members list in the order written. Numeric columns are
/// float64 with the CF "units" attribute and a "description"; text columns are
/// variable-length UTF-8 strings with a "description". Root attributes are strings or
/// float64.
///
/// Errors: RunError naming the file, the operation and the object (exit code 1).
#include <string>
#include <utility>
#include <vector>

#include "core/types.hpp"

namespace tw::io {

struct TableColumn {
  std::string path;                 ///< absolute dataset path
  bool text = false;                ///< strings (texts) or numbers (reals)
  std::vector<real> reals;
  std::vector<std::string> texts;
  std::string units;                ///< numbers only ("1" for dimensionless)
  std::string description;
  std::vector<std::pair<std::string, std::string>> attributes;  ///< extra string attributes
};

struct TableFile {
  std::vector<std::pair<std::string, std::string>> text_attributes;  ///< on the root group
  std::vector<std::pair<std::string, real>> real_attributes;         ///< on the root group
  std::vector<TableColumn> columns;
};

/// Write `table` to `path` (replacing an existing file by a rename). The folder must exist.
void write_table_file(const std::string& path, const TableFile& table);

}  // namespace tw::io
