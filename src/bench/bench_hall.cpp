// Benchmark (not a test): stepping past the whistler limit in Hall MHD.
//
//   ./build/src/bench_hall [--repeat R] [--threads N]
//
// Problem: a whistler-resolving Hall-MHD run, dx = d_i/20 over 200 d_i (4000 cells,
// periodic), normalized units (d_i = 1, v_A ~ 1, omega_ci = 1), holding the exact
// right-hand circularly polarised wave with 32 wavelengths in the box (k d_i = 1.005,
// 125 cells per wavelength, delta B/B0 = 0.05), run for one wave period. Scheme: PLM
// (unlimited), HLL, SSP-RK3, CFL 0.8 (the CFL number also scales the whistler limit and
// the sub-steps). Each Hall stepping mode runs the same case through the full run loop
// (`run_case`, with output only at the start and the end), and the phase speed of the
// wave is measured from the phase of its Fourier mode and compared with the Hall-MHD
// relation omega = (k^2 v_A d_i/2)(sqrt(1 + 4/(k d_i)^2) + 1). Explicit stepping runs at
// its stability limit; the other modes run at CFL 0.8 and at the largest CFL of 0.8, 0.7,
// ..., 0.1 whose phase-speed error does not exceed the explicit run's ("matched": equal
// accuracy). Reported per run: the relative phase-speed error, steps, wall time (best of
// R), the process CPU time (best of R; on a machine shared with other jobs it is the
// steadier measure of one thread's work), cell-updates per second (cells times steps over
// wall time) and the speed-ups over explicit stepping, by wall and by CPU time. JSON on
// stdout.
#include <omp.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <complex>
#include <cstdio>
#include <ctime>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <numbers>
#include <string>
#include <vector>

#include "io/h5read.hpp"
#include "io/runfile.hpp"
#include "sim/run.hpp"
#include "tubewave/version.hpp"

using namespace tw;

namespace {

constexpr double pi = std::numbers::pi;
constexpr int kCells = 4000;
constexpr double kLength = 200.0;  // d_i
constexpr int kWaves = 32;

std::string num(double v) {
  char b[64];
  std::snprintf(b, sizeof b, "%.17g", v);
  return b;
}

struct Result {
  std::string mode;
  std::string integrator;
  double cfl = 0.8;
  bool matched = false;
  double error = 0;  // relative phase-speed error
  long steps = 0;
  double wall = 0;
  double cpu = 0;  // process CPU time of the run (what a single thread costs on a busy machine)
  double rate = 0;
};

Result run_mode(const std::string& mode, const std::string& integrator, double cfl, int repeat,
                const std::filesystem::path& dir) {
  const double k = 2 * pi * kWaves / kLength;
  const double rho = 1 + 1 / 1836.15267343;  // n (m_i + m_e)
  const double v_A = 1 / std::sqrt(rho), d_i = 1 / v_A;  // h = v_A d_i = B/(mu0 e n) = 1
  const double kd = k * d_i;
  const double omega = 0.5 * k * k * v_A * d_i * (std::sqrt(1 + 4 / (kd * kd)) + 1);
  const double t_end = 2 * pi / omega;
  const std::string text = R"(
title: bench_hall
units: normalized
model:
  equations: hall
plasma:
  density: 1
  field: 1
  ion_temperature: 0.05
  electron_temperature: 0.05
grid:
  length: )" + num(kLength) + R"(
  cells: )" + std::to_string(kCells) + R"(
numerics:
  reconstruction: plm
  limiter: none
  flux: hll
initial:
  kind: circular
  branch: right
  amplitude: 0.05
  wavelength: )" + num(kLength / kWaves) + R"(
boundaries:
  left: {kind: periodic}
  right: {kind: periodic}
)";
  const io::RunFile rf = io::RunFile::parse(
      text, "bench_hall.yaml", run_schema(),
      {"model.hall_stepping=" + mode, "numerics.integrator=" + integrator, "numerics.cfl=" + num(cfl),
       "time.end=" + num(t_end),
       "output.snapshot_interval=" + num(t_end), "output.history_interval=" + num(t_end)});
  Result res;
  res.mode = mode;
  res.integrator = integrator;
  res.cfl = cfl;
  res.wall = 1e300;
  res.cpu = 1e300;
  const std::string out = (dir / ("bench_hall_" + mode + ".h5")).string();
  for (int r = 0; r < repeat; ++r) {
    RunOptions opt;
    opt.output_override = out;
    const std::clock_t c0 = std::clock();
    const RunSummary s = run_case(rf, opt);
    res.cpu = std::min(res.cpu, static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC);
    if (s.outcome != "completed") {
      std::fprintf(stderr, "bench_hall: %s run %s: %s\n", mode.c_str(), s.outcome.c_str(), s.message.c_str());
      std::exit(1);
    }
    res.steps = s.steps;
    res.wall = std::min(res.wall, s.wall_seconds);
  }
  res.rate = static_cast<double>(kCells) * static_cast<double>(res.steps) / res.wall;
  // Phase of the mode b ~ exp(-i(kx - omega t)) (right-hand wave toward +x, B_x > 0).
  io::H5Reader h(out);
  const auto x = h.read_real("/grid/x");
  const auto t = h.read_real("/snapshots/time");
  const auto by = h.read_real("/snapshots/magnetic_field_y");
  const auto bz = h.read_real("/snapshots/magnetic_field_z");
  const std::size_t n = x.size(), last = (t.size() - 1) * n;
  std::complex<double> c0, c1;
  for (std::size_t i = 0; i < n; ++i) {
    const auto e = std::exp(std::complex<double>(0, k * x[i]));
    c0 += std::complex<double>(by[i], bz[i]) * e;
    c1 += std::complex<double>(by[last + i], bz[last + i]) * e;
  }
  const double psi = std::arg(c1 / c0);  // = omega t (mod 2 pi)
  const double T = t.back();
  const double m = std::round((omega * T - psi) / (2 * pi));
  const double measured = (psi + 2 * pi * m) / T;
  res.error = std::abs(measured - omega) / omega;
  std::filesystem::remove(out);
  return res;
}

}  // namespace

