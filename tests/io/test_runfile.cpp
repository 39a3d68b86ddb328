// Tests of run-file loading and validation: every rule in io/runfile.hpp, with the error
// messages asserted (key path, file, line and column).
#include <catch2/catch.hpp>
#include <memory>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "io/config_error_check.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using Catch::Matchers::StartsWith;
using tw::io::ConfigError;
using tw::io::RunFile;
using tw::io::Schema;
using tw::io::Section;
using tw::test::config_error_of;

namespace {

/// An invented schema for the tests: a test tube with a plasma, a profile shared by two
/// keys, numerics and output probes. The real run schema is assembled elsewhere.
Schema test_schema() {
  Schema s;
  Section& root = s.root();
  root.string("title", "one line shown on plots").def("untitled");
  Section& plasma = root.section("plasma", "background plasma of the tube");
  plasma.real("density", "m^-3", "ion number density").require().positive();
  plasma.real("temperature", "eV", "electron temperature").def(5.0).non_negative();
  auto profile = std::make_shared<Section>("a profile along x");
  profile->real("peak", "", "value at the centre").require();
  profile->real("width", "m", "half width").def(0.1).positive();
  profile->choice("shape", {"gaussian", "flat", "tanh"}, "profile shape").def("gaussian");
  plasma.real_or_section("field", "T", "axial magnetic field", profile).def(0.1).positive();
  plasma.real_or_section("flow", "m/s", "bulk flow speed", profile);
  Section& num = root.section("numerics", "discretisation");
  num.real("cfl", "", "Courant number").def(0.8).above(0).at_most(1);
  num.integer("cells", "number of cells").def(200).at_least(2);
  num.choice("flux", {"hll", "hlld", "rusanov"}, "numerical flux").def("hlld");
  num.boolean("limiter", "limit slopes").def(true);
  num.real_list("domain", "m", "x range of the tube").length(2).def_list({0.0, 1.0});
  Section& out = root.section("output", "what is written");
  out.string("file", "output file").def("run.h5");
  out.real_list("times", "s", "snapshot times").non_negative();
  Section& probe = out.section_list("probes", "point probes");
  probe.real("x", "m", "probe position").require();
  probe.string("label", "name on plots");
  return s;
}

// Line numbers below are those of this text (1-based).
const std::string good_file = R"(title: Tube A-7 test
plasma:
  density: 2e18
  field:
    peak: 0.05
    shape: tanh
numerics:
  cells: 1e3
  domain: [-0.5, 0.5]
output:
  probes:
    - x: 0.1
      label: near
    - {x: 0.4}
)";

/// The error message for `text` (with the minimal valid plasma prepended when asked).
std::string error_of(const std::string& text, const std::vector<std::string>& overrides = {}) {
  static const Schema schema = test_schema();
  return config_error_of(text, schema, overrides);
}

RunFile parse(const std::string& text, const std::vector<std::string>& overrides = {}) {
  return RunFile::parse(text, "run.yaml", test_schema(), overrides);
}

}  // namespace

// ---------------------------------------------------------------------------------------
// Reading values

TEST_CASE("a valid run file gives its values, typed, by dotted path", "[unit]") {
  const RunFile rf = parse(good_file);
  CHECK(rf.get_string("title") == "Tube A-7 test");
  CHECK(rf.get_real("plasma.density") == 2e18);
  CHECK(rf.is_section("plasma.field"));
  CHECK(rf.get_real("plasma.field.peak") == 0.05);
  CHECK(rf.get_string("plasma.field.shape") == "tanh");
  CHECK(rf.get_int("numerics.cells") == 1000);
  CHECK(rf.get_reals("numerics.domain") == std::vector<double>{-0.5, 0.5});
  CHECK(rf.get_real("numerics.domain[1]") == 0.5);
  REQUIRE(rf.count("output.probes") == 2);
  CHECK(rf.get_real("output.probes[0].x") == 0.1);
  CHECK(rf.get_string("output.probes[0].label") == "near");
  CHECK(rf.get_real("output.probes[1].x") == 0.4);
  CHECK(rf.source_name() == "run.yaml");
  CHECK(rf.source_text() == good_file);
  CHECK(rf.overrides().empty());
}

TEST_CASE("absent keys take their declared defaults", "[unit]") {
  const RunFile rf = parse(good_file);
  CHECK(rf.get_real("plasma.temperature") == 5.0);
  CHECK(rf.get_real("plasma.field.width") == 0.1);
  CHECK(rf.get_real("numerics.cfl") == 0.8);
  CHECK(rf.get_string("numerics.flux") == "hlld");
  CHECK(rf.get_bool("numerics.limiter"));
  CHECK(rf.get_string("output.file") == "run.h5");

  // A minimal file: whole sections absent are filled with their defaults.
  const RunFile m = parse("plasma:\n  density: 1e17\n");
  CHECK(m.get_string("title") == "untitled");
  CHECK(m.get_int("numerics.cells") == 200);
  CHECK(m.get_reals("numerics.domain") == std::vector<double>{0.0, 1.0});
  CHECK(m.get_real("plasma.field") == 0.1);
  CHECK_FALSE(m.is_section("plasma.field"));
  CHECK(m.count("output.probes") == 0);
}

