#pragma once
/// Linearized runs (`model.form: linearized`) and the dispersion input of `tubewave modes`,
/// for every model: MHD, Hall MHD and two-fluid.
///
/// The background is the run's plasma (sim/plasma.hpp): its profiles of density and
/// temperatures along x, evaluated at every cell centre and face, so any profile the
/// `plasma` section can describe is a linearized background. Each point gets the model's
/// local parameters (isothermal sound speeds of the local temperatures) and its
/// linearization (models/linear_form.hpp); the grid's LinearSystem is built once.
///
/// Keys: `model.perpendicular_wavenumber` (k_perp [1/m], linearized form only) and the
/// initial kind `eigenmode` (with `initial.mode_number`, `wavelength`, `amplitude`,
/// `direction`): the eigenvector of branch N of the dispersion relation at k = 2 pi /
/// wavelength, for a uniform background. The nonlinear models' initial kinds also work:
/// their perturbation of the background (a nonlinear state minus the background) is the
/// linear initial state (real amplitudes).
#include <string>
#include <vector>

#include "models/dispersion.hpp"
#include "models/hall_linear.hpp"
#include "models/linearized.hpp"
#include "models/mhd_linear.hpp"
#include "models/twofluid_linear.hpp"
#include "sim/checkpoint.hpp"
#include "sim/model_setup.hpp"
#include "sim/plasma.hpp"
#include "sim/run.hpp"

namespace tw {

/// Keys only linearized runs read (model.perpendicular_wavenumber, initial.mode_number).
void declare_linear_keys(io::Schema& schema);
/// Initial kinds only linearized runs have.
inline std::vector<std::string> linear_initial_kinds() { return {"eigenmode"}; }
/// Refuse the linear-only keys and kinds when the form is nonlinear (ConfigError naming the key).
void reject_linear_keys(const io::RunFile& rf);

template <class M>
struct ModelSetup<Linearized<M>> {
  using L = Linearized<M>;
  using State = typename L::State;
  static L make(const io::RunFile& rf, const CaseSetup& c);
  /// The perturbation of the background at a point: zero (initial kinds add theirs).
  static State primitive(const L& m, const PlasmaPoint& p, const CaseSetup& c);
  static bool perturb(const L& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W);
  static std::vector<io::ParameterValue> parameters(const L& m, const CaseSetup& c);
  static FluxKind flux(const io::RunFile& rf, const L& m);
  static std::vector<std::string> check_warnings(const L& m, const CaseSetup& c);
};

/// The linearization of the run's model at position x for `tubewave modes` (the plasma
/// there taken as uniform), with perpendicular wavenumber k_perp [1/m].
DispersionInput dispersion_input(const io::RunFile& rf, const CaseSetup& c, real x, real k_perp);

/// Names of the primitive variables of the run's model's linear form (the entries of
/// WaveMode::vector), with units.
std::vector<VariableInfo> linear_variables(const std::string& equations);

/// Run and check linearized cases (sim/run_linear.cpp); called by run_case, restart_case
/// and check_case when model.form is linearized. `restart` continues from a checkpoint.
RunSummary run_linearized(const io::RunFile& rf, CaseSetup c, const RunOptions& options,
                          const RestartPlan* restart = nullptr);
CheckReport check_linearized(const io::RunFile& rf, CaseSetup c);

}  // namespace tw
