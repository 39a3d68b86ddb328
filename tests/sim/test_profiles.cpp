// Profiles along x for the background plasma (sim/profiles.hpp): every shape from the run
// file, the checks on the grid, and bad tables.
#include <catch2/catch.hpp>
#include <cmath>

#include "sim/case.hpp"
#include "sim/run.hpp"
#include "support/run_support.hpp"

using Catch::Matchers::Contains;
using namespace tw;
using namespace tw::test;


TEST_CASE("profile shapes give the documented values along the tube", "[unit][profile]") {
  ScratchDir dir("profiles");
  auto with = [&](const std::string& d) {
    write_text(dir / "p.yaml", std::string("plasma:\n  ion: He\n  field: 0.1\n  density: ") + d +
                                   "\ngrid: {x_min: 2.0, length: 10.0, cells: 100}\ntime: {end: 1.0e-6}\n"
                                   "boundaries: {left: {kind: conducting}, right: {kind: conducting}}\n");
    return read_case(load_run_file((dir / "p.yaml").string())).plasma.n_e;
  };
  const Profile u = with("3e18");
  CHECK(u.uniform);
  CHECK(u(5.0) == 3e18);
  const Profile un = with("{shape: uniform, value: 2e18}");
  CHECK(un(9.0) == 2e18);
  const Profile lin = with("{shape: linear, left: 1e18, right: 3e18}");
  CHECK_FALSE(lin.uniform);
  CHECK(lin(2.0) == Approx(1e18));
  CHECK(lin(7.0) == Approx(2e18));
  CHECK(lin(12.0) == Approx(3e18));
  const Profile th = with("{shape: tanh, left: 1e18, right: 4e18, centre: 6.0, width: 0.5}");
  CHECK(th(6.0) == Approx(2.5e18));
  CHECK(th(6.5) == Approx(1e18 + 3e18 * 0.5 * (1 + std::tanh(1.0))));
  CHECK(th(2.0) == Approx(1e18).epsilon(1e-6));
  const Profile thd = with("{shape: tanh, left: 1e18, right: 4e18, width: 0.5}");  // centre: middle
  CHECK(thd(7.0) == Approx(2.5e18));
  const Profile ex = with("{shape: exponential, value: 1e18, centre: 4.0, scale_length: -2.0}");
  CHECK(ex(4.0) == Approx(1e18));
  CHECK(ex(6.0) == Approx(1e18 / std::exp(1.0)));
  const Profile ga = with("{shape: gaussian, background: 1e18, peak: 3e18, centre: 5.0, width: 2.0}");
  CHECK(ga(5.0) == Approx(3e18));
  CHECK(ga(6.0) == Approx(2e18));  // half maximum above the background at width/2
  const Profile well = with("{shape: gaussian, background: 2e18, peak: 0.5e18, centre: 5.0, width: 2.0}");
  CHECK(well(5.0) == Approx(0.5e18));
  CHECK(well(4.0) == Approx(1.25e18));

  write_text(dir / "col.csv", "# x [m], n [m^-3], T_e, T_i [eV]\nx,n,T_e,T_i\n0,1e18,4,1\n10,3e18,8,1\n20,3e18,8,2\n");
  const Profile tab = with("{shape: table, file: col.csv}");
  CHECK(tab(5.0) == Approx(2e18));
  CHECK(tab(12.0) == Approx(3e18));
  // Temperatures read their own columns of the same table.
  write_text(dir / "t.yaml", "plasma:\n  ion: He\n  field: 0.1\n  density: {shape: table, file: col.csv}\n"
                             "  electron_temperature: {shape: table, file: col.csv}\n"
                             "  ion_temperature: {shape: table, file: col.csv}\n"
                             "grid: {x_min: 2.0, length: 10.0, cells: 100}\ntime: {end: 1.0e-6}\n"
                             "boundaries: {left: {kind: conducting}, right: {kind: conducting}}\n");
  const CaseSetup c = read_case(load_run_file((dir / "t.yaml").string()));
  CHECK(c.plasma.t_e_eV(5.0) == Approx(6.0));
  CHECK(c.plasma.t_i_eV(15.0) == Approx(1.5));
  const PlasmaPoint p = c.plasma.at(5.0, c.units);
  CHECK(p.t_e == Approx(6.0 * tw::constants::eV));
}

