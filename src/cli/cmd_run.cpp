// `tubewave run`, `tubewave check` and `tubewave keys`.
#include <omp.h>
#include <unistd.h>

#include <cstdio>
#include <iostream>
#include <optional>
#include <sstream>

#include "cli/args.hpp"
#include "cli/commands.hpp"
#include "cli/stop_signals.hpp"
#include "core/error.hpp"
#include "sim/run.hpp"

namespace tw::cli {

namespace {

std::string human_bytes(double b) {
  const char* units[] = {"B", "KiB", "MiB", "GiB", "TiB"};
  int k = 0;
  while (b >= 1024 && k < 4) {
    b /= 1024;
    ++k;
  }
  std::ostringstream s;
  s.precision(3);
  s << b << " " << units[k];
  return s.str();
}

std::string human_seconds(double s) {
  std::ostringstream o;
  o.precision(3);
  if (s < 120) o << s << " s";
  else if (s < 7200) o << s / 60 << " min";
  else o << s / 3600 << " h";
  return o.str();
}

void apply_threads(const ArgParser& a) {
  if (!a.has("threads")) return;
  const long n = a.int_value("threads");
  if (n < 1) throw InputError("option --threads: must be at least 1 (got " + std::to_string(n) + ");" + a.help_hint());
  omp_set_num_threads(static_cast<int>(n));
}

}  // namespace

int cmd_run(std::span<const std::string> args) {
  ArgParser a("run", "FILE.yaml [-o OUT.h5] [--set key.path=value ...] [--threads N]\n"
              "       tubewave run --restart CHECKPOINT.h5 [FILE.yaml] [-o OUT.h5] [--set ...] [--threads N]",
              "Run a case described by a run file and write its HDF5 output. The output is "
              "written under a temporary name and renamed when the run ends; a run that "
              "fails writes its last good state, says so and exits with code 1. Bad input "
              "exits with code 2 before anything is written. SIGTERM, SIGINT or SIGUSR1 stop "
              "the run after the current step: the output is closed as interrupted, a "
              "checkpoint is written (checkpoint.file, default NAME.checkpoint.h5) and the "
              "exit code is 3. --restart continues from a checkpoint, appending to the same "
              "output; the result is bitwise the one of an uninterrupted run.");
  a.positional("FILE.yaml", "the run file (with --restart: optional, must be the checkpoint's case)", false);
  a.option("restart", "CHECKPOINT.h5", "continue the run saved in a checkpoint");
  a.option("output", "OUT.h5", "output file (default: output.file, or the run file's name with .h5)");
  a.short_alias('o', "output");
  a.option("set", "KEY=VALUE", "override one run-file key, e.g. --set time.end=1e-5", true);
  a.option("threads", "N", "OpenMP threads (default: OMP_NUM_THREADS or all cores)");
  a.flag("quiet", "no progress output");
  if (!a.parse(args)) return 0;
  apply_threads(a);
  if (!a.has("restart") && !a.has("FILE.yaml"))
    throw InputError("missing argument FILE.yaml (or --restart CHECKPOINT.h5);" + a.help_hint());
  std::optional<io::RunFile> rf;
  if (!a.has("restart")) rf = load_run_file(a.positional_value("FILE.yaml"), a.values("set"));

  RunOptions opt;
  if (a.has("output")) opt.output_override = a.value("output");
  const StopOnSignals stop_guard;
  opt.stop = &StopOnSignals::requested();
  opt.stop_signal = &StopOnSignals::signal_number();
  const bool tty = ::isatty(STDERR_FILENO) != 0;
  if (!a.has("quiet")) {
    opt.progress_interval_s = tty ? 0.25 : 10.0;
    opt.progress = [tty](const Progress& p) {
      const double frac = p.t_end > 0 ? p.t / p.t_end : 1;
      const double eta = frac > 0 ? p.wall_seconds * (1 - frac) / frac : 0;
      const char* unit = p.normalized ? "" : " s";
      char line[256];
      std::snprintf(line, sizeof line,
                    "t = %.4e%s (%5.1f%%)  step %ld  dt = %.3e%s [%s]  %.3g cell-updates/s  ETA %s",
                    p.t, unit, 100 * frac, p.step, p.dt, unit, p.limited_by.c_str(), p.cell_updates_per_second,
                    p.final ? "-" : human_seconds(eta).c_str());
      if (tty) {
        std::cerr << "\r\033[K" << line << (p.final ? "\n" : "") << std::flush;
      } else {
        std::cerr << "tubewave: " << line << "\n";
      }
    };
  }
  RunSummary s;
  if (rf) {
    std::cerr << "tubewave: running " << rf->source_name() << " with " << omp_get_max_threads()
              << " thread(s)\n";
    s = run_case(*rf, opt);
  } else {
    RestartArgs r;
    r.checkpoint = a.value("restart");
    if (a.has("FILE.yaml")) r.run_file = a.positional_value("FILE.yaml");
    r.overrides = a.values("set");
    r.output = opt.output_override;
    std::cerr << "tubewave: continuing from " << r.checkpoint << " with " << omp_get_max_threads()
              << " thread(s)\n";
    s = restart_case(r, opt);
  }
  std::ostringstream msg;
  msg.precision(4);
  msg << "tubewave: " << s.outcome << ": " << s.steps << " steps to t = " << s.t << (s.normalized ? "" : " s") << " in "
      << human_seconds(s.wall_seconds) << " (" << s.cell_updates_per_second << " cell-updates/s)\n"
      << "tubewave: wrote " << s.output_file << " (" << s.snapshots << " snapshots, "
      << s.probe_samples << " probe samples)\n";
  for (const auto& n : s.notes) msg << "tubewave: " << n << "\n";
  if (s.outcome != "completed") msg << "tubewave: " << s.message << "\n";
  if (!s.checkpoint_file.empty())
    msg << "tubewave: checkpoint written to " << s.checkpoint_file
        << "; continue with: tubewave run --restart " << s.checkpoint_file << "\n";
  std::cout << msg.str();
  if (s.outcome == "completed") return exit_code::ok;
  if (s.outcome == "interrupted") return exit_code::interrupted;
  return exit_code::run_failed;
}

int cmd_check(std::span<const std::string> args) {
  ArgParser a("check", "FILE.yaml [--set key.path=value ...]",
              "Validate a run file without running it, and print the time step, the "
              "constraint that limits it, the number of steps and the memory and output "
              "size estimates.");
  a.positional("FILE.yaml", "the run file");
  a.option("set", "KEY=VALUE", "override one run-file key", true);
  a.option("output", "OUT.h5", "output file to report");
  a.short_alias('o', "output");
  if (!a.parse(args)) return 0;
  const io::RunFile rf = load_run_file(a.positional_value("FILE.yaml"), a.values("set"));
  const CheckReport r = check_case(rf, a.has("output") ? a.value("output") : "");
  std::ostringstream o;
  o.precision(4);
  o << rf.source_name() << ": valid\n"
    << "  model              " << r.model << "\n"
    << "  cells              " << r.cells << " (dx = " << r.dx << " m)\n"
    << "  time step          " << r.dt << " s, limited by " << r.limited_by << "\n";
  for (const auto& [name, dt] : r.limits) o << "    " << name << ": " << dt << " s\n";
  o << "  end time           " << r.t_end << " s\n"
    << "  steps (estimate)   " << r.estimated_steps << " (from the initial state; the step adapts)\n"
    << "  solver memory      " << human_bytes(r.memory_bytes) << "\n"
    << "  output             " << r.output_file << ", at most " << human_bytes(r.output_bytes)
    << " before compression (" << r.snapshots << " snapshots, " << r.probe_samples
    << " probe samples, " << r.history_samples << " history records)\n";
  for (const auto& w : r.warnings) o << "  warning: " << w << "\n";
  std::cout << o.str();
  return exit_code::ok;
}

int cmd_keys(std::span<const std::string> args) {
  ArgParser a("keys", "", "Print the reference of every run-file key (Markdown): type, unit, "
                          "default, allowed values and meaning.");
  if (!a.parse(args)) return 0;
  std::cout << run_schema().reference_markdown();
  return exit_code::ok;
}

}  // namespace tw::cli
