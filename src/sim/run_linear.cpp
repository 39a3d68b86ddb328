// Running linearized cases: the generic run loop (sim/runner.hpp) for Linearized<M> of every
// model. Kept apart from run.cpp so the two sets of runner instantiations compile
// separately.
#include "sim/linear_setup.hpp"
#include "sim/runner.hpp"

namespace tw {

namespace {

template <class F>
auto dispatch_linearized(const io::RunFile& rf, CaseSetup c, F&& f) {
  if (c.equations == "mhd") {
    CaseRunner<Linearized<Mhd>> runner(rf, std::move(c));
    return f(runner);
  }
  if (c.equations == "hall") {
    CaseRunner<Linearized<HallMhd>> runner(rf, std::move(c));
    return f(runner);
  }
  if (c.equations == "two-fluid") {
    CaseRunner<Linearized<TwoFluid>> runner(rf, std::move(c));
    return f(runner);
  }
  rf.fail("model.equations", "model '" + c.equations + "' has no linearized form in this tubewave");
}

}  // namespace

RunSummary run_linearized(const io::RunFile& rf, CaseSetup c, const RunOptions& options, const RestartPlan* restart) {
  return dispatch_linearized(rf, std::move(c), [&](auto& runner) { return runner.run(options, restart); });
}

CheckReport check_linearized(const io::RunFile& rf, CaseSetup c) {
  return dispatch_linearized(rf, std::move(c), [&](auto& runner) { return runner.check(); });
}

}  // namespace tw
