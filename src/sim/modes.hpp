#pragma once
/// The library part of `tubewave modes`: the run file a dispersion query stands on, from a
/// run file or from plasma flags, and its linearization (sim/linear_setup.hpp,
/// models/dispersion.hpp). The command itself (src/cli/cmd_modes.cpp) only parses options and
/// prints.
#include <optional>
#include <string>
#include <vector>

#include "core/plasma_params.hpp"
#include "io/runfile.hpp"
#include "models/dispersion.hpp"
#include "sim/case.hpp"

namespace tw {

/// A uniform plasma as a run file of the given model (`equations`: mhd, hall, two-fluid),
/// so that the model options come from the same keys and defaults as a run (`overrides`
/// are --set KEY=VALUE pairs, e.g. model.resistivity=1e-4). `ion` is a species name, or
/// "" to give the ion by its mass. Messages name the source "plasma flags".
io::RunFile plasma_run_file(const PlasmaInput& in, const std::string& ion, const std::string& equations,
                            real field_angle_deg, const std::vector<std::string>& overrides);

/// What a dispersion query needs: the model, the background's linearization at x, the
/// names of the primitive variables and, for SI runs, the derived plasma parameters there.
struct ModesSetup {
  std::string equations;                  ///< mhd, hall, two-fluid
  DispersionInput input;
  std::vector<VariableInfo> variables;
  std::optional<PlasmaParameters> plasma;  ///< SI runs with B > 0
  PlasmaInput plasma_input;               ///< n_e, B, masses, temperatures at x (SI runs)
  real x = 0;                             ///< where along the tube [m]
  real field_angle_deg = 0;
  bool normalized = false;                ///< the run's code units (lengths, times as typed)
};

/// The setup at position x (default: x_min) with perpendicular wavenumber k_perp (default:
/// the run's model.perpendicular_wavenumber for linearized runs, else 0).
ModesSetup modes_setup(const io::RunFile& rf, std::optional<real> x, std::optional<real> k_perp);

}  // namespace tw
