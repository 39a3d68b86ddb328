// The `tubewave` executable: top-level help and version, and the `plasma` subcommand.
// Physics values are checked against validation.md section 1, case A (computed
// independently with scipy.constants, CODATA 2018): v_A = 6.8976e6 m/s,
// omega_ci = 9.5788e7 rad/s, f_ci = 1.5245e7 Hz, d_e = 1.6805e-3 m, ln Lambda = 13.638.
#include <catch2/catch.hpp>

#include <cctype>
#include <cstdlib>
#include <string>

#include "support/test_support.hpp"

using tw::test::run_tubewave;

namespace {

bool contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// A minimal JSON syntax checker (RFC 8259 grammar, no semantic checks), enough to show
// that the output parses.
class JsonChecker {
 public:
  explicit JsonChecker(const std::string& s) : s_(s) {}
  bool document() {
    ws();
    if (!value()) return false;
    ws();
    return k_ == s_.size();
  }

 private:
  void ws() {
    while (k_ < s_.size() && std::isspace(static_cast<unsigned char>(s_[k_]))) ++k_;
  }
  bool lit(const char* t) {
    const std::string w(t);
    if (s_.compare(k_, w.size(), w) != 0) return false;
    k_ += w.size();
    return true;
  }
  bool string() {
    if (k_ >= s_.size() || s_[k_] != '"') return false;
    for (++k_; k_ < s_.size(); ++k_) {
      const auto c = static_cast<unsigned char>(s_[k_]);
      if (c < 0x20) return false;
      if (c == '\\') {
        ++k_;
        continue;
      }
      if (c == '"') {
        ++k_;
        return true;
      }
    }
    return false;
  }
  bool number() {
    const char* begin = s_.c_str() + k_;
    if (*begin != '-' && !std::isdigit(static_cast<unsigned char>(*begin))) return false;
    char* end = nullptr;
    std::strtod(begin, &end);
    if (end == begin) return false;
    k_ += static_cast<std::size_t>(end - begin);
    return true;
  }
  bool value() {
    ws();
    if (k_ >= s_.size()) return false;
    const char c = s_[k_];
    if (c == '{') return container('}', true);
    if (c == '[') return container(']', false);
    if (c == '"') return string();
    if (lit("true") || lit("false") || lit("null")) return true;
    return number();
  }
  bool container(char close, bool object) {
    ++k_;
    ws();
    if (k_ < s_.size() && s_[k_] == close) {
      ++k_;
      return true;
    }
    while (true) {
      ws();
      if (object) {
        if (!string()) return false;
        ws();
        if (k_ >= s_.size() || s_[k_++] != ':') return false;
      }
      if (!value()) return false;
      ws();
      if (k_ >= s_.size()) return false;
      if (s_[k_] == ',') {
        ++k_;
        continue;
      }
      if (s_[k_] == close) {
        ++k_;
        return true;
      }
      return false;
    }
  }
  const std::string& s_;
  std::size_t k_ = 0;
};

// The number after "key": in a JSON text (keys are unique in tubewave's output).
double json_number(const std::string& json, const std::string& key) {
  const std::string pattern = "\"" + key + "\":";
  const std::size_t at = json.find(pattern);
  if (at == std::string::npos) FAIL("key " << key << " not in output");
  return std::strtod(json.c_str() + at + pattern.size(), nullptr);
}

const std::string case_A = "plasma --n 1e19 --B 1 --ion H --Te 100 --Ti 100";

}  // namespace

TEST_CASE("cli: top-level help, version, unknown command", "[unit][cli]") {
  const auto help = run_tubewave("--help");
  CHECK(help.exit_code == 0);
  CHECK(contains(help.output, "usage: tubewave"));
  CHECK(contains(help.output, "plasma"));

  const auto none = run_tubewave("");
  CHECK(none.exit_code == 2);
  CHECK(contains(none.output, "usage: tubewave"));

  const auto version = run_tubewave("--version");
  CHECK(version.exit_code == 0);
  CHECK(version.output.rfind("tubewave ", 0) == 0);
  CHECK(contains(version.output, "(git "));

  const auto typo = run_tubewave("plasme");
  CHECK(typo.exit_code == 2);
  CHECK(contains(typo.output, "tubewave: error: unknown command 'plasme'"));
  CHECK(contains(typo.output, "did you mean 'plasma'"));
}

