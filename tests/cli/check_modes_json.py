#!/usr/bin/python3
"""`tubewave modes --json` parses as JSON with the documented members, and its numbers are
the table's: the forward branches of Hall MHD along B0 at k d_i = 1 are the ion-cyclotron
(L) and whistler (R) waves, omega_R - omega_L = (k d_i)^2 omega_ci and omega_R omega_L =
(k v_A)^2 (validation sheet sect. 3; Hall MHD, e.g. Huba 2003 [from memory]), in the run's
own constants (normalized: d_i = 1, omega_ci = 1 up to the electrons' mass in rho).

    /usr/bin/python3 tests/cli/check_modes_json.py TUBEWAVE SOURCE_DIR
"""
import json
import subprocess
import sys


def main(argv):
    tw, src = argv[1], argv[2]
    out = subprocess.run([tw, "modes", src + "/configs/hall_whistler.yaml", "--k", "1", "--json"],
                         capture_output=True, text=True, check=True).stdout
    d = json.loads(out)
    for key in ("tubewave_version", "model", "x", "field_angle_deg", "k_perp", "variables", "wavenumbers"):
        assert key in d, key
    row = d["wavenumbers"][0]
    fwd = [b for b in row["branches"] if b["direction"] == "forward"]
    pol = {b["polarization"]: b for b in fwd if b["polarization"] in ("R", "L")}
    assert set(pol) == {"R", "L"}, [b["polarization"] for b in fwd]
    wr, wl = pol["R"]["angular_frequency"], pol["L"]["angular_frequency"]
    rho = 1 + 1 / 1836.15267343
    assert abs((wr - wl) - 1.0) < 1e-9, wr - wl                  # (k d_i)^2 omega_ci, h = 1
    assert abs(wr * wl - 1 / rho) < 1e-9, wr * wl                 # (k v_A)^2
    for b in row["branches"]:
        assert len(b["vector"]) == len(d["variables"])
        for k in ("number", "frequency", "damping_rate", "phase_speed", "group_speed", "character"):
            assert k in b, k
    inv = json.loads(subprocess.run([tw, "modes", src + "/configs/hall_whistler.yaml", "--freq", str(wr / (2 * 3.141592653589793)),
                                     "--json"], capture_output=True, text=True, check=True).stdout)
    ks = [r["wavenumber"] for r in inv["frequencies"][0]["roots"] if abs(r["wavenumber_im"]) < 1e-9]
    assert any(abs(abs(k) - 1) < 1e-8 for k in ks), ks   # the whistler's k = 1 is a root at omega_R
    print("modes JSON ok")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
