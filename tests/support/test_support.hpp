#pragma once
/// Helpers shared by the tests: paths into the source tree, scratch directories,
/// running the `tubewave` executable.
#include <filesystem>
#include <string>
#include <vector>

namespace tw::test {

/// Absolute path of a file in the source tree, e.g. source_path("configs/sod.yaml").
std::filesystem::path source_path(const std::string& relative);

/// A fresh, empty directory under the system temp dir, removed when the object dies.
class ScratchDir {
 public:
  explicit ScratchDir(const std::string& tag);
  ScratchDir(const ScratchDir&) = delete;
  ScratchDir& operator=(const ScratchDir&) = delete;
  ~ScratchDir();
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }
  [[nodiscard]] std::filesystem::path operator/(const std::string& name) const { return path_ / name; }

 private:
  std::filesystem::path path_;
};

/// Result of running the tubewave executable.
struct CommandResult {
  int exit_code = -1;
  std::string output;  ///< stdout and stderr together
};

/// Run `tubewave ARGS` (ARGS is appended after the executable path, shell-quoted by the
/// caller where needed) in `workdir`, capturing output. `environment` ("NAME=value ...") is
/// set for the command only.
CommandResult run_tubewave(const std::string& args, const std::filesystem::path& workdir = {},
                           const std::string& environment = {});

/// Start `tubewave ARGS...` in the background in `workdir` (stdout and stderr to `log`) and
/// return its process id, for tests that signal or kill a running process.
int start_tubewave(const std::vector<std::string>& args, const std::filesystem::path& workdir,
                   const std::filesystem::path& log);

/// Wait for a process started by start_tubewave: its exit code, or 128 + the signal that
/// ended it (the shell's convention: 137 for SIGKILL).
int wait_tubewave(int pid);

/// Write `text` to `path` (helper for inline run files).
void write_text(const std::filesystem::path& path, const std::string& text);

}  // namespace tw::test