TEST_CASE("cli: plasma --help", "[unit][cli]") {
  const auto r = run_tubewave("plasma --help");
  CHECK(r.exit_code == 0);
  CHECK(contains(r.output, "usage: tubewave plasma"));
  for (const char* opt : {"--n", "--B", "--ion", "--mass-amu", "--charge", "--Te", "--Ti",
                          "--lnlambda", "--json"}) {
    CHECK(contains(r.output, opt));
  }
}

TEST_CASE("cli: plasma prints a table with units (case A)", "[unit][cli]") {
  const auto r = run_tubewave(case_A);
  REQUIRE(r.exit_code == 0);
  for (const char* unit : {" m/s", " rad/s", " Hz", " m^-3", " ohm m", " m^2/s", " s^-1"}) {
    CHECK(contains(r.output, unit));
  }
  CHECK(contains(r.output, "6.89757e+06"));  // v_A, [VAL] case A 6.8976e6 m/s
  CHECK(contains(r.output, "1.52452e+07"));  // f_ci, [VAL] case A 1.5245e7 Hz
  CHECK(contains(r.output, "inertial Alfvén"));
}

TEST_CASE("cli: plasma --json parses and carries case A values", "[unit][cli]") {
  const auto r = run_tubewave(case_A + " --json");
  REQUIRE(r.exit_code == 0);
  CHECK(JsonChecker(r.output).document());
  // [VAL] case A, 5 significant digits.
  CHECK(json_number(r.output, "alfven_speed_m_per_s") == Approx(6.8976e6).epsilon(1e-4));
  CHECK(json_number(r.output, "ion_cyclotron_frequency_rad_per_s") == Approx(9.5788e7).epsilon(1e-4));
  CHECK(json_number(r.output, "ion_cyclotron_frequency_hz") == Approx(1.5245e7).epsilon(1e-4));
  CHECK(json_number(r.output, "electron_inertial_length_m") == Approx(1.6805e-3).epsilon(1e-4));
  CHECK(json_number(r.output, "coulomb_logarithm") == Approx(13.638).epsilon(1e-4));
  // The inputs are echoed.
  CHECK(json_number(r.output, "electron_density_per_m3") == 1e19);
  CHECK(json_number(r.output, "magnetic_field_t") == 1.0);
  CHECK(contains(r.output, "\"ion\": \"H\""));
}

TEST_CASE("cli: plasma --mass-amu, --charge and --n=VALUE forms", "[unit][cli]") {
  // He2+ given by mass: 4.002602 u - 2 m_e ~ 4.0015 u; omega_ci = Z e B/m_i.
  const auto r = run_tubewave("plasma --n=2e18 --B=0.5 --mass-amu 4.0015 --charge 2 --Te 10 --json");
  REQUIRE(r.exit_code == 0);
  CHECK(JsonChecker(r.output).document());
  CHECK(json_number(r.output, "ion_charge_number") == 2.0);
  CHECK(json_number(r.output, "ion_density_per_m3") == Approx(1e18));
  // NRL Formulary: omega_ci = 9.58e3 Z mu^-1 B (B in gauss), mu = 4.0015 u/m_p = 3.9724.
  CHECK(json_number(r.output, "ion_cyclotron_frequency_rad_per_s") ==
        Approx(9.58e3 * 2 / 3.9724 * 5000).epsilon(5e-3));
  CHECK(contains(r.output, "\"ion\": null"));
}

TEST_CASE("cli: plasma with T = 0 succeeds with a note", "[unit][cli]") {
  const auto r = run_tubewave("plasma --n 1e18 --B 0.1 --ion Ar");
  CHECK(r.exit_code == 0);
  CHECK(contains(r.output, "T_e = 0"));
  CHECK_FALSE(contains(r.output, "ohm m"));
}

