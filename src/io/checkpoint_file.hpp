#pragma once
/// The checkpoint file: everything a run needs to continue, bit for bit, as if it had never
/// stopped. This header knows the HDF5 layout; what goes into the data and how a run is
/// rebuilt from it is sim/checkpoint.hpp's business.
///
/// Layout (HDF5, format "tubewave-checkpoint", format_version 1):
///
///   /                      attributes: format, format_version, complete (1, set last),
///                          created (UTC ISO 8601), tubewave_version, git_revision, reason,
///                          model, run_id, n_vars, n_cells, x_min [m], length [m]
///   /run_file/text         the run file as read (string); /run_file/name, /run_file/resolved
///                          (YAML with defaults filled in), /run_file/output_file (absolute
///                          path of the run output); /run_file/overrides/0, 1, ... (--set)
///   /loop                  attributes: t [s], step, t_snap_last [s], wall_seconds, restarts
///   /state/conserved       float64 [n_cells, n_vars]: conservative variables of the interior
///                          cells in the model's own variables and units
///   /cadences              int64 attributes: index of the next output time of each cadence
///   /counters              int64 attributes: counts shown in the run's summary
///   /series_rows           int64 attributes: rows of each output series at the checkpoint
///   /accumulators/NAME     float64 [k]: time integrals and sums carried by the run (the
///                          boundary-flux integrals of the Stepper, diagnostics)
///   /drives/NAME           float64 [k]: internal state of drives that have one
///
/// Every real is stored as float64 exactly as held in memory, so a continued run starts from
/// the same bits. Writing is atomic: the file is built under a temporary name and renamed over
/// the previous checkpoint only when complete, so a crash at any moment leaves the previous
/// checkpoint intact.
#include <map>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw::io {

/// Version of the layout above; a reader refuses any other.
inline constexpr int checkpoint_format_version = 1;

struct CheckpointData {
  // Identity. write_checkpoint_file stores this build's version and revision; reading gives
  // back what the file holds.
  std::string tubewave_version;
  std::string git_revision;
  std::string reason;  ///< why it was written, e.g. "signal SIGTERM", "simulated-time interval"
  std::string model;   ///< model and form, e.g. "mhd (nonlinear)"
  int n_vars = 0;
  int n_cells = 0;
  real x_min = 0;   ///< [m]
  real length = 0;  ///< [m]
  std::string run_id;  ///< the run output's run_id

  // The case.
  std::string run_file_name;
  std::string run_file_text;
  std::string resolved_run_file;
  std::vector<std::string> overrides;
  std::string output_file;  ///< absolute path of the run output

  // The time loop.
  real t = 0;             ///< simulated time [s]
  long step = 0;          ///< steps taken
  real t_snap_last = -1;  ///< time of the last snapshot written [s]
  double wall_seconds = 0;  ///< wall time used by the run so far, all segments [s]
  int restarts = 0;         ///< times the run was continued before this checkpoint
  std::vector<real> state;  ///< [n_cells * n_vars], cell-major
  std::map<std::string, long> cadences;
  std::map<std::string, long> counters;
  std::map<std::string, std::size_t> series_rows;
  std::map<std::string, std::vector<real>> accumulators;
  std::map<std::string, std::vector<real>> drives;
};

/// Write `data` to `path` atomically (see above). Names in the maps must be usable as HDF5
/// link names (no '/'). Throws RunError on failure; the previous file at `path` is kept.
void write_checkpoint_file(const std::string& path, const CheckpointData& data);

/// Read a checkpoint. Throws InputError (exit code 2) when `path` is missing, not HDF5, not a
/// checkpoint (a run output, say), of another format version, or incomplete.
CheckpointData read_checkpoint_file(const std::string& path);

}  // namespace tw::io
