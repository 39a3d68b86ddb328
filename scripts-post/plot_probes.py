#!/usr/bin/python3
"""Probe traces: one field's time series at every probe, one panel per probe.

    /usr/bin/python3 scripts-post/plot_probes.py RUN.h5 [--field NAME] [-o OUT.png]

A complex field shows its real and imaginary parts and its modulus.
"""
import sys

import numpy as np

import twrun


def main(argv):
    p = twrun.script_arguments(__doc__.splitlines()[0])
    a = p.parse_args(argv[1:])
    run = twrun.open_run(a.run, allow_incomplete=a.allow_incomplete)
    if "probes" not in run.h5:
        print(f"{a.run}: the run has no probes (output.probes)", file=sys.stderr)
        return 2
    field = a.field or run.default_field()
    t, v = run.probe_times(), run.probes(field)
    pos = run.probe_positions()
    n = v.shape[1]
    fig, axes = twrun.figure(n, 1, height_per_row=1.6, sharex=True, sharey=True, squeeze=False)
    units = run.field_units(field)
    xu = twrun.pretty_units(run.units("grid/x"))
    for i in range(n):
        ax = axes[i, 0]
        if np.iscomplexobj(v):
            ax.plot(t, v[:, i].real, color=twrun.PALETTE[1], label="re")
            ax.plot(t, v[:, i].imag, color=twrun.PALETTE[2], label="im")
            ax.plot(t, np.abs(v[:, i]), color=twrun.PALETTE[0], lw=0.9, label="|·|")
            if i == 0:
                ax.legend(loc="upper right", ncol=3)
        else:
            ax.plot(t, v[:, i], color=twrun.PALETTE[1 + i % (len(twrun.PALETTE) - 2)])
        where = f"x = {pos[i]:.4g} {xu}" if pos is not None and len(pos) == n else f"probe {i}"
        ax.text(0.005, 0.92, where, transform=ax.transAxes, va="top", fontsize=8.5, color=twrun.INK)
        ax.set_ylabel(f"[{twrun.pretty_units(units) or '1'}]")
    axes[-1, 0].set_xlabel(twrun.label("t", run.units("probes/time")))
    axes[0, 0].set_title(f"probe traces: {field} [{twrun.pretty_units(units) or '1'}]")
    out = a.output or twrun.default_output(a.run, "probes", field)
    twrun.save(fig, out, run)
    print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
