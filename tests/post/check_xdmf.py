#!/usr/bin/python3
"""Check a run's XDMF sidecar: it parses as XML, has one grid per snapshot with its time,
and every HDF reference names a dataset of the run file with the declared shape.

    /usr/bin/python3 tests/post/check_xdmf.py RUN.xmf RUN.h5
"""
import os
import sys
import xml.etree.ElementTree as ET

import h5py
import numpy as np


def fail(msg):
    print(f"check_xdmf: {msg}", file=sys.stderr)
    return 1


def main(argv):
    xmf, h5path = argv[1], argv[2]
    root = ET.parse(xmf).getroot()  # raises on malformed XML
    if root.tag != "Xdmf":
        return fail(f"root element is {root.tag}, not Xdmf")
    h5 = h5py.File(h5path, "r")
    times = h5["snapshots/time"][:]
    grids = root.findall("./Domain/Grid/Grid")
    if len(grids) != len(times):
        return fail(f"{len(grids)} grids for {len(times)} snapshots")
    for g, t in zip(grids, times):
        tv = float(g.find("Time").get("Value"))
        if not np.isclose(tv, t, rtol=1e-12, atol=0):
            return fail(f"grid time {tv} != snapshot time {t}")
    refs = root.iter("DataItem")
    n_refs = 0
    for item in refs:
        if item.get("Format") != "HDF":
            continue
        n_refs += 1
        fname, dset = item.text.strip().split(":", 1)
        if fname != os.path.basename(h5path):
            return fail(f"reference to {fname}, not {os.path.basename(h5path)}")
        if dset not in h5:
            return fail(f"{dset} is not in {h5path}")
        dims = tuple(int(v) for v in item.get("Dimensions").split())
        if h5[dset].shape != dims:
            return fail(f"{dset} has shape {h5[dset].shape}, the XDMF says {dims}")
    fields = [k for k in h5["snapshots"] if k not in ("time", "step")]
    attrs = {a.get("Name") for a in grids[0].findall("Attribute")} if grids else set()
    if set(fields) != attrs:
        return fail(f"attributes {sorted(attrs)} differ from the snapshot fields {sorted(fields)}")
    print(f"check_xdmf: {xmf}: {len(grids)} grids, {n_refs} HDF references, all present")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
