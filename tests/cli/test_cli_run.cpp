// The `tubewave` executable: `run`, `check` and `keys`, their exit codes, and what a run
// leaves in the working directory (a complete file, a file marked failed, or nothing).
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "io/config_error_check.hpp"
#include "io/h5read.hpp"
#include "io/schema.hpp"
#include "sim/run.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::test::run_tubewave;
using tw::test::ScratchDir;
using tw::test::source_path;
namespace fs = std::filesystem;

namespace {

/// Single-quote a word for /bin/sh.
std::string quoted(const std::string& s) {
  std::string r = "'";
  for (char c : s) r += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return r + "'";
}

/// The names of everything in a directory, sorted.
std::vector<std::string> entries(const fs::path& dir) {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir)) names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

std::string read_text(const fs::path& p) {
  std::ifstream in(p);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

}  // namespace

TEST_CASE("cli: --help lists the run, check, keys and plasma commands", "[unit]") {
  const auto r = run_tubewave("--help");
  CHECK(r.exit_code == 0);
  for (const char* c : {"run", "check", "keys", "plasma"})
    CHECK_THAT(r.output, Contains(std::string("\n  ") + c + " "));
}

TEST_CASE("cli: run --help explains the command and exits 0", "[unit]") {
  const auto r = run_tubewave("run --help");
  CHECK(r.exit_code == 0);
  CHECK_THAT(r.output, Contains("usage: tubewave run FILE.yaml"));
  CHECK_THAT(r.output, Contains("--set"));
  CHECK_THAT(r.output, Contains("--output"));
}

TEST_CASE("cli: check prints the time step and what limits it", "[unit]") {
  const auto r = run_tubewave("check " + quoted(source_path("configs/demo_column.yaml").string()));
  INFO(r.output);
  CHECK(r.exit_code == 0);
  CHECK_THAT(r.output, Contains("valid"));
  CHECK_THAT(r.output, Contains("time step"));
  CHECK_THAT(r.output, Contains("limited by"));
}

TEST_CASE("cli: check and run of a missing run file exit 2 and name it", "[unit]") {
  const ScratchDir dir("cli-missing");
  for (const char* cmd : {"check", "run"}) {
    const auto r = run_tubewave(std::string(cmd) + " no_such_run_file.yaml -o out.h5", dir.path());
    INFO(r.output);
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Contains("no_such_run_file.yaml"));
    CHECK_THAT(r.output, Contains("does not exist"));
  }
  CHECK(entries(dir.path()).empty());
}

TEST_CASE("cli: a small run completes, exits 0 and leaves one complete file and its XDMF sidecar", "[unit]") {
  const ScratchDir dir("cli-run");
  const auto r = run_tubewave("run " + quoted(source_path("configs/sod_shock_tube.yaml").string()) +
                                  " -o sod.h5 --quiet --threads 1 --set grid.cells=50"
                                  " --set time.end=0.02",
                              dir.path());
  INFO(r.output);
  CHECK(r.exit_code == 0);
  CHECK_THAT(r.output, Contains("completed"));
  // Only the final file and its sidecar: the temporary ones were renamed.
  CHECK(entries(dir.path()) == std::vector<std::string>{"sod.h5", "sod.xmf"});
  const tw::io::H5Reader h((dir / "sod.h5").string());
  CHECK(h.is_complete());
  CHECK(h.attr_int("/", "complete") == 1);
  CHECK(h.attr_string("/status", "outcome") == "completed");
  CHECK(h.attr_real("/status", "simulated_time") == Approx(0.02).epsilon(1e-12));
  // A normalized run: positions and times are numbers without SI units; no probes, no list.
  CHECK(h.attr_string("/grid/x", "units") == "1");
  CHECK(h.attr_string("/snapshots/time", "units") == "1");
  CHECK(h.attr_string("/history/time", "units") == "1");
  CHECK_FALSE(h.exists("/grid/probe_x"));
}

TEST_CASE("cli: an SI run with probes stores their positions and SI axis units", "[unit]") {
  const ScratchDir dir("cli-run-probes");
  const auto r = run_tubewave("run " + quoted(source_path("configs/demo_column.yaml").string()) +
                                  " -o demo.h5 --quiet --threads 1 --set grid.cells=100 --set time.end=1e-6"
                                  " --set output.probes=[3,7.5,30]",
                              dir.path());
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  const tw::io::H5Reader h((dir / "demo.h5").string());
  CHECK(h.read_real("/grid/probe_x") == std::vector<double>{3.0, 7.5, 30.0});
  CHECK(h.attr_string("/grid/probe_x", "units") == "m");
  CHECK(h.attr_string("/grid/x", "units") == "m");
  CHECK(h.attr_string("/probes/time", "units") == "s");
  CHECK(h.shape("/probes/velocity_y").at(1) == 3);
}

