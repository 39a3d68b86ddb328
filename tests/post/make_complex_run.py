#!/usr/bin/python3
"""Write a small synthetic run file with a complex field (velocity_y_re / velocity_y_im):
a wave a exp(i(k x - omega t)) in the documented layout (README, "Output file"), for the
post-processing tests. Uses only h5py and numpy.

    /usr/bin/python3 tests/post/make_complex_run.py OUT.h5
"""
import sys

import h5py
import numpy as np


def main(argv):
    path = argv[1]
    n, nt, length, f, lam = 120, 60, 6.0, 1e5, 2.0
    x = (np.arange(n) + 0.5) * length / n
    t = np.arange(nt) * 0.5e-6
    tp = np.arange(600) * 0.05e-6
    probes = np.array([1.0, 3.0])
    k, w = 2 * np.pi / lam, 2 * np.pi * f
    u = np.exp(1j * (k * x[None, :] - w * t[:, None]))
    up = np.exp(1j * (k * probes[None, :] - w * tp[:, None]))
    with h5py.File(path, "w") as h:
        h.attrs["format"] = "tubewave-run"
        h.attrs["format_version"] = np.int32(1)
        h.attrs["title"] = "synthetic complex wave"
        h.attrs["model"] = "synthetic"
        h.attrs["complete"] = np.int32(1)
        h["provenance/run_file"] = "synthetic"
        h["provenance/resolved_run_file"] = "units: si\noutput:\n  probes: [1.0, 3.0]\n"
        h["grid/x"] = x
        h["grid/x"].attrs["units"] = "m"
        h["grid/x_faces"] = np.arange(n + 1) * length / n
        for series, tt, vv in (("snapshots", t, u), ("probes", tp, up)):
            h[f"{series}/time"] = tt
            h[f"{series}/time"].attrs["units"] = "s"
            h[f"{series}/velocity_y_re"] = vv.real
            h[f"{series}/velocity_y_im"] = vv.imag
            for part in ("re", "im"):
                h[f"{series}/velocity_y_{part}"].attrs["units"] = "m/s"
        st = h.create_group("status")
        st.attrs["outcome"] = "completed"
    print(path)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
