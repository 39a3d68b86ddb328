// Benchmark (not a test): cell-updates per second of the nonlinear MHD step.
//
//   ./build/src/bench_mhd_step [--repeat R] [--steps S] [--cells N] [--threads T]
//
// --cells and --threads restrict the run to one size and one thread count (for profiling,
// e.g. under valgrind --tool=callgrind, whose instruction counts are deterministic).
// Problem: a periodic box holding a large-amplitude oblique fast wave (relative amplitude
// 0.1, B at 30 degrees), so HLLD takes its full path with every state populated. Scheme:
// PLM (MC limiter) + HLLD + SSP-RK2, CFL 0.8. A cell-update is one cell advanced by one
// full time step (two Runge-Kutta stages). For each size (4096 and 65536 cells) and thread
// count (1 and all), the best of R repetitions of S steps is reported, as JSON on stdout.
// No output file is written; the time loop is the same Stepper the runs use.
#include <omp.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <numbers>
#include <string>
#include <vector>

#include "models/mhd.hpp"
#include "numerics/fv_operator.hpp"
#include "time/stepper.hpp"
#include "tubewave/version.hpp"

using namespace tw;

namespace {

double run_once(int n, int steps) {
  Grid g(n, 0.0, 1.0);
  Mhd m;
  m.mu0 = 1;
  m.gamma = 5.0 / 3.0;
  m.bx = std::cos(std::numbers::pi / 6);
  Field<Mhd::State> U(g);
  for (int i = 0; i < n; ++i) {
    const double ph = std::sin(2 * std::numbers::pi * g.x_centre(i));
    Mhd::State W{};
    W[Mhd::RHO] = 1 + 0.1 * ph;
    W[Mhd::VX] = 0.1 * ph;
    W[Mhd::VY] = 0.02 * ph;
    W[Mhd::VZ] = -0.05 * ph;
    W[Mhd::BY] = 0.1 * std::cos(2 * std::numbers::pi * g.x_centre(i));
    W[Mhd::BZ] = 0.5 * (1 + 0.1 * ph);
    W[Mhd::P] = 0.6 * (1 + 0.15 * ph);
    U[i] = m.cons_from_prim(W);
  }
  auto periodic = std::make_shared<PeriodicBoundary<Mhd>>();
  Stepper<Mhd> stepper(FvOperator<Mhd>(g, {Reconstruction::plm, Limiter::mc, FluxKind::hlld}, periodic, periodic),
                       TimeControl{0.8, 1e30, IntegratorKind::ssp_rk2});
  double t = 0;
  stepper.step(m, U, t, 1e30, "none");  // warm-up (page faults, first touch)
  const auto t0 = std::chrono::steady_clock::now();
  for (int s = 0; s < steps; ++s) t += stepper.step(m, U, t, 1e30, "none").dt;
  const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  return static_cast<double>(n) * steps / wall;
}

}  // namespace

int main(int argc, char** argv) {
  int repeat = 5, steps = 0, only_cells = 0, only_threads = 0;
  for (int a = 1; a + 1 < argc; a += 2) {
    if (std::strcmp(argv[a], "--repeat") == 0) repeat = std::atoi(argv[a + 1]);
    if (std::strcmp(argv[a], "--steps") == 0) steps = std::atoi(argv[a + 1]);
    if (std::strcmp(argv[a], "--cells") == 0) only_cells = std::atoi(argv[a + 1]);
    if (std::strcmp(argv[a], "--threads") == 0) only_threads = std::atoi(argv[a + 1]);
  }
  const int all = omp_get_max_threads();
  std::vector<int> threads{1};
  if (all > 1) threads.push_back(all);
  if (only_threads > 0) threads = {only_threads};
  std::vector<int> sizes{4096, 65536};
  if (only_cells > 0) sizes = {only_cells};
  std::printf("{\n  \"benchmark\": \"nonlinear MHD step, PLM(MC) + HLLD + SSP-RK2\",\n");
  std::printf("  \"tubewave_version\": \"%s\", \"git\": \"%s\", \"compiler\": \"%s\", \"build_type\": \"%s\",\n",
              build::version, build::git_revision, build::compiler, build::build_type);
  std::printf("  \"results\": [\n");
  bool first = true;
  for (int n : sizes) {
    const int s = steps > 0 ? steps : (n <= 4096 ? 400 : 40);
    for (int th : threads) {
      omp_set_num_threads(th);
      double best = 0;
      for (int r = 0; r < repeat; ++r) best = std::max(best, run_once(n, s));
      std::printf("%s    {\"cells\": %d, \"threads\": %d, \"steps\": %d, \"best_of\": %d, \"cell_updates_per_second\": %.4g}",
                  first ? "" : ",\n", n, th, s, repeat, best);
      first = false;
    }
  }
  std::printf("\n  ]\n}\n");
  return 0;
}
