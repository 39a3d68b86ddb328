// The MHD block kernels against the generic passes they replace.
//
// Tolerance: none. The kernel is written to perform, per face, the same IEEE operations in
// the same order as the generic code (numerics/mhd_block_kernel.cpp), only with branches
// turned into selects, and the project compiles without FP contraction or -ffast-math.
// Bitwise equality is therefore the specification, and it is what makes results
// independent of the code path, the instruction set and the thread count;
// any tolerance would hide an operation done in a different order. Each check runs for
// every instruction set this processor supports (x86-64, AVX2, AVX-512).
#include <catch2/catch.hpp>

#include <bit>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
#include <random>
#include <vector>

#include <omp.h>

#include "core/simd_isa.hpp"
#include "drive/boundary.hpp"
#include "models/mhd.hpp"
#include "numerics/fluxes.hpp"
#include "numerics/fv_operator.hpp"
#include "time/stepper.hpp"

using namespace tw;

namespace {

using S = Mhd::State;

bool same_bits(double a, double b) { return std::bit_cast<std::uint64_t>(a) == std::bit_cast<std::uint64_t>(b); }

bool same_bits(const S& a, const S& b) {
  for (std::size_t k = 0; k < a.size(); ++k)
    if (!same_bits(a[k], b[k])) return false;
  return true;
}

/// Bitwise equal, except that any two NaNs count as equal (which NaN an operation returns
/// depends on operand order, which the compiler may swap for + and *).
bool same_value(const S& a, const S& b) {
  for (std::size_t k = 0; k < a.size(); ++k)
    if (!(same_bits(a[k], b[k]) || (std::isnan(a[k]) && std::isnan(b[k])))) return false;
  return true;
}

std::vector<SimdIsa> supported_isas() {
  std::vector<SimdIsa> v;
  for (SimdIsa isa : all_simd_isas)
    if (simd_isa_supported(isa)) v.push_back(isa);
  return v;
}

/// Restores the instruction set chosen at start-up when a test section ends.
struct IsaGuard {
  SimdIsa saved = simd_isa();
  ~IsaGuard() { set_simd_isa(saved); }
};

/// The model variants the kernel must reproduce: normalized and SI units, B_x positive,
/// negative, zero and tiny, two ratios of specific heats, both closures.
std::vector<Mhd> models() {
  std::vector<Mhd> out;
  for (double bx : {0.75, -1.2, 0.0, 1e-14}) {
    Mhd m;
    m.mu0 = 1;
    m.gamma = 5.0 / 3.0;
    m.bx = bx;
    out.push_back(m);
  }
  Mhd air;
  air.mu0 = 1;
  air.gamma = 1.4;
  air.bx = 0.3;
  out.push_back(air);
  Mhd si;  // SI: a hydrogen plasma of 1e19 m^-3 in about 0.1 T
  si.bx = 0.08;
  out.push_back(si);
  Mhd iso;
  iso.mu0 = 1;
  iso.closure = Closure::isothermal;
  iso.sound_speed_iso = 0.7;
  iso.bx = 0.5;
  out.push_back(iso);
  Mhd displacement;  // with the displacement current (a reduced light speed)
  displacement.mu0 = 1;
  displacement.bx = 0.75;
  displacement.eps_disp = 1.0 / (5 * 5);  // light speed 5 in these units
  out.push_back(displacement);
  Mhd displacement_iso = displacement;
  displacement_iso.closure = Closure::isothermal;
  displacement_iso.sound_speed_iso = 0.7;
  out.push_back(displacement_iso);
  return out;
}

/// Typical magnitudes of a model's states: density, speed, field, pressure.
struct Scales {
  double rho, vel, b, p;
};
Scales scales(const Mhd& m) {
  if (m.mu0 == 1) return {1, 1, 1, 1};
  const double rho = 1e19 * 1.67e-27, b = 0.1;
  const double va = b / std::sqrt(m.mu0 * rho);
  return {rho, va, b, 0.05 * b * b / m.mu0};
}

/// Random admissible primitive states, plus hand-picked degenerate ones, as (left, right)
/// pairs. The count is not a multiple of the vector width or the block size, so partial
/// vectors and partial blocks are exercised too.
void face_pairs(const Mhd& m, std::vector<S>& WL, std::vector<S>& WR) {
  const Scales sc = scales(m);
  std::mt19937_64 rng(12345);
  std::uniform_real_distribution<double> u01(0, 1), sym(-1, 1);
  auto logu = [&](double lo, double hi) { return lo * std::pow(hi / lo, u01(rng)); };
  auto random_state = [&]() {
    S w{};
    w[Mhd::RHO] = sc.rho * logu(1e-3, 1e2);
    for (int k : {int(Mhd::VX), int(Mhd::VY), int(Mhd::VZ)}) w[k] = sc.vel * 3 * sym(rng);
    for (int k : {int(Mhd::BY), int(Mhd::BZ)}) w[k] = u01(rng) < 0.1 ? 0.0 : sc.b * 2 * sym(rng);
    w[Mhd::P] = sc.p * logu(1e-4, 1e2);
    return w;
  };
  for (int i = 0; i < 2000; ++i) {
    S a = random_state(), b = random_state();
    const double r = u01(rng);
    if (r < 0.1) b = a;                                    // no jump at all
    else if (r < 0.2) b[Mhd::VX] = a[Mhd::VX] + 1e-3 * sc.vel;  // nearly no jump
    else if (r < 0.3) {                                    // no transverse field
      a[Mhd::BY] = a[Mhd::BZ] = b[Mhd::BY] = b[Mhd::BZ] = 0;
    } else if (r < 0.4) {                                  // supersonic to either side
      const double v = (u01(rng) < 0.5 ? -30 : 30) * sc.vel;
      a[Mhd::VX] = b[Mhd::VX] = v;
    }
    WL.push_back(a);
    WR.push_back(b);
  }
  // Published shock-tube states (Sod 1978; Brio & Wu 1988), scaled to the model's units.
  auto st = [&](double rho, double p, double by) {
    S w{};
    w[Mhd::RHO] = rho * sc.rho;
    w[Mhd::P] = p * sc.p;
    w[Mhd::BY] = by * sc.b;
    return w;
  };
  WL.push_back(st(1, 1, 0));
  WR.push_back(st(0.125, 0.1, 0));
  WL.push_back(st(1, 1, 1));
  WR.push_back(st(0.125, 0.1, -1));
  // Near vacuum next to a dense state.
  WL.push_back(st(1e-10, 1e-12, 0.5));
  WR.push_back(st(1, 1, -0.5));
  // No transverse field and a sound speed below the Alfvén speed along x: the fast and
  // Alfvén speeds coincide, the outer star states of HLLD are singular (eqs. 44-47 of
  // Miyoshi & Kusano 2005 divide by zero) and the solver takes its degenerate branch.
  for (int i = 0; i < 40; ++i) {
    S a = st(logu(0.1, 10), 1e-3 * logu(0.1, 10), 0);
    a[Mhd::VX] = sc.vel * 0.1 * sym(rng);
    S b = i % 2 == 0 ? a : st(logu(0.1, 10), 1e-3 * logu(0.1, 10), 0);
    WL.push_back(a);
    WR.push_back(b);
  }
}

template <class Solver>
void check_fluxes(const Mhd& m, FluxKind kind, const std::vector<S>& WL, const std::vector<S>& WR) {
  const int n = static_cast<int>(WL.size());
  std::vector<S> F(WL.size());
  std::vector<double> speed(WL.size());
  for (SimdIsa isa : supported_isas()) {
    set_simd_isa(isa);
    MhdBlockKernel::fluxes(m, kind, n, WL.data(), WR.data(), F.data(), speed.data());
    int mismatches = 0, first = -1;
    for (int i = 0; i < n; ++i) {
      const auto ref = Solver{}(m, WL[static_cast<std::size_t>(i)], WR[static_cast<std::size_t>(i)]);
      const bool ok = same_bits(ref.flux, F[static_cast<std::size_t>(i)]) && same_bits(ref.speed, speed[static_cast<std::size_t>(i)]);
      if (!ok && first < 0) first = i;
      mismatches += ok ? 0 : 1;
    }
    INFO("flux " << flux_names()[static_cast<std::size_t>(kind)] << ", instruction set " << simd_isa_name(isa)
                 << ", B_x = " << m.bx << ", first mismatching face " << first);
    CHECK(mismatches == 0);
  }
}

/// Cell values with smooth parts, jumps, and near-vacuum cells next to dense ones (the
/// unlimited slope then gives negative face values, so the positivity fallback acts).
Field<S> random_cells(const Mhd& m, const Grid& g, unsigned seed) {
  const Scales sc = scales(m);
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> u01(0, 1), sym(-1, 1);
  Field<S> U(g);
  for (int i = 0; i < g.n_cells; ++i) {
    const double x = g.x_centre(i);
    S w{};
    const bool jump = x > 0.5;
    w[Mhd::RHO] = sc.rho * ((jump ? 0.2 : 1.0) + 0.1 * std::sin(12 * x) + 0.02 * u01(rng));
    w[Mhd::VX] = sc.vel * (0.3 * std::sin(7 * x) + 0.05 * sym(rng));
    w[Mhd::VY] = sc.vel * 0.2 * sym(rng);
    w[Mhd::VZ] = sc.vel * 0.1 * std::cos(5 * x);
    w[Mhd::BY] = sc.b * ((jump ? -0.8 : 0.8) + 0.1 * sym(rng));
    w[Mhd::BZ] = sc.b * 0.3 * std::sin(9 * x);
    w[Mhd::P] = sc.p * ((jump ? 0.1 : 1.0) + 0.05 * u01(rng));
    if (i % 37 == 4) {  // a dilute cell before a near-vacuum one
      w[Mhd::RHO] *= 0.1;
      w[Mhd::P] *= 0.1;
    }
    if (i % 37 == 5) {  // the near-vacuum cell
      w[Mhd::RHO] *= 1e-6;
      w[Mhd::P] *= 1e-6;
    }
    U[i] = m.cons_from_prim(w);
  }
  return U;
}

}  // namespace

