#pragma once
/// Exact solution of the Riemann problem for the 1D Euler equations of an ideal gas,
/// following E. F. Toro, "Riemann Solvers and Numerical Methods for Fluid Dynamics",
/// 3rd ed. (Springer 2009), chapter 4: the pressure function f_L + f_R + du = 0 solved by
/// Newton iteration (sec. 4.3.1), then sampling of the wave pattern (sec. 4.5).
/// Used by the tests as an independent reference; it shares no code with the solver.
#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace tw::test {

struct GasState {
  double rho, u, p;
};

class ExactRiemann {
 public:
  ExactRiemann(GasState left, GasState right, double gamma) : L_(left), R_(right), g_(gamma) {
    cl_ = std::sqrt(g_ * L_.p / L_.rho);
    cr_ = std::sqrt(g_ * R_.p / R_.rho);
    if (2 / (g_ - 1) * (cl_ + cr_) <= R_.u - L_.u) throw std::runtime_error("vacuum is generated");
    solve_star();
  }
  [[nodiscard]] double p_star() const { return ps_; }
  [[nodiscard]] double u_star() const { return us_; }

  /// State at similarity coordinate s = (x - x0) / t.
  [[nodiscard]] GasState sample(double s) const {
    const double g = g_;
    if (s <= us_) {  // left of the contact
      if (ps_ > L_.p) {  // left shock
        const double sl = L_.u - cl_ * std::sqrt((g + 1) / (2 * g) * ps_ / L_.p + (g - 1) / (2 * g));
        if (s <= sl) return L_;
        const double r = ps_ / L_.p;
        return {L_.rho * (r + (g - 1) / (g + 1)) / ((g - 1) / (g + 1) * r + 1), us_, ps_};
      }
      const double shl = L_.u - cl_;
      if (s <= shl) return L_;
      const double cml = cl_ * std::pow(ps_ / L_.p, (g - 1) / (2 * g));
      const double stl = us_ - cml;
      if (s > stl) return {L_.rho * std::pow(ps_ / L_.p, 1 / g), us_, ps_};
      const double c = 2 / (g + 1) * (cl_ + (g - 1) / 2 * (L_.u - s));
      const double u = 2 / (g + 1) * (cl_ + (g - 1) / 2 * L_.u + s);
      const double rho = L_.rho * std::pow(c / cl_, 2 / (g - 1));
      return {rho, u, L_.p * std::pow(c / cl_, 2 * g / (g - 1))};
    }
    if (ps_ > R_.p) {  // right shock
      const double sr = R_.u + cr_ * std::sqrt((g + 1) / (2 * g) * ps_ / R_.p + (g - 1) / (2 * g));
      if (s >= sr) return R_;
      const double r = ps_ / R_.p;
      return {R_.rho * (r + (g - 1) / (g + 1)) / ((g - 1) / (g + 1) * r + 1), us_, ps_};
    }
    const double shr = R_.u + cr_;
    if (s >= shr) return R_;
    const double cmr = cr_ * std::pow(ps_ / R_.p, (g - 1) / (2 * g));
    const double str = us_ + cmr;
    if (s < str) return {R_.rho * std::pow(ps_ / R_.p, 1 / g), us_, ps_};
    const double c = 2 / (g + 1) * (cr_ - (g - 1) / 2 * (R_.u - s));
    const double u = 2 / (g + 1) * (-cr_ + (g - 1) / 2 * R_.u + s);
    const double rho = R_.rho * std::pow(c / cr_, 2 / (g - 1));
    return {rho, u, R_.p * std::pow(c / cr_, 2 * g / (g - 1))};
  }

 private:
  // f_K(p) and its derivative, Toro eqs. (4.6)-(4.7) and (4.37).
  void fk(double p, const GasState& K, double ck, double& f, double& df) const {
    const double g = g_;
    if (p > K.p) {
      const double a = 2 / ((g + 1) * K.rho), b = (g - 1) / (g + 1) * K.p;
      const double q = std::sqrt(a / (p + b));
      f = (p - K.p) * q;
      df = q * (1 - (p - K.p) / (2 * (b + p)));
    } else {
      f = 2 * ck / (g - 1) * (std::pow(p / K.p, (g - 1) / (2 * g)) - 1);
      df = 1 / (K.rho * ck) * std::pow(p / K.p, -(g + 1) / (2 * g));
    }
  }
  void solve_star() {
    // Two-rarefaction initial guess, Toro eq. (4.46).
    const double g = g_;
    const double z = (g - 1) / (2 * g);
    double p = std::pow((cl_ + cr_ - (g - 1) / 2 * (R_.u - L_.u)) /
                            (cl_ / std::pow(L_.p, z) + cr_ / std::pow(R_.p, z)), 1 / z);
    p = std::max(p, 1e-12);
    for (int it = 0; it < 100; ++it) {
      double fl, dfl, fr, dfr;
      fk(p, L_, cl_, fl, dfl);
      fk(p, R_, cr_, fr, dfr);
      const double pn = std::max(p - (fl + fr + R_.u - L_.u) / (dfl + dfr), 1e-14);
      const double change = 2 * std::abs(pn - p) / (pn + p);
      p = pn;
      if (change < 1e-14) break;
    }
    double fl, dfl, fr, dfr;
    fk(p, L_, cl_, fl, dfl);
    fk(p, R_, cr_, fr, dfr);
    ps_ = p;
    us_ = 0.5 * (L_.u + R_.u) + 0.5 * (fr - fl);
  }

  GasState L_, R_;
  double g_, cl_ = 0, cr_ = 0, ps_ = 0, us_ = 0;
};

}  // namespace tw::test
