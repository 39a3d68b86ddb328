#include "cli/args.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <iostream>
#include <utility>

#include "core/error.hpp"
#include "io/text_util.hpp"

namespace tw::cli {

ArgParser::ArgParser(std::string command, std::string synopsis, std::string description)
    : command_(std::move(command)),
      synopsis_(std::move(synopsis)),
      description_(std::move(description)) {}

namespace {

std::string strip_dashes(const std::string& name) {
  std::size_t k = 0;
  while (k < name.size() && k < 2 && name[k] == '-') ++k;
  return name.substr(k);
}

enum class RealParse { ok, not_a_number, not_finite };

// The whole of `text` as a double; out-of-range and inf/nan count as not finite.
RealParse parse_real_detail(std::string_view text, double& out) {
  if (!text.empty() && text.front() == '+') text.remove_prefix(1);
  if (text.empty()) return RealParse::not_a_number;
  double v = 0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  if (ptr != text.data() + text.size()) return RealParse::not_a_number;
  if (ec == std::errc::result_out_of_range) return RealParse::not_finite;
  if (ec != std::errc()) return RealParse::not_a_number;
  if (!std::isfinite(v)) return RealParse::not_finite;
  out = v;
  return RealParse::ok;
}

// Breaks lines longer than `width` bytes at spaces; existing line breaks are kept.
std::string wrap(const std::string& text, std::size_t width) {
  std::string out;
  std::size_t start = 0;
  while (start <= text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string::npos) end = text.size();
    std::string line = text.substr(start, end - start);
    while (line.size() > width) {
      std::size_t cut = line.rfind(' ', width);
      if (cut == std::string::npos || cut == 0) break;
      out += line.substr(0, cut) + "\n";
      line = line.substr(cut + 1);
    }
    out += line;
    if (end < text.size()) out += "\n";
    start = end + 1;
  }
  return out;
}

// A word that looks like a negative number is a value, not an option.
bool looks_numeric(std::string_view s) {
  return s.size() >= 2 && s[0] == '-' &&
         ((s[1] >= '0' && s[1] <= '9') || s[1] == '.');
}

}  // namespace

void ArgParser::declare(Spec s) {
  if (s.name.empty() || find_long(s.name) != nullptr) {
    fail_internal("option '" + s.name + "' declared twice or empty for command " + command_);
  }
  specs_.push_back(std::move(s));
}

ArgParser& ArgParser::flag(const std::string& name, const std::string& help) {
  declare({strip_dashes(name), Kind::flag, "", help, false, false, 0});
  return *this;
}

ArgParser& ArgParser::option(const std::string& name, const std::string& metavar,
                             const std::string& help, bool repeatable) {
  declare({strip_dashes(name), Kind::option, metavar, help, repeatable, false, 0});
  return *this;
}

ArgParser& ArgParser::short_alias(char c, const std::string& name) {
  if (find_short(c) != nullptr || c == 'h') {
    fail_internal(std::string("short option -") + c + " declared twice for " + command_);
  }
  for (auto& s : specs_) {
    if (s.name == strip_dashes(name) && s.kind != Kind::positional) {
      s.short_name = c;
      return *this;
    }
  }
  fail_internal("short alias for undeclared option '" + name + "'");
}

ArgParser& ArgParser::positional(const std::string& name, const std::string& help,
                                 bool required) {
  for (const auto& s : specs_) {
    if (s.kind == Kind::positional && !s.required && required) {
      fail_internal("required positional '" + name + "' after an optional one");
    }
  }
  declare({name, Kind::positional, name, help, false, required, 0});
  return *this;
}

const ArgParser::Spec* ArgParser::find_long(std::string_view name) const {
  for (const auto& s : specs_) {
    if (s.name == name) return &s;
  }
  return nullptr;
}

const ArgParser::Spec* ArgParser::find_short(char c) const {
  for (const auto& s : specs_) {
    if (s.short_name == c) return &s;
  }
  return nullptr;
}

const ArgParser::Spec& ArgParser::spec(const std::string& name) const {
  const Spec* s = find_long(strip_dashes(name));
  if (s == nullptr) fail_internal("command " + command_ + " has no option '" + name + "'");
  return *s;
}

std::string ArgParser::help_hint() const { return "see 'tubewave " + command_ + " --help'"; }

void ArgParser::fail(const std::string& message) const {
  throw InputError(message + "; " + help_hint());
}