TEST_CASE("has() and given() tell given, defaulted and absent keys apart", "[unit]") {
  const RunFile rf = parse(good_file);
  CHECK(rf.has("plasma.density"));
  CHECK(rf.given("plasma.density"));
  CHECK(rf.has("plasma.temperature"));
  CHECK_FALSE(rf.given("plasma.temperature"));
  // Optional without a default.
  CHECK_FALSE(rf.has("plasma.flow"));
  CHECK_FALSE(rf.given("plasma.flow"));
  CHECK_FALSE(rf.is_section("plasma.flow"));
  CHECK_FALSE(rf.has("output.times"));
  CHECK_FALSE(rf.has("output.probes[1].label"));
  // List elements.
  CHECK(rf.has("output.probes[1]"));
  CHECK(rf.has("output.probes[1].x"));
  CHECK_FALSE(rf.has("output.probes[2]"));
  CHECK_FALSE(rf.has("output.probes[2].x"));
  // Sections: given when written, present (filled) either way.
  CHECK(rf.given("numerics"));
  const RunFile m = parse("plasma:\n  density: 1e17\n");
  CHECK(m.has("numerics"));
  CHECK_FALSE(m.given("numerics"));
  CHECK_FALSE(m.has("output.probes"));
  CHECK(m.count("output.probes") == 0);
}

TEST_CASE("integers accept whole numbers written as reals", "[unit]") {
  CHECK(parse("plasma: {density: 1}\nnumerics: {cells: 2.0}\n").get_int("numerics.cells") == 2);
  CHECK(parse("plasma: {density: 1}\nnumerics: {cells: +12}\n").get_int("numerics.cells") == 12);
  CHECK(parse("plasma: {density: 1}\nnumerics: {cells: 4e6}\n").get_int("numerics.cells") ==
        4000000);
  // Reals accept integers; a string key keeps a number's text.
  CHECK(parse("plasma: {density: 3}\n").get_real("plasma.density") == 3.0);
  CHECK(parse("plasma: {density: .5e1}\n").get_real("plasma.density") == 5.0);
  CHECK(parse("title: 42\nplasma: {density: 1}\n").get_string("title") == "42");
  CHECK(parse("title: 'true'\nplasma: {density: 1}\n").get_string("title") == "true");
}

TEST_CASE("YAML anchors and aliases are followed", "[unit]") {
  const RunFile rf =
      parse("plasma: {density: 1}\nnumerics:\n  domain: &d [0, 2]\noutput:\n  times: *d\n");
  CHECK(rf.get_reals("output.times") == std::vector<double>{0.0, 2.0});
}

TEST_CASE("misusing the accessors is a programming error", "[unit]") {
  const RunFile rf = parse(good_file);
  CHECK_THROWS_AS(rf.get_real("plasma.densty"), tw::InternalError);
  CHECK_THROWS_WITH(rf.get_real("plasma.densty"), Contains("is not declared"));
  CHECK_THROWS_WITH(rf.has("nowhere"), Contains("is not declared"));
  CHECK_THROWS_WITH(rf.get_int("plasma.density"), Contains("get_int does not fit"));
  CHECK_THROWS_WITH(rf.get_real("numerics.cells"), Contains("get_real does not fit"));
  CHECK_THROWS_WITH(rf.get_string("numerics.limiter"), Contains("get_string does not fit"));
  CHECK_THROWS_WITH(rf.get_reals("output.probes"), Contains("get_reals does not fit"));
  CHECK_THROWS_WITH(rf.count("numerics.domain"), Contains("count does not fit"));
  CHECK_THROWS_WITH(rf.get_bool("plasma"), Contains("get_bool does not fit"));
  CHECK_THROWS_WITH(rf.get_real("plasma.flow"), Contains("has no value"));
  CHECK_THROWS_WITH(rf.get_real("output.probes[5].x"), Contains("has no value"));
  CHECK_THROWS_WITH(rf.get_real("plasma.field"), Contains("is_section"));
  CHECK_THROWS_WITH(rf.get_real("plasma..density"), Contains("malformed run-file key path"));
  CHECK_THROWS_WITH(rf.get_real("output.probes.x"), Contains("name an element first"));
  CHECK_THROWS_AS(rf.get_real("plasma.density[0]"), tw::InternalError);
}

TEST_CASE("a RunFile is a value: copies outlive the original and the schema", "[unit]") {
  std::unique_ptr<RunFile> copy;
  {
    const Schema schema = test_schema();
    const RunFile rf = RunFile::parse(good_file, "run.yaml", schema);
    copy = std::make_unique<RunFile>(rf);
    RunFile moved = std::move(*copy);
    *copy = moved;
  }
  CHECK(copy->get_real("output.probes[1].x") == 0.4);
  CHECK(copy->where("plasma.density").line == 3);
}

// ---------------------------------------------------------------------------------------
// Positions, where() and fail()

TEST_CASE("where() reports file, line and column (1-based)", "[unit]") {
  const RunFile rf = parse(good_file);
  const auto p = rf.where("plasma.density");
  CHECK(p.file == "run.yaml");
  CHECK(p.line == 3);
  CHECK(p.column == 12);
  CHECK(p.str() == "run.yaml:3:12");
  CHECK(rf.where("plasma").str() == "run.yaml:2:1");
  CHECK(rf.where("output.probes[1].x").str() == "run.yaml:14:11");
  CHECK(rf.where("numerics.domain[1]").str() == "run.yaml:9:18");
  // A missing key: its enclosing section (here the list element).
  CHECK(rf.where("output.probes[1].label").str() == "run.yaml:14:7");
  // A default is not from the file.
  const auto d = rf.where("numerics.cfl");
  CHECK(d.line == 0);
  CHECK(d.origin == "default");
  CHECK(d.str() == "run.yaml (default)");
  CHECK(rf.where("").str() == "run.yaml:1:1");
}

