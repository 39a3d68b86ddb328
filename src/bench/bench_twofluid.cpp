// Benchmark (not a test): the two-fluid model's cost.
//
//   ./build/src/bench_twofluid [--repeat R] [--quick]
//
// 1. Cell-updates per second of the two-fluid step (PLM (MC) + HLL per fluid + exact upwind
//    Maxwell flux + SSP-RK2, with the Strang-split implicit source), on a periodic box
//    holding a large-amplitude circularly polarised wave (normalized units, m_i/m_e = 100,
//    c/v_A = 10), 4096 and 65536 cells, 1 and all threads, best of R repetitions. A
//    cell-update is one cell advanced by one full step.
// 2. Cost per simulated Alfvén transit on one case, an invented laboratory column: He+,
//    n_e = 1e18 m^-3, T_e = 5 eV, T_i = 1 eV, B = 0.1 T along a 10 m tube of 1000 cells,
//    conducting ends, uniform (the work per step does not depend on the state). Models: two-fluid at the physical
//    light speed, at c = 10 v_A, and at c = 10 v_A with m_i/m_e = 100; ideal MHD (HLLD) for
//    comparison; Hall MHD when a build has it (model.equations: hall). Each run goes
//    through the ordinary run-file path (setup, stepper, output at the start and end only)
//    for a fixed number of steps; the cost per transit is wall time per step times the
//    steps a transit L/v_A takes (the step is constant here).
// Prints JSON on stdout.
#include <omp.h>
#include <unistd.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/runfile.hpp"
#include "models/twofluid.hpp"
#include "numerics/fv_operator.hpp"
#include "sim/run.hpp"
#include "sim/runner.hpp"
#include "sim/twofluid_setup.hpp"
#include "time/stepper.hpp"
#include "tubewave/version.hpp"

using namespace tw;
namespace fs = std::filesystem;

namespace {

fs::path scratch() {
  static const fs::path d = [] {
    fs::path p = fs::temp_directory_path() / ("tubewave-bench-twofluid-" + std::to_string(::getpid()));
    fs::create_directories(p);
    return p;
  }();
  return d;
}

io::RunFile load_text(const std::string& name, const std::string& yaml, const std::vector<std::string>& set = {}) {
  const fs::path f = scratch() / (name + ".yaml");
  std::FILE* out = std::fopen(f.c_str(), "w");
  std::fputs(yaml.c_str(), out);
  std::fclose(out);
  return load_run_file(f.string(), set);
}

// --- 1. throughput ----------------------------------------------------------------------

double throughput_once(int n, int steps) {
  const std::string yaml =
      "units: normalized\n"
      "normalized: {ion_inertial_length: 1.0, light_speed: 10, mass_ratio: 100}\n"
      "model: {equations: two-fluid}\n"
      "plasma: {density: 1, field: 1, electron_temperature: 0.05, ion_temperature: 0.05}\n"
      "grid: {length: 6.283185307179586, cells: " + std::to_string(n) + "}\n"
      "time: {end: 1}\n"
      "initial: {kind: circular, branch: right, amplitude: 0.2}\n"
      "boundaries: {left: {kind: periodic}, right: {kind: periodic}}\n";
  const io::RunFile rf = load_text("throughput", yaml);
  CaseRunner<TwoFluid> runner(rf, read_case(rf, (scratch() / "t.h5").string()));
  const TwoFluid m = runner.model();
  Field<TwoFluid::State> U = runner.state();
  const Grid g(n, 0.0, 6.283185307179586);
  auto periodic = std::make_shared<PeriodicBoundary<TwoFluid>>();
  Stepper<TwoFluid> stepper(FvOperator<TwoFluid>(g, {Reconstruction::plm, Limiter::mc, FluxKind::hll}, periodic, periodic),
                            TimeControl{0.8, 1e30, IntegratorKind::ssp_rk2});
  double t = 0;
  t += stepper.step(m, U, t, 1e30, "none").dt;  // warm-up
  const auto t0 = std::chrono::steady_clock::now();
  for (int s = 0; s < steps; ++s) t += stepper.step(m, U, t, 1e30, "none").dt;
  const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  return static_cast<double>(n) * steps / wall;
}

// --- 2. cost per Alfvén transit -----------------------------------------------------------

struct TransitCase {
  const char* label;
  std::string model;  // the `model` section
};

constexpr const char* kColumn =
    "plasma: {ion: He, density: 1.0e18, electron_temperature: 5, ion_temperature: 1, field: 0.1}\n"
    "grid: {length: 10.0, cells: 1000}\n"
    "boundaries: {left: {kind: conducting}, right: {kind: conducting}}\n";

}  // namespace

