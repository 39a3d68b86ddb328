// Benchmark (not a test): cell-updates per second of the nonlinear MHD step.
//
//   ./build/src/bench_mhd_step [--repeat R] [--steps S] [--cells N] [--threads T]
//                              [--isa x86-64|avx2|avx512] [--generic]
//
// Problem: a periodic box holding a large-amplitude oblique fast wave (relative amplitude
// 0.1, B at 30 degrees), so HLLD takes its full path with every state populated. Scheme:
// PLM (MC limiter) + HLLD + SSP-RK2, CFL 0.8. A cell-update is one cell advanced by one
// full time step (two Runge-Kutta stages). For each size (4096 and 65536 cells) and thread
// count (1 and all), the best of R repetitions of S steps is reported, as JSON on stdout.
// No output file is written; the time loop is the same Stepper the runs use.
//
// --cells and --threads restrict the run to one size and one thread count (for profiling,
// e.g. under valgrind --tool=callgrind, whose instruction counts are deterministic).
// --isa forces the instruction set of the vectorised kernels (default: the best this
// processor has); --generic turns the MHD block kernel off (the generic per-face passes),
// so one binary measures both paths under the same conditions.
//
// Besides the wall-clock rate, each result gives the rate per second of process CPU time
// (`cell_updates_per_cpu_second`): with one thread on a machine shared with other jobs it
// excludes the time spent waiting for a core, so it varies much less than the wall-clock
// figure. With several threads it also counts time threads spend waiting for each other,
// so only the wall-clock figure means anything there. The 1-minute load average at the
// start is printed so that readers can judge the conditions.
#include <omp.h>

#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <fstream>
#include <memory>
#include <numbers>
#include <string>
#include <vector>

#include "core/simd_isa.hpp"
#include "models/mhd.hpp"
#include "numerics/fv_operator.hpp"
#include "time/stepper.hpp"
#include "tubewave/version.hpp"

using namespace tw;

namespace {

struct Rate {
  double wall = 0;  ///< cell-updates per wall-clock second
  double cpu = 0;   ///< cell-updates per second of process CPU time
};

double cpu_seconds() {
  timespec ts{};
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

Rate run_once(int n, int steps, bool block_kernel) {
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
  FvOperator<Mhd> op(g, {Reconstruction::plm, Limiter::mc, FluxKind::hlld}, periodic, periodic);
  op.set_block_kernel(block_kernel);
  Stepper<Mhd> stepper(std::move(op), TimeControl{0.8, 1e30, IntegratorKind::ssp_rk2});
  double t = 0;
  stepper.step(m, U, t, 1e30, "none");  // warm-up (page faults, first touch)
  const double c0 = cpu_seconds();
  const auto t0 = std::chrono::steady_clock::now();
  for (int s = 0; s < steps; ++s) t += stepper.step(m, U, t, 1e30, "none").dt;
  const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  const double cpu = cpu_seconds() - c0;
  const double updates = static_cast<double>(n) * steps;
  return {updates / wall, updates / cpu};
}

double load_average() {
  std::ifstream f("/proc/loadavg");
  double l = -1;
  f >> l;
  return l;
}

}  // namespace

int main(int argc, char** argv) {
  int repeat = 5, steps = 0, only_cells = 0, only_threads = 0;
  bool block_kernel = true;
  for (int a = 1; a < argc; ++a) {
    const bool has_value = a + 1 < argc;
    if (std::strcmp(argv[a], "--generic") == 0) {
      block_kernel = false;
    } else if (has_value && std::strcmp(argv[a], "--repeat") == 0) {
      repeat = std::atoi(argv[++a]);
    } else if (has_value && std::strcmp(argv[a], "--steps") == 0) {
      steps = std::atoi(argv[++a]);
    } else if (has_value && std::strcmp(argv[a], "--cells") == 0) {
      only_cells = std::atoi(argv[++a]);
    } else if (has_value && std::strcmp(argv[a], "--threads") == 0) {
      only_threads = std::atoi(argv[++a]);
    } else if (has_value && std::strcmp(argv[a], "--isa") == 0) {
      const std::string name = argv[++a];
      bool found = false;
      for (SimdIsa isa : all_simd_isas)
        if (name == simd_isa_name(isa)) {
          if (!simd_isa_supported(isa)) {
            std::fprintf(stderr, "bench_mhd_step: instruction set %s not supported here\n", name.c_str());
            return 2;
          }
          set_simd_isa(isa);
          found = true;
        }
      if (!found) {
        std::fprintf(stderr, "bench_mhd_step: --isa must be x86-64, avx2 or avx512 (got '%s')\n", name.c_str());
        return 2;
      }
    } else {
      std::fprintf(stderr, "bench_mhd_step: unknown or incomplete option '%s'\n", argv[a]);
      return 2;
    }
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
  std::printf("  \"path\": \"%s\", \"instruction_set\": \"%s\", \"load_average_1min\": %.2f,\n",
              block_kernel ? "block kernel" : "generic", simd_isa_name(simd_isa()), load_average());
  std::printf("  \"results\": [\n");
  bool first = true;
  for (int n : sizes) {
    const int s = steps > 0 ? steps : (n <= 4096 ? 400 : 40);
    for (int th : threads) {
      omp_set_num_threads(th);
      Rate best;
      for (int r = 0; r < repeat; ++r) {
        const Rate x = run_once(n, s, block_kernel);
        best.wall = std::max(best.wall, x.wall);
        best.cpu = std::max(best.cpu, x.cpu);
      }
      std::printf("%s    {\"cells\": %d, \"threads\": %d, \"steps\": %d, \"best_of\": %d, "
                  "\"cell_updates_per_second\": %.4g, \"cell_updates_per_cpu_second\": %.4g}",
                  first ? "" : ",\n", n, th, s, repeat, best.wall, best.cpu);
      first = false;
    }
  }
  std::printf("\n  ]\n}\n");
  return 0;
}
