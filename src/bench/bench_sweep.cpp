// Benchmark (not a test): how well `tubewave sweep` keeps its ranks busy.
//
//   ./build/src/bench_sweep [--ranks N] [--mpiexec "mpiexec --allow-run-as-root --oversubscribe"]
//                           [--tubewave PATH] [--local] [--keep]
//
// 24 cases of unequal cost, an invented 16 m helium column (n_e = 1.5e18 m^-3, B = 0.1 T)
// driven at its end: 8 grid sizes from 800 to 4000 cells (the cost of a case grows as
// cells^2: more cells and, by the CFL limit, more steps; the largest case costs 25 times
// the smallest) x 3 drive frequencies, each measured (velocity_y: wavelength, phase speed).
// Outputs are sparse enough that the CFL limit, not output times, sets the step.
// The sweep runs under `MPIEXEC -np N tubewave sweep` (and, with --local, once more in
// local mode, N cases at a time), and
//
//   scheduling efficiency = sum of the cases' wall times / (N x sweep wall time),
//
// with the sweep wall time taken two ways: around the whole launcher command (process
// start, MPI start-up, validation of every case, the summary: everything a user waits
// for), and the sweep's own session time (summary.h5: session_wall_seconds). The cases'
// wall times are from the summary (run and measurement of each case). Prints JSON.
#include <unistd.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "io/h5read.hpp"

namespace fs = std::filesystem;

namespace {

const char* base_yaml = R"(title: bench column (invented)
model: {equations: mhd}
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 16.0, cells: 800}
time: {end: 2.0e-5}
boundaries:
  left: {kind: driven, velocity_amplitude: 2000.0, frequency: 100.0e3, polarization: y, ramp_periods: 2}
  right: {kind: zero-gradient}
output: {snapshot_interval: 4.0e-7, probe_interval: 1.0e-6, probes: [2.0, 6.0, 10.0]}
)";

const char* sweep_yaml = R"(title: scheduling benchmark, 24 cases of unequal cost
base: base.yaml
parameters:
  - key: grid.cells
    log: {from: 800, to: 4000, count: 8}
  - key: boundaries.left.frequency
    values: [1.0e5, 1.5e5, 2.0e5]
measure:
  - field: velocity_y
    quantities: [wavelength, phase_speed]
)";

struct Result {
  double outer_wall = 0, session_wall = 0, case_sum = 0;
  int completed = 0, cases = 0, exit_code = -1;
};

double now() { return std::chrono::duration<double>(std::chrono::steady_clock::now().time_since_epoch()).count(); }

Result run(const std::string& cmd, const fs::path& out) {
  Result r;
  const double t0 = now();
  const int status = std::system(cmd.c_str());
  r.outer_wall = now() - t0;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  const tw::io::H5Reader h((out / "summary.h5").string());
  r.session_wall = h.attr_real("/", "session_wall_seconds");
  r.completed = static_cast<int>(h.attr_real("/", "completed"));
  r.cases = static_cast<int>(h.attr_real("/", "cases"));
  for (double w : h.read_real("/cases/wall_seconds")) r.case_sum += w;
  return r;
}

void print(const char* name, const Result& r, int ranks, bool last) {
  std::printf(
      "  \"%s\": {\"exit_code\": %d, \"cases\": %d, \"completed\": %d, \"sum_case_wall_s\": %.3f, "
      "\"sweep_wall_s\": %.3f, \"session_wall_s\": %.3f, \"efficiency\": %.4f, \"efficiency_session\": %.4f}%s\n",
      name, r.exit_code, r.cases, r.completed, r.case_sum, r.outer_wall, r.session_wall,
      r.case_sum / (ranks * r.outer_wall), r.case_sum / (ranks * r.session_wall), last ? "" : ",");
}

}  // namespace

int main(int argc, char** argv) {
  int ranks = 2;
  std::string mpiexec = TUBEWAVE_BENCH_MPIEXEC;
  std::string tubewave = TUBEWAVE_BENCH_EXE;
  bool local = false, keep = false;
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    if (a == "--ranks" && i + 1 < argc) ranks = std::atoi(argv[++i]);
    else if (a == "--mpiexec" && i + 1 < argc) mpiexec = argv[++i];
    else if (a == "--tubewave" && i + 1 < argc) tubewave = argv[++i];
    else if (a == "--local") local = true;
    else if (a == "--keep") keep = true;
    else {
      std::fprintf(stderr, "usage: bench_sweep [--ranks N] [--mpiexec CMD] [--tubewave PATH] [--local] [--keep]\n");
      return 2;
    }
  }
  const fs::path dir = fs::temp_directory_path() / ("tubewave-bench-sweep-" + std::to_string(::getpid()));
  fs::create_directories(dir);
  std::ofstream(dir / "base.yaml") << base_yaml;
  std::ofstream(dir / "sweep.yaml") << sweep_yaml;
  const std::string cd = "cd '" + dir.string() + "' && ";
  std::printf("{\n  \"ranks\": %d,\n  \"launcher\": \"%s\",\n", ranks, mpiexec.c_str());
  if (mpiexec.empty()) {
    std::printf("  \"mpi\": \"this build has no MPI launcher\",\n");
  } else {
    const std::string cmd = cd + mpiexec + " -np " + std::to_string(ranks) + " '" + tubewave +
                            "' sweep sweep.yaml --output-dir mpi > mpi.log 2>&1";
    print("mpi", run(cmd, dir / "mpi"), ranks, !local);
  }
  if (local) {
    const std::string cmd = cd + "OMP_NUM_THREADS=" + std::to_string(ranks) + " '" + tubewave +
                            "' sweep sweep.yaml --output-dir local --jobs " + std::to_string(ranks) + " > local.log 2>&1";
    print("local", run(cmd, dir / "local"), ranks, true);
  }
  std::printf("}\n");
  if (keep) std::fprintf(stderr, "bench_sweep: files kept in %s\n", dir.c_str());
  else fs::remove_all(dir);
  return 0;
}
