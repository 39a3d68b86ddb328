#include "io/schema.hpp"

#include <yaml-cpp/yaml.h>

#include <cctype>
#include <cmath>
#include <map>
#include <sstream>

#include "core/error.hpp"
#include "io/text_util.hpp"

namespace tw::io {

namespace {

/// A key name must be usable in a dotted path: no '.', '[', ']', '=', spaces or '#'.
bool valid_key_name(const std::string& name) {
  if (name.empty()) return false;
  for (char c : name) {
    const bool ok = std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    if (!ok) return false;
  }
  return true;
}

/// A string as a YAML scalar that reads back as the same text.
std::string yaml_string(const std::string& v) {
  YAML::Emitter e;
  if (detail::needs_quotes(v)) e << YAML::DoubleQuoted;
  e << v;
  return e.c_str();
}

}  // namespace

// ---------------------------------------------------------------------------------------
// KeySpec defaults

KeySpec& KeySpec::def(real v) {
  TW_CHECK(std::isfinite(v), "default of key '" + name + "' must be finite");
  default_yaml = detail::format_real(v);
  return *this;
}

KeySpec& KeySpec::def(long v) {
  default_yaml = std::to_string(v);
  return *this;
}

KeySpec& KeySpec::def(bool v) {
  default_yaml = v ? "true" : "false";
  return *this;
}

KeySpec& KeySpec::def(const std::string& v) {
  default_yaml = yaml_string(v);
  return *this;
}

KeySpec& KeySpec::def_list(const std::vector<real>& v) {
  std::string s = "[";
  for (std::size_t i = 0; i < v.size(); ++i) {
    TW_CHECK(std::isfinite(v[i]), "default of key '" + name + "' must be finite");
    if (i > 0) s += ", ";
    s += detail::format_real(v[i]);
  }
  default_yaml = s + "]";
  return *this;
}

KeySpec& KeySpec::def_words(const std::vector<std::string>& v) {
  std::string s = "[";
  for (std::size_t i = 0; i < v.size(); ++i) s += (i ? ", " : "") + yaml_string(v[i]);
  default_yaml = s + "]";
  return *this;
}

// ---------------------------------------------------------------------------------------
// Section builders

KeySpec& Section::add(KeySpec k) {
  TW_CHECK(valid_key_name(k.name),
           "run-file key name '" + k.name + "' may hold only letters, digits, '_' and '-'");
  TW_CHECK(find(k.name) == nullptr, "run-file key '" + k.name + "' is declared twice");
  keys_.push_back(std::move(k));
  return keys_.back();
}

KeySpec& Section::real(const std::string& name, const std::string& unit, const std::string& doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::real;
  k.unit = unit;
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::integer(const std::string& name, const std::string& doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::integer;
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::boolean(const std::string& name, const std::string& doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::boolean;
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::string(const std::string& name, const std::string& doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::string;
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::choice(const std::string& name, std::vector<std::string> choices,
                         const std::string& doc) {
  TW_CHECK(!choices.empty(), "choice key '" + name + "' needs at least one word");
  KeySpec k;
  k.name = name;
  k.type = KeyType::choice;
  k.choices = std::move(choices);
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::real_list(const std::string& name, const std::string& unit,
                            const std::string& doc) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::real_list;
  k.unit = unit;
  k.doc = doc;
  return add(std::move(k));
}

KeySpec& Section::text_list(const std::string& name, const std::string& doc,
                            std::vector<std::string> choices) {
  KeySpec k;
  k.name = name;
  k.type = KeyType::text_list;
  k.choices = std::move(choices);
  k.doc = doc;
  return add(std::move(k));
}

Section& Section::section(const std::string& name, const std::string& doc) {
  for (auto& k : keys_) {
    if (k.name != name) continue;
    TW_CHECK(k.type == KeyType::section,
             "run-file key '" + name + "' is declared both as a section and as another type");
    return *k.sub;
  }
  KeySpec k;
  k.name = name;
  k.type = KeyType::section;
  k.doc = doc;
  k.sub = std::make_shared<Section>(doc);
  return *add(std::move(k)).sub;
}

Section& Section::section_list(const std::string& name, const std::string& doc) {
  for (auto& k : keys_) {
    if (k.name != name) continue;
    TW_CHECK(k.type == KeyType::section_list,
             "run-file key '" + name + "' is declared both as a section list and as another type");
    return *k.sub;
  }
  KeySpec k;
  k.name = name;
  k.type = KeyType::section_list;
  k.doc = doc;
  k.sub = std::make_shared<Section>(doc);
  return *add(std::move(k)).sub;
}

KeySpec& Section::real_or_section(const std::string& name, const std::string& unit,
                                  const std::string& doc, std::shared_ptr<Section> sub) {
  TW_CHECK(sub != nullptr, "real_or_section key '" + name + "' needs its map form");
  KeySpec k;
  k.name = name;
  k.type = KeyType::real_or_section;
  k.unit = unit;
  k.doc = doc;
  k.sub = std::move(sub);
  return add(std::move(k));
}

const KeySpec* Section::find(const std::string& name) const {
  for (const auto& k : keys_)
    if (k.name == name) return &k;
  return nullptr;
}

// ---------------------------------------------------------------------------------------
// Markdown reference

namespace {

std::string md_escape(const std::string& s) {
  std::string r;
  for (char c : s) {
    if (c == '|')
      r += "\\|";
    else if (c == '\n')
      r += ' ';
    else
      r += c;
  }
  return r;
}

std::string type_name(const KeySpec& k) {
  switch (k.type) {
    case KeyType::real:
      return "real";
    case KeyType::integer:
      return "integer";
    case KeyType::boolean:
      return "boolean";
    case KeyType::string:
      return "text";
    case KeyType::choice:
      return "choice";
    case KeyType::real_list:
      return k.list_length > 0 ? "list of " + std::to_string(k.list_length) + " reals"
                               : "list of reals";
    case KeyType::section:
      return "section";
    case KeyType::section_list:
      return "list of sections";
    case KeyType::real_or_section:
      return "real or section";
    case KeyType::text_list:
      return "list of words";
  }
  return "?";
}

bool numeric(const KeySpec& k) {
  return k.type == KeyType::real || k.type == KeyType::integer || k.type == KeyType::real_list ||
         k.type == KeyType::real_or_section;
}

std::string unit_cell(const KeySpec& k) {
  if (!k.unit.empty()) return k.unit;
  // Dimensionless reals read "1" (the CF convention); counts and words have no unit.
  if (k.type == KeyType::real || k.type == KeyType::real_list || k.type == KeyType::real_or_section)
    return "1";
  return "";
}

}  // namespace

namespace {

struct SectionToDocument {
  std::string path;  ///< dotted path of the section ("" for the root)
  const Section* section;
};

class MarkdownWriter {
 public:
  std::string run(const Section& root) {
    out_ << "# Run-file keys\n\n"
         << "Generated from the declarations in the source; every key, its type, SI unit, "
            "default and allowed values. `[]` marks the elements of a list of sections; "
            "\"required\" keys have no default and must be given.\n";
    // Depth-first in declaration order: a section's table is followed by the tables of
    // its sub-sections, so the output is deterministic and reads top-down.
    write_section("", root);
    return out_.str();
  }

 private:
  void write_section(const std::string& path, const Section& sec) {
    out_ << "\n## " << (path.empty() ? std::string("Top level") : "`" + path + "`") << "\n\n";
    if (!sec.doc().empty()) out_ << md_escape(sec.doc()) << "\n\n";
    if (sec.keys().empty()) {
      out_ << "(no keys)\n";
      return;
    }
    out_ << "| key | type | unit | default | allowed | description |\n"
         << "|---|---|---|---|---|---|\n";
    std::vector<SectionToDocument> children;
    for (const auto& k : sec.keys()) {
      const std::string key_path = path.empty() ? k.name : path + "." + k.name;
      std::string sub_path = key_path;
      if (k.type == KeyType::section_list) sub_path += "[]";
      std::string allowed = allowed_text(k);
      if (k.sub) {
        auto it = documented_at_.find(k.sub.get());
        if (it != documented_at_.end()) {
          allowed += std::string(allowed.empty() ? "" : "; ") + "keys: see `" + it->second + "`";
        } else {
          documented_at_[k.sub.get()] = sub_path;
          allowed += std::string(allowed.empty() ? "" : "; ") + "keys: see `" + sub_path + "`";
          children.push_back({sub_path, k.sub.get()});
        }
      }
      std::string def;
      if (k.required)
        def = "required";
      else if (k.default_yaml)
        def = "`" + *k.default_yaml + "`";
      else if (k.type == KeyType::section || k.type == KeyType::section_list)
        def = "";
      else
        def = "(none)";
      out_ << "| `" << key_path << "` | " << type_name(k) << " | " << md_escape(unit_cell(k))
           << " | " << md_escape(def) << " | " << md_escape(allowed) << " | " << md_escape(k.doc)
           << " |\n";
    }
    for (const auto& c : children) write_section(c.path, *c.section);
  }

  static std::string allowed_text(const KeySpec& k) {
    std::string r;
    switch (k.type) {
      case KeyType::boolean:
        return "`true`, `false`";
      case KeyType::choice:
      case KeyType::text_list:
        for (std::size_t i = 0; i < k.choices.size(); ++i)
          r += (i ? ", `" : "`") + k.choices[i] + "`";
        return r.empty() || k.type == KeyType::choice ? r : "each " + r;
      case KeyType::real_list:
        r = detail::range_text(k);
        return r.empty() ? r : "each " + r;
      default:
        break;
    }
    if (numeric(k)) {
      r = detail::range_text(k);
      if (k.type == KeyType::real_or_section && !r.empty()) r = "number " + r;
    }
    return r;
  }

  std::ostringstream out_;
  std::map<const Section*, std::string> documented_at_;
};

}  // namespace

std::string Schema::reference_markdown() const { return MarkdownWriter().run(*root_); }

}  // namespace tw::io
