#include "fuzz/runfile_target.hpp"

#include <exception>
#include <sstream>
#include <vector>

#include "core/error.hpp"
#include "io/runfile.hpp"
#include "sim/run.hpp"

namespace tw::fuzz {

Result run_file_input(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  // "#!set KEY=VALUE" lines at the top are overrides; they stay in the text as comments.
  std::vector<std::string> overrides;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line) && line.rfind("#!set ", 0) == 0) overrides.push_back(line.substr(6));
  Result r;
  try {
    const io::RunFile rf = io::RunFile::parse(text, "fuzz.yaml", run_schema(), overrides);
    if (rf.get_int("grid.cells") <= max_setup_cells) (void)check_case(rf, "fuzz-output.h5");
  } catch (const InputError& e) {
    r.verdict = Verdict::rejected;
    r.message = e.what();
    if (r.message.empty()) {
      r.verdict = Verdict::bug;
      r.message = "an InputError without a message";
    }
  } catch (const std::exception& e) {
    r.verdict = Verdict::bug;
    r.message = std::string("unexpected error: ") + e.what();
  } catch (...) {
    r.verdict = Verdict::bug;
    r.message = "an exception of unknown type";
  }
  return r;
}

}  // namespace tw::fuzz
