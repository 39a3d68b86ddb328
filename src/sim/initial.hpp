#pragma once
/// Initial states shared by every model, built from the background plasma:
///
///   uniform  — the background everywhere;
///   riemann  — two constant states meeting at `position` (shock tubes); each side may
///              override the background's density (or mass density), pressure (or
///              temperatures), velocity and transverse field.
///
/// Model-specific kinds (an MHD eigenmode, an exact circularly polarised wave, ...) are
/// handled by ModelSetup<M>::perturb after the background is laid down.
#include <string>
#include <vector>

#include "grid/grid.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "sim/case.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Initial kinds of this file; models add theirs to the same choice list.
void declare_initial_keys(io::Schema& schema, const std::vector<std::string>& model_kinds);

/// The plasma at the centre of every interior cell for the generic kinds. For a model
/// kind the background is returned and the model adds its perturbation.
std::vector<PlasmaPoint> initial_plasma(const io::RunFile& rf, const CaseSetup& c);

}  // namespace tw
