// Tests of the run-file key declarations (Section/KeySpec builders) and of the generated
// Markdown key reference.
#include <catch2/catch.hpp>
#include <cmath>
#include <memory>
#include <string>

#include "core/error.hpp"
#include "io/schema.hpp"
#include "io/text_util.hpp"

using Catch::Matchers::Contains;
using tw::io::KeySpec;
using tw::io::KeyType;
using tw::io::Schema;
using tw::io::Section;

namespace {

/// A small invented schema: a test tube with a plasma, a shared profile section and probes.
Schema reference_schema() {
  Schema s;
  Section& root = s.root();
  root.string("title", "one line shown on plots").def("untitled");
  Section& plasma = root.section("plasma", "background plasma of the tube");
  plasma.real("density", "m^-3", "ion number density").require().positive();
  plasma.real("temperature", "eV", "electron temperature").def(5.0).non_negative();
  auto profile = std::make_shared<Section>("a profile along x");
  profile->real("peak", "", "value at the centre").require();
  profile->real("width", "m", "half width | of the bump").def(0.1).positive();
  plasma.real_or_section("field", "T", "axial magnetic field", profile).def(0.1).positive();
  plasma.real_or_section("flow", "m/s", "bulk flow speed", profile);
  Section& num = root.section("numerics", "discretisation");
  num.real("cfl", "", "Courant number").def(0.8).above(0).at_most(1);
  num.integer("cells", "number of cells").def(200).at_least(2);
  num.choice("flux", {"hll", "hlld"}, "numerical flux").def("hlld");
  num.boolean("limiter", "limit slopes").def(true);
  num.real_list("domain", "m", "x range").length(2).def_list({0.0, 1.5});
  Section& probe = root.section("output", "what is written").section_list("probes", "point probes");
  probe.real("x", "m", "probe position").require();
  return s;
}

}  // namespace

TEST_CASE("defaults are stored as YAML text that reads back to the same value", "[unit]") {
  Section s;
  CHECK(s.real("a", "m", "").def(1e18).default_yaml == "1e+18");
  CHECK(s.real("b", "m", "").def(0.8).default_yaml == "0.8");
  CHECK(s.real("c", "m", "").def(0.1 + 0.2).default_yaml == "0.30000000000000004");
  CHECK(s.integer("d", "").def(200).default_yaml == "200");
  CHECK(s.integer("e", "").def(-7L).default_yaml == "-7");
  CHECK(s.boolean("f", "").def(false).default_yaml == "false");
  CHECK(s.string("g", "").def("out.h5").default_yaml == "out.h5");
  // Text that YAML would read as a boolean, a number or null is quoted.
  CHECK(s.string("h", "").def("true").default_yaml == "\"true\"");
  CHECK(s.string("i", "").def("1.5").default_yaml == "\"1.5\"");
  CHECK(s.string("j", "").def("").default_yaml == "\"\"");
  CHECK(s.real_list("k", "m", "").def_list({0.0, -2.5, 3e-9}).default_yaml == "[0, -2.5, 3e-09]");
  CHECK(s.real_list("m", "m", "").def_list({}).default_yaml == "[]");
  CHECK_THROWS_AS(s.real("l", "", "").def(std::nan("")), tw::InternalError);
}

TEST_CASE("key modifiers set type, range, requirement and length", "[unit]") {
  Section s("doc of s");
  CHECK(s.doc() == "doc of s");
  const KeySpec& k = s.real("n", "m^-3", "density").positive().below(1e30);
  CHECK(k.type == KeyType::real);
  CHECK(k.unit == "m^-3");
  CHECK(k.min == 0.0);
  CHECK(k.min_exclusive);
  CHECK(k.max == 1e30);
  CHECK(k.max_exclusive);
  CHECK_FALSE(k.required);
  CHECK(s.integer("m", "").require().at_least(2).at_most(9).required);
  const KeySpec* m = s.find("m");
  REQUIRE(m != nullptr);
  CHECK(m->type == KeyType::integer);
  CHECK(*m->min == 2.0);
  CHECK_FALSE(m->min_exclusive);
  CHECK(*m->max == 9.0);
  CHECK_FALSE(m->max_exclusive);
  CHECK(s.real_list("v", "", "").length(3).list_length == 3);
  CHECK(s.choice("w", {"a", "b"}, "").choices.size() == 2);
  CHECK(s.find("nope") == nullptr);
  // Declaration order is kept.
  REQUIRE(s.keys().size() == 4);
  CHECK(s.keys()[0].name == "n");
  CHECK(s.keys()[3].name == "w");
}

TEST_CASE("sections are shared by name; conflicting declarations are bugs", "[unit]") {
  Section root;
  Section& a = root.section("numerics", "first");
  a.real("cfl", "", "");
  Section& b = root.section("numerics", "second");
  CHECK(&a == &b);
  CHECK(b.find("cfl") != nullptr);
  Section& p1 = root.section_list("probes", "");
  Section& p2 = root.section_list("probes", "");
  CHECK(&p1 == &p2);
  CHECK(root.keys().size() == 2);

  CHECK_THROWS_AS(root.real("numerics", "", ""), tw::InternalError);
  CHECK_THROWS_AS(root.section_list("numerics", ""), tw::InternalError);
  CHECK_THROWS_AS(root.section("probes", ""), tw::InternalError);
  a.real("end", "s", "");
  CHECK_THROWS_WITH(a.real("end", "s", ""), Contains("declared twice"));
  CHECK_THROWS_WITH(root.real("a.b", "", ""), Contains("letters, digits"));
  CHECK_THROWS_WITH(root.real("", "", ""), Contains("letters, digits"));
  CHECK_THROWS_WITH(root.real("x[0]", "", ""), Contains("letters, digits"));
  CHECK_THROWS_AS(root.choice("c", {}, ""), tw::InternalError);
  CHECK_THROWS_AS(root.real_or_section("p", "", "", nullptr), tw::InternalError);
}