TEST_CASE("MHD block kernel fluxes equal the generic solvers bitwise", "[unit][numerics][mhd]") {
  IsaGuard guard;
  for (const Mhd& m : models()) {
    if (!MhdBlockKernel::applies(m)) continue;  // the operator never calls it then
    std::vector<S> WL, WR;
    face_pairs(m, WL, WR);
    if (m.closure == Closure::adiabatic) check_fluxes<HlldFlux>(m, FluxKind::hlld, WL, WR);
    check_fluxes<HllFlux>(m, FluxKind::hll, WL, WR);
    check_fluxes<RusanovFlux>(m, FluxKind::rusanov, WL, WR);
  }
}

TEST_CASE("MHD block kernel face pass equals the generic passes bitwise", "[unit][numerics][mhd]") {
  IsaGuard guard;
  const Grid g(301, 0.0, 1.0);  // 302 faces: five full blocks and a partial one
  const auto ends = std::make_shared<ZeroGradientBoundary<Mhd>>();
  const Reconstruction recons[] = {Reconstruction::first_order, Reconstruction::plm};
  const Limiter limiters[] = {Limiter::minmod, Limiter::mc, Limiter::van_leer, Limiter::none};
  const FluxKind kinds[] = {FluxKind::hlld, FluxKind::hll, FluxKind::rusanov};
  int compared = 0, fallbacks_seen = 0;
  for (Mhd m : models()) {
    for (bool dissipative : {false, true}) {
      // Resistivity and viscosity add the gradient flux on top of the kernel's flux.
      m.resistivity = dissipative ? 1e-3 * m.mu0 : 0;
      m.viscosity = dissipative ? 1e-3 : 0;
      const Field<S> U = random_cells(m, g, 7);
      for (Reconstruction r : recons)
        for (Limiter l : limiters)
          for (FluxKind k : kinds) {
            if (r == Reconstruction::first_order && l != Limiter::none) continue;
            const bool hlld_ok = m.closure == Closure::adiabatic;
            if (k == FluxKind::hlld && !hlld_ok) {
              FvOperator<Mhd> op(g, {r, l, k}, ends, ends);
              CHECK_FALSE(op.block_kernel_active(m));  // the generic solver's business
              continue;
            }
            const bool fast = MhdBlockKernel::applies(m);
            FvOperator<Mhd> generic(g, {r, l, k}, ends, ends);
            generic.set_block_kernel(false);
            REQUIRE_FALSE(generic.block_kernel_active(m));
            Field<S> d_ref(g);
            const auto ref = generic.evaluate(m, 0.0, U, d_ref, true);
            // Cells whose unlimited face values are not positive: they fall back to first
            // order, so the comparison covers the fallback.
            if (l == Limiter::none && r == Reconstruction::plm)
              for (int i = 1; i + 1 < g.n_cells; ++i) {
                const S a = m.prim_from_cons(U[i - 1]), c = m.prim_from_cons(U[i]), b = m.prim_from_cons(U[i + 1]);
                for (int q : {int(Mhd::RHO), int(Mhd::P)})
                  if (c[q] - 0.25 * (b[q] - a[q]) <= 0 || c[q] + 0.25 * (b[q] - a[q]) <= 0) {
                    ++fallbacks_seen;
                    break;
                  }
              }
            for (SimdIsa isa : supported_isas()) {
              set_simd_isa(isa);
              FvOperator<Mhd> fused(g, {r, l, k}, ends, ends);
              REQUIRE(fused.block_kernel_active(m) == fast);
              REQUIRE(fused.block_primitives_active(m) == fast);
              Field<S> d(g);
              const auto rep = fused.evaluate(m, 0.0, U, d, true);
              int bad = -1;
              for (int i = 0; i < g.n_cells && bad < 0; ++i)
                if (!same_bits(d[i], d_ref[i])) bad = i;
              INFO("reconstruction " << reconstruction_names()[static_cast<std::size_t>(r)] << ", limiter "
                                     << limiter_names()[static_cast<std::size_t>(l)] << ", flux "
                                     << flux_names()[static_cast<std::size_t>(k)] << ", B_x = " << m.bx
                                     << ", dissipative " << dissipative << ", instruction set " << simd_isa_name(isa)
                                     << ", first differing cell " << bad);
              CHECK(bad == -1);
              CHECK(same_bits(rep.max_speed, ref.max_speed));
              CHECK(same_bits(rep.flux_left, ref.flux_left));
              CHECK(same_bits(rep.flux_right, ref.flux_right));
              // The energy flux through the ends uses the reconstructed end-face states.
              CHECK(same_bits(rep.energy_flux_left, ref.energy_flux_left));
              CHECK(same_bits(rep.energy_flux_right, ref.energy_flux_right));
              CHECK(rep.bad_cell == ref.bad_cell);
              ++compared;
            }
          }
    }
  }
  CHECK(compared > 100);
  CHECK(fallbacks_seen > 0);
}

