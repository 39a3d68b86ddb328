#pragma once
/// Building Hall MHD from a run file: its `model` keys (electron closure, electron inertia,
/// Hall stepping; the MHD keys via read_mhd_fluid), its state from a plasma, the exact
/// circularly polarised wave, its /parameters and its `tubewave check` warnings.
#include <string>
#include <vector>

#include "models/hall.hpp"
#include "sim/model_setup.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Keys of the `model` section that only Hall MHD reads.
void declare_hall_keys(io::Schema& schema);

/// Their names (under `model.`), for rejecting them in other models' runs.
inline std::vector<std::string> hall_only_keys() { return {"electron_closure", "electron_inertia", "hall_stepping"}; }

template <>
struct ModelSetup<HallMhd> {
  using State = HallMhd::State;
  static HallMhd make(const io::RunFile& rf, const CaseSetup& c);
  static State primitive(const HallMhd& m, const PlasmaPoint& p, const CaseSetup& c);
  static bool perturb(const HallMhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W);
  static std::vector<io::ParameterValue> parameters(const HallMhd& m, const CaseSetup& c);
  static FluxKind flux(const io::RunFile& rf, const HallMhd& m);
  static std::vector<std::string> check_warnings(const HallMhd& m, const CaseSetup& c);
};

}  // namespace tw
