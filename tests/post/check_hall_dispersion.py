#!/usr/bin/python3
"""Check the Hall-MHD formulas of scripts-post/twdispersion.py ("hall-right", "hall-left").

References: the validation sheet, section 3 (Hall MHD parallel waves, normalised
v_A = d_i = omega_ci = 1): omega_R, omega_L at k d_i = 0.1, 0.5, 1, 3, and the exact identities
omega_R - omega_L = (k d_i)^2 omega_ci, omega_R omega_L = (k v_A)^2. With resistivity the two
roots of the same Fourier mode share the damping: gamma_R + gamma_L = eta_m k^2 (the sum of
the roots of the quadratic; derived). Tolerance 1e-6: the sheet's 7 digits.
Exit 0 on success, 1 with a message otherwise."""
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "scripts-post"))
import twdispersion as td  # noqa: E402

bg = {"initial_mean_mass_density": 1.0, "mu0": 1.0, "field_x": 1.0, "hall_coefficient": 1.0}
table = {0.1: (0.105125, 0.095125), 0.5: (0.640388, 0.390388), 1.0: (1.618034, 0.618034),
         3.0: (9.908327, 0.908327)}
bad = []
for k, (wr, wl) in table.items():
    r = complex(td.omega("hall-right", bg, k))
    l = complex(td.omega("hall-left", bg, k))
    if abs(r.real - wr) > 1e-6 or abs(l.real - wl) > 1e-6:
        bad.append(f"k d_i = {k}: omega_R {r.real:.7f} (sheet {wr}), omega_L {l.real:.7f} (sheet {wl})")
    if abs((r.real - l.real) - k * k) > 1e-12 or abs(r.real * l.real - k * k) > 1e-12:
        bad.append(f"k d_i = {k}: identities fail ({r.real - l.real}, {r.real * l.real})")
    if abs(r.imag) > 0 or abs(l.imag) > 0:
        bad.append(f"k d_i = {k}: undamped roots have imaginary parts {r.imag}, {l.imag}")
res = dict(bg, resistivity=0.01)
for k in (0.5, 1.0, 2.0):
    g = -complex(td.omega("hall-right", res, k)).imag - complex(td.omega("hall-left", res, k)).imag
    if abs(g - 0.01 * k * k) > 1e-12:
        bad.append(f"k d_i = {k}: gamma_R + gamma_L = {g}, expected {0.01 * k * k}")
if bad:
    print("check_hall_dispersion: " + "; ".join(bad))
    sys.exit(1)
print("check_hall_dispersion: ok")
