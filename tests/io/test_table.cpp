// CSV tables (io/table.hpp): reading, and the errors that name the file, the row and the
// column.
#include <catch2/catch.hpp>

#include "io/table.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::io::ConfigError;
using tw::io::CsvTable;
using namespace tw::test;

namespace {
std::string error_of(const std::string& path, const std::string& column_check = {}) {
  try {
    const CsvTable t = CsvTable::read(path, "plasma.density.file");
    if (column_check == "increasing") t.require_increasing("x");
    if (column_check == "positive") t.require_non_negative("n", true);
    if (column_check == "missing") (void)t.column("T_i");
    if (column_check == "rows") t.require_rows(3);
  } catch (const ConfigError& e) {
    CHECK(e.exit_code() == 2);
    return e.what();
  }
  FAIL("no error for " << path);
  return {};
}
}  // namespace

TEST_CASE("CSV tables read header, comments and rows", "[unit][table]") {
  ScratchDir dir("table");
  write_text(dir / "ok.csv", "# a profile\n\nx, n ,T_e\n0, 1e18, 5  # first\n1.5,2e18,6\n\n3,3e18,7\n");
  const CsvTable t = CsvTable::read((dir / "ok.csv").string(), "k");
  REQUIRE(t.rows() == 3);
  CHECK(t.names() == std::vector<std::string>{"x", "n", "T_e"});
  CHECK(t.column("n")[1] == 2e18);
  CHECK(t.column("T_e")[2] == 7);
  CHECK(tw::io::interpolate(t.column("x"), t.column("n"), 0.75) == Approx(1.5e18));
  CHECK(tw::io::interpolate(t.column("x"), t.column("n"), -1) == 1e18);  // clamped
  CHECK(tw::io::path_beside("/a/b/run.yaml", "p.csv") == "/a/b/p.csv");
  CHECK(tw::io::path_beside("/a/b/run.yaml", "/c/p.csv") == "/c/p.csv");
}

TEST_CASE("bad CSV tables are rejected with file, line, row and column", "[unit][table]") {
  ScratchDir dir("badtable");
  const auto f = [&](const std::string& name, const std::string& text) {
    write_text(dir / name, text);
    return (dir / name).string();
  };
  std::string m = error_of(f("word.csv", "x,n\n0,1\n1,abc\n"));
  CHECK_THAT(m, Contains("word.csv:3:3") && Contains("row 2") && Contains("column 'n'") && Contains("'abc'"));
  CHECK_THAT(m, Contains("key 'plasma.density.file'"));
  m = error_of(f("gap.csv", "x,n\n0,1\n1,\n"));
  CHECK_THAT(m, Contains("gap.csv:3:") && Contains("row 2: column 'n' is empty"));
  m = error_of(f("short.csv", "x,n,T_e\n0,1,2\n1,2\n"));
  CHECK_THAT(m, Contains("short.csv:3:1") && Contains("row 2 has 2 values, but the header names 3 columns"));
  m = error_of(f("unsorted.csv", "x,n\n0,1\n2,1\n1,1\n"), "increasing");
  CHECK_THAT(m, Contains("unsorted.csv:4:1") && Contains("row 3: column 'x' must increase") && Contains("1 follows 2"));
  m = error_of(f("neg.csv", "x,n\n0,1\n1,-5\n"), "positive");
  CHECK_THAT(m, Contains("neg.csv:3:3") && Contains("row 2: column 'n' must be > 0 (got -5)"));
  m = error_of(f("missing.csv", "# c\nx,n\n0,1\n"), "missing");
  CHECK_THAT(m, Contains("missing.csv:2:1") && Contains("missing column 'T_i'") && Contains("x, n"));
  m = error_of(f("norows.csv", "x,n\n0,1\n"), "rows");
  CHECK_THAT(m, Contains("at least 3 data rows (it has 1)"));
  m = error_of(f("noheader.csv", "0,1\n1,2\n"));
  CHECK_THAT(m, Contains("first line must name the columns"));
  m = error_of(f("empty.csv", "# nothing\n"));
  CHECK_THAT(m, Contains("empty"));
  m = error_of(f("dup.csv", "x,x\n0,1\n"));
  CHECK_THAT(m, Contains("column 'x' appears twice"));
  m = error_of(f("inf.csv", "x,n\n0,inf\n"));
  CHECK_THAT(m, Contains("not a finite number"));
  m = error_of((dir / "absent.csv").string());
  CHECK_THAT(m, Contains("cannot open the table file"));
}
