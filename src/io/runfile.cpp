#include "io/runfile.hpp"

#include <yaml-cpp/eventhandler.h>
#include <yaml-cpp/yaml.h>

#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <map>
#include <optional>
#include <set>
#include <sstream>

#include "io/text_util.hpp"

namespace tw::io {

// ---------------------------------------------------------------------------------------
// SourcePos and ConfigError

std::string SourcePos::str() const {
  std::string s = file;
  if (line > 0) s += ":" + std::to_string(line) + ":" + std::to_string(column);
  if (!origin.empty()) s += " (" + origin + ")";
  return s;
}

namespace {

std::string config_message(const SourcePos& pos, const std::string& key_path,
                           const std::string& reason) {
  std::string m = pos.str() + ": ";
  if (!key_path.empty()) m += "key '" + key_path + "': ";
  return m + reason;
}

}  // namespace

ConfigError::ConfigError(SourcePos pos, std::string key_path, const std::string& reason)
    : InputError(config_message(pos, key_path, reason)),
      pos_(std::move(pos)),
      key_path_(std::move(key_path)) {}

namespace {

using detail::format_real;
using detail::NumberParse;
using detail::parse_real;

/// Origin written on values that come from a declared default.
constexpr const char* default_origin = "default";
/// Deepest nesting accepted in a run file (guards against recursive YAML aliases).
constexpr int max_depth = 64;

// ---------------------------------------------------------------------------------------
// Key paths: "a.b[2].c"

struct Segment {
  std::string name;
  std::optional<std::size_t> index;
};

std::string join(const std::string& path, const std::string& name) {
  return path.empty() ? name : path + "." + name;
}

std::string indexed(const std::string& path, std::size_t i) {
  return path + "[" + std::to_string(i) + "]";
}

/// Split a dotted path with list indices. The empty path is the root. Returns "" on
/// success, else why the path is malformed.
std::string parse_path(std::string_view path, std::vector<Segment>& out) {
  out.clear();
  if (path.empty()) return "";
  std::size_t i = 0;
  while (true) {
    Segment seg;
    while (i < path.size() &&
           (std::isalnum(static_cast<unsigned char>(path[i])) || path[i] == '_' || path[i] == '-'))
      seg.name += path[i++];
    if (seg.name.empty()) return "expected a key name at character " + std::to_string(i + 1);
    if (i < path.size() && path[i] == '[') {
      const std::size_t close = path.find(']', i);
      if (close == std::string_view::npos) return "unclosed '['";
      const std::string_view digits = path.substr(i + 1, close - i - 1);
      std::size_t idx = 0;
      const auto res = std::from_chars(digits.data(), digits.data() + digits.size(), idx);
      if (digits.empty() || res.ec != std::errc() || res.ptr != digits.data() + digits.size())
        return "list index '[" + std::string(digits) + "]' must be a whole number >= 0";
      seg.index = idx;
      i = close + 1;
    }
    out.push_back(std::move(seg));
    if (i == path.size()) return "";
    if (path[i] != '.')
      return "unexpected '" + std::string(1, path[i]) + "' at character " + std::to_string(i + 1);
    ++i;
  }
}

std::string path_prefix(const std::vector<Segment>& segs, std::size_t n, bool with_last_index) {
  std::string p;
  for (std::size_t k = 0; k < n; ++k) {
    p = join(p, segs[k].name);
    if (segs[k].index && (k + 1 < n || with_last_index)) p = indexed(p, *segs[k].index);
  }
  return p;
}

const char* type_word(KeyType t) {
  switch (t) {
    case KeyType::real:
      return "a number";
    case KeyType::integer:
      return "a whole number";
    case KeyType::boolean:
      return "a boolean";
    case KeyType::string:
      return "text";
    case KeyType::choice:
      return "a choice";
    case KeyType::real_list:
      return "a list of numbers";
    case KeyType::section:
      return "a section";
    case KeyType::section_list:
      return "a list of sections";
    case KeyType::real_or_section:
      return "a number or a section";
    case KeyType::text_list:
      return "a list of words";
  }
  return "?";
}

/// Every declared key path whose last name is `name` ("numerics.cfl"), for "did you put it
/// in the wrong section?" hints. Shared sub-sections are visited once.
void find_key_everywhere(const Section& sec, const std::string& path, const std::string& name,
                         std::set<const Section*>& seen, std::vector<std::string>& found) {
  if (!seen.insert(&sec).second) return;
  for (const auto& k : sec.keys()) {
    const std::string p = join(path, k.name);
    if (k.name == name) found.push_back(p);
    if (k.sub)
      find_key_everywhere(*k.sub, k.type == KeyType::section_list ? p + "[]" : p, name, seen,
                          found);
  }
}

std::vector<std::string> key_names(const Section& sec) {
  std::vector<std::string> names;
  for (const auto& k : sec.keys()) names.push_back(k.name);
  return names;
}

/// The reason text for an unknown key `name` in section `sec`.
std::string unknown_key_reason(const Section& root, const Section& sec, const std::string& name,
                               const std::string& section_path, bool full_path_suggestion) {
  const std::string near = detail::nearest_name(name, key_names(sec));
  if (!near.empty())
    return "unknown key; did you mean '" +
           (full_path_suggestion ? join(section_path, near) : near) + "'?";
  std::set<const Section*> seen;
  std::vector<std::string> elsewhere;
  find_key_everywhere(root, "", name, seen, elsewhere);
  if (!elsewhere.empty()) {
    std::string r = "unknown key here; it is declared as ";
    for (std::size_t i = 0; i < elsewhere.size() && i < 3; ++i)
      r += (i ? " or '" : "'") + elsewhere[i] + "'";
    return r;
  }
  if (sec.keys().empty()) return "unknown key; this section takes no keys";
  std::string r = "unknown key; the keys here are: ";
  const auto names = key_names(sec);
  for (std::size_t i = 0; i < names.size() && i < 15; ++i) r += (i ? ", " : "") + names[i];
  if (names.size() > 15) r += ", ...";
  return r;
}

/// One resolved step of a key path against the schema.
struct Step {
  const KeySpec* spec;
  std::optional<std::size_t> index;
};

struct ResolveError {
  std::string key_path;  ///< the path up to the offending segment
  std::string reason;
};

/// Check a parsed path against the schema. Indices are allowed on lists (sections or reals);
/// a list of sections needs one before naming a key of its elements.
std::optional<ResolveError> resolve(const Section& root, const std::vector<Segment>& segs,
                                    std::vector<Step>& steps, bool full_path_suggestion) {
  steps.clear();
  const Section* sec = &root;
  for (std::size_t i = 0; i < segs.size(); ++i) {
    const Segment& seg = segs[i];
    if (sec == nullptr) {
      const KeySpec& prev = *steps.back().spec;
      const std::string prev_path = path_prefix(segs, i, true);
      if (prev.type == KeyType::section_list && !steps.back().index)
        return ResolveError{prev_path, "is a list of sections; name an element first, e.g. '" +
                                           indexed(prev_path, 0) + "." + seg.name + "'"};
      return ResolveError{prev_path, std::string("is ") +
                                         (steps.back().index ? "a number" : type_word(prev.type)) +
                                         ", not a section; it has no key '" + seg.name + "'"};
    }
    const KeySpec* spec = sec->find(seg.name);
    if (spec == nullptr)
      return ResolveError{path_prefix(segs, i + 1, false),
                          unknown_key_reason(root, *sec, seg.name, path_prefix(segs, i, true),
                                             full_path_suggestion)};
    if (seg.index) {
      if (spec->type == KeyType::section_list)
        sec = spec->sub.get();
      else if (spec->type == KeyType::real_list || spec->type == KeyType::text_list)
        sec = nullptr;
      else
        return ResolveError{path_prefix(segs, i + 1, false),
                            std::string("is ") + type_word(spec->type) +
                                ", not a list; it takes no index [" + std::to_string(*seg.index) +
                                "]"};
    } else if (spec->type == KeyType::section || spec->type == KeyType::real_or_section) {
      sec = spec->sub.get();
    } else {
      sec = nullptr;
    }
    steps.push_back({spec, seg.index});
  }
  return std::nullopt;
}

// ---------------------------------------------------------------------------------------
// The raw document: YAML converted to plain values with positions, before validation.
// Overrides are spliced into this tree, so they are validated exactly like file values.

struct RawEntry;

struct Raw {
  enum class Kind { null, scalar, seq, map };
  Kind kind = Kind::null;
  std::string text;               ///< scalar text
  bool plain = true;              ///< a plain scalar (not quoted, no explicit tag)
  SourcePos pos;                  ///< where the value starts
  std::vector<Raw> items;         ///< sequence elements
  std::vector<RawEntry> entries;  ///< map entries in file order (duplicates kept)
};

struct RawEntry {
  std::string key;
  SourcePos key_pos;
  Raw value;
};

/// Converts a yaml-cpp node tree to Raw. Positions come from the parser's marks (0-based,
/// reported 1-based), or, for overrides and defaults, from one fixed SourcePos.
class RawBuilder {
 public:
  /// `text`, when given, is the document the nodes came from (for the quote check).
  RawBuilder(std::string file, std::optional<SourcePos> fixed, const std::string* text = nullptr)
      : file_(std::move(file)), fixed_(std::move(fixed)), text_(text) {}

