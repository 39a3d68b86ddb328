#pragma once
/// Building the MHD model from a run file: the `model` keys it reads, its state from a
/// plasma, and its eigenmode initial condition (`initial.kind: wave`).
#include <vector>

#include "models/mhd.hpp"
#include "sim/model_setup.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Keys of the `model` section read by MHD (closure, gamma, resistivity, viscosity) and
/// the `initial` keys of its wave kind.
void declare_mhd_keys(io::Schema& schema);

/// The closure and dissipation keys, shared by every single-fluid model.
void read_mhd_fluid(const io::RunFile& rf, const CaseSetup& c, Mhd& m);

template <>
struct ModelSetup<Mhd> {
  using State = Mhd::State;
  static Mhd make(const io::RunFile& rf, const CaseSetup& c);
  static State primitive(const Mhd& m, const PlasmaPoint& p, const CaseSetup& c);
  static bool perturb(const Mhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W);
  static std::vector<io::ParameterValue> parameters(const Mhd& m, const CaseSetup& c);
  static FluxKind flux(const io::RunFile& rf, const Mhd& m);
};

/// The initial kinds MHD adds to `initial.kind`.
inline std::vector<std::string> mhd_initial_kinds() { return {"wave"}; }

/// Names of the linear MHD waves and the index of each, travelling forward (+x) or
/// backward, in the ascending list of the seven characteristic speeds
/// u-c_f, u-c_a, u-c_s, u, u+c_s, u+c_a, u+c_f.
int mhd_mode_index(const std::string& mode, bool forward);

/// The seven characteristic speeds and primitive eigenvectors of MHD at W (numerical
/// Jacobian; see models/eigen_modes.hpp). For the isothermal closure the pressure slot is
/// eliminated and its eigenvector entry is filled from the density entry.
struct ModeSet primitive_modes_mhd(const Mhd& m, const Mhd::State& W);

}  // namespace tw