int main(int argc, char** argv) {
  int repeat = 3;
  bool quick = false;
  for (int a = 1; a < argc; ++a) {
    if (std::strcmp(argv[a], "--repeat") == 0 && a + 1 < argc) repeat = std::atoi(argv[++a]);
    if (std::strcmp(argv[a], "--quick") == 0) quick = true;
  }
  try {
    const int all = omp_get_max_threads();
    std::vector<int> threads{1};
    if (all > 1) threads.push_back(all);
    std::printf("{\n  \"benchmark\": \"two-fluid model: throughput and cost per Alfven transit\",\n");
    std::printf("  \"tubewave_version\": \"%s\", \"git\": \"%s\", \"compiler\": \"%s\", \"build_type\": \"%s\",\n",
                build::version, build::git_revision, build::compiler, build::build_type);
    std::printf("  \"throughput\": [\n");
    bool first = true;
    for (int n : {4096, 65536}) {
      const int s = quick ? (n <= 4096 ? 20 : 4) : (n <= 4096 ? 200 : 20);
      for (int th : threads) {
        omp_set_num_threads(th);
        double best = 0;
        for (int r = 0; r < repeat; ++r) best = std::max(best, throughput_once(n, s));
        std::printf("%s    {\"cells\": %d, \"threads\": %d, \"steps\": %d, \"best_of\": %d, \"cell_updates_per_second\": %.4g}",
                    first ? "" : ",\n", n, th, s, repeat, best);
        first = false;
      }
    }
    std::printf("\n  ],\n");

    omp_set_num_threads(1);
    // v_A of the column (rho incl. electrons) and the reduced light speed 10 v_A.
    const real m_i = 4.002602 * constants::u - constants::m_e;
    const real v_a = 0.1 / std::sqrt(constants::mu0 * 1e18 * (m_i + constants::m_e));
    const real transit = 10.0 / v_a;
    char reduced[64];
    std::snprintf(reduced, sizeof reduced, "%.6g", 10 * v_a);
    const std::vector<TransitCase> cases{
        {"two-fluid, physical c", "model: {equations: two-fluid}\n"},
        {"two-fluid, c = 10 v_A", std::string("model: {equations: two-fluid, light_speed: ") + reduced + "}\n"},
        {"two-fluid, c = 10 v_A, m_i/m_e = 100",
         std::string("model: {equations: two-fluid, light_speed: ") + reduced + ", mass_ratio: 100}\n"},
        {"ideal MHD (HLLD)", "model: {equations: mhd}\n"},
        {"Hall MHD", "model: {equations: hall}\n"},
    };
    std::printf("  \"alfven_transit\": {\"case\": \"He+ 1e18 m^-3, 0.1 T, 10 m, 1000 cells, 1 thread\", "
                "\"v_A_m_per_s\": %.5g, \"transit_s\": %.5g, \"runs\": [\n",
                v_a, transit);
    first = true;
    for (const auto& c : cases) {
      const std::string yaml = c.model + kColumn + "time: {end: 1}\n";
      std::optional<io::RunFile> probe_rf;
      try {
        probe_rf.emplace(load_text("transit", yaml));
      } catch (const io::ConfigError&) {  // a model this build does not have
        std::printf("%s    {\"model\": \"%s\", \"available\": false}", first ? "" : ",\n", c.label);
        first = false;
        continue;
      }
      // The step from `check`, then a run of a fixed number of steps.
      const CheckReport chk = check_case(*probe_rf, (scratch() / "transit.h5").string());
      const int steps = quick ? 50 : 400;
      const real t_run = steps * chk.dt;
      char over[160];
      std::snprintf(over, sizeof over, "time.end=%.17g", t_run);
      double best = 1e300;
      long done = 0;
      for (int r = 0; r < repeat; ++r) {
        const io::RunFile rf = load_text("transit", yaml, {over, std::string("output.history_interval=") + (over + 9)});
        RunOptions opt;
        opt.output_override = (scratch() / "transit.h5").string();
        const RunSummary s = run_case(rf, opt);
        done = s.steps;
        best = std::min(best, s.wall_seconds / static_cast<double>(s.steps));
      }
      const double steps_per_transit = transit / chk.dt;
      std::printf("%s    {\"model\": \"%s\", \"available\": true, \"dt_s\": %.4g, \"limited_by\": \"%s\", "
                  "\"steps_per_transit\": %.4g, \"seconds_per_step\": %.4g, \"seconds_per_transit\": %.4g, "
                  "\"steps_timed\": %ld}",
                  first ? "" : ",\n", c.label, chk.dt, chk.limited_by.c_str(), steps_per_transit, best,
                  best * steps_per_transit, done);
      first = false;
    }
    std::printf("\n  ]}\n}\n");
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_twofluid: %s\n", e.what());
    fs::remove_all(scratch());
    return 1;
  }
  fs::remove_all(scratch());
  return 0;
}