  Raw build(const YAML::Node& n, const SourcePos& fallback, const std::string& path,
            int depth = 0) const {
    Raw r;
    r.pos = pos_of(n, fallback);
    if (depth > max_depth)
      throw ConfigError(r.pos, path,
                        "is nested too deeply (more than " + std::to_string(max_depth) +
                            " levels; a recursive alias?)");
    switch (n.Type()) {
      case YAML::NodeType::Undefined:
      case YAML::NodeType::Null:
        // yaml-cpp marks an empty value ("key:" at the end of a line) on the next line;
        // the caller's position (the key) is the useful one.
        r.kind = Raw::Kind::null;
        r.pos = fallback;
        break;
      case YAML::NodeType::Scalar:
        r.kind = Raw::Kind::scalar;
        r.text = n.Scalar();
        r.plain = n.Tag() == "?";
        if (!r.plain) require_closed_quote(n, r.pos, path);
        break;
      case YAML::NodeType::Sequence: {
        r.kind = Raw::Kind::seq;
        std::size_t i = 0;
        for (const auto& item : n) {
          const SourcePos ip = pos_of(item, r.pos);
          r.items.push_back(build(item, ip, indexed(path, i), depth + 1));
          ++i;
        }
        break;
      }
      case YAML::NodeType::Map:
        r.kind = Raw::Kind::map;
        for (auto it = n.begin(); it != n.end(); ++it) {
          const SourcePos kp = pos_of(it->first, r.pos);
          if (!it->first.IsScalar())
            throw ConfigError(kp, path, "keys must be plain words, not lists or maps");
          const std::string key = it->first.Scalar();
          r.entries.push_back({key, kp, build(it->second, kp, join(path, key), depth + 1)});
        }
        break;
    }
    return r;
  }

