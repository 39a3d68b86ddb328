#pragma once
/// Running a case: the public entry points used by the command line and the tests.
#include <atomic>
#include <functional>
#include <string>
#include <vector>

#include "io/runfile.hpp"
#include "io/schema.hpp"

namespace tw {

/// The complete run-file schema (every component's keys).
const io::Schema& run_schema();

/// Load and validate a run file with overrides (ConfigError on bad input).
io::RunFile load_run_file(const std::string& path, const std::vector<std::string>& overrides = {});

/// Progress of a running case, reported now and then.
struct Progress {
  double t = 0, t_end = 0;      ///< simulated time and end [s]
  bool normalized = false;      ///< t, t_end and dt are in normalized units
  long step = 0;
  double dt = 0;                ///< last step [s]
  std::string limited_by;       ///< what set the last step
  double wall_seconds = 0;
  double cell_updates_per_second = 0;
  bool final = false;           ///< last report of the run
};

struct RunOptions {
  std::string output_override;                   ///< -o path ("" = from the run file)
  std::function<void(const Progress&)> progress;  ///< may be empty
  double progress_interval_s = 0.5;              ///< wall seconds between reports
  const std::atomic<bool>* stop = nullptr;        ///< set asynchronously to stop the run
  const std::atomic<int>* stop_signal = nullptr;  ///< the signal that set `stop` (0: none)
};

struct RunSummary {
  std::string outcome;           ///< "completed" | "failed" | "interrupted"
  std::string message;
  std::string output_file;
  long steps = 0;
  double t = 0;                  ///< simulated time reached [s]
  bool normalized = false;       ///< t is in normalized units
  double wall_seconds = 0;
  double cell_updates_per_second = 0;
  long snapshots = 0, probe_samples = 0;
  long checkpoints = 0;          ///< checkpoints written by this segment of the run
  std::string checkpoint_file;   ///< the checkpoint written when the run was stopped, else ""
  int restarts = 0;              ///< times the run was continued from a checkpoint
  std::vector<std::string> notes;  ///< one-line results worth printing (antenna powers, reflections)
};

/// Run a validated case and write its output file. Bad input in the model-dependent parts
/// throws ConfigError before anything is written; a failing run writes its last good
/// state and returns outcome "failed".
RunSummary run_case(const io::RunFile& rf, const RunOptions& options = {});

/// What `tubewave run --restart CHECKPOINT [FILE.yaml] [--set ...] [-o OUT]` was given.
struct RestartArgs {
  std::string checkpoint;
  std::string run_file;                ///< optional; must describe the checkpoint's case
  std::vector<std::string> overrides;  ///< may change only checkpoint.*, time.max_steps, ...
  std::string output;                  ///< the output to continue (default: as recorded)
};

/// Continue a run from a checkpoint, appending to its output (sim/checkpoint.hpp). A
/// checkpoint of another build, model or grid, or an output of another run, is refused with
/// InputError before anything is written.
RunSummary restart_case(const RestartArgs& args, const RunOptions& options = {});

/// What `tubewave check` reports, without running.
struct CheckReport {
  std::string model;
  int cells = 0;
  double dx = 0;
  double dt = 0;                          ///< first time step [s]
  std::string limited_by;
  std::vector<std::pair<std::string, double>> limits;  ///< every limit, scaled by the CFL number
  double t_end = 0;
  long estimated_steps = 0;
  double memory_bytes = 0;                ///< working arrays of the solver
  double output_bytes = 0;                ///< uncompressed size of the output datasets
  long snapshots = 0, probe_samples = 0, history_samples = 0;
  std::string output_file;
  std::vector<std::string> warnings;
};

CheckReport check_case(const io::RunFile& rf, const std::string& output_override = {});

}  // namespace tw
