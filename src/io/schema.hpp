#pragma once
/// Declarations of run-file keys.
///
/// Each component declares the keys it reads (name, type, unit, default, valid range,
/// one-line doc) into a Schema; the loader (runfile.hpp) validates a YAML file against it,
/// and the key reference in the README is generated from the same declarations
/// (`tubewave keys`), so documentation cannot drift from the code.
///
/// Layout: a Section holds keys. A key is a scalar (real, integer, boolean, string, choice),
/// a list of reals, a list of words, a nested section, a list of sections (each element validated against
/// the same sub-section), or a "real or section" (a plain number, or a map validated against
/// a sub-section; used for profiles along x).
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw::io {

enum class KeyType {
  real,             ///< a floating-point number (YAML ints are accepted)
  integer,          ///< a whole number
  boolean,          ///< true / false
  string,           ///< free text
  choice,           ///< one of a fixed list of words
  real_list,        ///< a YAML sequence of numbers, optionally of fixed length
  section,          ///< a nested map validated against `sub`
  section_list,     ///< a YAML sequence of maps, each validated against `sub`
  real_or_section,  ///< a number, or a map validated against `sub`
  text_list,        ///< a YAML sequence of words (each one of `choices`, when declared)
};

class Section;

/// One declared key. Built with the chainable modifiers; read by the loader and doc generator.
struct KeySpec {
  std::string name;  ///< key name inside its section
  KeyType type = KeyType::real;
  std::string unit;  ///< SI unit ("m", "m^-3", "eV", "T", "s", "Hz"); "" = dimensionless
  std::string doc;   ///< one line
  bool required = false;
  std::optional<std::string> default_yaml;  ///< default as YAML text (absent: no default)
  std::optional<real> min, max;             ///< numeric range (integers too)
  bool min_exclusive = false, max_exclusive = false;
  std::vector<std::string> choices;  ///< for KeyType::choice (and text_list, when not empty)
  int list_length = -1;              ///< for real_list: required length, -1 = any (0 included)
  std::shared_ptr<Section> sub;      ///< for section / section_list / real_or_section

  KeySpec& require() { required = true; return *this; }
  KeySpec& def(real v);
  KeySpec& def(long v);
  KeySpec& def(int v) { return def(static_cast<long>(v)); }
  KeySpec& def(bool v);
  KeySpec& def(const char* v) { return def(std::string(v)); }
  KeySpec& def(const std::string& v);
  KeySpec& def_list(const std::vector<real>& v);
  KeySpec& def_words(const std::vector<std::string>& v);  ///< default of a text_list
  KeySpec& at_least(real v) { min = v; min_exclusive = false; return *this; }
  KeySpec& above(real v) { min = v; min_exclusive = true; return *this; }
  KeySpec& at_most(real v) { max = v; max_exclusive = false; return *this; }
  KeySpec& below(real v) { max = v; max_exclusive = true; return *this; }
  KeySpec& positive() { return above(0.0); }
  KeySpec& non_negative() { return at_least(0.0); }
  KeySpec& length(int n) { list_length = n; return *this; }
};

/// A map of declared keys. Sections are shared by pointer so one sub-section
/// (e.g. a profile) can be referenced from several keys.
///
/// A KeySpec& returned by a builder stays valid only until the next key is added to the same
/// section: chain the modifiers at once. Finish the schema before loading run files with it
/// (a RunFile keeps pointers to the declarations; it also keeps the schema alive).
/// Key names hold letters, digits, '_' and '-'; a name declared twice is a bug
/// (InternalError), except section()/section_list(), which return the existing section.
class Section : public std::enable_shared_from_this<Section> {
 public:
  explicit Section(std::string doc = {}) : doc_(std::move(doc)) {}

  KeySpec& real(const std::string& name, const std::string& unit, const std::string& doc);
  KeySpec& integer(const std::string& name, const std::string& doc);
  KeySpec& boolean(const std::string& name, const std::string& doc);
  KeySpec& string(const std::string& name, const std::string& doc);
  KeySpec& choice(const std::string& name, std::vector<std::string> choices, const std::string& doc);
  KeySpec& real_list(const std::string& name, const std::string& unit, const std::string& doc);
  /// A list of words; with `choices`, every element must be one of them.
  KeySpec& text_list(const std::string& name, const std::string& doc, std::vector<std::string> choices = {});
  /// Nested section; returns it so keys can be added. Declaring the same name twice returns
  /// the existing section (components may add keys to a shared section).
  Section& section(const std::string& name, const std::string& doc);
  /// List of maps; returns the element section.
  Section& section_list(const std::string& name, const std::string& doc);
  /// Number or map; `sub` is the map form (e.g. a profile). Returns the key for modifiers.
  KeySpec& real_or_section(const std::string& name, const std::string& unit, const std::string& doc,
                           std::shared_ptr<Section> sub);

  [[nodiscard]] const KeySpec* find(const std::string& name) const;
  [[nodiscard]] const std::vector<KeySpec>& keys() const { return keys_; }
  [[nodiscard]] const std::string& doc() const { return doc_; }

 private:
  KeySpec& add(KeySpec k);
  std::string doc_;
  std::vector<KeySpec> keys_;
};

/// The whole run-file schema: a root section.
class Schema {
 public:
  Schema() : root_(std::make_shared<Section>("run file")) {}
  Section& root() { return *root_; }
  [[nodiscard]] const Section& root() const { return *root_; }
  /// Markdown reference of every key (path, type, unit, default, range, doc).
  [[nodiscard]] std::string reference_markdown() const;

 private:
  std::shared_ptr<Section> root_;
};

}  // namespace tw::io