  /// yaml-cpp 0.7 ends a quoted scalar that is never closed at the end of the text without
  /// complaint, so a stray quote would swallow the rest of the file into one value. Find the
  /// closing quote in the source ('\\' escapes in "...", '' in '...').
  void require_closed_quote(const YAML::Node& n, const SourcePos& pos, const std::string& path) const {
    if (text_ == nullptr || fixed_) return;
    const YAML::Mark m = n.Mark();
    if (m.is_null() || m.pos < 0 || static_cast<std::size_t>(m.pos) >= text_->size()) return;
    const std::string& t = *text_;
    const char q = t[static_cast<std::size_t>(m.pos)];
    if (q != '"' && q != '\'') return;
    for (std::size_t i = static_cast<std::size_t>(m.pos) + 1; i < t.size(); ++i) {
      if (q == '"' && t[i] == '\\') {
        ++i;
      } else if (t[i] == q) {
        if (q == '\'' && i + 1 < t.size() && t[i + 1] == '\'') {
          ++i;
        } else {
          return;
        }
      }
    }
    throw ConfigError(pos, path, std::string("the quoted value starting here has no closing ") + q +
                                     " before the end of the file");
  }

  [[nodiscard]] SourcePos pos_of(const YAML::Node& n, const SourcePos& fallback) const {
    if (fixed_) return *fixed_;
    const YAML::Mark m = n.Mark();
    if (m.is_null() || m.line < 0) return fallback;
    return SourcePos{file_, m.line + 1, m.column + 1, ""};
  }

 private:
  std::string file_;
  std::optional<SourcePos> fixed_;
  const std::string* text_ = nullptr;
};

SourcePos mark_pos(const std::string& file, const YAML::Mark& m) {
  if (m.is_null() || m.line < 0) return SourcePos{file, 0, 0, ""};
  return SourcePos{file, m.line + 1, m.column + 1, ""};
}

/// Records where each document starts; nothing else.
class DocumentStarts final : public YAML::EventHandler {
 public:
  void OnDocumentStart(const YAML::Mark& mark) override { start = mark; }
  void OnDocumentEnd() override {}
  void OnNull(const YAML::Mark&, YAML::anchor_t) override {}
  void OnAlias(const YAML::Mark&, YAML::anchor_t) override {}
  void OnScalar(const YAML::Mark&, const std::string&, YAML::anchor_t, const std::string&) override {}
  void OnSequenceStart(const YAML::Mark&, const std::string&, YAML::anchor_t, YAML::EmitterStyle::value) override {}
  void OnSequenceEnd() override {}
  void OnMapStart(const YAML::Mark&, const std::string&, YAML::anchor_t, YAML::EmitterStyle::value) override {}
  void OnMapEnd() override {}
  YAML::Mark start = YAML::Mark::null_mark();
};

/// Text of the syntax error yaml-cpp cannot report (below).
constexpr const char* stray_separator =
    "unexpected ',' (a separator belongs inside a list [...] or a map {...})";

/// yaml-cpp 0.7 never returns from Load/LoadAll on a document whose root starts with ','
/// (a flow-collection separator outside [ ] or { }; the text "," is enough): the parser
/// produces an empty document without consuming the token, again and again, allocating as
/// it goes. Found by fuzzing the run-file loader (tests/fuzz). Walk the documents with the
/// event parser first; a document that does not advance is thrown as the syntax error it
/// is (YAML::ParserException at its position). Other errors are left to the loader, which
/// reports them as before.
void reject_stuck_documents(const std::string& text) {
  std::istringstream in(text);
  YAML::Parser parser(in);
  DocumentStarts h;
  std::optional<int> last_pos;
  bool stuck = false;
  try {
    for (int docs = 0; docs < 10000 && !stuck && parser.HandleNextDocument(h); ++docs) {
      stuck = last_pos && *last_pos == h.start.pos;
      last_pos = h.start.pos;
    }
  } catch (const YAML::Exception&) {
    return;  // reported by the loader with the same position
  }
  if (stuck) throw YAML::ParserException(h.start, stray_separator);
}

/// Parse one YAML value written on the command line or as a declared default.
YAML::Node load_value(const std::string& text) {
  reject_stuck_documents(text);
  return YAML::Load(text);
}

// ---------------------------------------------------------------------------------------
// Validated values

struct Value {
  enum class Kind { real, integer, boolean, text, list, map };
  Kind kind = Kind::map;
  const KeySpec* spec = nullptr;  ///< the key (list elements: the list's key); null for the root
  SourcePos pos;                  ///< value position (sections: their key's position)
  bool given = false;             ///< written in the file or set on the command line
  real r = 0;
  long i = 0;
  bool b = false;
  std::string s;
  std::vector<Value> items;  ///< list elements, or a map's keys in declaration order
};

std::string describe_raw(const Raw& raw) {
  switch (raw.kind) {
    case Raw::Kind::null:
      return "nothing";
    case Raw::Kind::scalar:
      return "'" + raw.text + "'";
    case Raw::Kind::seq:
      return "a list";
    case Raw::Kind::map:
      return "a map";
  }
  return "?";
}

class Validator {
 public:
  explicit Validator(const Section& root) : root_(root) {}

