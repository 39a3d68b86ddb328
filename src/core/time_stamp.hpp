#pragma once
/// Wall-clock time stamps for output files, checkpoints and sweep records.
#include <array>
#include <ctime>
#include <string>

namespace tw {

/// The current UTC time as ISO 8601, e.g. "2024-05-01T12:34:56Z".
inline std::string utc_now_iso8601() {
  const std::time_t now = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&now, &tm);
  std::array<char, 32> buf{};
  const std::size_t n = std::strftime(buf.data(), buf.size(), "%Y-%m-%dT%H:%M:%SZ", &tm);
  return std::string(buf.data(), n);
}

}  // namespace tw
