// The corpus of broken run files in tests/io/bad_runfiles/: every file must be rejected by
// the loader or by the case setup (what `tubewave check` does) with a ConfigError (exit
// code 2) whose message contains the file's own "# expect-error:" fragments: the file
// name with line and column (or the override), the key path and the reason.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "io/config_error_check.hpp"
#include "io/runfile.hpp"
#include "sim/run.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using Catch::Matchers::StartsWith;
namespace fs = std::filesystem;

namespace {

fs::path corpus_dir() { return tw::test::source_path("tests/io/bad_runfiles"); }

std::string read_text(const fs::path& p) {
  std::ifstream in(p);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

/// How loading and setting up a case ended.
struct SetupOutcome {
  bool config_error = false;  ///< a ConfigError was thrown
  int exit_code = -1;         ///< of whatever tubewave error was thrown
  std::string message;        ///< its what(); empty if the case was accepted
};

/// Load `file` with overrides and set the case up as `tubewave check` does, without
/// running it. `output` is the output file named to the setup (never written).
SetupOutcome load_and_set_up(const fs::path& file, const std::vector<std::string>& overrides,
                             const fs::path& output) {
  SetupOutcome r;
  try {
    const tw::io::RunFile rf = tw::load_run_file(file.string(), overrides);
    (void)tw::check_case(rf, output.string());
  } catch (const tw::io::ConfigError& e) {
    r.config_error = true;
    r.exit_code = e.exit_code();
    r.message = e.what();
  } catch (const tw::Error& e) {  // a wrong error class: reported by the caller
    r.exit_code = e.exit_code();
    r.message = e.what();
  }
  return r;
}

}  // namespace

TEST_CASE("bad run files: the corpus is large and every file documents its error", "[unit]") {
  const auto files = tw::test::yaml_files_in(corpus_dir());
  CHECK(files.size() >= 60);
  // A position is "NAME.yaml:LINE:COL:" (file errors, keys) or "NAME.yaml (--set ...)".
  for (const auto& f : files) {
    INFO("corpus file: " << f.filename().string());
    const std::string text = read_text(f);
    // The first line says what is wrong, in words.
    const std::string first = text.substr(0, text.find('\n'));
    CHECK_THAT(first, StartsWith("# "));
    CHECK_THAT(first, !Contains("expect-error:") && !Contains("set:"));
    CHECK(first.size() > 12);
    const auto x = tw::test::read_expectations(text);
    CHECK(x.fragments.size() >= 2);  // a position and a reason at least
    const std::string name = f.filename().string();
    const std::regex position("^" + std::regex_replace(name, std::regex(R"([.])"), R"(\.)") +
                              R"((:[0-9]+:[0-9]+:| \(--set ).*)");
    bool has_position = false;
    for (const auto& frag : x.fragments) has_position = has_position || std::regex_match(frag, position);
    CHECK(has_position);
  }
}

TEST_CASE("bad run files: each is rejected with its expected message", "[unit]") {
  const tw::test::ScratchDir dir("bad-runfiles");
  const auto files = tw::test::yaml_files_in(corpus_dir());
  REQUIRE_FALSE(files.empty());
  for (const auto& f : files) {
    INFO("corpus file: " << f.string());
    const auto x = tw::test::read_expectations(read_text(f));
    const SetupOutcome r = load_and_set_up(f, x.overrides, dir / (f.stem().string() + ".h5"));
    INFO("message: " << r.message);
    CHECK(r.config_error);
    CHECK(r.exit_code == 2);
    // The message names the file as it was given.
    CHECK_THAT(r.message, StartsWith(f.string()));
    for (const auto& frag : x.fragments) CHECK_THAT(r.message, Contains(frag));
  }
  // Setting a case up writes nothing.
  CHECK(fs::is_empty(dir.path()));
}

TEST_CASE("bad run files: the valid cases the corpus is built from set up cleanly", "[unit]") {
  // Each corpus file is one of these three cases with one fault added, so its error must
  // come from that fault. This also shows that the loop above reports no error for a
  // valid file, so the corpus cannot pass because setup rejects everything.
  const tw::test::ScratchDir dir("bad-runfiles-bases");
  const std::string si = R"(title: corpus case (SI units)
plasma:
  ion: He
  density: 1.0e18
  electron_temperature: 5
  ion_temperature: 1
  field: 0.1
grid:
  length: 10.0
  cells: 100
time:
  end: 1.0e-6
boundaries:
  left: {kind: conducting}
  right: {kind: conducting}
)";
  const std::string riemann = R"(title: corpus case (normalized units)
units: normalized
model:
  gamma: 1.4
plasma:
  density: 1
  field: 0.5
grid:
  length: 1.0
  cells: 64
time:
  end: 0.1
initial:
  kind: riemann
  position: 0.5
  left: {mass_density: 1.0, pressure: 1.0}
  right: {mass_density: 0.125, pressure: 0.1}
boundaries:
  left: {kind: zero-gradient}
  right: {kind: zero-gradient}
)";
  const std::string wave = R"(title: corpus case (a wave in normalized units)
units: normalized
plasma:
  density: 1
  ion_temperature: 0.3
  electron_temperature: 0.3
  field: 1.5
  field_angle_deg: 30
grid:
  length: 1.0
  cells: 64
time:
  end: 0.5
initial:
  kind: wave
  mode: alfven
  amplitude: 1.0e-6
boundaries:
  left: {kind: periodic}
  right: {kind: periodic}
)";
  int k = 0;
  for (const std::string* base : {&si, &riemann, &wave}) {
    const fs::path file = dir / ("base" + std::to_string(k++) + ".yaml");
    tw::test::write_text(file, *base);
    const SetupOutcome r = load_and_set_up(file, {}, dir / "base.h5");
    INFO(file.filename().string() << " message: " << r.message);
    CHECK_FALSE(r.config_error);
    CHECK(r.message.empty());
  }
}
