#pragma once
/// The run-file fuzz target's body, shared by the libFuzzer executable (fuzz_runfile.cpp,
/// built with -DTUBEWAVE_FUZZ=ON) and the corpus replay test (test_fuzz_corpus.cpp, part of
/// the default test run), so every input the fuzzer kept is checked on every build.
///
/// Input: the text of a run file. Lines at the very top of the form "#!set KEY=VALUE" become
/// --set overrides (so the fuzzer reaches the override parser too). The text is loaded
/// against the full run-file schema; when it loads and the grid is small (at most
/// `max_setup_cells` cells, to keep memory bounded), the case is also set up as `tubewave
/// check` does (initial state, ends, time step), without writing anything.
///
/// Contract under test: any input is either accepted or rejected with an InputError
/// (exit code 2) carrying a message. Anything else - another exception, an InternalError, a
/// crash, a sanitizer report - is a finding.
#include <cstddef>
#include <cstdint>
#include <string>

namespace tw::fuzz {

/// Largest grid the target sets up (the loader itself accepts up to 1e8 cells).
inline constexpr long max_setup_cells = 256;

enum class Verdict { accepted, rejected, bug };

struct Result {
  Verdict verdict = Verdict::accepted;
  std::string message;  ///< the error's text (rejected, bug)
};

Result run_file_input(const std::uint8_t* data, std::size_t size);

}  // namespace tw::fuzz
