#pragma once
/// Typed errors and the two tiers of checks.
///
/// - InputError: bad user input (run file, command line, tables). Exit code 2.
/// - RunError: a run that started but failed (non-finite state, I/O failure). Exit code 1.
/// - InternalError: a broken invariant inside tubewave (a bug). Exit code 1.
///
/// TW_ASSERT is compiled only in debug builds and guards internal invariants;
/// TW_CHECK is always on. Both add the function name and file:line.
#include <source_location>
#include <stdexcept>
#include <string>

namespace tw {

#if defined(__cpp_lib_source_location)
/// Where a check failed (function, file, line).
using SourceLocation = std::source_location;
#else
/// Where a check failed. Stand-in for std::source_location where the standard library does
/// not offer it to this compiler (libstdc++ 12 with clang 14, used by the fuzz build): the
/// same builtins, the same member names.
class SourceLocation {
 public:
  static constexpr SourceLocation current(const char* file = __builtin_FILE(),
                                          const char* function = __builtin_FUNCTION(),
                                          unsigned line = __builtin_LINE()) noexcept {
    SourceLocation s;
    s.file_ = file;
    s.function_ = function;
    s.line_ = line;
    return s;
  }
  [[nodiscard]] constexpr const char* file_name() const noexcept { return file_; }
  [[nodiscard]] constexpr const char* function_name() const noexcept { return function_; }
  [[nodiscard]] constexpr unsigned line() const noexcept { return line_; }

 private:
  const char* file_ = "";
  const char* function_ = "";
  unsigned line_ = 0;
};
#endif

/// Base of every tubewave error; `what()` is the complete message for the user.
class Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
  /// Process exit code this error maps to.
  [[nodiscard]] virtual int exit_code() const noexcept { return 1; }
};

/// Bad input from the user: exit code 2, nothing is written.
class InputError : public Error {
 public:
  using Error::Error;
  [[nodiscard]] int exit_code() const noexcept override { return 2; }
};

/// A run that failed after it started: exit code 1.
class RunError : public Error {
 public:
  using Error::Error;
};

/// A violated internal invariant (a bug in tubewave): exit code 1.
class InternalError : public Error {
 public:
  using Error::Error;
};

/// Exit codes of the `tubewave` executable.
namespace exit_code {
inline constexpr int ok = 0;
inline constexpr int run_failed = 1;
inline constexpr int bad_input = 2;
/// A run stopped by a signal after writing a checkpoint.
inline constexpr int interrupted = 3;
}  // namespace exit_code

[[noreturn]] void fail_internal(const std::string& what,
                                SourceLocation where = SourceLocation::current());

}  // namespace tw

/// Always-on check of a run-time condition; throws InternalError with location.
#define TW_CHECK(cond, msg)                                  \
  do {                                                       \
    if (!(cond)) ::tw::fail_internal(std::string(#cond ": ") + (msg)); \
  } while (0)

#ifndef NDEBUG
/// Debug-only check of an internal invariant (sizes, index ranges).
#define TW_ASSERT(cond, msg) TW_CHECK(cond, msg)
#else
#define TW_ASSERT(cond, msg) \
  do {                       \
  } while (0)
#endif
