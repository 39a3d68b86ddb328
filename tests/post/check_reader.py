#!/usr/bin/python3
"""The shared reader (scripts-post/twrun.py): reads a complete run, refuses an incomplete
one unless allowed, reads units, probe positions and the background, and labels axes.

    /usr/bin/python3 tests/post/check_reader.py RUN.h5 SCRATCH_DIR
"""
import os
import shutil
import sys

import h5py

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "scripts-post"))
import twrun  # noqa: E402


def main(argv):
    run_path, scratch = argv[1], argv[2]
    run = twrun.open_run(run_path)
    assert run.units("snapshots/velocity_y") == "m/s", run.units("snapshots/velocity_y")
    assert twrun.label("density", "m^-3") == "density [m⁻³]"
    pos = run.probe_positions()
    assert pos is not None and list(pos) == [2.0, 6.0, 10.0, 14.0], pos  # configs/demo_column.yaml
    bg = run.background()
    assert abs(bg["initial_mean_density"] - 1.5e18 / 1) / 1.5e18 < 1e-9, bg["initial_mean_density"]
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
