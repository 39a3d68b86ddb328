#pragma once
/// Test helpers for run-file errors, including a driver for a corpus of broken run files.
///
/// A corpus file is an ordinary run file whose comment lines (anywhere, usually at the top)
/// say what loading it must report:
///
///   # expect-error: broken_density.yaml:4:12
///   # expect-error: key 'plasma.density'
///   # expect-error: must be > 0 (got -1e+18)
///   # set: numerics.cfl=0.5          (optional: an override applied while loading)
///
/// `check_broken_run_file(path, schema)` loads the file and requires a ConfigError (exit
/// code 2) whose message contains every `expect-error` fragment. A file without any
/// `expect-error` line fails, so a corpus entry can never pass vacuously.
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "io/runfile.hpp"
#include "io/schema.hpp"

namespace tw::test {

/// Load `text` and return the ConfigError's message; the calling test fails if it loads.
inline std::string config_error_of(const std::string& text, const io::Schema& schema,
                                   const std::vector<std::string>& overrides = {},
                                   const std::string& name = "run.yaml") {
  try {
    (void)io::RunFile::parse(text, name, schema, overrides);
  } catch (const io::ConfigError& e) {
    CHECK(e.exit_code() == 2);
    return e.what();
  }
  FAIL("expected a ConfigError, but the run file loaded:\n" << text);
  return {};
}

/// What a corpus file expects: message fragments and overrides.
struct BrokenFileExpectation {
  std::vector<std::string> fragments;  ///< from "# expect-error: ..." lines
  std::vector<std::string> overrides;  ///< from "# set: key=value" lines
};

/// Read the "# expect-error:" and "# set:" comment lines of a run file's text.
inline BrokenFileExpectation read_expectations(const std::string& text) {
  BrokenFileExpectation x;
  std::istringstream in(text);
  std::string line;
  const auto strip = [](std::string s) {
    s.erase(0, s.find_first_not_of(" \t"));
    s.erase(s.find_last_not_of(" \t\r") + 1);
    return s;
  };
  while (std::getline(in, line)) {
    const std::string t = strip(line);
    if (t.rfind('#', 0) != 0) continue;
    const std::string body = strip(t.substr(1));
    if (body.rfind("expect-error:", 0) == 0)
      x.fragments.push_back(strip(body.substr(13)));
    else if (body.rfind("set:", 0) == 0)
      x.overrides.push_back(strip(body.substr(4)));
  }
  return x;
}

/// Load a broken run file and check its error against the file's own expectations.
inline void check_broken_run_file(const std::filesystem::path& path, const io::Schema& schema) {
  INFO("broken run file: " << path.string());
  std::ifstream in(path);
  REQUIRE(in.good());
  std::ostringstream text;
  text << in.rdbuf();
  const BrokenFileExpectation x = read_expectations(text.str());
  REQUIRE_FALSE(x.fragments.empty());
  std::string message;
  try {
    (void)io::RunFile::load(path.string(), schema, x.overrides);
  } catch (const io::ConfigError& e) {
    CHECK(e.exit_code() == 2);
    message = e.what();
  }
  INFO("message: " << message);
  REQUIRE_FALSE(message.empty());
  for (const auto& f : x.fragments) CHECK_THAT(message, Catch::Matchers::Contains(f));
}

/// The *.yaml files of a folder, sorted by name (a stable order for a corpus).
inline std::vector<std::filesystem::path> yaml_files_in(const std::filesystem::path& dir) {
  std::vector<std::filesystem::path> files;
  for (const auto& e : std::filesystem::directory_iterator(dir))
    if (e.is_regular_file() && e.path().extension() == ".yaml") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

}  // namespace tw::test
