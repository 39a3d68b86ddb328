#include "sim/run.hpp"

#include "sim/case.hpp"
#include "sim/checkpoint.hpp"
#include "sim/drives.hpp"
#include "sim/hall_setup.hpp"
#include "sim/initial.hpp"
#include "sim/linear_setup.hpp"
#include "sim/mhd_setup.hpp"
#include "sim/runner.hpp"
#include "sim/twofluid_setup.hpp"

namespace tw {

namespace {

/// The model catalogue: the `model.equations` and `model.form` choices. A new model adds
/// its name here, its keys in build_schema() and a branch in dispatch().
const std::vector<std::string>& equation_names() {
  static const std::vector<std::string> n{"mhd", "hall", "two-fluid"};
  return n;
}
const std::vector<std::string>& form_names() {
  static const std::vector<std::string> n{"nonlinear", "linearized"};
  return n;
}

io::Schema build_schema() {
  io::Schema s;
  io::Section& model = s.root().section("model", "which equations are solved");
  model.choice("equations", equation_names(),
               "the model: ideal/resistive MHD (mhd), Hall MHD (hall), or ion and electron fluids with "
               "Maxwell's equations (two-fluid)")
      .def("mhd");
  model.choice("form", form_names(),
               "full nonlinear equations, or linear perturbations about the background (complex amplitudes, "
               "with model.perpendicular_wavenumber)")
      .def("nonlinear");
  declare_case_keys(s);
  declare_checkpoint_keys(s);
  declare_drive_keys(s);
  std::vector<std::string> kinds = mhd_initial_kinds();
  for (const auto& k : twofluid_initial_kinds()) kinds.push_back(k);
  for (const auto& k : linear_initial_kinds()) kinds.push_back(k);
  declare_initial_keys(s, kinds);
  declare_mhd_keys(s);
  declare_hall_keys(s);
  declare_twofluid_keys(s);
  declare_linear_keys(s);
  return s;
}

/// Runs f(runner) for the run's model; the linearized form goes to `linear(c)`
/// (sim/run_linear.cpp).
template <class F, class G>
auto dispatch(const io::RunFile& rf, CaseSetup c, F&& f, G&& linear) {
  c.equations = rf.get_string("model.equations");
  c.form = rf.get_string("model.form");
  if (c.equations != "hall")
    for (const auto& k : hall_only_keys())
      if (rf.given("model." + k)) rf.fail("model." + k, "only the hall model takes '" + k + "'");
  if (c.equations != "two-fluid") reject_two_fluid_keys(rf, c.equations);
  reject_linear_keys(rf);
  if (c.form == "linearized") return linear(std::move(c));
  if (c.equations == "mhd") {
    CaseRunner<Mhd> runner(rf, std::move(c));
    return f(runner);
  }
  if (c.equations == "hall") {
    CaseRunner<HallMhd> runner(rf, std::move(c));
    return f(runner);
  }
  if (c.equations == "two-fluid") {
    CaseRunner<TwoFluid> runner(rf, std::move(c));
    return f(runner);
  }
  rf.fail("model.equations", "model '" + c.equations + "' is not built into this tubewave");
}

}  // namespace

const io::Schema& run_schema() {
  static const io::Schema s = build_schema();
  return s;
}

io::RunFile load_run_file(const std::string& path, const std::vector<std::string>& overrides) {
  return io::RunFile::load(path, run_schema(), overrides);
}

RunSummary run_case(const io::RunFile& rf, const RunOptions& options) {
  return dispatch(rf, read_case(rf, options.output_override), [&](auto& runner) { return runner.run(options); },
                  [&](CaseSetup c) { return run_linearized(rf, std::move(c), options); });
}

RunSummary restart_case(const RestartArgs& args, const RunOptions& options) {
  RestartRequest req;
  req.checkpoint = args.checkpoint;
  req.run_file = args.run_file;
  req.overrides = args.overrides;
  req.output_override = args.output;
  const RestartPlan plan = plan_restart(req, run_schema());
  return dispatch(plan.run_file, read_case(plan.run_file, plan.output_file),
                  [&](auto& runner) { return runner.run(options, &plan); },
                  [&](CaseSetup c) { return run_linearized(plan.run_file, std::move(c), options, &plan); });
}

CheckReport check_case(const io::RunFile& rf, const std::string& output_override) {
  return dispatch(rf, read_case(rf, output_override), [&](auto& runner) { return runner.check(); },
                  [&](CaseSetup c) { return check_linearized(rf, std::move(c)); });
}

}  // namespace tw
