#include "support/test_support.hpp"

#include <fcntl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <array>
#include <cerrno>
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

CommandResult run_tubewave(const std::string& args, const std::filesystem::path& workdir,
                           const std::string& environment) {
  std::string cmd;
  if (!workdir.empty()) cmd = "cd '" + workdir.string() + "' && ";
  if (!environment.empty()) cmd += "env " + environment + " ";
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

int start_tubewave(const std::vector<std::string>& args, const std::filesystem::path& workdir,
                   const std::filesystem::path& log) {
  std::vector<std::string> argv_s{TUBEWAVE_EXE};
  argv_s.insert(argv_s.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : argv_s) argv.push_back(a.data());
  argv.push_back(nullptr);
  const pid_t pid = ::fork();
  if (pid < 0) throw std::runtime_error("fork failed");
  if (pid == 0) {  // the child: only async-signal-safe calls until exec
    if (::chdir(workdir.c_str()) != 0) ::_exit(126);
    const int fd = ::open(log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    if (fd < 0) ::_exit(126);
    ::dup2(fd, STDOUT_FILENO);
    ::dup2(fd, STDERR_FILENO);
    ::execv(argv[0], argv.data());
    ::_exit(127);
  }
  return pid;
}

int wait_tubewave(int pid) {
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) throw std::runtime_error("waitpid failed");
  }
  if (WIFEXITED(status)) return WEXITSTATUS(status);
  if (WIFSIGNALED(status)) return 128 + WTERMSIG(status);
  return -1;
}

void write_text(const std::filesystem::path& path, const std::string& text) {
  std::ofstream out(path);
  if (!out) throw std::runtime_error("cannot write " + path.string());
  out << text;
}

}  // namespace tw::test
