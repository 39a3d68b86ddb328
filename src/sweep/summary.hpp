#pragma once
/// The summary of a sweep: one row per case with its parameters, measured and predicted
/// figures, status and wall time, written as OUTPUT_DIR/summary.csv and summary.h5 (each
/// atomically: a temporary file renamed over the old one).
///
/// CSV: one header row, then one row per case in case order. Columns: index, id, status,
/// one per parameter (by label), `measured/FIELD/Q` and `measured/FIELD/Q_uncertainty` per
/// measured figure, `predicted/SOURCE/Q` per predicted figure, wall_seconds, steps,
/// threads, run_file_hash, output (relative to the output folder), message. Numbers in
/// shortest round-trip form; "nan" where there is no value. Fields with a comma, quote or
/// line break are quoted (RFC 4180).
///
/// HDF5 (every dataset [cases]; numbers with "units" and "description"):
///   /                         attributes format = "tubewave-sweep", format_version, title,
///                             sweep_file, base_run_file, combine, created,
///                             tubewave_version, cases, completed, failed, not_run,
///                             session_wall_seconds (NaN for --merge)
///   /cases/index, id, status, message, output, run_file_hash, wall_seconds, steps, threads
///   /parameters/LABEL         values (numbers with the run-file key's unit, or strings);
///                             attribute key
///   /measured/FIELD/Q, Q_uncertainty
///   /predicted/SOURCE/Q
#include <string>
#include <vector>

#include "sweep/case_run.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::sweep {

struct SummaryInfo {
  double session_wall_seconds = -1;  ///< wall time of this sweep session (< 0: unknown, e.g. --merge)
};

/// The records to summarise: for each case, its file's record when it describes the
/// case's present run file (`plans[i].run_hash`), else this session's record of it (a
/// failure that could not be recorded, an interrupted case), else "not run".
[[nodiscard]] std::vector<CaseRecord> gather_records(const Sweep& s, const std::vector<CasePlan>& plans,
                                                     const std::vector<CaseRecord>& session);

/// Write summary.csv and summary.h5 into the sweep's output folder (which must exist).
void write_summary(const Sweep& s, const std::vector<CaseRecord>& records, const SummaryInfo& info);

}  // namespace tw::sweep