bool ArgParser::parse(std::span<const std::string> args) {
  given_.clear();
  std::vector<const Spec*> positionals;
  for (const auto& s : specs_) {
    if (s.kind == Kind::positional) positionals.push_back(&s);
  }
  std::size_t next_positional = 0;
  auto take_positional = [&](const std::string& word) {
    if (next_positional >= positionals.size()) fail("unexpected argument '" + word + "'");
    given_[positionals[next_positional++]->name].push_back(word);
  };

  bool options_done = false;
  for (std::size_t k = 0; k < args.size(); ++k) {
    const std::string& word = args[k];
    if (options_done || word == "-" || word.empty() || word[0] != '-' || looks_numeric(word)) {
      take_positional(word);
      continue;
    }
    if (word == "--") {
      options_done = true;
      continue;
    }
    if (word == "--help" || word == "-h") {
      std::cout << help_text();
      return false;
    }

    const Spec* s = nullptr;
    std::string shown;  // the option as the user should see it in messages
    std::string inline_value;
    bool has_inline = false;
    if (word.starts_with("--")) {
      std::string name = word.substr(2);
      if (const auto eq = name.find('='); eq != std::string::npos) {
        inline_value = name.substr(eq + 1);
        has_inline = true;
        name.resize(eq);
      }
      s = find_long(name);
      shown = "--" + name;
      if (s == nullptr || s->kind == Kind::positional) {
        std::vector<std::string> names;
        for (const auto& c : specs_) {
          if (c.kind != Kind::positional) names.push_back(c.name);
        }
        names.push_back("help");
        const std::string near = io::detail::nearest_name(name, names);
        fail("unknown option '" + shown + "'" +
             (near.empty() ? std::string() : " (did you mean '--" + near + "'?)"));
      }
    } else {  // -x, -xVALUE
      s = find_short(word[1]);
      if (s == nullptr) fail("unknown option '" + word.substr(0, 2) + "'");
      shown = "--" + s->name;
      if (word.size() > 2) {
        inline_value = word.substr(word[2] == '=' ? 3 : 2);
        has_inline = true;
      }
    }

    if (s->kind == Kind::flag) {
      if (has_inline) fail("option " + shown + " takes no value (got '" + inline_value + "')");
      given_[s->name].push_back("");
      continue;
    }
    std::string value;
    if (has_inline) {
      value = inline_value;
    } else {
      if (k + 1 >= args.size() || (args[k + 1].starts_with("--") && args[k + 1].size() > 2)) {
        fail("option " + shown + " needs a value " + s->metavar);
      }
      value = args[++k];
    }
    auto& list = given_[s->name];
    if (!s->repeatable) list.clear();
    list.push_back(value);
  }

  for (std::size_t k = next_positional; k < positionals.size(); ++k) {
    if (positionals[k]->required) fail("missing argument " + positionals[k]->name);
  }
  return true;
}

bool ArgParser::has(const std::string& name) const {
  return given_.contains(spec(name).name);
}

std::string ArgParser::value(const std::string& name) const {
  const Spec& s = spec(name);
  const auto it = given_.find(s.name);
  if (it == given_.end() || it->second.empty()) {
    if (s.kind == Kind::positional) fail("missing argument " + s.name);
    fail("option --" + s.name + " " + s.metavar + " is required");
  }
  return it->second.back();
}

std::vector<std::string> ArgParser::values(const std::string& name) const {
  const auto it = given_.find(spec(name).name);
  return it == given_.end() ? std::vector<std::string>{} : it->second;
}

double ArgParser::real_value(const std::string& name) const {
  const std::string text = value(name);
  double v = 0;
  switch (parse_real_detail(text, v)) {
    case RealParse::ok: return v;
    case RealParse::not_finite:
      fail("option --" + spec(name).name + ": '" + text + "' is not a finite number");
    case RealParse::not_a_number: break;
  }
  fail("option --" + spec(name).name + ": '" + text + "' is not a number");
}

long ArgParser::int_value(const std::string& name) const {
  const std::string text = value(name);
  std::string_view t = text;
  if (!t.empty() && t.front() == '+') t.remove_prefix(1);
  long v = 0;
  const auto [ptr, ec] = std::from_chars(t.data(), t.data() + t.size(), v);
  if (t.empty() || ec != std::errc() || ptr != t.data() + t.size()) {
    fail("option --" + spec(name).name + ": '" + text + "' is not an integer");
  }
  return v;
}

std::string ArgParser::positional_value(const std::string& name) const {
  const Spec& s = spec(name);
  if (s.kind != Kind::positional) fail_internal("'" + name + "' is not a positional");
  return value(name);
}

std::string ArgParser::help_text() const {
  std::string out = "usage: tubewave " + command_ + " " + synopsis_ + "\n";
  if (!description_.empty()) {
    // Appended piecewise: "literal" + std::string&& trips a false -Wrestrict in GCC 12.
    out += '\n';
    out += wrap(description_, 88);
    out += '\n';
  }

  struct Line {
    std::string left, help;
  };
  std::vector<Line> pos_lines, opt_lines;
  for (const auto& s : specs_) {
    if (s.kind == Kind::positional) {
      pos_lines.push_back({s.name + (s.required ? "" : " (optional)"), s.help});
      continue;
    }
    std::string left = s.short_name ? std::string("-") + s.short_name + ", " : "    ";
    left += "--" + s.name;
    if (s.kind == Kind::option) left += " " + s.metavar;
    opt_lines.push_back({left, s.help + (s.repeatable ? " (repeatable)" : "")});
  }
  opt_lines.push_back({"-h, --help", "show this help and exit"});

  std::size_t width = 0;
  for (const auto& l : pos_lines) width = std::max(width, l.left.size());
  for (const auto& l : opt_lines) width = std::max(width, l.left.size());
  auto emit = [&](const std::vector<Line>& lines) {
    for (const auto& l : lines) {
      out += "  " + l.left + std::string(width - l.left.size() + 2, ' ') + l.help + "\n";
    }
  };
  if (!pos_lines.empty()) {
    out += "\narguments:\n";
    emit(pos_lines);
  }
  out += "\noptions:\n";
  emit(opt_lines);
  return out;
}

bool parse_real(std::string_view text, double& out) {
  return parse_real_detail(text, out) == RealParse::ok;
}

}  // namespace tw::cli