  /// Validate a map (or nothing, for an empty or absent section) against `sec`.
  Value section(const Section& sec, const Raw* raw, const std::string& path, const SourcePos& pos,
                bool given) const {
    Value v;
    v.kind = Value::Kind::map;
    v.pos = pos;
    v.given = given;
    std::vector<std::optional<Value>> found(sec.keys().size());
    std::map<std::string, SourcePos> first_seen;
    if (raw != nullptr) {
      for (const auto& e : raw->entries) {
        const std::string child = join(path, e.key);
        const KeySpec* spec = sec.find(e.key);
        if (spec == nullptr)
          throw ConfigError(e.key_pos, child, unknown_key_reason(root_, sec, e.key, path, false));
        const auto [it, fresh] = first_seen.emplace(e.key, e.key_pos);
        if (!fresh)
          throw ConfigError(e.key_pos, child,
                            "duplicate key (first given at " + it->second.str() + ")");
        const auto idx = static_cast<std::size_t>(spec - sec.keys().data());
        found[idx] = key(*spec, e.value, child, e.key_pos, given);
      }
    }
    // Defaults are "not from the file": line 0, origin "default".
    const SourcePos default_pos{pos.file, 0, 0, default_origin};
    for (std::size_t j = 0; j < sec.keys().size(); ++j) {
      const KeySpec& k = sec.keys()[j];
      const std::string child = join(path, k.name);
      if (found[j]) {
        v.items.push_back(std::move(*found[j]));
      } else if (k.required) {
        throw ConfigError(pos, child, "missing required key (" + describe_key(k) + ")");
      } else if (k.default_yaml) {
        v.items.push_back(default_value(k, child, default_pos));
      } else if (k.type == KeyType::section) {
        // An absent section is an empty one: its defaults are filled in and its required
        // keys are reported missing at this (the enclosing) section's position.
        Value s = section(*k.sub, nullptr, child, pos, false);
        s.spec = &k;
        v.items.push_back(std::move(s));
      }
    }
    return v;
  }

 private:
  static std::string describe_key(const KeySpec& k) {
    std::string d = k.doc;
    d += std::string(d.empty() ? "" : "; ") + type_word(k.type);
    if (!k.unit.empty()) d += " in " + k.unit;
    return d;
  }

  /// A declared default, validated like a value from the file. An invalid default is a bug.
  Value default_value(const KeySpec& k, const std::string& path, const SourcePos& pos) const {
    try {
      const Raw raw = RawBuilder("", pos).build(load_value(*k.default_yaml), pos, path);
      return key(k, raw, path, pos, false);
    } catch (const std::exception& e) {
      fail_internal("the declared default '" + *k.default_yaml + "' of run-file key '" + path +
                    "' is invalid: " + e.what());
    }
  }

  Value key(const KeySpec& k, const Raw& raw, const std::string& path, const SourcePos& key_pos,
            bool given) const {
    Value v;
    v.spec = &k;
    v.given = given;
    v.pos = raw.pos;
    switch (k.type) {
      case KeyType::real:
        v.kind = Value::Kind::real;
        v.r = number(k, raw, path);
        break;
      case KeyType::integer:
        v.kind = Value::Kind::integer;
        v.i = whole_number(k, raw, path);
        break;
      case KeyType::boolean:
        v.kind = Value::Kind::boolean;
        v.b = boolean(k, raw, path);
        break;
      case KeyType::string:
        v.kind = Value::Kind::text;
        v.s = text(k, raw, path, "text");
        break;
      case KeyType::choice: {
        v.kind = Value::Kind::text;
        v.s = text(k, raw, path, "one word");
        check_choice(k, v.s, raw, path);
        break;
      }
      case KeyType::real_list: {
        v.kind = Value::Kind::list;
        if (raw.kind == Raw::Kind::null) no_value(k, raw, path);
        if (raw.kind != Raw::Kind::seq)
          throw ConfigError(
              raw.pos, path,
              "must be a list of numbers such as [1, 2, 3] (got " + describe_raw(raw) + ")");
        if (k.list_length > 0 && raw.items.size() != static_cast<std::size_t>(k.list_length))
          throw ConfigError(raw.pos, path,
                            "must have exactly " + std::to_string(k.list_length) +
                                " elements (got " + std::to_string(raw.items.size()) + ")");
        for (std::size_t i = 0; i < raw.items.size(); ++i) {
          Value e;
          e.kind = Value::Kind::real;
          e.spec = &k;
          e.given = given;
          e.pos = raw.items[i].pos;
          e.r = number(k, raw.items[i], indexed(path, i));
          v.items.push_back(std::move(e));
        }
        break;
      }
      case KeyType::text_list: {
        v.kind = Value::Kind::list;
        if (raw.kind == Raw::Kind::null) no_value(k, raw, path);
        if (raw.kind != Raw::Kind::seq)
          throw ConfigError(raw.pos, path,
                            "must be a list of words such as [a, b] (got " + describe_raw(raw) + ")");
        for (std::size_t i = 0; i < raw.items.size(); ++i) {
          Value e;
          e.kind = Value::Kind::text;
          e.spec = &k;
          e.given = given;
          e.pos = raw.items[i].pos;
          e.s = text(k, raw.items[i], indexed(path, i), "a word");
          if (!k.choices.empty()) check_choice(k, e.s, raw.items[i], indexed(path, i));
          v.items.push_back(std::move(e));
        }
        break;
      }
      case KeyType::section:
        if (raw.kind != Raw::Kind::map && raw.kind != Raw::Kind::null)
          throw ConfigError(raw.pos, path,
                            "must be a section (a map of keys), not " + describe_raw(raw));
        v = section(*k.sub, raw.kind == Raw::Kind::map ? &raw : nullptr, path, key_pos, given);
        v.spec = &k;
        break;
      case KeyType::section_list:
        v.kind = Value::Kind::list;
        v.pos = key_pos;
        if (raw.kind != Raw::Kind::seq && raw.kind != Raw::Kind::null)
          throw ConfigError(
              raw.pos, path,
              "must be a list of sections (lines starting with '- '), not " + describe_raw(raw));
        for (std::size_t i = 0; i < raw.items.size(); ++i) {
          const Raw& item = raw.items[i];
          const std::string ip = indexed(path, i);
          if (item.kind != Raw::Kind::map)
            throw ConfigError(
                item.pos, ip,
                "each element must be a map of keys (got " + describe_raw(item) + ")");
          Value e = section(*k.sub, &item, ip, item.pos, given);
          e.spec = &k;
          v.items.push_back(std::move(e));
        }
        break;
      case KeyType::real_or_section:
        if (raw.kind == Raw::Kind::map) {
          v = section(*k.sub, &raw, path, key_pos, given);
          v.spec = &k;
        } else if (raw.kind == Raw::Kind::seq) {
          throw ConfigError(raw.pos, path, "must be a number or a map of keys, not a list");
        } else {
          v.kind = Value::Kind::real;
          v.r = number(k, raw, path);
        }
        break;
    }
    return v;
  }