TEST_CASE("the key reference has one table per section with every column", "[unit]") {
  const std::string md = reference_schema().reference_markdown();
  CHECK_THAT(md, Contains("| key | type | unit | default | allowed | description |"));
  CHECK_THAT(md, Contains("## Top level"));
  CHECK_THAT(md, Contains("| `title` | text |  | `untitled` |  | one line shown on plots |"));
  CHECK_THAT(md, Contains("## `plasma`\n\nbackground plasma of the tube\n"));
  CHECK_THAT(md,
             Contains("| `plasma.density` | real | m^-3 | required | > 0 | ion number density |"));
  CHECK_THAT(md,
             Contains("| `plasma.temperature` | real | eV | `5` | >= 0 | electron temperature |"));
  CHECK_THAT(md, Contains("| `numerics.cfl` | real | 1 | `0.8` | (0, 1] | Courant number |"));
  CHECK_THAT(md, Contains("| `numerics.cells` | integer |  | `200` | >= 2 | number of cells |"));
  CHECK_THAT(md,
             Contains("| `numerics.flux` | choice |  | `hlld` | `hll`, `hlld` | numerical flux |"));
  CHECK_THAT(md, Contains("| `numerics.limiter` | boolean |  | `true` | `true`, `false` |"));
  CHECK_THAT(md, Contains("| `numerics.domain` | list of 2 reals | m | `[0, 1.5]` |  | x range |"));
  CHECK_THAT(
      md, Contains("| `output.probes` | list of sections |  |  | keys: see `output.probes[]` |"));
  CHECK_THAT(md, Contains("## `output.probes[]`"));
  CHECK_THAT(md, Contains("| `output.probes[].x` | real | m | required |  | probe position |"));
  // A key without default that is not required.
  CHECK_THAT(md, Contains("| `plasma.flow` | real or section | m/s | (none) |"));
  // Pipes in descriptions are escaped so the table stays intact.
  CHECK_THAT(md, Contains("half width \\| of the bump"));
}

TEST_CASE("a shared sub-section is documented once and referenced", "[unit]") {
  const std::string md = reference_schema().reference_markdown();
  CHECK_THAT(md, Contains("| `plasma.field` | real or section | T | `0.1` | number > 0; keys: see "
                          "`plasma.field` | axial magnetic field |"));
  CHECK_THAT(md, Contains("| `plasma.flow` | real or section | m/s | (none) | keys: see "
                          "`plasma.field` | bulk flow speed |"));
  CHECK_THAT(md, Contains("| `plasma.field.peak` | real | 1 | required |"));
  std::size_t headings = 0;
  for (std::size_t p = md.find("## `plasma.field`"); p != std::string::npos;
       p = md.find("## `plasma.field`", p + 1))
    ++headings;
  CHECK(headings == 1);
  CHECK(md.find("plasma.flow.peak") == std::string::npos);
}

TEST_CASE("the key reference is deterministic and in declaration order", "[unit]") {
  const Schema s = reference_schema();
  const std::string md = s.reference_markdown();
  CHECK(md == s.reference_markdown());
  CHECK(md == reference_schema().reference_markdown());
  const auto pos = [&](const std::string& what) {
    const auto p = md.find(what);
    REQUIRE(p != std::string::npos);
    return p;
  };
  CHECK(pos("## Top level") < pos("## `plasma`"));
  CHECK(pos("## `plasma`") < pos("## `plasma.field`"));
  CHECK(pos("## `plasma.field`") < pos("## `numerics`"));
  CHECK(pos("## `numerics`") < pos("## `output`"));
  CHECK(pos("## `output`") < pos("## `output.probes[]`"));
  CHECK(pos("`plasma.density`") < pos("`plasma.temperature`"));
  CHECK(pos("`numerics.cfl`") < pos("`numerics.cells`"));
}

TEST_CASE("an empty section is listed without a table", "[unit]") {
  Schema s;
  s.root().section("spare", "kept for later");
  const std::string md = s.reference_markdown();
  CHECK_THAT(md, Contains("## `spare`\n\nkept for later\n\n(no keys)\n"));
  CHECK_THAT(md, Contains("| `spare` | section |  |  | keys: see `spare` | kept for later |"));
}

TEST_CASE("suggestions: edit distance with swaps, and a closeness limit", "[unit]") {
  using tw::io::detail::edit_distance;
  using tw::io::detail::nearest_name;
  CHECK(edit_distance("density", "density") == 0);
  CHECK(edit_distance("densty", "density") == 1);   // a dropped letter
  CHECK(edit_distance("lable", "label") == 1);      // two letters swapped
  CHECK(edit_distance("Density", "density") == 0);  // case is ignored
  CHECK(edit_distance("", "abc") == 3);
  CHECK(edit_distance("kitten", "sitting") == 3);  // the textbook example
  const std::vector<std::string> keys{"density", "temperature", "field", "flow"};
  CHECK(nearest_name("densty", keys) == "density");
  CHECK(nearest_name("feild", keys) == "field");
  CHECK(nearest_name("flwo", keys) == "flow");
  CHECK(nearest_name("colour", keys).empty());
  CHECK(nearest_name("temp", keys).empty());  // 7 edits from "temperature": not close
  // Ties go to the earlier candidate.
  CHECK(nearest_name("hlle", {"hll", "hlld"}) == "hll");
}
