#pragma once
/// What a finished run's own resolved run file says about how to measure it: probe
/// positions, periodic ends, the drive frequency, code units. Shared by `tubewave measure`
/// and `tubewave sweep`, which measure runs the same way.
#include <string>
#include <vector>

#include "diagnostics/run_measure.hpp"
#include "io/h5read.hpp"

namespace tw::diag {

/// Read the layout from /provenance/resolved_run_file of `h` with this build's run-file
/// schema. Keys this build does not declare, or a file that does not read with this
/// version, leave the layout partly unknown; the reason is appended to `notes` (nothing
/// throws for that).
[[nodiscard]] RunLayout read_run_layout(const io::H5Reader& h, std::vector<std::string>& notes);

}  // namespace tw::diag
