// `tubewave sweep`: batches of cases from a sweep file, locally or under MPI, with resume,
// a summary table, job-array scripts and merging (src/sweep/).
#include <omp.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <optional>
#include <sstream>

#include "cli/args.hpp"
#include "cli/commands.hpp"
#include "cli/stop_signals.hpp"
#include "core/error.hpp"
#include "io/file_ops.hpp"
#include "sweep/case_run.hpp"
#include "sweep/job_script.hpp"
#include "sweep/mpi_sweep.hpp"
#include "sweep/schedule.hpp"
#include "sweep/summary.hpp"
#include "sweep/sweep_file.hpp"

namespace tw::cli {

namespace {

namespace fs = std::filesystem;
using namespace tw::sweep;

int positive_option(const ArgParser& a, const char* name) {
  if (!a.has(name)) return 0;
  const long n = a.int_value(name);
  if (n < 1 || n > 1 << 20)
    throw InputError(std::string("option --") + name + ": must be at least 1 (got " + a.value(name) + ");" + a.help_hint());
  return static_cast<int>(n);
}

std::string count_text(std::size_t n, const char* one, const char* many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

/// "4 x 6 grid", "zip of 12" for the opening line.
std::string shape_text(const Sweep& s) {
  if (s.combine == "zip") return "zipped";
  std::string r;
  std::vector<std::string> groups;
  for (const auto& p : s.parameters) {
    if (!p.group.empty()) {
      if (std::find(groups.begin(), groups.end(), p.group) != groups.end()) continue;
      groups.push_back(p.group);
    }
    r += (r.empty() ? "" : " x ") + std::to_string(p.size());
  }
  return "grid " + r;
}

void make_dirs(const Sweep& s) {
  std::error_code ec;
  fs::create_directories(s.cases_dir(), ec);
  if (ec) throw RunError("cannot create the sweep's folder '" + s.cases_dir() + "': " + ec.message());
}

int exit_code_of(const std::vector<CaseRecord>& all, bool stopped) {
  if (stopped) return exit_code::interrupted;
  for (const auto& r : all)
    if (r.status != "completed") return exit_code::run_failed;
  return exit_code::ok;
}

std::string result_line(const Sweep& s, const std::vector<CaseRecord>& all) {
  std::size_t done = 0, failed = 0, other = 0;
  for (const auto& r : all) {
    if (r.status == "completed") ++done;
    else if (r.status == "failed") ++failed;
    else ++other;
  }
  return "tubewave: sweep: " + std::to_string(done) + " of " + std::to_string(all.size()) + " cases completed, " +
         std::to_string(failed) + " failed, " + std::to_string(other) + " not run; summary in " + s.summary_csv() +
         " and " + s.summary_h5() + "\n";
}

std::size_t count_state(const std::vector<CasePlan>& plans, CasePlan::State st) {
  std::size_t n = 0;
  for (const auto& p : plans) n += p.state == st ? 1 : 0;
  return n;
}

std::string plan_text(const Sweep& s, const std::vector<CasePlan>& plans, const std::vector<Job>& jobs,
                      bool retry) {
  const std::size_t done = count_state(plans, CasePlan::State::done);
  const std::size_t failed = count_state(plans, CasePlan::State::failed);
  std::string t = "tubewave: sweep: " + s.path + ": " + count_text(s.cases.size(), "case", "cases") + " (" +
                  shape_text(s) + "); " + std::to_string(done) + " complete, " + std::to_string(jobs.size()) + " to run";
  if (failed > 0 && !retry) t += ", " + std::to_string(failed) + " failed before (--retry-failed runs them again)";
  return t;
}

int list_cases(const Sweep& s, const std::vector<CasePlan>& plans) {
  double total = 0;
  for (const auto& p : plans) total += p.cost;
  std::ostringstream o;
  o << s.path << ": " << s.cases.size() << " cases, output in " << s.output_dir << "\n";
  for (const auto& c : s.cases) {
    const CasePlan& p = plans[c.index];
    const char* state = p.state == CasePlan::State::done        ? "complete"
                        : p.state == CasePlan::State::failed    ? "failed"
                        : p.state == CasePlan::State::remeasure ? "measure again"
                                                                : "to run";
    char cost[32];
    std::snprintf(cost, sizeof cost, "%5.1f%%", total > 0 ? 100 * p.cost / total : 0.0);
    o << "  " << c.id << "  " << state << std::string(14 - std::string(state).size(), ' ') << " cost " << cost << "  "
      << c.describe(s.parameters) << "\n";
  }
  std::cout << o.str();
  return exit_code::ok;
}

std::string self_executable() {
  std::error_code ec;
  const auto p = fs::read_symlink("/proc/self/exe", ec);
  return ec ? std::string("tubewave") : p.string();
}

int write_job_script(const Sweep& s, const std::vector<CasePlan>& plans, const ArgParser& a, bool retry) {
  std::vector<std::size_t> cases;
  for (const auto& j : make_jobs(plans, retry)) cases.push_back(j.index);
  const bool all_done = cases.empty();
  if (all_done)
    for (const auto& c : s.cases) cases.push_back(c.index);
  JobScriptOptions opt;
  opt.tubewave = self_executable();
  opt.sweep_file = fs::absolute(s.path).lexically_normal().string();
  for (const auto& v : a.values("set")) {
    opt.extra_args.push_back("--set");
    opt.extra_args.push_back(v);
  }
  if (a.has("output-dir")) {
    opt.extra_args.push_back("--output-dir");
    opt.extra_args.push_back(fs::absolute(a.value("output-dir")).lexically_normal().string());
  }
  opt.threads = std::max(1, positive_option(a, "threads"));
  opt.retry_failed = retry;
  const std::string text = job_script_text(s, cases, opt);
  std::error_code ec;
  fs::create_directories(fs::path(s.output_dir) / "logs", ec);
  if (ec) throw RunError("cannot create '" + (fs::path(s.output_dir) / "logs").string() + "': " + ec.message());
  make_dirs(s);
  const std::string path = (fs::path(s.output_dir) / "job-array.sh").string();
  io::write_text_file(path, text, true);
  std::string merge = shell_quote(opt.tubewave) + " sweep " + shell_quote(opt.sweep_file);
  for (const auto& x : opt.extra_args) {
    merge += ' ';
    merge += shell_quote(x);
  }
  std::cout << "wrote " << path << " (" << count_text(cases.size(), "array task", "array tasks") << ": cases "
            << index_ranges(cases) << (all_done ? "; every case is complete already" : "") << ")\n"
            << "submit:  sbatch " << shell_quote(path) << "\n"
            << "then:    " << merge << " --merge\n";
  return exit_code::ok;
}

int run_single_case(const Sweep& s, const ArgParser& a, bool retry) {
  const long n = a.int_value("case");
  if (n < 0 || static_cast<std::size_t>(n) >= s.cases.size())
    throw InputError("option --case: the sweep has cases 0 to " + std::to_string(s.cases.size() - 1) + " (got " +
                     a.value("case") + ");" + a.help_hint());
  const Case& c = s.cases[static_cast<std::size_t>(n)];
  const CasePlan plan = plan_case(s, c, true);
  if (plan.state == CasePlan::State::done) {
    std::cerr << "tubewave: sweep: " << c.id << " is complete already (" << c.describe(s.parameters) << ")\n";
    return exit_code::ok;
  }
  if (plan.state == CasePlan::State::failed && !retry) {
    std::cerr << "tubewave: sweep: " << c.id << " failed before: " << plan.record.message
              << " (--retry-failed runs it again)\n";
    return exit_code::run_failed;
  }
  make_dirs(s);
  const StopOnSignals guard;
  CaseOptions co;
  co.threads = std::max(1, positive_option(a, "threads") > 0 ? positive_option(a, "threads") : omp_get_max_threads());
  co.stop = &StopOnSignals::requested();
  co.measure_only = plan.state == CasePlan::State::remeasure;
  std::cerr << "tubewave: sweep: running " << c.id << " (" << c.describe(s.parameters) << ") with " << co.threads
            << " thread(s)\n";
  const CaseRecord r = run_one_case(s, c, plan.run_hash, co);
  std::cerr << "tubewave: sweep: " << c.id << " " << r.status << " in " << r.wall_seconds << " s"
            << (r.status == "completed" ? std::string() : ": " + r.message) << "\n";
  if (r.status == "completed") return exit_code::ok;
  return r.status == "interrupted" ? exit_code::interrupted : exit_code::run_failed;
}

int merge(const Sweep& s) {
  const auto plans = plan_cases(s, false);
  make_dirs(s);
  const auto all = gather_records(s, plans, {});
  write_summary(s, all, {});
  std::cout << result_line(s, all);
  return exit_code::ok;
}

int run_local_sweep(const Sweep& s, const ArgParser& a, bool retry) {
  const auto t0 = std::chrono::steady_clock::now();
  const auto plans = plan_cases(s, true);  // every case validated before anything runs
  const auto jobs = make_jobs(plans, retry);
  LocalOptions lo;
  lo.jobs = positive_option(a, "jobs");
  lo.threads = positive_option(a, "threads");
  lo.stop = &StopOnSignals::requested();
  const LocalShape shape = local_shape(lo, jobs.size());
  std::cerr << plan_text(s, plans, jobs, retry);
  if (!jobs.empty())
    std::cerr << ", " << shape.workers << " at a time with " << count_text(static_cast<std::size_t>(shape.threads), "thread", "threads")
              << " each";
  std::cerr << "\n";
  make_dirs(s);
  std::vector<CaseRecord> session;
  {
    const StopOnSignals guard;
    ProgressReporter progress(s, count_state(plans, CasePlan::State::done), jobs, std::cerr);
    session = run_local(s, plans, jobs, lo, progress);
  }
  const auto all = gather_records(s, plans, session);
  SummaryInfo info;
  info.session_wall_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  write_summary(s, all, info);
  std::cout << result_line(s, all);
  return exit_code_of(all, StopOnSignals::requested().load());
}

int run_mpi_sweep(const std::string& path, const LoadOptions& lopt, const ArgParser& a, bool retry) {
  const auto t0 = std::chrono::steady_clock::now();
  const mpi::Session session;
  // Every rank reads the sweep; rank 0 validates every case. All ranks agree on the outcome
  // before anything runs, so bad input ends every rank with exit code 2 and one message.
  int code = 0;
  std::optional<Sweep> s;
  std::vector<CasePlan> plans;
  std::string message;
  try {
    s = load_sweep(path, lopt);
    if (session.rank() == 0) plans = plan_cases(*s, true);
  } catch (const Error& e) {
    code = e.exit_code();
    message = e.what();
  }
  code = session.agree(code);
  if (code != 0) {
    if (session.rank() == 0) {
      if (message.empty()) message = "another rank could not read the sweep file (is it on a shared file system?)";
      std::cerr << "tubewave: error: " << message << "\n";
    }
    return code;
  }
  const int threads = positive_option(a, "threads") > 0 ? positive_option(a, "threads") : omp_get_max_threads();
  std::vector<Job> jobs;
  std::optional<ProgressReporter> progress;
  if (session.rank() == 0) {
    jobs = make_jobs(plans, retry);
    std::cerr << plan_text(*s, plans, jobs, retry) << ", on " << session.size() << " MPI ranks with "
              << count_text(static_cast<std::size_t>(threads), "thread", "threads") << " per case\n";
    make_dirs(*s);
    progress.emplace(*s, count_state(plans, CasePlan::State::done), jobs, std::cerr);
  }
  std::vector<CaseRecord> session_records;
  {
    const StopOnSignals guard;
    session_records = mpi::run_distributed(session, *s, plans, jobs, threads, &StopOnSignals::requested(), progress ? &*progress : nullptr);
  }
  if (session.rank() != 0) return exit_code::ok;
  const auto all = gather_records(*s, plans, session_records);
  SummaryInfo info;
  info.session_wall_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  write_summary(*s, all, info);
  std::cout << result_line(*s, all);
  return exit_code_of(all, StopOnSignals::requested().load());
}

}  // namespace

int cmd_sweep(std::span<const std::string> args) {
  ArgParser a("sweep", "SWEEP.yaml [--jobs N] [--threads N] [--retry-failed] [--set key=value ...] "
                       "[--output-dir DIR] [--list | --job-script | --merge | --case N | --keys]",
              "Run every case of a sweep file: a base run file with some keys varied (lists, linear and log "
              "ranges, full grid or zipped). Every case is validated before any runs; then the cases run several "
              "at once (threads split between them), or, started by mpirun, one per MPI rank with cases handed out "
              "as ranks become free. Each case writes OUTPUT_DIR/cases/ID.h5 with its measurements and a completion "
              "record; OUTPUT_DIR/summary.csv and summary.h5 hold each case's parameters, measured and predicted "
              "figures, status and wall time. Run again to resume: complete cases are skipped (their recorded run "
              "file must match), failed ones run again with --retry-failed. Exit codes: 0 every case completed, 1 "
              "some failed, 2 bad input (nothing runs), 3 interrupted. This tubewave was built " +
                  std::string(mpi::built_with_mpi() ? "with MPI." : "without MPI: sweeps run locally only."));
  a.positional("SWEEP.yaml", "the sweep file", false);
  a.option("jobs", "N", "cases at once in local mode (default: the number of threads)");
  a.option("threads", "N", "threads in all (local mode) or per case (MPI, --case, job scripts); default: OMP_NUM_THREADS or all cores");
  a.flag("retry-failed", "run the cases that failed before again");
  a.option("set", "KEY=VALUE", "override a run-file key in every case, e.g. --set time.end=1e-5", true);
  a.option("output-dir", "DIR", "write cases and summary here instead of the sweep file's output_dir");
  a.flag("list", "validate and list the cases, their state and relative cost; run nothing");
  a.flag("job-script", "write OUTPUT_DIR/job-array.sh, a job-array script for a batch scheduler (one task per case), and print the merge command");
  a.flag("merge", "build the summary from the case files (after job-array tasks); run nothing");
  a.option("case", "N", "run only case N (what each job-array task does); no summary");
  a.flag("keys", "print the reference of every sweep-file key");
  if (!a.parse(args)) return 0;

  int modes = 0;
  for (const char* m : {"list", "job-script", "merge", "case", "keys"}) modes += a.has(m) ? 1 : 0;
  if (modes > 1) throw InputError("options --list, --job-script, --merge, --case and --keys exclude each other;" + a.help_hint());
  if (a.has("keys")) {
    std::string md = sweep_schema().reference_markdown();
    if (md.compare(0, 15, "# Run-file keys") == 0) md.replace(0, 15, "# Sweep-file keys");
    std::cout << md;
    return exit_code::ok;
  }
  const std::string path = a.positional_value("SWEEP.yaml");
  LoadOptions lopt;
  if (a.has("output-dir")) lopt.output_dir = a.value("output-dir");
  lopt.overrides = a.values("set");
  const bool retry = a.has("retry-failed");
  positive_option(a, "jobs");
  positive_option(a, "threads");

  const int world = mpi::launched_world_size();
  if (modes == 0 && world > 1) {
    if (!mpi::built_with_mpi())
      throw InputError("tubewave sweep was started as one of " + std::to_string(world) +
                       " MPI processes, but this tubewave was built without MPI: run it without mpirun (cases then run "
                       "several at once), or build with -DTUBEWAVE_WITH_MPI=ON");
    return run_mpi_sweep(path, lopt, a, retry);
  }
  const Sweep s = load_sweep(path, lopt);
  if (a.has("list")) return list_cases(s, plan_cases(s, true));
  if (a.has("job-script")) return write_job_script(s, plan_cases(s, true), a, retry);
  if (a.has("merge")) return merge(s);
  if (a.has("case")) return run_single_case(s, a, retry);
  return run_local_sweep(s, a, retry);
}

}  // namespace tw::cli
