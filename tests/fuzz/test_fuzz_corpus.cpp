// Replays the run-file fuzz corpus (tests/fuzz/corpus/runfile: the inputs libFuzzer kept,
// including every finding that was fixed) through the fuzz target's body: each input must be
// accepted or rejected with an InputError, never anything else.
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "fuzz/runfile_target.hpp"
#include "support/test_support.hpp"

namespace fs = std::filesystem;

TEST_CASE("fuzz corpus: every kept input is accepted or rejected cleanly", "[unit][fuzz]") {
  const fs::path dir = tw::test::source_path("tests/fuzz/corpus/runfile");
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(dir))
    if (e.is_regular_file()) files.push_back(e.path());
  std::sort(files.begin(), files.end());
  REQUIRE(files.size() >= 50);
  int accepted = 0, rejected = 0;
  for (const auto& f : files) {
    std::ifstream in(f, std::ios::binary);
    const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    const auto r = tw::fuzz::run_file_input(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
    INFO(f.filename().string() << ": " << r.message);
    CHECK(r.verdict != tw::fuzz::Verdict::bug);
    (r.verdict == tw::fuzz::Verdict::accepted ? accepted : rejected)++;
  }
  // The corpus exercises both sides of the loader.
  CHECK(accepted >= 5);
  CHECK(rejected >= 20);
}
