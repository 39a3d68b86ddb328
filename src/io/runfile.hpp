#pragma once
/// Loading and validating run files: the one place where YAML is parsed.
///
/// A RunFile is a YAML document validated against a Schema, with defaults filled in and
/// `--set key.path=value` overrides applied. Values are read by dotted path with list
/// indices: "plasma.density", "output.probes[2].x". Every value remembers where it came from
/// (file:line:column, or the command-line override), so components can reject
/// unphysical combinations with `fail(path, reason)` at the right place.
///
/// Validation (all errors are ConfigError, exit code 2):
/// - YAML syntax errors (with the parser's line and column);
/// - unknown keys, with the nearest declared key suggested;
/// - wrong types (a word where a number is expected, 3.5 for an integer, a map for a scalar);
/// - values out of the declared range, words not in a choice list (nearest suggested);
/// - missing required keys (reported at the enclosing section);
/// - duplicate keys in one map;
/// - overrides naming an undeclared key or carrying a malformed value.
///
/// Rules in detail:
/// - Paths: dotted names; list elements by 0-based index ("output.probes[0].x",
///   "plasma.flow[2]" for one number of a real list). The empty path is the root.
/// - real: a plain YAML number ("1e18", "-2.5", "3"); quoted numbers, words, booleans,
///   .inf/.nan, maps and lists are rejected. integer: "42", "+7", or a real form that is
///   exactly whole ("1e3", "2.0"; at most 2^53); 3.5 is rejected. boolean: exactly `true` or
///   `false`. string: any single value. choice: one of the declared words.
///   real_list: a list of numbers (any length, empty included, unless `length(n)`).
///   text_list: a list of single values read as text (each one of the declared choices, if any).
/// - An absent section is an empty one: its defaults are filled in and its required keys are
///   reported missing. An empty value ("numerics:") is an empty section / an empty list of
///   sections; for any other key it is an error ("has no value").
/// - Positions: values report where they start; sections and lists of sections report their
///   key. A missing required key is reported at its enclosing section (file:1:1 for the
///   root). A default has line 0 and origin "default"; an override has line 0 and origin
///   "--set KEY=VALUE".
/// - Overrides "KEY=VALUE" are applied in order, before validation; VALUE is parsed as YAML
///   ("[1, 2]", "{peak: 2}"). An override replaces the value at KEY (a whole map or list if
///   KEY names one); maps on the way are created, and anything on the way that is not a map
///   is replaced by one. An index may name an existing element or the next one (appends).
/// - Only the first error is reported.
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "core/error.hpp"
#include "core/types.hpp"
#include "io/schema.hpp"

namespace YAML {
class Node;
}

namespace tw::io {

/// Where a value came from. line/column are 1-based; line == 0 means "not from a file"
/// (a default, or a command-line override, described in `origin`).
struct SourcePos {
  std::string file;
  int line = 0;
  int column = 0;
  std::string origin;  ///< e.g. "--set numerics.cfl=2" or "default"
  [[nodiscard]] std::string str() const;  ///< "file:line:col" or "file (--set ...)"
};

/// A run-file error. what() reads
///   "FILE:LINE:COL: key 'plasma.density': must be > 0 (got -1e+18)"
///   "FILE (--set plasma.density=-1): key 'plasma.density': must be > 0 (got -1)"
///   "FILE:LINE:COL: REASON"   (errors of the whole file: syntax, empty file; no key part)
class ConfigError : public InputError {
 public:
  ConfigError(SourcePos pos, std::string key_path, const std::string& reason);
  [[nodiscard]] const SourcePos& pos() const { return pos_; }
  [[nodiscard]] const std::string& key_path() const { return key_path_; }

 private:
  SourcePos pos_;
  std::string key_path_;
};

/// The declaration a key path names ("plasma.density", "output.probes[0]": for an index,
/// the list's declaration), or null with the reason, naming the nearest declared key, in
/// `why`. For tools that take key paths from elsewhere than --set (sweep files).
[[nodiscard]] const KeySpec* declared_key(const Schema& schema, std::string_view path, std::string* why = nullptr);

class RunFile {
 public:
  /// Read and validate a file. A missing or unreadable file is a ConfigError too.
  static RunFile load(const std::string& path, const Schema& schema,
                      const std::vector<std::string>& overrides = {});
  /// Validate text already in memory; `source_name` is used in messages.
  static RunFile parse(const std::string& text, const std::string& source_name,
                       const Schema& schema, const std::vector<std::string>& overrides = {});

  RunFile(const RunFile&);
  RunFile(RunFile&&) noexcept;
  RunFile& operator=(const RunFile&);
  RunFile& operator=(RunFile&&) noexcept;
  ~RunFile();

  /// True if the key has a value (given, or a declared default).
  [[nodiscard]] bool has(std::string_view path) const;
  /// True if the key was written in the file or set on the command line.
  [[nodiscard]] bool given(std::string_view path) const;

  [[nodiscard]] real get_real(std::string_view path) const;
  [[nodiscard]] long get_int(std::string_view path) const;
  [[nodiscard]] bool get_bool(std::string_view path) const;
  [[nodiscard]] std::string get_string(std::string_view path) const;  ///< strings and choices
  [[nodiscard]] std::vector<real> get_reals(std::string_view path) const;
  [[nodiscard]] std::vector<std::string> get_strings(std::string_view path) const;  ///< text_list keys
  /// Number of elements of a section_list (0 if absent).
  [[nodiscard]] std::size_t count(std::string_view path) const;
  /// For real_or_section keys: true if the map form was given.
  [[nodiscard]] bool is_section(std::string_view path) const;

  /// Where the key's value came from (for a missing key: its enclosing section).
  [[nodiscard]] SourcePos where(std::string_view path) const;
  /// Throw a ConfigError located at `path`.
  [[noreturn]] void fail(std::string_view path, const std::string& reason) const;

  /// The file name as given, and its text exactly as read.
  [[nodiscard]] const std::string& source_name() const;
  [[nodiscard]] const std::string& source_text() const;
  /// The overrides as given on the command line.
  [[nodiscard]] const std::vector<std::string>& overrides() const;
  /// The resolved document: overrides applied and defaults filled in, as YAML text.
  [[nodiscard]] std::string resolved_yaml() const;
  /// Every value of the resolved document as (key path, value text), in declaration order:
  /// "grid.cells" -> "400", "plasma.flow" -> "[0, 0, 0]"; a list of sections gives its
  /// length, then each element's keys ("output.lines[0].x"). For comparing two run files.
  [[nodiscard]] std::vector<std::pair<std::string, std::string>> values() const;

 private:
  struct Impl;
  explicit RunFile(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace tw::io
