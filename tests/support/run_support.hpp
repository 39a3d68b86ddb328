#pragma once
/// Running run files from the tests and reading their output back.
#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "sim/run.hpp"
#include "support/test_support.hpp"

namespace tw::test {

/// A finished run and its output, read back from the HDF5 file.
struct RunOutput {
  RunSummary summary;
  std::string file;
  std::vector<double> x;                                   ///< cell centres
  std::vector<double> snapshot_times;
  std::map<std::string, std::vector<double>> first, last;  ///< first and last snapshot
  std::map<std::string, std::vector<double>> history;      ///< history columns and "time"
  std::map<std::string, std::vector<double>> probes;       ///< [n_t * n_probes], and "time"
  std::size_t n_probes = 0;
};

/// Run `config` (a path relative to the source tree, or absolute) with overrides, writing
/// into `dir`; the output is read back completely.
RunOutput run_config(const std::string& config, std::vector<std::string> overrides,
                     const ScratchDir& dir, const std::string& name = "run.h5");

/// Same, from run-file text.
RunOutput run_text(const std::string& yaml, std::vector<std::string> overrides,
                   const ScratchDir& dir, const std::string& name = "run.h5");

/// L1 norm of a - b per unit length: sum |a_i - b_i| dx.
double l1_difference(const std::vector<double>& a, const std::vector<double>& b, double dx);

/// Observed order of convergence from errors at h and h/2.
inline double observed_order(double e_coarse, double e_fine) { return std::log2(e_coarse / e_fine); }

}  // namespace tw::test
