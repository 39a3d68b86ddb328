#!/usr/bin/python3
"""Analytic dispersion relations, by formula id, for the validation suite and the plots.

Each formula maps a run's background (a dict, see twrun.Run.background()) and a wavenumber
k to the complex angular frequency omega(k) of one branch, for waves exp(i(k x - omega t)):
Re(omega) > 0 is the forward branch, Im(omega) = -gamma is the amplitude decay rate. Units
are those of the run (SI, or the code units of a normalized run). Only numpy is needed.

    import twdispersion as td
    w = td.omega("mhd-alfven", bg, k)            # complex array like k
    q = td.given_wavenumber("mhd-alfven", bg, k) # dict of frequency, phase speed, ...
    q = td.given_frequency("mhd-alfven", bg, w)  # dict of wavelength, phase speed, ...

Sources are named beside each formula; "[M]" marks a reference quoted from memory.
A case can instead name its reference as {modes = {...}}: those are eigenvalues from
`tubewave modes`, which the runner calls on the case's run file (validation/run_all.py).
"""
import numpy as np

FORMULAS = {}


def formula(name, description):
    def register(f):
        f.description = description
        FORMULAS[name] = f
        return f
    return register


# --- Ideal and resistive MHD ------------------------------------------------------------
#
# Background: mass density rho, pressure p, field (B_x, B_y, B_z), mu0 of the unit system,
# gamma (or the isothermal sound speed a when the closure is isothermal), resistivity eta
# and kinematic viscosity nu. In 1D along x the three ideal-MHD speeds along x are
#   c_a = |B_x| / sqrt(mu0 rho),
#   c_f,s^2 = ( a^2 + b^2 +- sqrt((a^2 + b^2)^2 - 4 a^2 b_x^2) ) / 2,
# a^2 = gamma p / rho, b^2 = |B|^2 / (mu0 rho), b_x^2 = B_x^2 / (mu0 rho)
# (J. P. Goedbloed and S. Poedts 2004, "Principles of Magnetohydrodynamics", Cambridge,
# ch. 5 [M]); omega = c k, no dispersion.

def _mhd(bg):
    rho = bg["initial_mean_mass_density"]
    mu0 = bg["mu0"]
    bx = bg["field_x"]
    by = bg.get("initial_mean_magnetic_field_y", 0.0)
    bz = bg.get("initial_mean_magnetic_field_z", 0.0)
    a_iso = bg.get("isothermal_sound_speed", 0.0)
    a2 = a_iso ** 2 if a_iso > 0 else bg["gamma"] * bg["initial_mean_pressure"] / rho
    b2 = (bx * bx + by * by + bz * bz) / (mu0 * rho)
    bx2 = bx * bx / (mu0 * rho)
    disc = np.sqrt(max((a2 + b2) ** 2 - 4 * a2 * bx2, 0.0))
    return {"fast": np.sqrt(0.5 * (a2 + b2 + disc)), "alfven": np.sqrt(bx2),
            "slow": np.sqrt(max(0.5 * (a2 + b2 - disc), 0.0)), "rho": rho, "mu0": mu0}


@formula("mhd-fast", "ideal-MHD fast magnetosonic wave, omega = c_f k")
def _mhd_fast(bg, k):
    return _mhd(bg)["fast"] * np.asarray(k, dtype=complex)


@formula("mhd-alfven", "ideal-MHD shear Alfven wave, omega = |B_x| k / sqrt(mu0 rho)")
def _mhd_alfven(bg, k):
    return _mhd(bg)["alfven"] * np.asarray(k, dtype=complex)


@formula("mhd-slow", "ideal-MHD slow magnetosonic wave, omega = c_s k")
def _mhd_slow(bg, k):
    return _mhd(bg)["slow"] * np.asarray(k, dtype=complex)


@formula("mhd-alfven-resistive",
         "shear Alfven wave with magnetic diffusivity eta/mu0 and viscosity nu: "
         "omega = -i (eta_m + nu) k^2 / 2 + sqrt(k^2 c_a^2 - ((eta_m - nu) k^2 / 2)^2)")
def _mhd_alfven_resistive(bg, k):
    # The linear shear Alfven wave with resistive and viscous diffusion of the transverse
    # field and velocity (standard; e.g. L. D. Landau and E. M. Lifshitz, "Electrodynamics of
    # Continuous Media", MHD chapter [M]; the check values of the project's validation sheet,
    # section 6, are reproduced by this form).
    m = _mhd(bg)
    k = np.asarray(k, dtype=complex)
    eta_m = bg.get("resistivity", 0.0) / m["mu0"]
    nu = bg.get("viscosity", 0.0)
    root = np.sqrt(k * k * m["alfven"] ** 2 - ((eta_m - nu) * k * k / 2) ** 2 + 0j)
    return -0.5j * (eta_m + nu) * k * k + root


