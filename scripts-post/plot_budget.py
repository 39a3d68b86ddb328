#!/usr/bin/python3
"""Energy budget over time, from /history (and any budget group the run file has).

    /usr/bin/python3 scripts-post/plot_budget.py RUN.h5 [-o OUT.png]

Top panel: every energy column found (its change since the start): columns of /history
whose name contains "energy" or whose units are energy per unit area (J m^-2), and the
columns of any group whose name contains "budget". Bottom panel, when the run records the
energy total and its inflow through the ends: the balance residual
total(t) - total(0) - inflow(t), relative to the largest term.
"""
import sys

import numpy as np

import twrun

ENERGY_UNITS = ("J m^-2", "J/m^2", "J m-2")


def energy_columns(run):
    """[(label, time, values, units)] of every energy-like series in the file."""
    out = []
    if "history" in run.h5:
        t = run.history_times()
        for c in run.history_columns():
            u = run.units("history/" + c)
            if "energy" in c or u in ENERGY_UNITS:
                v = run.history(c)
                out.append((c, t, v.reshape(len(t), -1)[:, 0], u))
    for g in run.h5:
        if "budget" not in g or not hasattr(run.h5[g], "keys") or "time" not in run.h5[g]:
            continue
        t = run.h5[g + "/time"][:]
        for c in run.h5[g]:
            if c in ("time", "step"):
                continue
            v = run.h5[g + "/" + c][:]
            out.append((f"{g}/{c}", t, v.reshape(len(t), -1)[:, 0], run.units(f"{g}/{c}")))
    return out


def main(argv):
    p = twrun.script_arguments(__doc__.splitlines()[0], field=False)
    a = p.parse_args(argv[1:])
    run = twrun.open_run(a.run, allow_incomplete=a.allow_incomplete)
    cols = energy_columns(run)
    if not cols:
        print(f"{a.run}: no energy columns in /history or a budget group", file=sys.stderr)
        return 2
    have_balance = "history" in run.h5 and {"energy_total", "energy_inflow"} <= set(run.history_columns())
    fig, axes = twrun.figure(2 if have_balance else 1, 1, sharex=True, squeeze=False)
    ax = axes[0, 0]
    units = cols[0][3]
    for i, (name, t, v, u) in enumerate(cols):
        ax.plot(t, v - v[0], color=twrun.PALETTE[i % len(twrun.PALETTE)], label=f"{name} − initial")
    ax.set_ylabel(twrun.label("energy change", units))
    ax.set_title("energy budget")
    ax.legend(loc="best", fontsize=8)
    if have_balance:
        t = run.history_times()
        tot = run.history("energy_total").reshape(len(t))
        inflow = run.history("energy_inflow").reshape(len(t))
        scale = max(np.max(np.abs(tot - tot[0])), np.max(np.abs(inflow)), np.max(np.abs(tot)) * 1e-16, 1e-300)
        resid = (tot - tot[0] - inflow) / scale
        b = axes[1, 0]
        b.plot(t, resid, color=twrun.PALETTE[3])
        b.set_ylabel(twrun.label("balance residual / scale", "1"))
        b.set_title("total − initial − inflow through the ends", fontsize=9.5, fontweight="normal")
    axes[-1, 0].set_xlabel(twrun.label("t", run.units("history/time") if "history" in run.h5 else "s"))
    out = a.output or twrun.default_output(a.run, "budget")
    twrun.save(fig, out, run)
    print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