TEST_CASE("fail() throws a ConfigError at the key's position", "[unit]") {
  const RunFile rf = parse(good_file);
  try {
    rf.fail("plasma.density", "too dense for the electrostatic limit");
    FAIL("fail() returned");
  } catch (const ConfigError& e) {
    CHECK(std::string(e.what()) ==
          "run.yaml:3:12: key 'plasma.density': too dense for the electrostatic limit");
    CHECK(e.key_path() == "plasma.density");
    CHECK(e.pos().line == 3);
    CHECK(e.exit_code() == 2);
  }
  CHECK_THROWS_WITH(rf.fail("numerics.cfl", "too large for this model"),
                    "run.yaml (default): key 'numerics.cfl': too large for this model");
  CHECK_THROWS_WITH(rf.fail("output.probes[1].x", "outside the domain"),
                    "run.yaml:14:11: key 'output.probes[1].x': outside the domain");
  CHECK_THROWS_WITH(rf.fail("", "no probe is inside the domain"),
                    "run.yaml:1:1: no probe is inside the domain");
  CHECK_THROWS_AS(rf.fail("plasma.nothing", "x"), tw::InternalError);
}

// ---------------------------------------------------------------------------------------
// File-level errors

TEST_CASE("a missing or unreadable file names the file", "[unit]") {
  const Schema schema = test_schema();
  CHECK_THROWS_WITH(RunFile::load("/nonexistent/tube/run.yaml", schema),
                    "/nonexistent/tube/run.yaml: the run file does not exist");
  tw::test::ScratchDir dir("runfile");
  CHECK_THROWS_WITH(RunFile::load(dir.path().string(), schema),
                    dir.path().string() + ": cannot read the run file: it is a directory");
  CHECK_THROWS_AS(RunFile::load("/nonexistent/tube/run.yaml", schema), ConfigError);
}

TEST_CASE("a file on disk loads, and its errors carry its path", "[unit]") {
  const Schema schema = test_schema();
  tw::test::ScratchDir dir("runfile");
  const auto good = dir / "good.yaml";
  tw::test::write_text(good, good_file);
  const RunFile rf = RunFile::load(good.string(), schema, {"numerics.cfl=0.5"});
  CHECK(rf.source_name() == good.string());
  CHECK(rf.source_text() == good_file);
  CHECK(rf.get_real("numerics.cfl") == 0.5);
  CHECK(rf.overrides() == std::vector<std::string>{"numerics.cfl=0.5"});

  const auto bad = dir / "bad.yaml";
  tw::test::write_text(bad, "plasma:\n  density: -1e18\n");
  CHECK_THROWS_WITH(RunFile::load(bad.string(), schema),
                    bad.string() + ":2:12: key 'plasma.density': must be > 0 (got -1e+18)");
}

TEST_CASE("YAML syntax errors give the parser's line and column", "[unit]") {
  const std::string m = error_of("plasma:\n  density: 1\nnumerics:\n  domain: [0, 1\n");
  CHECK_THAT(m, StartsWith("run.yaml:5:1: YAML syntax error: "));
  CHECK_THAT(m, Contains("end of sequence flow not found"));
  CHECK_THAT(error_of("plasma:\n  density: 1\n\tcells: 3\n"),
             StartsWith("run.yaml:3:1: YAML syntax error: "));
  CHECK_THAT(error_of("plasma:\n  density: 1\n   temperature: 2\n"),
             StartsWith("run.yaml:3:15: YAML syntax error: "));
  CHECK_THAT(error_of("plasma: *nowhere\n"), StartsWith("run.yaml:1:9: YAML syntax error: "));
}

TEST_CASE("an empty run file is rejected", "[unit]") {
  CHECK(error_of("") == "run.yaml:1:1: the run file is empty");
  CHECK(error_of("# only a comment\n\n   # and another\n") ==
        "run.yaml:1:1: the run file is empty");
  CHECK(error_of("---\n") == "run.yaml:1:1: the run file is empty");
  CHECK(error_of("~\n") == "run.yaml:1:1: the run file is empty");
}

TEST_CASE("the top level must be one map", "[unit]") {
  CHECK(error_of("- plasma\n- numerics\n") ==
        "run.yaml:1:1: the top level must be a map of keys (got a list)");
  CHECK(error_of("just some words\n") ==
        "run.yaml:1:1: the top level must be a map of keys (got a single value)");
  CHECK(error_of("plasma: {density: 1}\n---\nplasma: {density: 2}\n") ==
        "run.yaml:3:1: the run file holds 2 YAML documents (separated by '---'); it must hold one");
}

// ---------------------------------------------------------------------------------------
// Keys

TEST_CASE("an unknown key is rejected with the nearest declared key", "[unit]") {
  CHECK(error_of("plasma:\n  densty: 1e18\n") ==
        "run.yaml:2:3: key 'plasma.densty': unknown key; did you mean 'density'?");
  CHECK(error_of("plasm:\n  density: 1e18\n") ==
        "run.yaml:1:1: key 'plasm': unknown key; did you mean 'plasma'?");
  // Case differences count as close.
  CHECK_THAT(error_of("plasma:\n  Density: 1\n"), Contains("did you mean 'density'?"));
  CHECK_THAT(
      error_of("plasma: {density: 1}\noutput:\n  probes:\n    - x: 1\n      lable: a\n"),
      Contains("run.yaml:5:7: key 'output.probes[0].lable': unknown key; did you mean 'label'?"));
}

