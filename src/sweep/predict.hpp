#pragma once
/// Analytic predictions for the cases of a sweep: what a dispersion relation says a case's
/// measured figures should be, so the summary holds theory beside measurement.
///
/// A prediction comes from a named source. The closed forms (predict.cpp) are the branches
/// of scripts-post/twdispersion.py, ported with the same ids, formulas and sources:
/// `mhd-fast`, `mhd-alfven`, `mhd-slow`, `mhd-alfven-resistive`, `hall-right`, `hall-left`.
/// Each gives omega(k) (complex: Im omega = -gamma) from the case's background; a source is
/// asked either at the frequency of a driven run (the complex k with omega(k) = omega, by
/// Newton's method) or at the wavenumber of an initial-value run.
///
/// The hook for numerical eigenmodes: any function of the case can be a source (it gets the
/// background, the case's resolved run file and its output). `modes_prediction_sources()`
/// (predict_modes.cpp) returns the sources backed by `tubewave modes`; it is the one place
/// to connect that command's library (see the comment there).
///
/// Units are those of the run: SI, or the code units of a normalized run.
#include <complex>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "io/h5read.hpp"
#include "io/runfile.hpp"

namespace tw::sweep {

using cplx = std::complex<real>;

/// The background a prediction starts from, read from a finished case file the way the
/// post-processing reads it (scripts-post/twrun.py, Run.background()): every scalar under
/// /parameters by name, and "initial_mean_FIELD", the mean over the tube of each snapshot
/// field at the first snapshot (t = 0).
struct Background {
  std::map<std::string, real> values;
  bool normalized = false;  ///< code units
  /// The value, or `fallback` when the file has none (e.g. hall_coefficient of an MHD run).
  [[nodiscard]] real get(const std::string& name, real fallback) const;
  /// The value; InputError naming the missing name when the file has none.
  [[nodiscard]] real need(const std::string& name) const;
};

[[nodiscard]] Background read_background(const io::H5Reader& h, bool normalized);

/// The quantities a prediction (and a measurement) can give, in a fixed order.
[[nodiscard]] const std::vector<std::string>& wave_quantities();
/// SI unit of a quantity ("1" in a normalized run).
[[nodiscard]] std::string quantity_unit(const std::string& quantity, bool normalized);

/// What a source is asked.
struct PredictionInput {
  const Background& bg;
  const io::RunFile* run = nullptr;  ///< the case's resolved run file
  std::string case_file;             ///< the case's output file
  std::optional<real> omega;         ///< angular frequency [rad/s] of a driven run
  std::optional<real> k;             ///< wavenumber [rad/m] of an initial-value run
};

/// quantity name -> value. Quantities a source does not give are absent (NaN in tables).
using PredictionValues = std::map<std::string, real>;

/// A named source of predictions.
struct PredictionSource {
  std::string id;
  std::string description;  ///< one line, with its source
  std::function<PredictionValues(const PredictionInput&)> predict;
};

/// Every source: the closed forms, then modes_prediction_sources(). Built once; safe to
/// read from several threads.
[[nodiscard]] const std::vector<PredictionSource>& prediction_sources();
[[nodiscard]] const PredictionSource* find_prediction_source(const std::string& id);
/// The sources backed by `tubewave modes` (predict_modes.cpp; empty until that lands).
[[nodiscard]] std::vector<PredictionSource> modes_prediction_sources();

/// Complex omega(k) of a closed-form branch (InternalError for an unknown id): exposed for
/// the tests, which check it against the validation sheet's values.
[[nodiscard]] cplx closed_form_omega(const std::string& id, const Background& bg, cplx k);

/// A closed form at a given real wavenumber k > 0 / real angular frequency omega > 0
/// (same quantities as twdispersion.given_wavenumber / given_frequency).
[[nodiscard]] PredictionValues closed_form_given_wavenumber(const std::string& id, const Background& bg, real k);
[[nodiscard]] PredictionValues closed_form_given_frequency(const std::string& id, const Background& bg, real omega);

}  // namespace tw::sweep
