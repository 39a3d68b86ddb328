#pragma once
/// Small text helpers shared by the run-file schema and loader (internal to src/io).
///
/// - format_real: the shortest text that reads back as the same double ("1e+18", "0.8", "3"),
///   used for defaults, range bounds, "(got ...)" in messages and the resolved YAML;
/// - edit_distance / nearest_name: "did you mean ...?" suggestions for misspelt keys and
///   choice words.
#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "core/types.hpp"
#include "io/schema.hpp"

namespace tw::io::detail {

/// Result of reading a number from a YAML scalar.
enum class NumberParse { ok, not_a_number, not_finite, out_of_range };

/// Read a real from plain YAML scalar text: an optional sign, digits, optional fraction and
/// exponent ("1e18", "-2.5", "+3", ".5"). The YAML forms .inf/.nan (any case, signed) and the
/// words inf/nan read as `not_finite`; values beyond the double range as `out_of_range`.
inline NumberParse parse_real(std::string_view text, real& out) {
  std::string_view t = text;
  if (!t.empty() && t.front() == '+') {
    t.remove_prefix(1);
    if (!t.empty() && (t.front() == '+' || t.front() == '-')) return NumberParse::not_a_number;
  }
  if (t.empty()) return NumberParse::not_a_number;
  std::string lower;
  for (char c : t) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (lower == ".inf" || lower == "-.inf" || lower == ".nan") return NumberParse::not_finite;
  real v = 0;
  const auto res = std::from_chars(t.data(), t.data() + t.size(), v, std::chars_format::general);
  if (res.ptr != t.data() + t.size()) return NumberParse::not_a_number;
  if (res.ec == std::errc::result_out_of_range) return NumberParse::out_of_range;
  if (res.ec != std::errc()) return NumberParse::not_a_number;
  if (!std::isfinite(v)) return NumberParse::not_finite;
  out = v;
  return NumberParse::ok;
}

/// True if plain scalar text would be read as something other than text (a number, a
/// boolean, null) or is empty: such strings are double-quoted when written back as YAML.
inline bool needs_quotes(std::string_view text) {
  if (text.empty()) return true;
  real v = 0;
  if (parse_real(text, v) != NumberParse::not_a_number) return true;
  std::string lower;
  for (char c : text) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  for (const char* w : {"true", "false", "yes", "no", "on", "off", "y", "n", "null", "~"})
    if (lower == w) return true;
  return false;
}

/// Shortest round-trip decimal form of `v` (std::to_chars without a format).
inline std::string format_real(real v) {
  char buf[64];
  const auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

/// Edit distance between two words: insertions, deletions, substitutions and swaps of
/// two neighbouring letters each cost 1 (Levenshtein distance extended by transpositions,
/// the "optimal string alignment" form), ignoring ASCII case. Keys are case-sensitive, but
/// "Density" for "density" and "lable" for "label" are still the obvious suggestions.
inline std::size_t edit_distance(std::string_view a, std::string_view b) {
  const auto low = [](char c) { return std::tolower(static_cast<unsigned char>(c)); };
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::size_t> d((n + 1) * (m + 1));
  const auto at = [&](std::size_t i, std::size_t j) -> std::size_t& { return d[i * (m + 1) + j]; };
  for (std::size_t i = 0; i <= n; ++i) at(i, 0) = i;
  for (std::size_t j = 0; j <= m; ++j) at(0, j) = j;
  for (std::size_t i = 1; i <= n; ++i) {
    for (std::size_t j = 1; j <= m; ++j) {
      const std::size_t cost = low(a[i - 1]) == low(b[j - 1]) ? 0 : 1;
      std::size_t best = std::min({at(i - 1, j) + 1, at(i, j - 1) + 1, at(i - 1, j - 1) + cost});
      if (i > 1 && j > 1 && low(a[i - 1]) == low(b[j - 2]) && low(a[i - 2]) == low(b[j - 1]))
        best = std::min(best, at(i - 2, j - 2) + 1);
      at(i, j) = best;
    }
  }
  return at(n, m);
}

/// The candidate closest to `word`, or "" when none is reasonably close. "Reasonably close":
/// at most max(1, L/3) edits, L the longer of the two words (one typo in a short word, a few
/// in a long one; "temp" is not offered for "time"). Ties go to the earlier candidate, so
/// suggestions follow declaration order and are deterministic.
inline std::string nearest_name(std::string_view word, const std::vector<std::string>& candidates) {
  std::string best;
  std::size_t best_d = 0;
  for (const auto& c : candidates) {
    if (c == word) continue;
    const std::size_t d = edit_distance(word, c);
    const std::size_t limit = std::max<std::size_t>(1, std::max(word.size(), c.size()) / 3);
    if (d > limit) continue;
    if (best.empty() || d < best_d) {
      best = c;
      best_d = d;
    }
  }
  return best;
}

/// The allowed range of a numeric key as text: "> 0", "<= 1", "[0, 1]", "(0, 1]";
/// "" when unbounded.
inline std::string range_text(const KeySpec& k) {
  if (k.min && k.max) {
    return std::string(k.min_exclusive ? "(" : "[") + format_real(*k.min) + ", " +
           format_real(*k.max) + (k.max_exclusive ? ")" : "]");
  }
  if (k.min) return std::string(k.min_exclusive ? "> " : ">= ") + format_real(*k.min);
  if (k.max) return std::string(k.max_exclusive ? "< " : "<= ") + format_real(*k.max);
  return "";
}

}  // namespace tw::io::detail