TEST_CASE("cli: plasma rejects bad flags with exit code 2", "[unit][cli]") {
  struct Case {
    const char* args;
    const char* message;
  };
  const Case cases[] = {
      {"plasma --n -1 --B 1 --ion H", "option --n: '-1' is out of range"},
      {"plasma --n abc --B 1 --ion H", "option --n: 'abc' is not a number"},
      {"plasma --n 1e19 --B 0 --ion H", "option --B: '0' is out of range"},
      {"plasma --n 1e19 --B nan --ion H", "option --B: 'nan' is not a finite number"},
      {"plasma --n 1e19 --B 1 --ion H --Te -5", "option --Te: '-5' is out of range"},
      {"plasma --n 1e19 --B 1 --ion H --charge 0", "option --charge: '0' is out of range"},
      {"plasma --n 1e19 --B 1 --ion H --charge 1.5", "option --charge: '1.5' is not an integer"},
      {"plasma --n 1e19 --B 1 --ion H --lnlambda 0", "option --lnlambda: '0' is out of range"},
      {"plasma --n 1e19 --B 1 --mass-amu -4", "option --mass-amu: '-4' is out of range"},
      {"plasma --n 1e19 --B 1", "give exactly one of --ion NAME or --mass-amu M"},
      {"plasma --n 1e19 --B 1 --ion H --mass-amu 1", "both given"},
      {"plasma --n 1e19 --B 1 --ion Qq", "option --ion: unknown ion species 'Qq'"},
      {"plasma --B 1 --ion H", "option --n N_M3 is required"},
      {"plasma --n", "option --n needs a value"},
      {"plasma --n --B 1 --ion H", "option --n needs a value"},
      {"plasma --n 1e19 --B 1 --ion H --bogus", "unknown option '--bogus'"},
      {"plasma --n 1e19 --B 1 --ion H --jsn", "unknown option '--jsn' (did you mean '--json'?)"},
      {"plasma --n 1e19 --B 1 --ion H --json=yes", "option --json takes no value"},
      {"plasma run.yaml extra", "unexpected argument 'extra'"},
      {"plasma --n 1e19 --B 1 --ion H run.yaml", "give either a run file or the plasma flags, not both"},
      {"plasma --n 1e19 --B 1 --ion H --at 3", "option --at needs a run file"},
  };
  for (const auto& c : cases) {
    INFO(c.args);
    const auto r = run_tubewave(c.args);
    CHECK(r.exit_code == 2);
    CHECK(contains(r.output, "tubewave: error: "));
    CHECK(contains(r.output, c.message));
    CHECK(contains(r.output, "see 'tubewave plasma --help'"));
  }
  // An error prints nothing on stdout besides the message (no half-written table).
  const auto r = run_tubewave("plasma --n 1e19 --B 1 --ion H --Te -5 2>/dev/null | cat");
  CHECK(r.output.empty());
}

TEST_CASE("plasma: a run file gives the same parameters as the equivalent flags", "[unit][cli]") {
  // The demo column's plasma at its left end (He, n_e = 4e18 m^-3, B = 0.15 T, T_e = 6 eV,
  // T_i = 1 eV, from its profile table) must give exactly the output of the same values
  // as flags.
  const std::string cfg = tw::test::source_path("configs/demo_column.yaml").string();
  const auto from_file = tw::test::run_tubewave("plasma '" + cfg + "' --json");
  const auto from_flags = tw::test::run_tubewave("plasma --n 4e18 --B 0.15 --ion He --Te 6 --Ti 1 --json");
  REQUIRE(from_file.exit_code == 0);
  REQUIRE(from_flags.exit_code == 0);
  CHECK(from_file.output == from_flags.output);
  // Flags and a run file together are ambiguous: exit 2 naming the flag.
  const auto both = tw::test::run_tubewave("plasma '" + cfg + "' --n 1e18");
  CHECK(both.exit_code == 2);
  CHECK(both.output.find("--n") != std::string::npos);
  // A position outside the tube is bad input.
  const auto outside = tw::test::run_tubewave("plasma '" + cfg + "' --at 99");
  CHECK(outside.exit_code == 2);
  CHECK(outside.output.find("--at") != std::string::npos);
}