TEST_CASE("a far-off unknown key lists the section's keys instead of guessing", "[unit]") {
  CHECK(error_of("plasma:\n  density: 1\n  colour: red\n") ==
        "run.yaml:3:3: key 'plasma.colour': unknown key; the keys here are: density, "
        "temperature, field, flow");
  // "temp" is not offered for "time"-like words: too many edits for a short word.
  CHECK_THAT(error_of("plasma:\n  density: 1\n  temp: 3\n"), !Contains("did you mean"));
}

TEST_CASE("a key in the wrong section points to where it is declared", "[unit]") {
  CHECK(error_of("plasma:\n  density: 1\n  cfl: 0.5\n") ==
        "run.yaml:3:3: key 'plasma.cfl': unknown key here; it is declared as 'numerics.cfl'");
  CHECK_THAT(error_of("plasma: {density: 1}\nx: 3\n"),
             Contains("key 'x': unknown key here; it is declared as 'output.probes[].x'"));
}

TEST_CASE("duplicate keys are rejected", "[unit]") {
  CHECK(error_of("plasma:\n  density: 1e18\n  temperature: 3\n  density: 2e18\n") ==
        "run.yaml:4:3: key 'plasma.density': duplicate key (first given at run.yaml:2:3)");
  CHECK(error_of("plasma: {density: 1}\nnumerics: {}\nnumerics: {cells: 3}\n") ==
        "run.yaml:3:1: key 'numerics': duplicate key (first given at run.yaml:2:1)");
}

TEST_CASE("map keys must be words", "[unit]") {
  CHECK_THAT(error_of("plasma: {density: 1}\n? [a, b]\n: 1\n"),
             Contains("keys must be plain words, not lists or maps"));
}

TEST_CASE("a recursive alias is reported, not followed forever", "[unit]") {
  CHECK_THAT(error_of("plasma: &p\n  density: 1\n  field: *p\n"), Contains("nested too deeply"));
}

TEST_CASE("missing required keys are reported at the enclosing section", "[unit]") {
  CHECK(error_of("title: x\nplasma:\n  temperature: 3\n") ==
        "run.yaml:2:1: key 'plasma.density': missing required key (ion number density; a number "
        "in m^-3)");
  // No plasma section at all: the root's position.
  CHECK_THAT(error_of("numerics:\n  cells: 10\n"),
             StartsWith("run.yaml:1:1: key 'plasma.density': missing required key"));
  CHECK_THAT(error_of("title: x\nplasma:\n"),
             StartsWith("run.yaml:2:1: key 'plasma.density': missing required key"));
  // In a list element: the element's position.
  CHECK_THAT(error_of("plasma: {density: 1}\noutput:\n  probes:\n    - x: 1\n    - label: b\n"),
             StartsWith("run.yaml:5:7: key 'output.probes[1].x': missing required key"));
  // In the map form of a number-or-section key: that key's position.
  CHECK_THAT(error_of("plasma:\n  density: 1\n  field:\n    width: 0.2\n"),
             StartsWith("run.yaml:3:3: key 'plasma.field.peak': missing required key"));
}

// ---------------------------------------------------------------------------------------
// Types

TEST_CASE("real keys take numbers only, and finite ones", "[unit]") {
  const auto density = [](const std::string& v) {
    return error_of("plasma:\n  density: " + v + "\n");
  };
  CHECK(density("lots") == "run.yaml:2:12: key 'plasma.density': must be a number (got 'lots')");
  CHECK(density("true") == "run.yaml:2:12: key 'plasma.density': must be a number (got 'true')");
  CHECK(density("1,5") == "run.yaml:2:12: key 'plasma.density': must be a number (got '1,5')");
  CHECK(density("{a: 1}") == "run.yaml:2:12: key 'plasma.density': must be a number, not a map");
  CHECK(density("[1, 2]") == "run.yaml:2:12: key 'plasma.density': must be a number, not a list");
  CHECK(density(".nan") == "run.yaml:2:12: key 'plasma.density': must be finite (got .nan)");
  CHECK(density(".inf") == "run.yaml:2:12: key 'plasma.density': must be finite (got .inf)");
  CHECK(density("-.Inf") == "run.yaml:2:12: key 'plasma.density': must be finite (got -.Inf)");
  CHECK(density("nan") == "run.yaml:2:12: key 'plasma.density': must be finite (got nan)");
  CHECK_THAT(density("1e400"),
             Contains("key 'plasma.density': is outside the double-precision range"));
  CHECK(density("\"1e18\"") ==
        "run.yaml:2:12: key 'plasma.density': must be a number, not quoted text (got \"1e18\"); "
        "remove the quotes");
  CHECK(density("") == "run.yaml:2:3: key 'plasma.density': has no value");
  CHECK(
      error_of("plasma:\n  density: 1\n  temperature:\n") ==
      "run.yaml:3:3: key 'plasma.temperature': has no value; remove the key to use the default 5");
}