TEST_CASE("bad profiles and bad profile tables are rejected with key, file and row", "[unit][profile]") {
  ScratchDir dir("badprofiles");
  auto err = [&](const std::string& d, const std::string& extra = {}) {
    write_text(dir / "b.yaml", std::string("plasma:\n  ion: He\n  field: 0.1\n  density: ") + d + "\n" + extra +
                                   "grid: {x_min: 2.0, length: 10.0, cells: 100}\ntime: {end: 1.0e-6}\n"
                                   "boundaries: {left: {kind: conducting}, right: {kind: conducting}}\n");
    try {
      (void)read_case(load_run_file((dir / "b.yaml").string()));
    } catch (const io::ConfigError& e) {
      CHECK(e.exit_code() == 2);
      return std::string(e.what());
    }
    FAIL("no error for density " << d);
    return std::string();
  };
  CHECK_THAT(err("{shape: tanh, left: 1e18, right: 4e18}"), Contains("plasma.density") && Contains("needs 'width'"));
  CHECK_THAT(err("{shape: linear, left: 1e18, right: 3e18, width: 1}"),
             Contains("plasma.density.width") && Contains("the linear shape does not take 'width'"));
  CHECK_THAT(err("{shape: linear, left: 1e18, right: -3e18}"),
             Contains("key 'plasma.density'") && Contains("must be > 0 along the whole tube") && Contains("at x = "));
  CHECK_THAT(err("{shape: exponential, value: 1e18, scale_length: 0}"), Contains("must not be zero"));
  CHECK_THAT(err("{shape: spiral}"), Contains("plasma.density.shape"));
  CHECK_THAT(err("-1"), Contains("plasma.density") && Contains("must be > 0"));

  write_text(dir / "unsorted.csv", "x,n,T_e,T_i\n0,1e18,4,1\n10,2e18,4,1\n5,2e18,4,1\n20,2e18,4,1\n");
  std::string m = err("{shape: table, file: unsorted.csv}");
  CHECK_THAT(m, Contains("unsorted.csv:4:1") && Contains("row 3") && Contains("must increase") &&
                    Contains("plasma.density.file"));
  write_text(dir / "neg.csv", "x,n,T_e,T_i\n0,1e18,4,1\n20,2e18,-4,1\n");
  CHECK_THAT(err("{shape: table, file: neg.csv}"), Contains("neg.csv:3:") && Contains("column 'T_e' must be >= 0"));
  write_text(dir / "cols.csv", "x,n,T_e\n0,1e18,4\n20,2e18,4\n");
  CHECK_THAT(err("{shape: table, file: cols.csv}"), Contains("cols.csv:1:1") && Contains("missing column 'T_i'"));
  write_text(dir / "gap.csv", "x,n,T_e,T_i\n0,1e18,4,1\n10,,4,1\n20,2e18,4,1\n");
  CHECK_THAT(err("{shape: table, file: gap.csv}"), Contains("gap.csv:3:") && Contains("row 2: column 'n' is empty"));
  write_text(dir / "short.csv", "x,n,T_e,T_i\n3,1e18,4,1\n20,2e18,4,1\n");
  CHECK_THAT(err("{shape: table, file: short.csv}"),
             Contains("covers x from 3 to 20 m, but the tube runs from 2 to 12 m"));
  CHECK_THAT(err("{shape: table, file: nowhere.csv}"), Contains("cannot open the table file"));
}

TEST_CASE("a density profile sets the initial state and rejects the uniform-only wave kind", "[unit][profile]") {
  ScratchDir dir("profilerun");
  const std::string text = R"(
plasma: {ion: He, field: 0.1, electron_temperature: 5, density: {shape: tanh, left: 1.0e18, right: 4.0e18, centre: 5.0, width: 1.0}}
grid: {length: 10.0, cells: 50}
time: {end: 1.0e-7}
boundaries: {left: {kind: conducting}, right: {kind: conducting}}
output: {snapshot_interval: 1.0e-7}
)";
  const RunOutput r = run_text(text, {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  const auto& n = r.first.at("density");  // ion density = n_e / Z, Z = 1
  for (std::size_t i = 0; i < n.size(); ++i)
    CHECK(n[i] == Approx(1e18 + 3e18 * 0.5 * (1 + std::tanh((r.x[i] - 5.0) / 1.0))).epsilon(1e-12));
  write_text(dir / "w.yaml", text + "initial: {kind: wave}\n");
  try {
    (void)run_config((dir / "w.yaml").string(), {}, dir, "w.h5");
    FAIL("the wave kind accepted a non-uniform background");
  } catch (const io::ConfigError& e) {
    CHECK_THAT(std::string(e.what()), Contains("needs a uniform background"));
  }
}
