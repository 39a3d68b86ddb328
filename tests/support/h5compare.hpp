#pragma once
/// Bitwise comparison of two run outputs, for restart and thread-count tests.
#include <string>
#include <vector>

namespace tw::test {

/// Every numeric dataset of `a` outside /provenance and /status, compared bit for bit with
/// the dataset of the same path in `b` (shape and every value's bits; -0.0 differs from 0.0,
/// NaN payloads count). Returns one line per difference ("/snapshots/density: value 17
/// differs"), and one per dataset only one file has; empty when they agree. Also returns how
/// many datasets were compared through `compared`, so a test can require a non-trivial
/// comparison.
std::vector<std::string> bitwise_differences(const std::string& a, const std::string& b,
                                             int* compared = nullptr);

/// True when every value the run wrote as it went is finite: every dataset of every series
/// (a group with a `time` dataset: snapshots, probes, history, budget, ...) and the grid.
/// The summaries written after the run (/antennas, /regions) are left out: they hold NaN by
/// design where a figure does not apply (README). `where` receives the first dataset
/// holding a non-finite value.
bool all_finite(const std::string& file, std::string* where = nullptr);

}  // namespace tw::test