TEST_CASE("integer keys take whole numbers only", "[unit]") {
  const auto cells = [](const std::string& v) {
    return error_of("plasma: {density: 1}\nnumerics:\n  cells: " + v + "\n");
  };
  CHECK(cells("3.5") == "run.yaml:3:10: key 'numerics.cells': must be a whole number (got 3.5)");
  CHECK(parse("plasma: {density: 1}\nnumerics:\n  cells: 1.5e2\n").get_int("numerics.cells") ==
        150);
  CHECK_THAT(cells("1.25e1"), Contains("must be a whole number (got 12.5)"));
  CHECK(cells("many") ==
        "run.yaml:3:10: key 'numerics.cells': must be a whole number (got 'many')");
  CHECK_THAT(cells("1e30"),
             Contains("key 'numerics.cells': is too large for a whole number (got 1e30)"));
  CHECK_THAT(cells("99999999999999999999"), Contains("is too large for a whole number"));
  CHECK_THAT(cells(".inf"), Contains("must be finite"));
  CHECK_THAT(cells("'12'"), Contains("must be a whole number, not quoted text"));
  CHECK_THAT(cells("[1]"), Contains("must be a whole number, not a list"));
}

TEST_CASE("boolean keys take true or false only", "[unit]") {
  const auto limiter = [](const std::string& v) {
    return error_of("plasma: {density: 1}\nnumerics:\n  limiter: " + v + "\n");
  };
  CHECK(limiter("yes") ==
        "run.yaml:3:12: key 'numerics.limiter': must be true or false (got 'yes')");
  CHECK(limiter("1") == "run.yaml:3:12: key 'numerics.limiter': must be true or false (got '1')");
  CHECK(limiter("True") ==
        "run.yaml:3:12: key 'numerics.limiter': must be true or false (got 'True')");
  CHECK_THAT(limiter("\"true\""), Contains("must be true or false without quotes"));
  CHECK(parse("plasma: {density: 1}\nnumerics: {limiter: false}\n").get_bool("numerics.limiter") ==
        false);
}

TEST_CASE("text keys take a single value", "[unit]") {
  CHECK(error_of("title: {a: 1}\nplasma: {density: 1}\n") ==
        "run.yaml:1:8: key 'title': must be text, not a map");
  CHECK(error_of("title: [a]\nplasma: {density: 1}\n") ==
        "run.yaml:1:8: key 'title': must be text, not a list");
}

TEST_CASE("choice keys take one of their words, with the nearest suggested", "[unit]") {
  const auto flux = [](const std::string& v) {
    return error_of("plasma: {density: 1}\nnumerics:\n  flux: " + v + "\n");
  };
  CHECK(flux("hlle") ==
        "run.yaml:3:9: key 'numerics.flux': must be one of: hll, hlld, rusanov (got 'hlle'); did "
        "you mean 'hll'?");
  CHECK(flux("rusonov") ==
        "run.yaml:3:9: key 'numerics.flux': must be one of: hll, hlld, rusanov (got 'rusonov'); "
        "did you mean 'rusanov'?");
  CHECK(flux("roe") ==
        "run.yaml:3:9: key 'numerics.flux': must be one of: hll, hlld, rusanov (got 'roe')");
  CHECK_THAT(flux("[hll]"), Contains("must be one word, not a list"));
}

TEST_CASE("real lists take numbers, of the declared length", "[unit]") {
  const auto domain = [](const std::string& v) {
    return error_of("plasma: {density: 1}\nnumerics:\n  domain: " + v + "\n");
  };
  CHECK(domain("1") ==
        "run.yaml:3:11: key 'numerics.domain': must be a list of numbers such as [1, 2, 3] (got "
        "'1')");
  CHECK(domain("[0, 1, 2]") ==
        "run.yaml:3:11: key 'numerics.domain': must have exactly 2 elements (got 3)");
  CHECK(domain("[0, wide]") ==
        "run.yaml:3:15: key 'numerics.domain[1]': must be a number (got 'wide')");
  CHECK(domain("") ==
        "run.yaml:3:3: key 'numerics.domain': has no value; remove the key to use "
        "the default [0, 1]");
  CHECK(parse("plasma: {density: 1}\nnumerics:\n  domain:\n    - 0\n    - 2\n")
            .get_reals("numerics.domain") == std::vector<double>{0.0, 2.0});
}

TEST_CASE("real list elements are range-checked one by one", "[unit]") {
  CHECK(error_of("plasma: {density: 1}\noutput:\n  times: [0.1, -1]\n") ==
        "run.yaml:3:16: key 'output.times[1]': must be >= 0 (got -1)");
  // Without a fixed length, an empty list is a valid value ("no snapshot times").
  const RunFile rf = parse("plasma: {density: 1}\noutput:\n  times: []\n");
  CHECK(rf.has("output.times"));
  CHECK(rf.get_reals("output.times").empty());
  CHECK_THAT(rf.resolved_yaml(), Contains("times: []\n"));
}

TEST_CASE("section keys take maps", "[unit]") {
  CHECK(error_of("plasma: {density: 1}\nnumerics: 5\n") ==
        "run.yaml:2:11: key 'numerics': must be a section (a map of keys), not '5'");
  CHECK(error_of("plasma: {density: 1}\nnumerics: [1]\n") ==
        "run.yaml:2:11: key 'numerics': must be a section (a map of keys), not a list");
  // An empty section is a section with all defaults.
  CHECK(parse("plasma: {density: 1}\nnumerics:\n").get_int("numerics.cells") == 200);
}

