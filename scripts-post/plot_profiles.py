#!/usr/bin/python3
"""Profile snapshots: one field along the tube at several times, overlaid.

    /usr/bin/python3 scripts-post/plot_profiles.py RUN.h5 [--field NAME] [--times T1,T2,...] [--count N] [-o OUT.png]

Without --times, N snapshots (default 5) evenly spread over the run; the nearest stored
snapshot is drawn for each requested time.
"""
import sys

import numpy as np

import twrun


def main(argv):
    p = twrun.script_arguments(__doc__.splitlines()[0])
    p.add_argument("--times", help="comma-separated times [s] (nearest snapshots)")
    p.add_argument("--count", type=int, default=5, help="number of snapshots when --times is not given")
    p.add_argument("--part", choices=["re", "im", "abs"], default="re", help="part of a complex field")
    a = p.parse_args(argv[1:])
    run = twrun.open_run(a.run, allow_incomplete=a.allow_incomplete)
    field = a.field or run.default_field()
    x, t = run.grid_x(), run.snapshot_times()
    v = twrun.part(run.snapshots(field), a.part)
    if a.times:
        want = [float(s) for s in a.times.split(",") if s.strip()]
        rows = sorted({int(np.argmin(np.abs(t - w))) for w in want})
    else:
        rows = sorted({int(round(r)) for r in np.linspace(0, len(t) - 1, max(1, a.count))})
    fig, ax = twrun.figure()
    tu = twrun.pretty_units(run.units("snapshots/time"))
    for j, r in enumerate(rows):
        shade = 0.25 + 0.75 * (j + 1) / len(rows)
        ax.plot(x, v[r], color=twrun.PALETTE[1 + j % (len(twrun.PALETTE) - 2)], alpha=shade,
                label=f"t = {t[r]:.4g} {tu}")
    ax.set_xlabel(twrun.label("x", run.units("grid/x")))
    name = field + ("" if not run.is_complex(field) else f" ({a.part})")
    ax.set_ylabel(twrun.label(name, run.field_units(field)))
    ax.set_title(f"profiles: {name}")
    ax.legend(loc="best", fontsize=8)
    out = a.output or twrun.default_output(a.run, "profiles", field)
    twrun.save(fig, out, run)
    print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
