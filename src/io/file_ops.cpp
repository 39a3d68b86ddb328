#include "io/file_ops.hpp"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <system_error>

#include "core/error.hpp"

namespace tw::io {

namespace fs = std::filesystem;

namespace {

/// fsync an open-able path (a file, or a directory opened read-only).
void sync_path(const std::string& path, bool directory) {
  const int fd = ::open(path.c_str(), (directory ? O_RDONLY | O_DIRECTORY : O_RDWR) | O_CLOEXEC);
  if (fd < 0) throw RunError("cannot open '" + path + "' to sync it: " + std::strerror(errno));
  const int rc = ::fsync(fd);
  const int err = errno;
  ::close(fd);
  // Some file systems do not sync directories (EINVAL); the rename itself is still atomic.
  if (rc != 0 && !(directory && (err == EINVAL || err == ENOTSUP)))
    throw RunError("cannot sync '" + path + "' to disk: " + std::strerror(err));
}

std::string directory_of(const std::string& path) {
  const fs::path dir = fs::path(path).parent_path();
  return dir.empty() ? std::string(".") : dir.string();
}

}  // namespace

void sync_file(const std::string& path) { sync_path(path, false); }

void replace_file(const std::string& temp_path, const std::string& final_path) {
  sync_path(temp_path, false);
  std::error_code ec;
  fs::rename(temp_path, final_path, ec);
  if (ec)
    throw RunError("cannot rename '" + temp_path + "' to '" + final_path + "': " + ec.message());
  sync_path(directory_of(final_path), true);
}

void copy_new_file(const std::string& from, const std::string& to) {
  std::error_code ec;
  if (!fs::copy_file(from, to, fs::copy_options::none, ec) || ec)
    throw RunError("cannot copy '" + from + "' to '" + to + "': " +
                   (ec ? ec.message() : std::string("the copy failed")));
  sync_path(to, false);
}

std::string temporary_name(const std::string& path) {
  return path + ".tmp." + std::to_string(::getpid());
}

void write_text_file(const std::string& path, const std::string& text, bool executable) {
  const std::string temp = temporary_name(path);
  std::error_code ec;
  {
    std::ofstream out(temp, std::ios::binary | std::ios::trunc);
    out << text;
    out.close();
    if (!out) {
      fs::remove(temp, ec);
      throw RunError("cannot write '" + temp + "'");
    }
  }
  if (executable)
    fs::permissions(temp, fs::perms::owner_exec | fs::perms::group_exec | fs::perms::others_exec,
                    fs::perm_options::add, ec);
  try {
    replace_file(temp, path);
  } catch (...) {
    fs::remove(temp, ec);
    throw;
  }
}

}  // namespace tw::io