TEST_CASE("lists of sections take lists of maps, each validated", "[unit]") {
  CHECK(error_of("plasma: {density: 1}\noutput:\n  probes: {x: 1}\n") ==
        "run.yaml:3:11: key 'output.probes': must be a list of sections (lines starting with "
        "'- '), not a map");
  CHECK(error_of("plasma: {density: 1}\noutput:\n  probes: [1, 2]\n") ==
        "run.yaml:3:12: key 'output.probes[0]': each element must be a map of keys (got '1')");
  CHECK(error_of("plasma: {density: 1}\noutput:\n  probes:\n    - x: 1\n    - x: far\n") ==
        "run.yaml:5:10: key 'output.probes[1].x': must be a number (got 'far')");
  CHECK(parse("plasma: {density: 1}\noutput:\n  probes: []\n").count("output.probes") == 0);
}

TEST_CASE("number-or-section keys take a number or a map", "[unit]") {
  CHECK(error_of("plasma:\n  density: 1\n  field: [1, 2]\n") ==
        "run.yaml:3:10: key 'plasma.field': must be a number or a map of keys, not a list");
  CHECK(error_of("plasma:\n  density: 1\n  field: -0.1\n") ==
        "run.yaml:3:10: key 'plasma.field': must be > 0 (got -0.1)");
  CHECK(error_of("plasma:\n  density: 1\n  field: {peak: 1, shap: flat}\n") ==
        "run.yaml:3:20: key 'plasma.field.shap': unknown key; did you mean 'shape'?");
  CHECK(
      error_of("plasma:\n  density: 1\n  flow: {peak: 1, shape: round}\n") ==
      "run.yaml:3:26: key 'plasma.flow.shape': must be one of: gaussian, flat, tanh (got 'round')");
  const RunFile rf = parse("plasma:\n  density: 1\n  flow: {peak: 3}\n");
  CHECK(rf.is_section("plasma.flow"));
  CHECK(rf.get_real("plasma.flow.peak") == 3.0);
  CHECK(rf.get_real("plasma.flow.width") == 0.1);
}

TEST_CASE("range checks name the bound and the value", "[unit]") {
  CHECK(error_of("plasma:\n  density: -1e18\n") ==
        "run.yaml:2:12: key 'plasma.density': must be > 0 (got -1e+18)");
  CHECK(error_of("plasma:\n  density: 0\n") ==
        "run.yaml:2:12: key 'plasma.density': must be > 0 (got 0)");
  CHECK(error_of("plasma: {density: 1}\nnumerics:\n  cfl: 1.5\n") ==
        "run.yaml:3:8: key 'numerics.cfl': must be in (0, 1] (got 1.5)");
  CHECK(error_of("plasma: {density: 1}\nnumerics:\n  cfl: 0\n") ==
        "run.yaml:3:8: key 'numerics.cfl': must be in (0, 1] (got 0)");
  CHECK(parse("plasma: {density: 1}\nnumerics:\n  cfl: 1\n").get_real("numerics.cfl") == 1.0);
  CHECK(error_of("plasma: {density: 1}\nnumerics:\n  cells: 1\n") ==
        "run.yaml:3:10: key 'numerics.cells': must be >= 2 (got 1)");
  CHECK(error_of("plasma:\n  density: 1\n  temperature: -0.5\n") ==
        "run.yaml:3:16: key 'plasma.temperature': must be >= 0 (got -0.5)");
}

TEST_CASE("an empty list can be a declared default", "[unit]") {
  Schema s;
  s.root().real_list("marks", "m", "").def_list({});
  const RunFile rf = RunFile::parse("{}\n", "run.yaml", s);
  CHECK(rf.has("marks"));
  CHECK_FALSE(rf.given("marks"));
  CHECK(rf.get_reals("marks").empty());
  CHECK(RunFile::parse("marks: [1, 2]\n", "run.yaml", s).get_reals("marks").size() == 2);
}

TEST_CASE("an invalid declared default is a programming error", "[unit]") {
  Schema s;
  s.root().choice("mode", {"a", "b"}, "").def("c");
  CHECK_THROWS_AS(RunFile::parse("other: 1\n", "run.yaml", s), ConfigError);  // unknown key first
  CHECK_THROWS_AS(RunFile::parse("{}\n", "run.yaml", s), tw::InternalError);
  CHECK_THROWS_WITH(RunFile::parse("{}\n", "run.yaml", s),
                    Contains("the declared default 'c' of run-file key 'mode' is invalid"));
}

// ---------------------------------------------------------------------------------------
// Overrides

TEST_CASE("overrides replace, add and fill values before validation", "[unit]") {
  const RunFile rf = parse(good_file, {"plasma.density=3e18", "numerics.cfl=0.5",
                                       "numerics.flux=hll", "output.file=tube.h5"});
  CHECK(rf.get_real("plasma.density") == 3e18);
  CHECK(rf.get_real("numerics.cfl") == 0.5);
  CHECK(rf.given("numerics.cfl"));
  CHECK(rf.get_string("numerics.flux") == "hll");
  CHECK(rf.get_string("output.file") == "tube.h5");
  const auto p = rf.where("plasma.density");
  CHECK(p.line == 0);
  CHECK(p.origin == "--set plasma.density=3e18");
  CHECK(p.str() == "run.yaml (--set plasma.density=3e18)");
  // Untouched keys keep their file positions.
  CHECK(rf.where("plasma.field.peak").str() == "run.yaml:5:11");
  CHECK(rf.overrides().size() == 4);
  // The later override wins.
  CHECK(parse(good_file, {"numerics.cells=10", "numerics.cells=20"}).get_int("numerics.cells") ==
        20);
  // A section absent from the file is created.
  CHECK(parse("plasma: {density: 1}\n", {"numerics.cells=50"}).get_int("numerics.cells") == 50);
  // A required key can come from the command line alone.
  CHECK(parse("title: x\n", {"plasma.density=4"}).get_real("plasma.density") == 4.0);
  // A bad value in the file is replaced before it is checked.
  CHECK(parse("plasma:\n  density: lots\n", {"plasma.density=1"}).get_real("plasma.density") ==
        1.0);
}