  /// A word that must be one of the key's choices.
  static void check_choice(const KeySpec& k, const std::string& word, const Raw& raw,
                           const std::string& path) {
    bool ok = false;
    for (const auto& c : k.choices) ok = ok || c == word;
    if (ok) return;
    std::string r = "must be one of: ";
    for (std::size_t i = 0; i < k.choices.size(); ++i) r += (i ? ", " : "") + k.choices[i];
    r += " (got '" + word + "')";
    const std::string near = detail::nearest_name(word, k.choices);
    if (!near.empty()) r += "; did you mean '" + near + "'?";
    throw ConfigError(raw.pos, path, r);
  }

  [[noreturn]] static void no_value(const KeySpec& k, const Raw& raw, const std::string& path) {
    std::string r = "has no value";
    if (k.default_yaml) r += "; remove the key to use the default " + *k.default_yaml;
    throw ConfigError(raw.pos, path, r);
  }

  static void expect_scalar(const KeySpec& k, const Raw& raw, const std::string& path,
                            const std::string& what) {
    if (raw.kind == Raw::Kind::null) no_value(k, raw, path);
    if (raw.kind == Raw::Kind::seq)
      throw ConfigError(raw.pos, path, "must be " + what + ", not a list");
    if (raw.kind == Raw::Kind::map)
      throw ConfigError(raw.pos, path, "must be " + what + ", not a map");
  }

  static void check_range(const KeySpec& k, real x, const std::string& got, const Raw& raw,
                          const std::string& path) {
    const bool low = k.min && (k.min_exclusive ? !(x > *k.min) : !(x >= *k.min));
    const bool high = k.max && (k.max_exclusive ? !(x < *k.max) : !(x <= *k.max));
    if (low || high)
      throw ConfigError(raw.pos, path,
                        std::string("must be ") + (k.min && k.max ? "in " : "") +
                            detail::range_text(k) + " (got " + got + ")");
  }

  static real number(const KeySpec& k, const Raw& raw, const std::string& path) {
    expect_scalar(k, raw, path, "a number");
    real x = 0;
    const NumberParse p = parse_real(raw.text, x);
    if (!raw.plain) {
      if (p != NumberParse::not_a_number)
        throw ConfigError(
            raw.pos, path,
            "must be a number, not quoted text (got \"" + raw.text + "\"); remove the quotes");
      throw ConfigError(raw.pos, path, "must be a number (got '" + raw.text + "')");
    }
    switch (p) {
      case NumberParse::ok:
        break;
      case NumberParse::not_a_number:
        throw ConfigError(raw.pos, path, "must be a number (got '" + raw.text + "')");
      case NumberParse::not_finite:
        throw ConfigError(raw.pos, path, "must be finite (got " + raw.text + ")");
      case NumberParse::out_of_range:
        throw ConfigError(raw.pos, path,
                          "is outside the double-precision range (got " + raw.text + ")");
    }
    check_range(k, x, format_real(x), raw, path);
    return x;
  }

