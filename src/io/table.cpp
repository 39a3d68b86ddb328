#include "io/table.hpp"

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "io/text_util.hpp"

namespace tw::io {

namespace {

std::string trim(const std::string& s, std::size_t& offset) {
  const auto b = s.find_first_not_of(" \t\r");
  if (b == std::string::npos) {
    offset = s.size();
    return {};
  }
  const auto e = s.find_last_not_of(" \t\r");
  offset = b;
  return s.substr(b, e - b + 1);
}

/// Fields of one line with the 1-based column where each starts.
void split(const std::string& line, std::vector<std::string>& fields, std::vector<int>& cols) {
  fields.clear();
  cols.clear();
  std::size_t start = 0;
  while (true) {
    const auto comma = line.find(',', start);
    const std::string raw = line.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    std::size_t off = 0;
    fields.push_back(trim(raw, off));
    cols.push_back(static_cast<int>(start + off + 1));
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
}

}  // namespace

CsvTable CsvTable::read(const std::string& path, const std::string& key_path) {
  CsvTable t;
  t.file_ = path;
  t.key_ = key_path;
  std::ifstream in(path);
  if (!in) {
    SourcePos pos;
    pos.file = path;
    throw ConfigError(pos, key_path, "cannot open the table file '" + path + "'");
  }
  std::string line;
  int lineno = 0;
  std::vector<std::string> fields;
  std::vector<int> cols;
  while (std::getline(in, line)) {
    ++lineno;
    const auto hash = line.find('#');
    if (hash != std::string::npos) line.erase(hash);
    std::size_t off = 0;
    if (trim(line, off).empty()) continue;
    split(line, fields, cols);
    if (t.names_.empty()) {
      t.header_line_ = lineno;
      for (std::size_t k = 0; k < fields.size(); ++k) {
        if (fields[k].empty())
          throw ConfigError({path, lineno, cols[k], ""}, key_path,
                            "the header has an empty column name (column " + std::to_string(k + 1) + ")");
        real dummy = 0;
        if (detail::parse_real(fields[k], dummy) == detail::NumberParse::ok)
          throw ConfigError({path, lineno, cols[k], ""}, key_path,
                            "the first line must name the columns (got the number '" + fields[k] + "')");
        for (std::size_t j = 0; j < k; ++j)
          if (t.names_[j] == fields[k])
            throw ConfigError({path, lineno, cols[k], ""}, key_path, "column '" + fields[k] + "' appears twice");
        t.names_.push_back(fields[k]);
      }
      t.columns_.resize(t.names_.size());
      continue;
    }
    const std::size_t row = t.lines_.size() + 1;
    if (fields.size() != t.names_.size()) {
      std::ostringstream m;
      m << "row " << row << " has " << fields.size() << " values, but the header names "
        << t.names_.size() << " columns";
      throw ConfigError({path, lineno, 1, ""}, key_path, m.str());
    }
    for (std::size_t k = 0; k < fields.size(); ++k) {
      real v = 0;
      if (fields[k].empty())
        throw ConfigError({path, lineno, cols[k], ""}, key_path,
                          "row " + std::to_string(row) + ": column '" + t.names_[k] + "' is empty");
      if (detail::parse_real(fields[k], v) != detail::NumberParse::ok)
        throw ConfigError({path, lineno, cols[k], ""}, key_path,
                          "row " + std::to_string(row) + ": column '" + t.names_[k] + "': '" + fields[k] +
                              "' is not a finite number");
      t.columns_[k].push_back(v);
    }
    t.lines_.push_back(lineno);
    t.cols_.push_back(cols);
  }
  if (t.names_.empty()) throw ConfigError({path, 0, 0, ""}, key_path, "the table file is empty (no header line)");
  return t;
}

int CsvTable::find(const std::string& name) const {
  for (std::size_t k = 0; k < names_.size(); ++k)
    if (names_[k] == name) return static_cast<int>(k);
  return -1;
}

const std::vector<real>& CsvTable::column(const std::string& name) const {
  const int k = find(name);
  if (k < 0) {
    std::string have;
    for (const auto& n : names_) have += (have.empty() ? "" : ", ") + n;
    fail_header("missing column '" + name + "' (the header has: " + have + ")");
  }
  return columns_[static_cast<std::size_t>(k)];
}

void CsvTable::require_increasing(const std::string& name) const {
  const auto& c = column(name);
  const int k = find(name);
  for (std::size_t i = 1; i < c.size(); ++i)
    if (!(c[i] > c[i - 1])) {
      std::ostringstream m;
      m << "row " << i + 1 << ": column '" << name << "' must increase from row to row (" << c[i]
        << " follows " << c[i - 1] << ")";
      fail_row(i, k, m.str());
    }
}

void CsvTable::require_non_negative(const std::string& name, bool strict) const {
  const auto& c = column(name);
  const int k = find(name);
  for (std::size_t i = 0; i < c.size(); ++i)
    if (strict ? !(c[i] > 0) : c[i] < 0) {
      std::ostringstream m;
      m << "row " << i + 1 << ": column '" << name << "' must be " << (strict ? "> 0" : ">= 0")
        << " (got " << c[i] << ")";
      fail_row(i, k, m.str());
    }
}

void CsvTable::require_rows(std::size_t n) const {
  if (rows() < n) {
    std::ostringstream m;
    m << "the table needs at least " << n << " data rows (it has " << rows() << ")";
    fail_header(m.str());
  }
}

void CsvTable::fail_row(std::size_t row, int col, const std::string& reason) const {
  const int c = col >= 0 && row < cols_.size() ? cols_[row][static_cast<std::size_t>(col)] : 1;
  throw ConfigError({file_, row < lines_.size() ? lines_[row] : 0, c, ""}, key_, reason);
}

void CsvTable::fail_header(const std::string& reason) const {
  throw ConfigError({file_, header_line_, 1, ""}, key_, reason);
}

real interpolate(const std::vector<real>& xs, const std::vector<real>& ys, real x) {
  if (x <= xs.front()) return ys.front();
  if (x >= xs.back()) return ys.back();
  const auto it = std::upper_bound(xs.begin(), xs.end(), x);
  const std::size_t j = static_cast<std::size_t>(it - xs.begin());
  const real w = (x - xs[j - 1]) / (xs[j] - xs[j - 1]);
  return (1 - w) * ys[j - 1] + w * ys[j];
}

std::string path_beside(const std::string& run_file_name, const std::string& file) {
  const std::filesystem::path p(file);
  if (p.is_absolute()) return file;
  const std::filesystem::path dir = std::filesystem::path(run_file_name).parent_path();
  return (dir / p).lexically_normal().string();
}

}  // namespace tw::io