TEST_CASE("block kernel finds the same first inadmissible cell and primitive state", "[unit][numerics][mhd]") {
  IsaGuard guard;
  const Grid g(300, 0.0, 1.0);
  const auto ends = std::make_shared<ZeroGradientBoundary<Mhd>>();
  for (Mhd m : models()) {
    for (int bad_kind = 0; bad_kind < 4; ++bad_kind) {
      Field<S> U = random_cells(m, g, 11);
      // Cells 211 and 150 (in that order of damage) made inadmissible, so the reported cell
      // must be the first one, not the first one found.
      for (int i : {211, 150}) {
        S& u = U[i];
        switch (bad_kind) {
          case 0: u[Mhd::RHO] = -u[Mhd::RHO]; break;                          // negative density
          case 1: u[Mhd::EN] = 0; break;                                     // negative pressure
          case 2: u[Mhd::MY] = std::numeric_limits<double>::quiet_NaN(); break;  // not finite
          case 3: u[Mhd::BZ] = std::numeric_limits<double>::infinity(); break;
        }
      }
      if (m.closure == Closure::isothermal && bad_kind == 1) continue;  // energy not used
      FvOperator<Mhd> generic(g, {Reconstruction::plm, Limiter::mc, FluxKind::hll}, ends, ends);
      generic.set_block_kernel(false);
      Field<S> d(g);
      const auto ref = generic.evaluate(m, 0.0, U, d, false);
      REQUIRE(ref.bad_cell == 150);
      for (SimdIsa isa : supported_isas()) {
        set_simd_isa(isa);
        FvOperator<Mhd> fused(g, {Reconstruction::plm, Limiter::mc, FluxKind::hll}, ends, ends);
        const auto rep = fused.evaluate(m, 0.0, U, d, false);
        INFO("kind of damage " << bad_kind << ", instruction set " << simd_isa_name(isa) << ", B_x = " << m.bx);
        CHECK(rep.bad_cell == 150);
        CHECK(same_value(rep.bad_state, ref.bad_state));
        // Every primitive state, admissible or not, as the generic pass computes it.
        int differ = -1;
        for (int i = 0; i < g.n_cells && differ < 0; ++i)
          if (!same_value(fused.primitives()[i], generic.primitives()[i])) differ = i;
        CHECK(differ == -1);
      }
    }
  }
}