  /// Integers: plain digits ("42", "-3", "+7"), or a real form that is exactly a whole
  /// number ("1e3", "2.0"; at most 2^53 in size, where doubles stop being exact).
  static long whole_number(const KeySpec& k, const Raw& raw, const std::string& path) {
    expect_scalar(k, raw, path, "a whole number");
    if (!raw.plain)
      throw ConfigError(raw.pos, path,
                        "must be a whole number, not quoted text (got \"" + raw.text + "\")");
    std::string_view t = raw.text;
    if (!t.empty() && t.front() == '+') t.remove_prefix(1);
    long n = 0;
    const auto res = std::from_chars(t.data(), t.data() + t.size(), n);
    if (!t.empty() && res.ptr == t.data() + t.size()) {
      if (res.ec == std::errc::result_out_of_range)
        throw ConfigError(raw.pos, path, "is too large for a whole number (got " + raw.text + ")");
      if (res.ec == std::errc()) {
        check_range(k, static_cast<real>(n), std::to_string(n), raw, path);
        return n;
      }
    }
    real x = 0;
    switch (parse_real(raw.text, x)) {
      case NumberParse::ok:
        break;
      case NumberParse::not_a_number:
        throw ConfigError(raw.pos, path, "must be a whole number (got '" + raw.text + "')");
      case NumberParse::not_finite:
        throw ConfigError(raw.pos, path, "must be finite (got " + raw.text + ")");
      case NumberParse::out_of_range:
        throw ConfigError(raw.pos, path, "is too large for a whole number (got " + raw.text + ")");
    }
    if (x != std::floor(x))
      throw ConfigError(raw.pos, path, "must be a whole number (got " + format_real(x) + ")");
    constexpr real exact_limit = 9007199254740992.0;  // 2^53
    if (std::fabs(x) > exact_limit)
      throw ConfigError(raw.pos, path, "is too large for a whole number (got " + raw.text + ")");
    n = static_cast<long>(x);
    check_range(k, x, std::to_string(n), raw, path);
    return n;
  }

  static bool boolean(const KeySpec& k, const Raw& raw, const std::string& path) {
    expect_scalar(k, raw, path, "true or false");
    if (raw.plain && raw.text == "true") return true;
    if (raw.plain && raw.text == "false") return false;
    if (!raw.plain && (raw.text == "true" || raw.text == "false"))
      throw ConfigError(raw.pos, path,
                        "must be true or false without quotes (got \"" + raw.text + "\")");
    throw ConfigError(raw.pos, path, "must be true or false (got '" + raw.text + "')");
  }

  static std::string text(const KeySpec& k, const Raw& raw, const std::string& path,
                          const std::string& what) {
    expect_scalar(k, raw, path, what);
    return raw.text;
  }

