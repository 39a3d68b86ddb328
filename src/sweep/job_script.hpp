#pragma once
/// `tubewave sweep SWEEP.yaml --job-script`: a job-array script for a cluster batch
/// scheduler, one array task per case, and the command that merges the tasks' results.
///
/// The script is bash with `#SBATCH` directives (the array-job syntax of a widely used
/// open-source scheduler; other schedulers take the same script after their own directive
/// lines are written in). Each task runs `tubewave sweep SWEEP --case N`: the case's run,
/// measurement and record, skipping a case that is already complete, so the array can be
/// submitted again after a failure or a time-out. `tubewave sweep SWEEP --merge` then
/// builds the summary from the case files.
#include <string>
#include <vector>

#include "sweep/schedule.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::sweep {

struct JobScriptOptions {
  std::string tubewave;                 ///< absolute path of the executable
  std::string sweep_file;               ///< absolute path of the sweep file
  std::vector<std::string> extra_args;  ///< --set and --output-dir given to this command
  int threads = 1;                      ///< OpenMP threads per task
  bool retry_failed = false;
};

/// "0-5,8,10-23": case indices as ranges for the array directive.
[[nodiscard]] std::string index_ranges(std::vector<std::size_t> indices);

/// The script's text for the given cases.
[[nodiscard]] std::string job_script_text(const Sweep& s, const std::vector<std::size_t>& cases,
                                          const JobScriptOptions& opt);

/// Single-quote a word for a POSIX shell.
[[nodiscard]] std::string shell_quote(const std::string& word);

}  // namespace tw::sweep
