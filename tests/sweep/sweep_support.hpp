#pragma once
/// Helpers for the sweep tests: a tiny driven column as the base run file (a case runs in
/// a few tens of milliseconds), sweep files written into scratch folders, and the summary
/// CSV read back.
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "support/test_support.hpp"

namespace tw::test {

/// A 16 m helium column (invented, as the demo's) in a 0.1 T field, 64 cells, driven at
/// its left end; a shear Alfven wave of about 9 m wavelength at 100 kHz.
inline const char* tiny_column_yaml() {
  return R"(title: tiny driven column for sweep tests
model: {equations: mhd}
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 16.0, cells: 64}
time: {end: 2.0e-5}
boundaries:
  left: {kind: driven, velocity_amplitude: 2000.0, frequency: 100.0e3, polarization: y, ramp_periods: 2}
  right: {kind: zero-gradient}
output: {snapshot_interval: 4.0e-7, probe_interval: 1.0e-7, probes: [2.0, 6.0, 10.0]}
)";
}

/// Write the tiny column as base.yaml and `sweep_text` as sweep.yaml into `dir`.
inline std::filesystem::path write_sweep(const ScratchDir& dir, const std::string& sweep_text) {
  write_text(dir / "base.yaml", tiny_column_yaml());
  write_text(dir / "sweep.yaml", sweep_text);
  return dir / "sweep.yaml";
}

/// A CSV file as rows of fields (RFC 4180 quoting), the header first.
inline std::vector<std::vector<std::string>> read_csv(const std::filesystem::path& p) {
  std::ifstream in(p);
  std::stringstream ss;
  ss << in.rdbuf();
  const std::string t = ss.str();
  std::vector<std::vector<std::string>> rows(1);
  std::string field;
  bool quoted = false;
  for (std::size_t i = 0; i < t.size(); ++i) {
    const char c = t[i];
    if (quoted) {
      if (c == '"' && i + 1 < t.size() && t[i + 1] == '"') {
        field += '"';
        ++i;
      } else if (c == '"') {
        quoted = false;
      } else {
        field += c;
      }
    } else if (c == '"') {
      quoted = true;
    } else if (c == ',') {
      rows.back().push_back(field);
      field.clear();
    } else if (c == '\n') {
      rows.back().push_back(field);
      field.clear();
      rows.emplace_back();
    } else {
      field += c;
    }
  }
  if (rows.back().empty()) rows.pop_back();
  return rows;
}

/// The index of a CSV column by name (-1 if absent).
inline int column(const std::vector<std::vector<std::string>>& csv, const std::string& name) {
  for (std::size_t k = 0; k < csv.at(0).size(); ++k)
    if (csv[0][k] == name) return static_cast<int>(k);
  return -1;
}

/// How many times `what` occurs in `text`.
inline int occurrences(const std::string& text, const std::string& what) {
  int n = 0;
  for (std::size_t p = text.find(what); p != std::string::npos; p = text.find(what, p + what.size())) ++n;
  return n;
}

}  // namespace tw::test
