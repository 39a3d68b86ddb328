#include "support/test_support.hpp"

#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <atomic>
#include <cstdio>
#include <fstream>
#include <stdexcept>

namespace tw::test {

std::filesystem::path source_path(const std::string& relative) {
  return std::filesystem::path(TUBEWAVE_SOURCE_DIR) / relative;
}

ScratchDir::ScratchDir(const std::string& tag) {
  static std::atomic<int> counter{0};
  path_ = std::filesystem::temp_directory_path() /
          ("tubewave-test-" + tag + "-" + std::to_string(::getpid()) + "-" +
           std::to_string(counter++));
  std::filesystem::remove_all(path_);
  std::filesystem::create_directories(path_);
}

ScratchDir::~ScratchDir() {
  std::error_code ec;
  std::filesystem::remove_all(path_, ec);
}

CommandResult run_tubewave(const std::string& args, const std::filesystem::path& workdir) {
  std::string cmd;
  if (!workdir.empty()) cmd = "cd '" + workdir.string() + "' && ";
  cmd += std::string("'") + TUBEWAVE_EXE + "' " + args + " 2>&1";
  CommandResult r;
  FILE* pipe = ::popen(cmd.c_str(), "r");
  if (pipe == nullptr) throw std::runtime_error("popen failed: " + cmd);
  std::array<char, 4096> buf{};
  std::size_t n = 0;
  while ((n = std::fread(buf.data(), 1, buf.size(), pipe)) > 0) r.output.append(buf.data(), n);
  const int status = ::pclose(pipe);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

void write_text(const std::filesystem::path& path, const std::string& text) {
  std::ofstream out(path);
  if (!out) throw std::runtime_error("cannot write " + path.string());
  out << text;
}

}  // namespace tw::test