TEST_CASE("override values are YAML: lists and maps work", "[unit]") {
  const RunFile rf = parse(good_file, {"output.times=[1e-6, 2e-6]", "numerics.domain=[-1, 1]",
                                       "output.probes=[{x: 0.2}, {x: 0.3, label: mid}, {x: 0.9}]",
                                       "plasma.flow={peak: 2, shape: flat}"});
  CHECK(rf.get_reals("output.times") == std::vector<double>{1e-6, 2e-6});
  CHECK(rf.get_reals("numerics.domain") == std::vector<double>{-1.0, 1.0});
  REQUIRE(rf.count("output.probes") == 3);
  CHECK(rf.get_string("output.probes[1].label") == "mid");
  CHECK(rf.get_string("plasma.flow.shape") == "flat");
  // Elements of a list given on the command line carry the override as their origin.
  CHECK_THAT(rf.where("output.probes[2].x").str(), Contains("(--set output.probes=["));
}

TEST_CASE("overrides can address list elements by index", "[unit]") {
  const RunFile rf = parse(
      good_file, {"output.probes[1].x=0.35", "numerics.domain[0]=-2", "output.probes[2].x=0.9"});
  REQUIRE(rf.count("output.probes") == 3);
  CHECK(rf.get_real("output.probes[0].x") == 0.1);
  CHECK(rf.get_real("output.probes[1].x") == 0.35);
  CHECK(rf.get_real("output.probes[2].x") == 0.9);
  CHECK(rf.get_string("output.probes[0].label") == "near");
  CHECK(rf.get_reals("numerics.domain") == std::vector<double>{-2.0, 0.5});
  CHECK(rf.where("output.probes[1]").str() == "run.yaml:14:7");
  CHECK(rf.where("output.probes[1].x").str() == "run.yaml (--set output.probes[1].x=0.35)");
}

TEST_CASE("an override of a sub-key turns a number into the map form", "[unit]") {
  const RunFile rf = parse("plasma:\n  density: 1\n  field: 0.2\n", {"plasma.field.peak=0.3"});
  CHECK(rf.is_section("plasma.field"));
  CHECK(rf.get_real("plasma.field.peak") == 0.3);
}

TEST_CASE("override values are validated like file values", "[unit]") {
  CHECK(error_of(good_file, {"plasma.density=-1"}) ==
        "run.yaml (--set plasma.density=-1): key 'plasma.density': must be > 0 (got -1)");
  CHECK(error_of(good_file, {"numerics.cells=3.5"}) ==
        "run.yaml (--set numerics.cells=3.5): key 'numerics.cells': must be a whole number (got "
        "3.5)");
  CHECK(error_of(good_file, {"output.probes=[1,2]"}) ==
        "run.yaml (--set output.probes=[1,2]): key 'output.probes[0]': each element must be a map "
        "of keys (got '1')");
  CHECK(error_of(good_file, {"title="}) ==
        "run.yaml (--set title=): key 'title': has no value; remove the key to use the default "
        "untitled");
  CHECK(error_of(good_file, {"plasma={temperature: 1}"}) ==
        "run.yaml (--set plasma={temperature: 1}): key 'plasma.density': missing required key (ion "
        "number density; a number in m^-3)");
}

TEST_CASE("overrides naming undeclared keys are rejected with a suggestion", "[unit]") {
  CHECK(error_of(good_file, {"plasma.densty=1"}) ==
        "run.yaml (--set plasma.densty=1): key 'plasma.densty': unknown key; did you mean "
        "'plasma.density'?");
  CHECK(error_of(good_file, {"numerix.cfl=1"}) ==
        "run.yaml (--set numerix.cfl=1): key 'numerix': unknown key; did you mean 'numerics'?");
  CHECK(error_of(good_file, {"output.probes[0].lable=a"}) ==
        "run.yaml (--set output.probes[0].lable=a): key 'output.probes[0].lable': unknown key; did "
        "you mean 'output.probes[0].label'?");
  CHECK(error_of(good_file, {"cfl=0.5"}) ==
        "run.yaml (--set cfl=0.5): key 'cfl': unknown key here; it is declared as 'numerics.cfl'");
}

TEST_CASE("malformed overrides are rejected", "[unit]") {
  CHECK(error_of(good_file, {"plasma.density"}) ==
        "run.yaml (--set plasma.density): malformed override: expected KEY=VALUE, e.g. --set "
        "time.end=1e-6");
  CHECK(error_of(good_file, {"=5"}) ==
        "run.yaml (--set =5): malformed override: the key before '=' is empty");
  CHECK_THAT(
      error_of(good_file, {"plasma..density=1"}),
      StartsWith("run.yaml (--set plasma..density=1): key 'plasma..density': malformed key path"));
  CHECK_THAT(error_of(good_file, {"output.probes[x].x=1"}),
             Contains("must be a whole number >= 0"));
  CHECK_THAT(error_of(good_file, {"numerics.domain=[0, 1"}),
             StartsWith("run.yaml (--set numerics.domain=[0, 1): key 'numerics.domain': malformed "
                        "value '[0, 1': "));
}

