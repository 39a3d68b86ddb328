// `tubewave modes`: output formats, the run-file and flag inputs, and bad input (exit code
// 2 with a message naming the option). The physics of the numbers is tested in
// tests/models/test_modes.cpp; here the whistler root of case B at k d_i = 1 (d_i = 0.45389 m,
// validation sheet sect. 1), f_R = (1 + sqrt 5)/2 f_ci = 620.8 kHz in Hall MHD (sect. 3; 620.79
// kHz with the electrons' mass in rho), only shows that the command prints the library's result.
#include <catch2/catch.hpp>

#include <sstream>
#include <string>

#include "support/test_support.hpp"

using tw::test::run_tubewave;

namespace {

bool contains(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

int lines(const std::string& text) {
  int n = 0;
  for (char c : text) n += c == '\n';
  return n;
}

const std::string kPlasma = "--n 1e18 --B 0.1 --ion He --Te 5 --Ti 1";

}  // namespace

TEST_CASE("tubewave modes: a table of every branch from the plasma flags", "[unit][cli]") {
  const auto r = run_tubewave("modes --model hall " + kPlasma + " --k 2.2031");
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  CHECK(contains(r.output, "tubewave modes: hall model"));
  CHECK(contains(r.output, "omega [rad/s]"));
  CHECK(contains(r.output, "620794"));  // f_R [Hz]
  CHECK(contains(r.output, " R "));
  CHECK(contains(r.output, " L "));
  CHECK(contains(r.output, "static modes"));
}

TEST_CASE("tubewave modes: CSV rows per branch and a wavenumber scan", "[unit][cli]") {
  const auto r = run_tubewave("modes --model mhd " + kPlasma + " --angle-deg 30 --k 1:3:5 --csv");
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  CHECK(r.output.rfind("k_per_m,branch,direction,omega_rad_per_s,frequency_hz,damping_rate_per_s,", 0) == 0);
  CHECK(lines(r.output) == 1 + 5 * 6);  // 5 wavenumbers, 3 forward and 3 backward branches
  CHECK(contains(r.output, ",shear\n"));
}

TEST_CASE("tubewave modes: the inverse problem lists complex wavenumbers at a drive frequency", "[unit][cli]") {
  const auto r = run_tubewave("modes --model mhd " + kPlasma + " --set model.resistivity=1e-4 --freq 1e5");
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  CHECK(contains(r.output, "Re k [1/m]"));
  CHECK(contains(r.output, "damping len [m]"));
  const auto c = run_tubewave("modes --model mhd " + kPlasma + " --freq 1e5:2e5:2 --csv");
  REQUIRE(c.exit_code == 0);
  CHECK(c.output.rfind("frequency_hz,omega_rad_per_s,k_re_per_m,k_im_per_m,wavelength_m,damping_length_m,", 0) == 0);
}

TEST_CASE("tubewave modes: from a run file, with its k_perp and a position", "[unit][cli]") {
  const std::string cfg = tw::test::source_path("configs/hall_whistler.yaml").string();
  const auto r = run_tubewave("modes " + cfg + " --k 1 --kperp 0.5 --json");
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  CHECK(contains(r.output, "\"model\": \"hall\""));
  CHECK(contains(r.output, "\"k_perp\": 0.5"));
  CHECK(contains(r.output, "\"branches\": ["));
  const auto far = run_tubewave("modes " + cfg + " --k 1 --at 1e9");
  CHECK(far.exit_code == 2);
  CHECK(contains(far.output, "option --at"));
  CHECK(contains(far.output, "outside the tube"));
}

TEST_CASE("tubewave modes: bad input is refused with exit code 2 naming the option", "[unit][cli]") {
  struct Bad {
    std::string args, message;
  };
  const std::vector<Bad> cases{
      {"modes --model hall " + kPlasma, "give --k K"},
      {"modes --model hall " + kPlasma + " --k 1 --freq 1e5", "options --k and --freq were both given"},
      {"modes --model hall " + kPlasma + " --k 1:2", "needs START:STOP:COUNT"},
      {"modes --model hall " + kPlasma + " --k 1:2:0.5", "whole COUNT"},
      {"modes " + kPlasma + " --k 1", "no model"},
      {"modes --model fluid " + kPlasma + " --k 1", "option --model: 'fluid' is not a model"},
      {"modes --model hall --B 0.1 --ion He --k 1", "option --n"},
      {"modes --model hall " + kPlasma + " --k 1 --json --csv", "choose one output format"},
      {"modes --model hall " + kPlasma + " --k 1 --kperp -1", "option --kperp"},
      {"modes --model hall " + kPlasma + " --freq 0", "option --freq"},
      {"modes --model hall " + kPlasma + " --k 0", "k = 0 with k_perp = 0"},
      {"modes --model two-fluid " + kPlasma + " --Ti 0 --k 1", "the two-fluid model needs T_i > 0"},
      {"modes " + tw::test::source_path("configs/hall_whistler.yaml").string() + " --n 1e18 --k 1",
       "give either a run file or the plasma flags"},
      {"modes --model hall " + kPlasma + " --k 1 --set model.bogus=1", "model.bogus"},
  };
  for (const auto& b : cases) {
    const auto r = run_tubewave(b.args);
    INFO(b.args << "\n" << r.output);
    CHECK(r.exit_code == 2);
    CHECK(contains(r.output, b.message));
  }
}