TEST_CASE("MHD steps are bitwise identical for both paths, every instruction set and 1 or 2 threads",
          "[unit][numerics][mhd]") {
  IsaGuard guard;
  // Large enough (>= parallel_min_iterations) that loops really run on two threads; a
  // steepening oblique fast wave, as in the benchmark, for 10 steps of PLM + HLLD + SSP-RK2.
  const int n = 4100;
  const Grid g(n, 0.0, 1.0);
  Mhd m;
  m.mu0 = 1;
  m.bx = std::cos(0.5);
  auto initial = [&]() {
    Field<S> U(g);
    for (int i = 0; i < n; ++i) {
      const double ph = std::sin(2 * 3.141592653589793 * g.x_centre(i));
      S w{};
      w[Mhd::RHO] = 1 + 0.3 * ph;
      w[Mhd::VX] = 0.3 * ph;
      w[Mhd::VY] = 0.02 * ph;
      w[Mhd::BY] = 0.1;
      w[Mhd::BZ] = 0.5 * (1 + 0.3 * ph);
      w[Mhd::P] = 0.6 * (1 + 0.5 * ph);
      U[i] = m.cons_from_prim(w);
    }
    return U;
  };
  auto run = [&](bool kernel, int threads) {
    const auto periodic = std::make_shared<PeriodicBoundary<Mhd>>();
    FvOperator<Mhd> op(g, {Reconstruction::plm, Limiter::mc, FluxKind::hlld}, periodic, periodic);
    op.set_block_kernel(kernel);
    Stepper<Mhd> stepper(std::move(op), TimeControl{0.8, 1e30, IntegratorKind::ssp_rk2});
    Field<S> U = initial();
    const int saved = omp_get_max_threads();
    omp_set_num_threads(threads);
    REQUIRE(omp_get_max_threads() == threads);  // whatever OMP_NUM_THREADS the test runs with
    double t = 0;
    for (int s = 0; s < 10; ++s) t += stepper.step(m, U, t, 1e30, "none").dt;
    omp_set_num_threads(saved);
    return U;
  };
  const Field<S> ref = run(false, 1);
  for (SimdIsa isa : supported_isas()) {
    set_simd_isa(isa);
    for (int threads : {1, 2}) {
      const Field<S> U = run(true, threads);
      int bad = -1;
      for (int i = 0; i < n && bad < 0; ++i)
        if (!same_bits(U[i], ref[i])) bad = i;
      INFO("instruction set " << simd_isa_name(isa) << ", threads " << threads << ", first differing cell " << bad);
      CHECK(bad == -1);
    }
  }
  const Field<S> generic2 = run(false, 2);
  int bad = -1;
  for (int i = 0; i < n && bad < 0; ++i)
    if (!same_bits(generic2[i], ref[i])) bad = i;
  CHECK(bad == -1);
}
