#pragma once
/// One case of a sweep: validating its run file, deciding whether it must run (resume),
/// running it, measuring it, predicting, and recording the result in its own file.
///
/// The record (the completion mark) is the group /sweep of the case's HDF5 file, written
/// with the case's measurements (/measurements/FIELD, as `tubewave measure` stores them) in
/// one atomic copy-and-rename after the run ends (io::replace_groups):
///
///   /sweep                       attributes: format = "tubewave-sweep-case", case_id,
///                                case_index, status ("completed" | "failed"), message,
///                                run_file_hash, results_hash, wall_seconds, steps,
///                                threads, finished (UTC), sweep_file, overrides,
///                                tubewave_version
///   /sweep/measured/FIELD/Q      scalar [units]; attributes uncertainty (one sigma), method
///   /sweep/predicted/SOURCE/Q    scalar [units]; attribute description
///
/// `run_file_hash` is the FNV-1a 64-bit hash of the case's resolved run file (the base file
/// with the case's overrides and every default filled in, as stored in
/// /provenance/resolved_run_file), so a case is skipped only when it would run exactly
/// the same; `results_hash` covers the sweep's measure and predict entries, so changing
/// those measures the finished runs again without rerunning them.
#include <atomic>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::sweep {

/// One figure in a record: measured (with its uncertainty) or predicted.
struct Quantity {
  std::string name;  ///< "FIELD/QUANTITY" or "SOURCE/QUANTITY"
  real value = std::numeric_limits<real>::quiet_NaN();
  real uncertainty = std::numeric_limits<real>::quiet_NaN();
  std::string units;
  std::string method;  ///< how it was obtained, or why not
};

/// What the summary holds for a case.
struct CaseRecord {
  std::size_t index = 0;
  std::string id;
  std::string status = "not run";  ///< completed | failed | interrupted | not run
  std::string message;
  double wall_seconds = std::numeric_limits<double>::quiet_NaN();  ///< run + measurement
  long steps = 0;
  int threads = 0;
  std::string run_hash, results_hash;
  std::string output;  ///< the case file
  std::vector<Quantity> measured, predicted;
  std::string finished;  ///< UTC time the record was made
  bool recorded = false;  ///< the record is in the case file
};

/// What a case needs before the sweep starts.
struct CasePlan {
  enum class State { to_run, done, failed, remeasure };
  State state = State::to_run;
  std::string run_hash;
  double cost = 1;        ///< estimated cost (cells x steps x model factor), for scheduling and ETA
  CaseRecord record;      ///< the case file's record, when it has a valid one
  std::string why;        ///< why it runs ("no output yet", "the run file changed", ...)
};

/// FNV-1a 64-bit hash as 16 hex digits (change detection, not security).
[[nodiscard]] std::string fnv1a_hex(std::string_view text);

/// Load and validate every case's run file (and, with `check`, build each case as
/// `tubewave check` does: model-dependent checks and the cost estimate). Errors are
/// rethrown as errors of the sweep file (Sweep::fail_case). Then read each case file's
/// record to decide what must run. Nothing is written.
[[nodiscard]] std::vector<CasePlan> plan_cases(const Sweep& s, bool check);
/// The same for one case.
[[nodiscard]] CasePlan plan_case(const Sweep& s, const Case& c, bool check);

/// The record in a case file, if it has one that reads; nullopt otherwise.
[[nodiscard]] std::optional<CaseRecord> read_record(const std::string& file);

struct CaseOptions {
  int threads = 1;                          ///< OpenMP threads of this case
  const std::atomic<bool>* stop = nullptr;  ///< set to interrupt the case
  bool measure_only = false;                ///< the run is complete: measure and record again
};

/// Run (or only measure) one case and record the result in its file. Never throws for a
/// failing case: the record says "failed" with the reason; an interrupted case is not
/// recorded (it runs again next time). Safe to call from several threads at once for
/// different cases.
[[nodiscard]] CaseRecord run_one_case(const Sweep& s, const Case& c, const std::string& run_hash,
                                      const CaseOptions& opt);

}  // namespace tw::sweep
