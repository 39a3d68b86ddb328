#pragma once
/// Sweep files: a base run file, the run-file keys to vary, how their values combine, where
/// the cases go, and what to collect from each case. YAML with our own schema, validated by
/// the run-file machinery (io/schema.hpp, io/runfile.hpp) against a second schema, so errors
/// carry file:line:column and the key path, and unknown keys get the nearest valid one.
///
///     title: frequency scan of the Fenwick column
///     base: ../demo_column.yaml           # relative to this file's folder
///     output_dir: frequency_scan          # relative to this file's folder
///     combine: grid                       # or zip
///     set: [numerics.flux=hll]            # overrides for every case
///     parameters:
///       - key: boundaries.left.frequency
///         log: {from: 40.0e3, to: 320.0e3, count: 7}
///       - key: numerics.reconstruction
///         words: [plm, weno5]
///     measure:
///       - field: velocity_y
///         quantities: [wavelength, phase_speed]
///     predict:
///       - formula: hall-left
///         quantities: [wavelength, phase_speed]
///
/// Cases are `--set KEY=VALUE` overrides of the base run file, numbered in expansion order:
/// `combine: grid` takes every combination, the first parameter varying slowest
/// (parameters sharing a `group` name are zipped into one axis); `combine: zip` takes the
/// i-th value of every parameter for case i. Each case writes OUTPUT_DIR/cases/ID.h5.
#include <optional>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"

namespace tw::sweep {

/// The sweep-file schema (also the source of `tubewave sweep --keys`).
[[nodiscard]] const io::Schema& sweep_schema();

/// One varied run-file key and its values.
struct Parameter {
  std::string key;    ///< run-file key path
  std::string label;  ///< summary column name
  std::string group;  ///< grid mode: parameters of one group are zipped
  std::string unit;   ///< SI unit of the run-file key ("" for words and counts)
  bool numeric = true;               ///< numbers (values, linear, log) or words
  std::vector<real> numbers;
  std::vector<std::string> words;
  std::string path;                  ///< "parameters[j]" in the sweep file
  std::vector<std::string> value_paths;  ///< sweep-file key path of each value, for messages
  bool quote_words = false;          ///< the key is text: words are passed as quoted YAML
  [[nodiscard]] std::size_t size() const { return numeric ? numbers.size() : words.size(); }
  /// The i-th value as YAML text for --set (numbers in shortest round-trip form).
  [[nodiscard]] std::string yaml_value(std::size_t i) const;
  /// The i-th value for tables (numbers as in yaml_value, words as written).
  [[nodiscard]] std::string text(std::size_t i) const;
};

/// One `measure` entry: a field and the figures collected from it.
struct Measurement {
  std::string field;
  std::vector<std::string> quantities;
  std::optional<real> frequency, t_min, t_max, x_min, x_max;
};

/// One `predict` entry: a prediction source and the quantities taken from it.
struct Prediction {
  std::string formula;
  std::string given;  ///< auto | frequency | wavenumber
  std::optional<real> frequency, wavelength;
  std::vector<std::string> quantities;
};

/// One case: which value of each parameter, and the resulting overrides.
struct Case {
  std::size_t index = 0;
  std::string id;                         ///< "case-07"
  std::vector<std::size_t> value_index;   ///< per parameter
  std::vector<std::string> overrides;     ///< the sweep's extra --set, then KEY=VALUE per parameter
  /// "key=value, key=value" for messages and progress lines.
  [[nodiscard]] std::string describe(const std::vector<Parameter>& params) const;
};

/// Options from the command line.
struct LoadOptions {
  std::string output_dir;               ///< replaces output_dir ("" = from the file)
  std::vector<std::string> overrides;   ///< --set applied to every case
};

struct Sweep {
  io::RunFile file;                     ///< the sweep file as loaded (for messages)
  std::string path;                     ///< as given
  std::string title;
  std::string base;                     ///< base run file (resolved path)
  std::string output_dir;               ///< resolved path
  std::string combine;                  ///< grid | zip
  std::vector<Parameter> parameters;
  std::vector<Measurement> measure;
  std::vector<Prediction> predict;
  std::vector<std::string> overrides;   ///< the file's `set`, then --set: for every case
  std::size_t n_fixed = 0;              ///< how many of `overrides` come from the file's `set`
  std::vector<Case> cases;

  [[nodiscard]] std::string cases_dir() const;
  [[nodiscard]] std::string case_file(const Case& c) const;
  [[nodiscard]] std::string summary_csv() const;
  [[nodiscard]] std::string summary_h5() const;
  /// Canonical text of what is collected per case (measure and predict): a case whose
  /// record was made for another text is measured again (its run is kept).
  [[nodiscard]] std::string results_key() const;
  /// Rethrow a run-file error of case `c` (from loading or checking its run file) as an
  /// error of the sweep file: at the value of the parameter that caused it, or at `base`,
  /// with the case's values in the message.
  [[noreturn]] void fail_case(const Case& c, const io::ConfigError& e) const;
};

/// Load, validate and expand a sweep file. ConfigError (exit code 2) naming file:line, the
/// key and the reason for anything wrong in the file itself; run files are validated
/// separately (validate_cases in sweep_run.hpp).
[[nodiscard]] Sweep load_sweep(const std::string& path, const LoadOptions& options = {});

/// Most cases one sweep may expand to (a guard against a grid typed by mistake).
inline constexpr std::size_t max_cases = 1000000;

}  // namespace tw::sweep