  const Section& root_;
};

}  // namespace

// ---------------------------------------------------------------------------------------
// RunFile

struct RunFile::Impl {
  std::shared_ptr<const Section> schema_root;  ///< keeps the KeySpecs that values point to
  std::string source_name;
  std::string source_text;
  std::vector<std::string> overrides;
  Value root;
};

namespace {

/// Splice one "--set a.b[1].c=value" into the raw document.
void apply_override(const Section& schema_root, const std::string& source_name,
                    const std::string& text, Raw& doc) {
  const SourcePos pos{source_name, 0, 0, "--set " + text};
  const std::size_t eq = text.find('=');
  if (eq == std::string::npos)
    throw ConfigError(pos, "", "malformed override: expected KEY=VALUE, e.g. --set time.end=1e-6");
  std::string key = text.substr(0, eq);
  while (!key.empty() && std::isspace(static_cast<unsigned char>(key.back()))) key.pop_back();
  while (!key.empty() && std::isspace(static_cast<unsigned char>(key.front()))) key.erase(0, 1);
  if (key.empty()) throw ConfigError(pos, "", "malformed override: the key before '=' is empty");
  std::vector<Segment> segs;
  if (const std::string why = parse_path(key, segs); !why.empty())
    throw ConfigError(pos, key, "malformed key path: " + why);
  std::vector<Step> steps;
  if (auto err = resolve(schema_root, segs, steps, true))
    throw ConfigError(pos, err->key_path, err->reason);

  YAML::Node node;
  try {
    node = load_value(text.substr(eq + 1));
  } catch (const YAML::Exception& e) {
    throw ConfigError(pos, key, "malformed value '" + text.substr(eq + 1) + "': " + e.msg);
  }
  Raw value = RawBuilder(source_name, pos).build(node, pos, key);

  // Walk the document, creating maps and list elements as needed. Whatever the path
  // passes through that is not a map (or not a list, before an index) is replaced: the
  // command line wins over the file.
  Raw* cur = &doc;
  for (std::size_t i = 0; i < segs.size(); ++i) {
    const bool last = i + 1 == segs.size();
    if (cur->kind != Raw::Kind::map) {
      *cur = Raw{};
      cur->kind = Raw::Kind::map;
      cur->pos = pos;
    }
    RawEntry* entry = nullptr;
    for (auto& e : cur->entries)
      if (e.key == segs[i].name) {
        entry = &e;
        break;
      }
    if (entry == nullptr) {
      cur->entries.push_back({segs[i].name, pos, Raw{}});
      entry = &cur->entries.back();
      entry->value.pos = pos;
    }
    if (!segs[i].index) {
      if (last) {
        entry->key_pos = pos;
        entry->value = std::move(value);
        return;
      }
      cur = &entry->value;
      continue;
    }
    Raw& list = entry->value;
    if (list.kind != Raw::Kind::seq) {
      list = Raw{};
      list.kind = Raw::Kind::seq;
      list.pos = pos;
    }
    const std::size_t idx = *segs[i].index;
    const std::size_t n = list.items.size();
    if (idx > n)
      throw ConfigError(pos, path_prefix(segs, i + 1, true),
                        "list index out of range: '" + path_prefix(segs, i + 1, false) + "' has " +
                            std::to_string(n) + (n == 1 ? " element" : " elements") +
                            " (indices start at 0; index " + std::to_string(n) + " appends one)");
    if (idx == n) {
      list.items.emplace_back();
      list.items.back().pos = pos;
    }
    if (last) {
      list.items[idx] = std::move(value);
      return;
    }
    cur = &list.items[idx];
  }
  // An empty key path is rejected above, so the loop always returns.
}

struct Lookup {
  const KeySpec* spec = nullptr;  ///< the last key on the path (null: the root)
  bool element = false;           ///< the path ends with a list index
  const Value* value = nullptr;   ///< null when the key has no value
  SourcePos nearest;              ///< position of the deepest present value on the path
};

Lookup find_value(const Section& schema_root, const Value& root, std::string_view path) {
  std::vector<Segment> segs;
  const std::string why = parse_path(path, segs);
  TW_CHECK(why.empty(), "malformed run-file key path '" + std::string(path) + "': " + why);
  std::vector<Step> steps;
  const auto err = resolve(schema_root, segs, steps, true);
  TW_CHECK(!err, "run-file key path '" + std::string(path) + "' is not declared ('" +
                     (err ? err->key_path + "': " + err->reason : std::string("'")) + ")");
  Lookup l;
  l.value = &root;
  l.nearest = root.pos;
  for (const Step& st : steps) {
    l.spec = st.spec;
    l.element = st.index.has_value();
    if (l.value == nullptr) continue;
    const Value* child = nullptr;
    if (l.value->kind == Value::Kind::map)
      for (const auto& c : l.value->items)
        if (c.spec == st.spec) {
          child = &c;
          break;
        }
    l.value = child;
    if (child == nullptr) continue;
    l.nearest = child->pos;
    if (st.index) {
      if (child->kind == Value::Kind::list && *st.index < child->items.size()) {
        l.value = &child->items[*st.index];
        l.nearest = l.value->pos;
      } else {
        l.value = nullptr;
      }
    }
  }
  return l;
}

}  // namespace

const KeySpec* declared_key(const Schema& schema, std::string_view path, std::string* why) {
  std::vector<Segment> segs;
  if (std::string err = parse_path(path, segs); !err.empty() || segs.empty()) {
    if (why) *why = segs.empty() && err.empty() ? "the key path is empty" : "malformed key path: " + err;
    return nullptr;
  }
  std::vector<Step> steps;
  if (auto err = resolve(schema.root(), segs, steps, true)) {
    if (why) *why = "key '" + err->key_path + "': " + err->reason;
    return nullptr;
  }
  return steps.back().spec;
}

RunFile::RunFile(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
RunFile::RunFile(const RunFile& other)
    : impl_(other.impl_ ? std::make_unique<Impl>(*other.impl_) : nullptr) {}
RunFile::RunFile(RunFile&&) noexcept = default;
RunFile& RunFile::operator=(const RunFile& other) {
  if (this != &other) impl_ = other.impl_ ? std::make_unique<Impl>(*other.impl_) : nullptr;
  return *this;
}
RunFile& RunFile::operator=(RunFile&&) noexcept = default;
RunFile::~RunFile() = default;

RunFile RunFile::load(const std::string& path, const Schema& schema,
                      const std::vector<std::string>& overrides) {
  namespace fs = std::filesystem;
  const SourcePos at{path, 0, 0, ""};
  std::error_code ec;
  if (!fs::exists(path, ec)) throw ConfigError(at, "", "the run file does not exist");
  if (fs::is_directory(path, ec))
    throw ConfigError(at, "", "cannot read the run file: it is a directory");
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw ConfigError(at, "", std::string("cannot open the run file: ") + std::strerror(errno));
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) throw ConfigError(at, "", "cannot read the run file");
  return parse(text.str(), path, schema, overrides);
}

RunFile RunFile::parse(const std::string& text, const std::string& source_name,
                       const Schema& schema, const std::vector<std::string>& overrides) {
  auto impl = std::make_unique<Impl>();
  impl->schema_root = schema.root().shared_from_this();
  impl->source_name = source_name;
  impl->source_text = text;
  impl->overrides = overrides;
  const Section& root = *impl->schema_root;
  const SourcePos start{source_name, 1, 1, ""};

  std::vector<YAML::Node> docs;
  try {
    reject_stuck_documents(text);
    docs = YAML::LoadAll(text);
  } catch (const YAML::Exception& e) {
    SourcePos p = mark_pos(source_name, e.mark);
    throw ConfigError(p, "", "YAML syntax error: " + e.msg);
  }
  if (docs.empty() || (docs.size() == 1 && docs[0].IsNull()))
    throw ConfigError(start, "", "the run file is empty");
  if (docs.size() > 1)
    throw ConfigError(mark_pos(source_name, docs[1].Mark()), "",
                      "the run file holds " + std::to_string(docs.size()) +
                          " YAML documents (separated by '---'); it must hold one");
  if (!docs[0].IsMap()) {
    const SourcePos p = RawBuilder(source_name, std::nullopt).pos_of(docs[0], start);
    throw ConfigError(p, "",
                      std::string("the top level must be a map of keys (got ") +
                          (docs[0].IsSequence() ? "a list" : "a single value") + ")");
  }
  Raw doc = RawBuilder(source_name, std::nullopt, &text).build(docs[0], start, "");
  for (const auto& o : overrides) apply_override(root, source_name, o, doc);
  impl->root = Validator(root).section(root, &doc, "", start, true);
  return RunFile(std::move(impl));
}

bool RunFile::has(std::string_view path) const {
  return find_value(*impl_->schema_root, impl_->root, path).value != nullptr;
}

bool RunFile::given(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  return l.value != nullptr && l.value->given;
}

namespace {

const Value& require_value(const Lookup& l, std::string_view path) {
  TW_CHECK(l.value != nullptr, "run-file key '" + std::string(path) +
                                   "' has no value (optional without default; check has() first)");
  return *l.value;
}

void require_type(const Lookup& l, std::string_view path, bool ok, const char* getter) {
  TW_CHECK(l.spec != nullptr && ok, std::string(getter) + " does not fit run-file key '" +
                                        std::string(path) + "' (declared as " +
                                        (l.spec ? type_word(l.spec->type) : "the root") + ")");
}

}  // namespace

real RunFile::get_real(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  const bool ok =
      l.spec &&
      (l.element ? l.spec->type == KeyType::real_list
                 : (l.spec->type == KeyType::real || l.spec->type == KeyType::real_or_section));
  require_type(l, path, ok, "get_real");
  const Value& v = require_value(l, path);
  TW_CHECK(v.kind == Value::Kind::real,
           "run-file key '" + std::string(path) + "' was given as a map; check is_section() first");
  return v.r;
}

long RunFile::get_int(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::integer, "get_int");
  return require_value(l, path).i;
}