TEST_CASE("cli: a run that blows up exits 1 and leaves a file marked failed", "[unit]") {
  // The Brio & Wu shock tube with both states at pressure 1e-8 (plasma beta ~ 1e-8) and
  // Courant number 1. The pressure is the small difference of the total, kinetic and
  // magnetic energies, and the fast shocks drive it negative within a few hundred steps:
  // the known weakness of conservative MHD schemes at low beta (common practice; nothing
  // here restores positivity). If the scheme ever gains a positivity fix, this case needs
  // another way to fail.
  const ScratchDir dir("cli-blowup");
  const auto r = run_tubewave(
      "run " + quoted(source_path("configs/brio_wu_shock_tube.yaml").string()) +
          " -o blowup.h5 --quiet --threads 1 --set grid.cells=100 --set numerics.cfl=1"
          " --set initial.left.pressure=1e-8 --set initial.right.pressure=1e-8",
      dir.path());
  INFO(r.output);
  CHECK(r.exit_code == 1);
  CHECK_THAT(r.output, Contains("non-physical state"));
  // A normalized run: the numbers of the message carry no SI units.
  CHECK_THAT(r.output, Contains("(normalized units):"));
  CHECK_THAT(r.output, !Contains(" m) at t") && !Contains(" s (Runge") && !Contains(" s) was kept"));
  CHECK_THAT(r.output, Contains("failed"));
  REQUIRE(entries(dir.path()) == std::vector<std::string>{"blowup.h5", "blowup.xmf"});
  const tw::io::H5Reader h((dir / "blowup.h5").string());
  CHECK_FALSE(h.is_complete());
  CHECK(h.attr_int("/", "complete") == 0);
  CHECK(h.attr_string("/status", "outcome") == "failed");
  CHECK_THAT(h.attr_string("/status", "message"), Contains("non-physical state"));
  // The last good state was kept: it ends before the end time, after the start.
  const double t_failed = h.attr_real("/status", "simulated_time");
  CHECK(t_failed > 0);
  CHECK(t_failed < 0.1);
  const auto times = h.read_real("/snapshots/time");
  REQUIRE_FALSE(times.empty());
  CHECK(times.back() == Approx(t_failed).epsilon(1e-12));
}

TEST_CASE("cli: keys prints every top-level section", "[unit]") {
  const auto r = run_tubewave("keys");
  CHECK(r.exit_code == 0);
  // The sections as declared today, then whatever the schema declares (new sections too).
  for (const char* s : {"model", "normalized", "plasma", "grid", "time", "numerics",
                        "boundaries", "output", "initial"})
    CHECK_THAT(r.output, Contains(std::string("## `") + s + "`"));
  int sections = 0;
  for (const auto& k : tw::run_schema().root().keys()) {
    if (k.type != tw::io::KeyType::section) continue;
    ++sections;
    CHECK_THAT(r.output, Contains("## `" + k.name + "`"));
  }
  CHECK(sections >= 9);
}

TEST_CASE("cli: bad run files exit 2 naming key and line, and write nothing", "[unit]") {
  // The whole corpus in tests/io/bad_runfiles (also checked in-process, with the expected
  // messages, by test_bad_runfiles.cpp), through `tubewave run` as a user meets it: loader
  // errors, setup errors and bad overrides.
  const auto files = tw::test::yaml_files_in(source_path("tests/io/bad_runfiles"));
  REQUIRE(files.size() >= 60);
  // Errors of the whole file (syntax, shape of the document, a malformed override) name
  // no key; every other message names one.
  const auto whole_file_error = [](const std::string& name) {
    for (const char* prefix : {"syntax_", "top_level_", "empty_file", "two_documents", "override_empty_key",
                               "override_without_equals"})
      if (name.rfind(prefix, 0) == 0) return true;
    return false;
  };
  for (const auto& file : files) {
    const std::string name = file.filename().string();
    INFO("corpus file: " << file.string());
    const auto x = tw::test::read_expectations(read_text(file));
    REQUIRE_FALSE(x.fragments.empty());
    std::string args = "run " + quoted(file.string()) + " -o out.h5 --quiet";
    for (const auto& o : x.overrides) args += " --set " + quoted(o);
    const ScratchDir dir("cli-bad");
    const auto r = run_tubewave(args, dir.path());
    INFO("output: " << r.output);
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Contains("error"));
    // Position (file:line:column or the override), key and reason, as the file expects.
    for (const auto& f : x.fragments) CHECK_THAT(r.output, Contains(f));
    CHECK_THAT(r.output, Contains(name));
    if (!whole_file_error(name)) CHECK_THAT(r.output, Contains("key '"));
    // Nothing written: neither the output nor a temporary file.
    CHECK(entries(dir.path()).empty());
  }
}
