#!/usr/bin/python3
"""The shared reader (scripts-post/twrun.py): reads a complete run, refuses an incomplete
one unless allowed, reads units, probe positions and the background, and labels axes.

    /usr/bin/python3 tests/post/check_reader.py RUN.h5 SCRATCH_DIR
"""
import os
import shutil
import sys

import h5py
import numpy as np

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "scripts-post"))
import twrun  # noqa: E402


def main(argv):
    run_path, scratch = argv[1], argv[2]
    run = twrun.open_run(run_path)
    assert run.units("snapshots/velocity_y") == "m/s", run.units("snapshots/velocity_y")
    assert twrun.label("density", "m^-3") == "density [m⁻³]"
    pos = run.probe_positions()
    assert pos is not None and list(pos) == [6.0, 12.0, 20.0, 28.0], pos  # configs/demo_column.yaml
    bg = run.background()
    # The demo's density comes from its profile table (He+, Z = 1: ion density = n_e):
    # the mean over the cell centres of the linear interpolation in the table.
    cfg = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "configs")
    with open(os.path.join(cfg, "demo_column_profile.csv")) as f:
        lines = [ln for ln in f if ln.strip() and not ln.lstrip().startswith("#")]
    head = [h.strip() for h in lines[0].split(",")]
    tab = np.array([[float(v) for v in ln.split(",")] for ln in lines[1:]])
    x = run.h5["grid/x"][:]
    expect = float(np.mean(np.interp(x, tab[:, head.index("x")], tab[:, head.index("n")])))
    assert abs(bg["initial_mean_density"] - expect) / expect < 1e-9, (bg["initial_mean_density"], expect)
    assert run.default_field() in ("velocity_y", "magnetic_field_y"), run.default_field()
    run.close()
    bad = os.path.join(scratch, "incomplete.h5")
    shutil.copyfile(run_path, bad)
    with h5py.File(bad, "r+") as h:
        h.attrs["complete"] = 0
    try:
        twrun.open_run(bad)
    except twrun.IncompleteRun as e:
        assert "not complete" in str(e)
    else:
        raise AssertionError("an incomplete run file was opened")
    twrun.open_run(bad, allow_incomplete=True).close()
    os.remove(bad)
    print("check_reader: ok")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
