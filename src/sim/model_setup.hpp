#pragma once
/// How a model is built from a run file. Each model specialises ModelSetup<M> in its own
/// sim/<model>_setup.hpp; the generic run loop (sim/runner.hpp), the initial conditions
/// and the boundaries only use these members:
///
///   static M make(const io::RunFile&, const CaseSetup&);
///        the model's parameters (reads the `model` section and anything model-specific)
///   static State primitive(const M&, const PlasmaPoint&, const CaseSetup&);
///        the primitive state of a plasma at one point
///   static bool perturb(const M&, const io::RunFile&, const CaseSetup&, Field<State>& W);
///        model-specific initial perturbations (e.g. an eigenmode); false if the
///        `initial.kind` is not one it handles
///   static std::vector<io::ParameterValue> parameters(const M&, const CaseSetup&);
///        resolved model parameters for the output file
///   static FluxKind flux(const io::RunFile&, const M&);
///        the numerical flux to use (resolving "auto", rejecting unavailable ones)
///
/// Optional (detected with HasCheckWarnings):
///   static std::vector<std::string> check_warnings(const M&, const CaseSetup&);
///        sentences `tubewave check` prints as warnings (a reduced light speed, a stiff
///        limit stepped past, an unresolved length, ...)
#include <concepts>
#include <string>
#include <vector>

#include "grid/grid.hpp"
#include "io/output.hpp"
#include "io/runfile.hpp"
#include "sim/case.hpp"

namespace tw {

template <class M>
struct ModelSetup;

template <class M>
concept HasCheckWarnings = requires(const M& m, const CaseSetup& c) {
  { ModelSetup<M>::check_warnings(m, c) } -> std::same_as<std::vector<std::string>>;
};

}  // namespace tw