TEST_CASE("override paths must fit the declared shape", "[unit]") {
  CHECK(error_of(good_file, {"output.probes[5].x=1"}) ==
        "run.yaml (--set output.probes[5].x=1): key 'output.probes[5]': list index out of range: "
        "'output.probes' has 2 elements (indices start at 0; index 2 appends one)");
  CHECK(error_of(good_file, {"plasma.density[0]=1"}) ==
        "run.yaml (--set plasma.density[0]=1): key 'plasma.density': is a number, not a list; it "
        "takes no index [0]");
  CHECK(error_of(good_file, {"output.probes.x=1"}) ==
        "run.yaml (--set output.probes.x=1): key 'output.probes': is a list of sections; name an "
        "element first, e.g. 'output.probes[0].x'");
  CHECK(error_of(good_file, {"plasma.density.peak=1"}) ==
        "run.yaml (--set plasma.density.peak=1): key 'plasma.density': is a number, not a section; "
        "it has no key 'peak'");
  CHECK(error_of(good_file, {"numerics.domain[0].x=1"}) ==
        "run.yaml (--set numerics.domain[0].x=1): key 'numerics.domain[0]': is a number, not a "
        "section; it has no key 'x'");
}

// ---------------------------------------------------------------------------------------
// Resolved document

TEST_CASE("the resolved YAML has overrides and defaults, in declaration order", "[unit]") {
  const RunFile rf = parse(good_file, {"numerics.cfl=0.5"});
  const std::string y = rf.resolved_yaml();
  CHECK_THAT(y, Contains("cfl: 0.5\n"));
  CHECK_THAT(y, Contains("cells: 1000\n"));
  CHECK_THAT(y, Contains("density: 2e+18\n"));
  CHECK_THAT(y, Contains("temperature: 5\n"));
  CHECK_THAT(y, Contains("domain: [-0.5, 0.5]\n"));
  CHECK_THAT(y, Contains("file: run.h5\n"));
  const auto at = [&](const std::string& s) {
    const auto p = y.find(s);
    REQUIRE(p != std::string::npos);
    return p;
  };
  CHECK(at("title:") < at("plasma:"));
  CHECK(at("plasma:") < at("numerics:"));
  CHECK(at("numerics:") < at("output:"));
  CHECK(at("density:") < at("temperature:"));
  CHECK(at("temperature:") < at("field:"));
  CHECK(at("cfl:") < at("cells:"));
  // Optional keys without a value are left out.
  CHECK(y.find("flow:") == std::string::npos);
  CHECK(y.find("times:") == std::string::npos);
}

TEST_CASE("the resolved YAML reads back to the same run", "[unit]") {
  const RunFile rf = parse(good_file, {"output.times=[0, 1e-6]", "title=true"});
  const std::string y = rf.resolved_yaml();
  CHECK_THAT(y, Contains("title: \"true\"\n"));
  const RunFile back = parse(y);
  CHECK(back.resolved_yaml() == y);
  CHECK(back.get_string("title") == "true");
  CHECK(back.get_real("plasma.density") == 2e18);
  CHECK(back.get_int("numerics.cells") == 1000);
  CHECK(back.get_string("plasma.field.shape") == "tanh");
  CHECK(back.get_reals("output.times") == std::vector<double>{0.0, 1e-6});
  CHECK(back.count("output.probes") == 2);
  CHECK(back.get_real("output.probes[1].x") == 0.4);
  // Defaults are written out, so they read back as given.
  CHECK(back.given("numerics.cfl"));
  // Exact doubles survive the round trip.
  const RunFile odd = parse("plasma: {density: 0.30000000000000004}\n");
  CHECK(parse(odd.resolved_yaml()).get_real("plasma.density") == 0.1 + 0.2);
}

// ---------------------------------------------------------------------------------------
// The broken-file corpus helper

TEST_CASE("broken run files state their expected error in comments", "[unit]") {
  const auto x = tw::test::read_expectations(
      "# expect-error: key 'plasma.density'\n  #expect-error:  must be > 0  \n"
      "# set: numerics.cfl=0.5\n# a plain comment\nplasma:\n  density: -1\n");
  CHECK(x.fragments == std::vector<std::string>{"key 'plasma.density'", "must be > 0"});
  CHECK(x.overrides == std::vector<std::string>{"numerics.cfl=0.5"});

  tw::test::ScratchDir dir("corpus");
  tw::test::write_text(dir / "b_negative.yaml",
                       "# expect-error: b_negative.yaml:3:12: key 'plasma.density'\n"
                       "plasma:\n  density: -1\n");
  tw::test::write_text(
      dir / "a_override.yaml",
      "# set: numerics.cells=1\n"
      "# expect-error: (--set numerics.cells=1): key 'numerics.cells': must be >= 2\n"
      "plasma:\n  density: 1\n");
  tw::test::write_text(dir / "notes.txt", "not a run file\n");
  const auto files = tw::test::yaml_files_in(dir.path());
  REQUIRE(files.size() == 2);
  CHECK(files[0].filename() == "a_override.yaml");
  const Schema schema = test_schema();
  for (const auto& f : files) tw::test::check_broken_run_file(f, schema);
}