# --- Hall MHD ----------------------------------------------------------------------------
#
# Parallel circularly polarised waves along B0 = B_x x of Hall MHD (the model's header,
# src/models/hall.hpp): with the Hall coefficient h = B_x/(mu0 e n_e) = v_A d_i, the magnetic
# diffusivity eta_m = eta/mu0, the electron inertial length d_e (0 without electron inertia)
# and the Alfven speed along x, with the displacement current's extra inertia when a light
# speed c is kept, v^2 = v_A^2/(1 + v_A^2/c^2), the field b = B_y + i B_z ~ exp(i(k x - w t))
# obeys
#   (1 + k^2 d_e^2) w^2 + (|h| + i eta_m) k^2 w - k^2 v^2 = 0.
# Without eta_m and d_e this is w = (k^2 v_A d_i / 2)(sqrt(1 + 4/(k d_i)^2) -+ 1), the
# left-hand (ion-cyclotron, upper sign) and right-hand (whistler) branches (validation sheet
# section 3; Hall MHD, e.g. J. D. Huba 2003, Lect. Notes Phys. 615, 166 [M]); electron
# inertia bends the whistler toward the electron cyclotron frequency (the sheet's section 4,
# "Hall + electron inertia"); the resistive damping of each branch is derived here. The
# right-hand wave toward +x is the mirror image of the root with negative real part.

def _hall(bg, k, right):
    rho = bg["initial_mean_mass_density"]
    mu0 = bg["mu0"]
    bx = bg["field_x"]
    h = abs(bg.get("hall_coefficient", 0.0))
    va2 = bx * bx / (mu0 * rho)
    c = bg.get("displacement_light_speed", 0.0)
    if c > 0:
        va2 = va2 / (1 + va2 / (c * c))
    de2 = bg.get("electron_inertial_length", 0.0) ** 2
    eta_m = bg.get("resistivity", 0.0) / mu0
    k = np.asarray(k, dtype=complex)
    g = 1 + k * k * de2
    b = (h + 1j * eta_m) * k * k
    s = np.sqrt(b * b + 4 * g * k * k * va2)
    if right:
        return -np.conj((-b - s) / (2 * g))
    return (-b + s) / (2 * g)


@formula("hall-right", "Hall MHD right-hand (whistler) wave along B0, with electron inertia, "
                       "resistivity and the displacement current when the run has them")
def _hall_right(bg, k):
    return _hall(bg, k, True)


@formula("hall-left", "Hall MHD left-hand (ion-cyclotron) wave along B0, with electron inertia, "
                      "resistivity and the displacement current when the run has them")
def _hall_left(bg, k):
    return _hall(bg, k, False)


# --- Derived quantities -----------------------------------------------------------------

def omega(formula_id, bg, k):
    """Complex omega(k) of a branch (KeyError for an unknown id, listing the known ones)."""
    if formula_id not in FORMULAS:
        raise KeyError(f"unknown formula '{formula_id}'; known: {', '.join(sorted(FORMULAS))}")
    return FORMULAS[formula_id](bg, k)


def _group_speed(formula_id, bg, k):
    h = 1e-6 * abs(k) if k != 0 else 1e-9
    return float(np.real(omega(formula_id, bg, k + h) - omega(formula_id, bg, k - h)) / (2 * h))


def given_wavenumber(formula_id, bg, k):
    """What a wave of real wavenumber k > 0 does on this branch (an initial-value run):
    frequency [Hz], angular_frequency, phase_speed, group_speed, damping_rate, wavelength,
    wavenumber."""
    w = complex(omega(formula_id, bg, k))
    return {"wavenumber": k, "wavelength": 2 * np.pi / k, "angular_frequency": w.real,
            "frequency": w.real / (2 * np.pi), "phase_speed": w.real / k,
            "group_speed": _group_speed(formula_id, bg, k), "damping_rate": -w.imag}


def given_frequency(formula_id, bg, w, k_start=None):
    """What a wave driven at real angular frequency w > 0 does on this branch (a driven run):
    the complex k with omega(k) = w, found by Newton's method from the branch's real root;
    wavenumber Re k, wavelength, phase_speed w / Re k, spatial_damping_rate Im k (amplitude
    decay along the direction of travel), damping_length, group_speed, frequency."""
    if k_start is None:
        # A real starting point: the branch's speed at a trial k.
        k0 = 1.0
        for _ in range(60):  # fixed point k = w / v(k) (converges for weak dispersion)
            v = np.real(omega(formula_id, bg, k0)) / k0
            k0 = w / v
        k_start = k0
    k = complex(k_start)
    for _ in range(100):
        f = complex(omega(formula_id, bg, k)) - w
        h = 1e-7 * abs(k)
        df = (complex(omega(formula_id, bg, k + h)) - complex(omega(formula_id, bg, k - h))) / (2 * h)
        step = f / df
        k -= step
        if abs(step) < 1e-14 * abs(k):
            break
    kr, ki = k.real, k.imag
    out = {"angular_frequency": w, "frequency": w / (2 * np.pi), "wavenumber": kr,
           "wavelength": 2 * np.pi / abs(kr), "phase_speed": w / kr,
           "spatial_damping_rate": ki * np.sign(kr),
           "group_speed": _group_speed(formula_id, bg, kr)}
    out["damping_length"] = 1 / out["spatial_damping_rate"] if out["spatial_damping_rate"] > 0 else float("inf")
    return out


def branch_curve(formula_id, bg, k_max, n=400):
    """(k, Re omega) of a branch over 0 <= k <= k_max, for plots."""
    k = np.linspace(0.0, k_max, n)
    return k, np.real(omega(formula_id, bg, k))