bool RunFile::get_bool(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::boolean, "get_bool");
  return require_value(l, path).b;
}

std::string RunFile::get_string(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(
      l, path,
      l.spec && !l.element && (l.spec->type == KeyType::string || l.spec->type == KeyType::choice),
      "get_string");
  return require_value(l, path).s;
}

std::vector<real> RunFile::get_reals(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::real_list, "get_reals");
  std::vector<real> r;
  for (const auto& e : require_value(l, path).items) r.push_back(e.r);
  return r;
}

std::vector<std::string> RunFile::get_strings(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::text_list, "get_strings");
  std::vector<std::string> r;
  for (const auto& e : require_value(l, path).items) r.push_back(e.s);
  return r;
}

std::size_t RunFile::count(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::section_list, "count");
  return l.value ? l.value->items.size() : 0;
}

bool RunFile::is_section(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  require_type(l, path, l.spec && !l.element && l.spec->type == KeyType::real_or_section,
               "is_section");
  return l.value != nullptr && l.value->kind == Value::Kind::map;
}

SourcePos RunFile::where(std::string_view path) const {
  const Lookup l = find_value(*impl_->schema_root, impl_->root, path);
  return l.value ? l.value->pos : l.nearest;
}

void RunFile::fail(std::string_view path, const std::string& reason) const {
  throw ConfigError(where(path), std::string(path), reason);
}

const std::string& RunFile::source_name() const { return impl_->source_name; }
const std::string& RunFile::source_text() const { return impl_->source_text; }
const std::vector<std::string>& RunFile::overrides() const { return impl_->overrides; }

namespace {

void emit(YAML::Emitter& out, const Value& v) {
  switch (v.kind) {
    case Value::Kind::real:
      out << format_real(v.r);
      break;
    case Value::Kind::integer:
      out << std::to_string(v.i);
      break;
    case Value::Kind::boolean:
      out << std::string(v.b ? "true" : "false");
      break;
    case Value::Kind::text:
      if ((v.spec->type == KeyType::string || v.spec->type == KeyType::text_list) &&
          detail::needs_quotes(v.s))
        out << YAML::DoubleQuoted;
      out << v.s;
      break;
    case Value::Kind::list:
      if (v.spec->type == KeyType::real_list || v.spec->type == KeyType::text_list || v.items.empty())
        out << YAML::Flow;
      out << YAML::BeginSeq;
      for (const auto& e : v.items) emit(out, e);
      out << YAML::EndSeq;
      break;
    case Value::Kind::map:
      if (v.items.empty()) out << YAML::Flow;
      out << YAML::BeginMap;
      for (const auto& c : v.items) {
        out << YAML::Key << c.spec->name << YAML::Value;
        emit(out, c);
      }
      out << YAML::EndMap;
      break;
  }
}

}  // namespace

namespace {

/// One value as text: numbers in the form resolved_yaml() writes them, lists in brackets.
std::string value_text(const Value& v) {
  switch (v.kind) {
    case Value::Kind::real:
      return format_real(v.r);
    case Value::Kind::integer:
      return std::to_string(v.i);
    case Value::Kind::boolean:
      return v.b ? "true" : "false";
    case Value::Kind::text:
      return v.s;
    case Value::Kind::list:
    case Value::Kind::map: {
      std::string t = "[";
      for (std::size_t i = 0; i < v.items.size(); ++i) t += (i ? ", " : "") + value_text(v.items[i]);
      return t + "]";
    }
  }
  return "";
}

void flatten(const Value& v, const std::string& path, std::vector<std::pair<std::string, std::string>>& out) {
  if (v.kind == Value::Kind::map) {
    for (const auto& c : v.items) flatten(c, join(path, c.spec->name), out);
  } else if (v.kind == Value::Kind::list && v.spec->type == KeyType::section_list) {
    out.emplace_back(path, std::to_string(v.items.size()) + " element(s)");
    for (std::size_t i = 0; i < v.items.size(); ++i) flatten(v.items[i], indexed(path, i), out);
  } else {
    out.emplace_back(path, value_text(v));
  }
}

}  // namespace

std::vector<std::pair<std::string, std::string>> RunFile::values() const {
  std::vector<std::pair<std::string, std::string>> out;
  flatten(impl_->root, "", out);
  return out;
}

std::string RunFile::resolved_yaml() const {
  YAML::Emitter out;
  emit(out, impl_->root);
  return std::string(out.c_str()) + "\n";
}

}  // namespace tw::io
