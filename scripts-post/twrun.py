#!/usr/bin/python3
"""Read a tubewave run file (HDF5) for post-processing.

Shared by every script in scripts-post/. Depends only on the documented output layout
(README, "Output file"). Run with Debian's Python: /usr/bin/python3.

    import twrun
    run = twrun.open_run("demo_column.h5")   # refuses incomplete files unless allowed
    x, t, vy = run.grid_x(), run.snapshot_times(), run.snapshots("velocity_y")
"""
import sys

import h5py
import numpy as np


class IncompleteRun(Exception):
    """The file's root attribute complete != 1: the run failed, stopped or is running."""


class Run:
    def __init__(self, path, allow_incomplete=False):
        self.path = path
        self.h5 = h5py.File(path, "r")
        if self.h5.attrs.get("format") != "tubewave-run":
            raise ValueError(f"{path}: not a tubewave run file")
        if int(self.h5.attrs.get("complete", 0)) != 1 and not allow_incomplete:
            outcome = self.status().get("outcome", "unknown")
            raise IncompleteRun(f"{path}: the run is not complete (outcome: {outcome})")

    def status(self):
        return {k: (v.decode() if isinstance(v, bytes) else v) for k, v in self.h5["status"].attrs.items()} \
            if "status" in self.h5 else {}

    def title(self):
        return self.h5.attrs.get("title", "")

    def grid_x(self):
        return self.h5["grid/x"][:]

    def units(self, path):
        return self.h5[path].attrs.get("units", "")

    def fields(self, series="snapshots"):
        return [k for k in self.h5[series].keys() if k not in ("time", "step")]

    def snapshot_times(self):
        return self.h5["snapshots/time"][:]

    def snapshots(self, field):
        """Array [n_snapshots, n_cells]."""
        return self.h5["snapshots/" + field][:]

    def probe_times(self):
        return self.h5["probes/time"][:] if "probes" in self.h5 else np.zeros(0)

    def probes(self, field):
        """Array [n_samples, n_probes]."""
        return self.h5["probes/" + field][:]

    def history(self, column):
        return self.h5["history/" + column][:]

    def parameter(self, name):
        return float(self.h5["parameters/" + name][()])

    def run_file_text(self):
        return self.h5["provenance/run_file"].asstr()[()]


def open_run(path, allow_incomplete=False):
    return Run(path, allow_incomplete)


def main(argv):
    """Print a short summary of a run file."""
    if len(argv) != 2:
        print("usage: /usr/bin/python3 scripts-post/twrun.py RUN.h5", file=sys.stderr)
        return 2
    run = open_run(argv[1], allow_incomplete=True)
    st = run.status()
    print(f"{run.path}: {run.title()}")
    print(f"  outcome {st.get('outcome')} after {st.get('steps')} steps, t = {st.get('simulated_time')} s")
    x = run.grid_x()
    print(f"  {len(x)} cells from {x[0]:.4g} to {x[-1]:.4g} m; {len(run.snapshot_times())} snapshots")
    print(f"  fields: {', '.join(run.fields())}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
