// Lists of words in run-file schemas (KeyType::text_list), key paths checked against a
// schema without a file (io::declared_key), several groups replaced in one update of a
// finished file, and whole tables written to new HDF5 files.
#include <catch2/catch.hpp>
#include <filesystem>
#include <string>
#include <vector>

#include "io/config_error_check.hpp"
#include "io/h5read.hpp"
#include "io/h5table.hpp"
#include "io/h5update.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::io::RunFile;
using tw::io::Schema;
using tw::test::config_error_of;
using tw::test::ScratchDir;

namespace {

Schema word_schema() {
  Schema s;
  s.root().text_list("colours", "paint colours", {"red", "green", "blue"}).def_words({"red"});
  s.root().text_list("names", "any words");
  s.root().real_list("sizes", "m", "sizes");
  return s;
}

}  // namespace

TEST_CASE("text_list: words are read in order and checked against the choices and defaulted", "[unit]") {
  const Schema s = word_schema();
  const RunFile rf = RunFile::parse("colours: [green, blue]\nnames: [a b, \"1.5\", 'true']\n", "w.yaml", s);
  CHECK(rf.get_strings("colours") == std::vector<std::string>{"green", "blue"});
  CHECK(rf.get_strings("names") == std::vector<std::string>{"a b", "1.5", "true"});
  const RunFile d = RunFile::parse("names: []\n", "w.yaml", s);
  CHECK(d.get_strings("colours") == std::vector<std::string>{"red"});
  CHECK_FALSE(d.given("colours"));
  CHECK(d.get_strings("names").empty());
  // The resolved YAML quotes words that would read back as something else.
  const RunFile again = RunFile::parse(rf.resolved_yaml(), "again.yaml", s);
  CHECK(again.get_strings("names") == rf.get_strings("names"));
}

TEST_CASE("text_list: a word outside the choices or a map or a scalar is refused with its position", "[unit]") {
  const Schema s = word_schema();
  const std::string bad_word = config_error_of("colours: [green, bleu]\n", s, {}, "w.yaml");
  CHECK_THAT(bad_word, Contains("w.yaml:1:18"));
  CHECK_THAT(bad_word, Contains("key 'colours[1]'"));
  CHECK_THAT(bad_word, Contains("did you mean 'blue'"));
  CHECK_THAT(config_error_of("colours: red\n", s), Contains("must be a list of words"));
  CHECK_THAT(config_error_of("names: [[a, b]]\n", s), Contains("key 'names[0]': must be a word, not a list"));
  // Overrides reach list elements like any key.
  const RunFile o = RunFile::parse("colours: [red, red]\n", "w.yaml", s, {"colours[1]=green"});
  CHECK(o.get_strings("colours") == std::vector<std::string>{"red", "green"});
}

TEST_CASE("text_list: the key reference lists the allowed words", "[unit]") {
  const std::string md = word_schema().reference_markdown();
  CHECK_THAT(md, Contains("| `colours` | list of words |  | `[red]` | each `red`, `green`, `blue` | paint colours |"));
}

TEST_CASE("declared_key names the declaration of a key path or says why there is none", "[unit]") {
  const Schema s = word_schema();
  std::string why;
  REQUIRE(tw::io::declared_key(s, "sizes[2]", &why) != nullptr);
  CHECK(tw::io::declared_key(s, "sizes[2]")->unit == "m");
  CHECK(tw::io::declared_key(s, "colors", &why) == nullptr);
  CHECK_THAT(why, Contains("key 'colors'") && Contains("did you mean 'colours'"));
  CHECK(tw::io::declared_key(s, "sizes.x", &why) == nullptr);
  CHECK_THAT(why, Contains("not a section"));
  CHECK(tw::io::declared_key(s, "", &why) == nullptr);
}

TEST_CASE("replace_groups writes several groups of a finished file in one update", "[unit]") {
  const ScratchDir dir("replace-groups");
  const std::string file = (dir / "t.h5").string();
  tw::io::TableFile t;
  t.text_attributes = {{"format", "test"}};
  t.columns.push_back({"/a/x", false, {1.0, 2.0}, {}, "m", "x", {}});
  tw::io::write_table_file(file, t);
  tw::io::replace_groups(file, {{"/one", [](tw::io::GroupWriter& g) { g.scalar("v", 1.5, "s", "first"); }},
                                {"/two/deep", [](tw::io::GroupWriter& g) { g.attribute("", "note", std::string("hi")); }}});
  const tw::io::H5Reader h(file);
  CHECK(h.read_real("/one/v") == std::vector<double>{1.5});
  CHECK(h.attr_string("/two/deep", "note") == "hi");
  CHECK(h.read_real("/a/x") == std::vector<double>{1.0, 2.0});
  // No temporary file is left next to it.
  int n = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir.path())) n += e.path().filename() != "t.h5";
  CHECK(n == 0);
}

TEST_CASE("write_table_file writes numeric and text columns with units and replaces an old table", "[unit]") {
  const ScratchDir dir("table");
  const std::string file = (dir / "t.h5").string();
  tw::io::TableFile t;
  t.text_attributes = {{"format", "tubewave-test"}};
  t.real_attributes = {{"rows", 3}};
  t.columns.push_back({"/cases/speed", false, {1.0, 2.5, -3.0}, {}, "m/s", "a speed", {{"key", "k.speed"}}});
  t.columns.push_back({"/cases/name", true, {}, {"a", "b,c", ""}, "", "a name", {}});
  tw::io::write_table_file(file, t);
  t.columns[0].reals = {4.0, 5.0, 6.0};
  tw::io::write_table_file(file, t);  // replaces the first
  const tw::io::H5Reader h(file);
  CHECK(h.attr_string("/", "format") == "tubewave-test");
  CHECK(h.attr_real("/", "rows") == 3);
  CHECK(h.read_real("/cases/speed") == std::vector<double>{4.0, 5.0, 6.0});
  CHECK(h.attr_string("/cases/speed", "units") == "m/s");
  CHECK(h.attr_string("/cases/speed", "key") == "k.speed");
  CHECK(h.members("/cases") == std::vector<std::string>{"speed", "name"});
}