int main(int argc, char** argv) {
  int repeat = 3, threads = 1;
  for (int a = 1; a + 1 < argc; a += 2) {
    if (std::strcmp(argv[a], "--repeat") == 0) repeat = std::atoi(argv[a + 1]);
    if (std::strcmp(argv[a], "--threads") == 0) threads = std::atoi(argv[a + 1]);
  }
  omp_set_num_threads(threads);
  const auto dir = std::filesystem::temp_directory_path();
  std::vector<Result> rs;
  rs.push_back(run_mode("explicit", "ssp-rk3", 0.8, repeat, dir));
  const double target = rs[0].error;
  for (const auto& [mode, integrator] : {std::pair<std::string, std::string>{"subcycled", "ssp-rk3"},
                                         {"implicit", "ssp-rk3"}, {"implicit", "ssp-rk2"}}) {
    rs.push_back(run_mode(mode, integrator, 0.8, repeat, dir));
    for (double cfl : {0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1}) {
      Result r = cfl == 0.8 ? rs.back() : run_mode(mode, integrator, cfl, repeat, dir);
      if (r.error <= target || cfl == 0.1) {
        r.matched = true;
        rs.push_back(r);
        break;
      }
    }
  }
  std::printf("{\n  \"benchmark\": \"Hall MHD whistler, dx = d_i/20, 200 d_i (4000 cells), one wave period\",\n");
  std::printf("  \"tubewave_version\": \"%s\", \"git\": \"%s\", \"compiler\": \"%s\", \"build_type\": \"%s\",\n",
              build::version, build::git_revision, build::compiler, build::build_type);
  std::printf("  \"threads\": %d, \"best_of\": %d,\n  \"results\": [\n", threads, repeat);
  for (std::size_t j = 0; j < rs.size(); ++j) {
    const Result& r = rs[j];
    std::printf("    {\"hall_stepping\": \"%s\", \"integrator\": \"%s\", \"cfl\": %g, \"accuracy\": \"%s\", "
                "\"phase_speed_error\": %.3g, \"steps\": %ld, \"wall_seconds\": %.4g, \"cpu_seconds\": %.4g, "
                "\"cell_updates_per_second\": %.4g, \"speedup_over_explicit\": %.3g, \"cpu_speedup_over_explicit\": %.3g}%s\n",
                r.mode.c_str(), r.integrator.c_str(), r.cfl, j == 0 ? "reference" : r.matched ? "matched" : "cfl 0.8",
                r.error, r.steps, r.wall, r.cpu, r.rate, rs[0].wall / r.wall, rs[0].cpu / r.cpu,
                j + 1 < rs.size() ? "," : "");
  }
  std::printf("  ]\n}\n");
  return 0;
}
