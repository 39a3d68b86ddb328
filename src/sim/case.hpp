#pragma once
/// The model-independent part of a run, resolved from a run file: units, plasma, grid,
/// time, numerics, ends and output. Each piece declares its own run-file keys here.
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "grid/grid.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "numerics/fv_operator.hpp"
#include "sim/plasma.hpp"
#include "time/stepper.hpp"

namespace tw {

/// One end of the tube as given in the run file. The keys of driven and open ends are
/// read where the end is built (sim/drives.hpp, sim/drive_setup.hpp).
struct EndSpec {
  std::string kind;             ///< periodic | zero-gradient | conducting | driven | open
  std::string key;              ///< run-file path of this end, for messages and its keys
};

/// Output cadence and probes.
struct OutputSpec {
  std::string file;             ///< final output path
  real snapshot_interval = 0;   ///< [s]
  real probe_interval = 0;      ///< [s]
  real history_interval = 0;    ///< [s]
  std::vector<real> probes;     ///< probe positions [m]
};

struct CaseSetup {
  std::string title;
  std::string equations;        ///< mhd | ...
  std::string form;             ///< nonlinear | ...
  UnitSystem units;
  PlasmaSpec plasma;
  Grid grid;
  real t_end = 0;
  long max_steps = 0;
  SpatialScheme scheme;
  TimeControl time;
  EndSpec left, right;
  OutputSpec output;
};

/// Declare the keys of every model-independent section.
void declare_case_keys(io::Schema& schema);

/// Resolve the model-independent sections. `output_override` replaces output.file
/// (the -o option); the default output name is the run file's stem + ".h5".
/// Cross-key checks (both ends periodic, probes inside the tube, ...) raise ConfigError.
CaseSetup read_case(const io::RunFile& rf, const std::string& output_override = {});

/// Numerical flux to use: "auto" resolves to the most accurate flux the model offers.
FluxKind resolve_flux(const io::RunFile& rf, bool hlld_available, bool upwind_available);

}  // namespace tw
