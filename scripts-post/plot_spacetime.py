#!/usr/bin/python3
"""Space-time diagram of one field: x along the tube, time upward, the field in colour.

    /usr/bin/python3 scripts-post/plot_spacetime.py RUN.h5 [--field NAME] [--part re|im|abs] [-o OUT.png]

The time mean of each cell is removed (--absolute keeps it), so a wave stands out from
its background; the colour scale is symmetric about zero.
"""
import sys

import numpy as np

import twrun


def main(argv):
    p = twrun.script_arguments(__doc__.splitlines()[0])
    p.add_argument("--part", choices=["re", "im", "abs"], default="re", help="part of a complex field")
    p.add_argument("--absolute", action="store_true", help="plot the values, not the departure from each cell's mean")
    a = p.parse_args(argv[1:])
    run = twrun.open_run(a.run, allow_incomplete=a.allow_incomplete)
    field = a.field or run.default_field()
    x, t = run.grid_x(), run.snapshot_times()
    v = twrun.part(run.snapshots(field), a.part)
    if not a.absolute:
        v = v - v.mean(axis=0, keepdims=True)
    lim = float(np.max(np.abs(v))) or 1.0
    div, _ = twrun.colormaps()
    fig, ax = twrun.figure(height_per_row=4.6)
    ax.grid(False)
    mesh = ax.pcolormesh(x, t, v, cmap=div if not a.absolute else twrun.colormaps()[1],
                         vmin=-lim if not a.absolute else None, vmax=lim if not a.absolute else None,
                         shading="nearest", rasterized=True)
    name = field + ("" if not run.is_complex(field) else f" ({a.part})")
    units = run.field_units(field)
    cb = fig.colorbar(mesh, ax=ax, pad=0.015)
    cb.set_label(twrun.label(name if a.absolute else f"{name} − cell mean", units))
    ax.set_xlabel(twrun.label("x", run.units("grid/x")))
    ax.set_ylabel(twrun.label("t", run.units("snapshots/time")))
    ax.set_title(f"space–time: {name}")
    out = a.output or twrun.default_output(a.run, "spacetime", field)
    twrun.save(fig, out, run)
    print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
