// Checkpoints and restarts (sim/checkpoint.hpp): a run stopped and continued writes, bit for
// bit, what an uninterrupted run writes; periodic checkpoints change nothing; a checkpoint that
// does not belong to the case, the build or the output is refused before anything is written.
#include <hdf5.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <csignal>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

#include "core/error.hpp"
#include "io/checkpoint_file.hpp"
#include "io/h5read.hpp"
#include "sim/run.hpp"
#include "support/h5compare.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::test::ScratchDir;
using tw::test::source_path;
namespace fs = std::filesystem;

namespace {

/// The demo column, shortened: a driven end (its phase is a function of t), a conducting end,
/// probes (interpolated, every 0.05 us) and snapshots (every 0.5 us).
const std::vector<std::string> demo_short{"grid.cells=200", "time.end=6e-6"};
/// The Brio & Wu shock tube, shortened: shocks, zero-gradient ends, no probes.
const std::vector<std::string> brio_wu_short{"grid.cells=200", "time.end=0.05"};
/// Hall MHD whistler with implicit Hall stepping and electron inertia: a split step (its end
/// fluxes join the integrals) and primitives that couple the whole grid.
const std::vector<std::string> hall_short{"time.end=0.6", "model.hall_stepping=implicit",
                                          "model.electron_inertia=true"};
/// Two-fluid: a whistler with a probe (the stiff source is Strang-split), and a shock tube
/// (the model's whole-tube diagnostics go to /history).
const std::vector<std::string> two_fluid_whistler_short{"time.end=1e-7"};
const std::vector<std::string> two_fluid_tube_short{"grid.cells=200", "time.end=1"};
/// Linearized Hall MHD with electron inertia and k_perp (complex amplitudes), driven, open end.
const std::vector<std::string> kinetic_alfven_short{"time.end=1.5e-6"};

tw::RunSummary run_to(const std::string& config, const std::vector<std::string>& overrides, const fs::path& out,
                      long stop_at_step = -1) {
  const tw::io::RunFile rf = tw::load_run_file(source_path(config).string(), overrides);
  std::atomic<bool> stop{false};
  tw::RunOptions opt;
  opt.output_override = out.string();
  if (stop_at_step >= 0) {
    opt.stop = &stop;
    opt.progress_interval_s = 0;  // a report after every step: the stop lands right after stop_at_step
    opt.progress = [&](const tw::Progress& p) {
      if (p.step >= stop_at_step) stop = true;
    };
  }
  return tw::run_case(rf, opt);
}

tw::RunSummary continue_from(const fs::path& checkpoint, long stop_at_step = -1,
                             const std::vector<std::string>& overrides = {}) {
  std::atomic<bool> stop{false};
  tw::RunOptions opt;
  if (stop_at_step >= 0) {
    opt.stop = &stop;
    opt.progress_interval_s = 0;
    opt.progress = [&](const tw::Progress& p) {
      if (p.step >= stop_at_step) stop = true;
    };
  }
  tw::RestartArgs args;
  args.checkpoint = checkpoint.string();
  args.overrides = overrides;
  return tw::restart_case(args, opt);
}

void require_identical(const fs::path& a, const fs::path& b) {
  int compared = 0;
  const auto diffs = tw::test::bitwise_differences(a.string(), b.string(), &compared);
  std::string listed;
  for (const auto& d : diffs) listed += d + "\n";
  INFO(listed);
  CHECK(diffs.empty());
  CHECK(compared >= 8);  // grid, parameters, snapshot and history columns at least
  const tw::io::H5Reader ra(a.string()), rb(b.string());
  CHECK(ra.attr_int("/status", "steps") == rb.attr_int("/status", "steps"));
  CHECK(ra.attr_real("/status", "simulated_time") == rb.attr_real("/status", "simulated_time"));
  CHECK(ra.attr_string("/status", "outcome") == rb.attr_string("/status", "outcome"));
  CHECK(ra.attr_int("/", "complete") == rb.attr_int("/", "complete"));
}

std::string bytes_of(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<std::string> entries(const fs::path& dir) {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

std::string quoted(const std::string& s) { return "'" + s + "'"; }

/// Overwrite a string attribute of the root group of an HDF5 file (to fake a checkpoint of
/// another build or model).
void set_root_string(const fs::path& file, const char* name, const std::string& value) {
  const hid_t f = H5Fopen(file.c_str(), H5F_ACC_RDWR, H5P_DEFAULT);
  REQUIRE(f >= 0);
  REQUIRE(H5Adelete(f, name) >= 0);
  const hid_t type = H5Tcopy(H5T_C_S1);
  H5Tset_size(type, H5T_VARIABLE);
  const hid_t space = H5Screate(H5S_SCALAR);
  const hid_t a = H5Acreate2(f, name, type, space, H5P_DEFAULT, H5P_DEFAULT);
  const char* data = value.c_str();
  REQUIRE(H5Awrite(a, type, &data) >= 0);
  H5Aclose(a);
  H5Sclose(space);
  H5Tclose(type);
  H5Fclose(f);
}

}  // namespace

TEST_CASE("restart: a run stopped twice and continued is bitwise the uninterrupted run", "[unit][restart]") {
  const auto [config, overrides, first_stop, second_stop] = GENERATE(
      std::make_tuple(std::string("configs/demo_column.yaml"), demo_short, 150L, 400L),
      std::make_tuple(std::string("configs/brio_wu_shock_tube.yaml"), brio_wu_short, 37L, 90L),
      std::make_tuple(std::string("configs/hall_whistler.yaml"), hall_short, 300L, 700L),
      std::make_tuple(std::string("configs/two_fluid_whistler.yaml"), two_fluid_whistler_short, 300L, 700L),
      std::make_tuple(std::string("configs/two_fluid_shock_tube.yaml"), two_fluid_tube_short, 60L, 150L),
      std::make_tuple(std::string("configs/kinetic_alfven_column.yaml"), kinetic_alfven_short, 600L, 1400L));
  INFO(config);
  const ScratchDir dir("restart-chain");
  const fs::path ref = dir / "ref.h5", out = dir / "run.h5", ckpt = dir / "run.checkpoint.h5";
  const tw::RunSummary r = run_to(config, overrides, ref);
  REQUIRE(r.outcome == "completed");
  REQUIRE(r.steps > second_stop + 10);

  // First segment: stopped on request after step first_stop.
  const tw::RunSummary s1 = run_to(config, overrides, out, first_stop);
  REQUIRE(s1.outcome == "interrupted");
  CHECK(s1.steps == first_stop);  // the flag is read before the next step
  CHECK(s1.checkpoint_file == ckpt.string());
  CHECK(fs::exists(ckpt));
  {
    const tw::io::H5Reader h(out.string());
    CHECK(h.attr_int("/", "complete") == 0);
    CHECK(h.attr_string("/status", "outcome") == "interrupted");
    // The stop time gets a snapshot of its own; continuing drops it again.
    CHECK(h.read_real("/snapshots/time").back() == Approx(s1.t).epsilon(0));
    CHECK_THROWS_WITH(tw::io::H5Reader::open_complete_or_throw(out.string()),
                      Contains("is incomplete") && Contains("interrupted") && Contains("--restart"));
    const tw::io::CheckpointData d = tw::io::read_checkpoint_file(ckpt.string());
    CHECK(d.t == s1.t);
    CHECK(d.step == s1.steps);
    CHECK(d.run_id == h.attr_string("/", "run_id"));
    CHECK(d.reason == "stopped on request");
  }

  // Second segment: continued, stopped again.
  const tw::RunSummary s2 = continue_from(ckpt, second_stop);
  REQUIRE(s2.outcome == "interrupted");
  CHECK(s2.steps == second_stop);
  CHECK(s2.restarts == 1);

  // Third segment: to the end.
  const tw::RunSummary s3 = continue_from(ckpt);
  REQUIRE(s3.outcome == "completed");
  CHECK(s3.steps == r.steps);
  CHECK(s3.restarts == 2);
  CHECK(s3.snapshots == r.snapshots);
  CHECK(s3.probe_samples == r.probe_samples);
  require_identical(out, ref);
  const tw::io::H5Reader h(out.string());
  CHECK(h.attr_int("/status", "restarts") == 2);
  CHECK(h.is_complete());
  // Nothing but the outputs and the checkpoint is left behind.
  CHECK(entries(dir.path()) ==
        std::vector<std::string>{"ref.h5", "ref.xmf", "run.checkpoint.h5", "run.h5", "run.xmf"});
}

TEST_CASE("restart: periodic checkpoints leave the result unchanged and can be continued", "[unit][restart]") {
  const ScratchDir dir("restart-periodic");
  const fs::path ref = dir / "ref.h5", out = dir / "run.h5", ckpt = dir / "run.checkpoint.h5";
  REQUIRE(run_to("configs/demo_column.yaml", demo_short, ref).outcome == "completed");
  std::vector<std::string> o = demo_short;
  o.push_back("checkpoint.interval=1.3e-6");
  const tw::RunSummary s = run_to("configs/demo_column.yaml", o, out);
  REQUIRE(s.outcome == "completed");
  CHECK(s.checkpoints == 4);  // after the steps reaching 1.3, 2.6, 3.9 and 5.2 us
  require_identical(out, ref);
  const tw::io::CheckpointData d = tw::io::read_checkpoint_file(ckpt.string());
  CHECK(d.reason == "simulated-time interval");
  CHECK(d.t >= 5.2e-6 * (1 - 1e-12));  // 5.2 us is a probe time: a step lands on it
  CHECK(d.t < 5.2e-6 + 1e-7);  // the first step end at or after 5.2 us (steps are ~4e-8 s)

  // Continuing from the last checkpoint redoes the tail: rows written after it are
  // dropped and written again, identically.
  const tw::RunSummary c = continue_from(ckpt);
  REQUIRE(c.outcome == "completed");
  require_identical(out, ref);
}

TEST_CASE("restart: keys that steer bookkeeping may change, the case may not", "[unit][restart]") {
  const ScratchDir dir("restart-keys");
  const fs::path out = dir / "run.h5", ckpt = dir / "run.checkpoint.h5";
  REQUIRE(run_to("configs/demo_column.yaml", demo_short, out, 50).outcome == "interrupted");
  const std::string before = bytes_of(out);

  SECTION("a changed grid is refused at the key, with the run file's position") {
    CHECK_THROWS_WITH(continue_from(ckpt, -1, {"grid.cells=400"}),
                      Contains("key 'grid.cells'") && Contains("differs from the run in checkpoint") &&
                          Contains("another grid") && Contains("'400' here, '200' in the checkpoint"));
  }
  SECTION("a changed model key is refused") {
    CHECK_THROWS_WITH(continue_from(ckpt, -1, {"numerics.flux=hll"}),
                      Contains("key 'numerics.flux'") && Contains("same case"));
  }
  SECTION("time.max_steps may change") {
    const tw::RunSummary c = continue_from(ckpt, -1, {"time.max_steps=60"});
    CHECK(c.outcome == "failed");  // the new limit applies
    CHECK(c.steps == 60);
    return;
  }
  // Refused restarts write nothing: the output is as it was, no file was added.
  CHECK(bytes_of(out) == before);
  CHECK(entries(dir.path()) == std::vector<std::string>{"run.checkpoint.h5", "run.h5", "run.xmf"});
}

TEST_CASE("restart: a checkpoint of another build, model or run is refused with exit code 2", "[unit][restart]") {
  const ScratchDir dir("restart-refused");
  const fs::path out = dir / "run.h5", ckpt = dir / "run.checkpoint.h5";
  const std::string cfg = source_path("configs/demo_column.yaml").string();
  REQUIRE(run_to("configs/demo_column.yaml", demo_short, out, 50).outcome == "interrupted");
  const fs::path other = dir / "other.h5";
  REQUIRE(run_to("configs/demo_column.yaml", demo_short, other).outcome == "completed");
  const std::string before = bytes_of(out);

  std::string args, expect;
  SECTION("another build") {
    set_root_string(ckpt, "git_revision", "0123456789ab");
    args = "run --restart " + quoted(ckpt.string());
    expect = "was written by tubewave";
  }
  SECTION("another model") {
    set_root_string(ckpt, "model", "hall (nonlinear)");
    args = "run --restart " + quoted(ckpt.string());
    expect = "holds a run of the hall (nonlinear) model";
  }
  SECTION("a run file of another grid") {
    args = "run --restart " + quoted(ckpt.string()) + " " + quoted(cfg) + " --set grid.cells=200 --set time.end=6e-6" +
           " --set grid.length=12";
    expect = "key 'grid.length': differs from the run in checkpoint";
  }
  SECTION("a run output instead of a checkpoint") {
    args = "run --restart " + quoted(out.string());
    expect = "is not a tubewave checkpoint";
  }
  SECTION("the output of another run") {
    args = "run --restart " + quoted(ckpt.string()) + " -o " + quoted(other.string());
    expect = "belongs to another run";
  }
  SECTION("a missing checkpoint") {
    args = "run --restart " + quoted((dir / "none.h5").string());
    expect = "no such file";
  }
  const std::string other_before = bytes_of(other);
  const auto r = tw::test::run_tubewave(args + " --quiet", dir.path());
  INFO(r.output);
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.output, Contains(expect));
  CHECK(bytes_of(out) == before);
  CHECK(bytes_of(other) == other_before);
  CHECK(entries(dir.path()) ==
        std::vector<std::string>{"other.h5", "other.xmf", "run.checkpoint.h5", "run.h5", "run.xmf"});
}

TEST_CASE("restart: an output older than the checkpoint is refused", "[unit][restart]") {
  const ScratchDir dir("restart-old-output");
  const fs::path out = dir / "run.h5", ckpt = dir / "run.checkpoint.h5", old = dir / "old.h5";
  REQUIRE(run_to("configs/demo_column.yaml", demo_short, out, 50).outcome == "interrupted");
  fs::copy_file(out, old);
  REQUIRE(continue_from(ckpt, 300).outcome == "interrupted");
  tw::RestartArgs a;
  a.checkpoint = ckpt.string();
  a.output = old.string();
  CHECK_THROWS_WITH(tw::restart_case(a), Contains("the checkpoint needs") && Contains("an older copy"));
  CHECK_THROWS_AS(tw::restart_case(a), tw::InputError);
}

TEST_CASE("restart: SIGTERM stops a run with exit code 3; the CLI continues it on more threads, bitwise",
          "[unit][restart]") {
  // 2048 cells: the loops run on several threads (core/parallel.hpp), and the continued
  // run uses a different thread count than the first segment and the reference.
  const ScratchDir dir("restart-sigterm");
  const std::string cfg = source_path("configs/demo_column.yaml").string();
  const std::vector<std::string> sets{"--set", "grid.cells=2048", "--set", "time.end=10e-6"};
  std::vector<std::string> run{"run", cfg, "-o", "run.h5", "--quiet", "--threads", "1"};
  run.insert(run.end(), sets.begin(), sets.end());
  const int pid = tw::test::start_tubewave(run, dir.path(), dir / "log1.txt");
  // Wait until the run is under way (its temporary output exists), then a little more.
  for (int i = 0; i < 400 && entries(dir.path()).size() < 2; ++i) ::usleep(10000);
  ::usleep(100000);
  ::kill(pid, SIGTERM);
  const int code = tw::test::wait_tubewave(pid);
  const std::string log = bytes_of(dir / "log1.txt");
  INFO(log);
  REQUIRE(code == 3);
  CHECK_THAT(log, Contains("interrupted"));
  CHECK_THAT(log, Contains("SIGTERM"));
  CHECK_THAT(log, Contains("tubewave run --restart run.checkpoint.h5"));
  CHECK(tw::io::read_checkpoint_file((dir / "run.checkpoint.h5").string()).reason == "stopped by SIGTERM");

  // Passive waiting: on a loaded machine, spinning OpenMP threads slow a run tenfold.
  const auto c = tw::test::run_tubewave("run --restart run.checkpoint.h5 --quiet --threads 2", dir.path(),
                                        "OMP_WAIT_POLICY=passive");
  INFO(c.output);
  REQUIRE(c.exit_code == 0);
  std::string ref = "run " + quoted(cfg) + " -o ref.h5 --quiet --threads 1";
  for (std::size_t i = 1; i < sets.size(); i += 2) ref += " --set " + sets[i];
  REQUIRE(tw::test::run_tubewave(ref, dir.path()).exit_code == 0);
  require_identical(dir / "run.h5", dir / "ref.h5");
}

TEST_CASE("restart: kill -9 at any moment leaves no complete-looking output and a usable checkpoint",
          "[unit][restart]") {
  // Frequent wall-clock checkpoints (each publishes the output so far), then SIGKILL at
  // moments spread over the run. Whatever is left: the output at its final name is readable
  // and incomplete (or the whole run finished), the checkpoint (if any) is complete, and
  // continuing from it gives the uninterrupted result bit for bit.
  const ScratchDir dir("restart-kill");
  const std::string cfg = source_path("configs/demo_column.yaml").string();
  // About a second of running (not much less: process start-up and the first checkpoint
  // must be a small part of it, or every kill lands before the first checkpoint).
  const std::vector<std::string> sets{"grid.cells=3200", "time.end=24e-6", "checkpoint.wall_interval=0.03"};
  std::string ref = "run " + quoted(cfg) + " -o ref.h5 --quiet --threads 1";
  for (const auto& s : sets) ref += " --set " + s;
  const auto t0 = std::chrono::steady_clock::now();
  REQUIRE(tw::test::run_tubewave(ref, dir.path()).exit_code == 0);
  const double duration = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  const fs::path reference = dir / "ref.h5";

  int continued = 0;
  for (int k = 0; k < 8; ++k) {
    const ScratchDir run_dir("restart-kill-" + std::to_string(k));
    std::vector<std::string> args{"run", cfg, "-o", "run.h5", "--quiet", "--threads", "1"};
    for (const auto& s : sets) {
      args.push_back("--set");
      args.push_back(s);
    }
    const fs::path out = run_dir / "run.h5", ckpt = run_dir / "run.checkpoint.h5";
    const int pid = tw::test::start_tubewave(args, run_dir.path(), run_dir / "log.txt");
    // The first half at moments spread over the run (wall clock: on a loaded machine these
    // may all land before the first checkpoint); the second half once a checkpoint exists,
    // so the continuing path is always exercised.
    if (k >= 4)
      for (int i = 0; i < 3000 && !fs::exists(ckpt); ++i) ::usleep(10000);
    const double wait = duration * (k < 4 ? 0.1 + 0.11 * k : 0.05 * (k - 4));
    ::usleep(static_cast<useconds_t>(1e6 * wait));
    ::kill(pid, SIGKILL);
    const int code = tw::test::wait_tubewave(pid);
    INFO("kill " << k << " after " << wait << " s" << (k >= 4 ? " past the first checkpoint" : "") << ", exit "
                 << code);
    if (code == 0) {  // finished before the kill: a complete, correct file
      require_identical(out, reference);
      continue;
    }
    REQUIRE(code == 137);
    if (fs::exists(out)) {
      const tw::io::H5Reader h(out.string());
      CHECK(h.attr_int("/", "complete") == 0);
      CHECK(h.attr_string("/status", "outcome") == "running");
      CHECK_THROWS_AS(tw::io::H5Reader::open_complete_or_throw(out.string()), tw::InputError);
    }
    if (!fs::exists(ckpt)) continue;
    ++continued;
    const auto c = tw::test::run_tubewave("run --restart run.checkpoint.h5 --quiet --threads 1", run_dir.path());
    INFO(c.output);
    REQUIRE(c.exit_code == 0);
    require_identical(out, reference);
  }
  CHECK(continued >= 3);
}

TEST_CASE("restart: the checkpoint cannot be the output file", "[unit][restart]") {
  const ScratchDir dir("restart-same-file");
  const fs::path out = dir / "run.h5";
  std::vector<std::string> o = demo_short;
  o.push_back("checkpoint.file=" + out.string());
  try {
    (void)run_to("configs/demo_column.yaml", o, out);
    FAIL("the run started");
  } catch (const tw::io::ConfigError& e) {
    CHECK(e.exit_code() == 2);
    CHECK_THAT(std::string(e.what()), Contains("(--set checkpoint.file=") && Contains("key 'checkpoint.file'") &&
                                          Contains("cannot be the output file"));
  }
  CHECK(entries(dir.path()).empty());
}
