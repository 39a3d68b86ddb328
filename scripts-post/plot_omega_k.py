#!/usr/bin/python3
"""omega-k spectrum of one field with analytic branches overlaid.

    /usr/bin/python3 scripts-post/plot_omega_k.py RUN.h5 [--field NAME] [--branches ID,ID,...] [-o OUT.png]

The spectrum is the one `tubewave measure` stored under /measurements/FIELD/omega_k, with
its ridge; without it, the same windowed transform is computed here (time mean of each cell
removed, Hann windows, no window in x for a periodic tube). Branches are formula ids of
twdispersion.py (default for MHD runs: mhd-fast, mhd-alfven, mhd-slow), drawn for the
run's background with both signs of k.
"""
import sys

import numpy as np

import twdispersion
import twrun


def spectrum(run, field):
    """(k, omega, power, ridge_k, ridge_omega) from the file, or computed."""
    g = f"measurements/{field}/omega_k"
    if g in run.h5:
        s = run.h5[g]
        return s["k"][:], s["omega"][:], s["power"][:], s["ridge_k"][:], s["ridge_omega"][:]
    x, t = run.grid_x(), run.snapshot_times()
    # The uniformly spaced snapshots (a final snapshot off the cadence is left out).
    dt = np.diff(t)
    off = np.nonzero(np.abs(dt - dt[0]) > 1e-6 * abs(dt[0]))[0] if len(dt) else []
    n = int(off[0]) + 1 if len(off) else len(t)
    v = run.snapshots(field)[:n].astype(complex)
    v -= v.mean(axis=0, keepdims=True)
    periodic = "kind: periodic" in run.resolved_run_file()
    wt = np.sin(np.pi * (np.arange(n) + 0.5) / n) ** 2
    wx = np.ones(len(x)) if periodic else np.sin(np.pi * (np.arange(len(x)) + 0.5) / len(x)) ** 2
    s = np.fft.fft(v * wt[:, None] * wx[None, :], axis=1)           # e^{-i k x}
    s = np.fft.ifft(s, axis=0) * n                                   # e^{+i omega t}
    k = np.fft.fftshift(np.fft.fftfreq(len(x), x[1] - x[0])) * 2 * np.pi
    w = np.fft.fftshift(np.fft.fftfreq(n, t[1] - t[0])) * 2 * np.pi
    p = np.abs(np.fft.fftshift(s)) ** 2
    if not np.iscomplexobj(run.snapshots(field)):
        keep = w >= 0
        w, p = w[keep], p[keep]
    p /= p.max() or 1.0
    ridge_k, ridge_w = [], []
    for j in range(len(k)):
        i = int(np.argmax(p[:, j]))
        if k[j] != 0 and p[i, j] >= 1e-4:
            ridge_k.append(k[j])
            ridge_w.append(w[i])
    return k, w, p, np.array(ridge_k), np.array(ridge_w)


def main(argv):
    p = twrun.script_arguments(__doc__.splitlines()[0])
    p.add_argument("--branches", help="comma-separated formula ids of twdispersion.py, or 'none'")
    p.add_argument("--floor-db", type=float, default=-60, help="lowest power shown [dB] (default -60)")
    p.add_argument("--k-max", type=float, help="largest |k| shown (default: where the power is)")
    p.add_argument("--omega-max", type=float, help="largest |omega| shown (default: where the power is)")
    a = p.parse_args(argv[1:])
    run = twrun.open_run(a.run, allow_incomplete=a.allow_incomplete)
    field = a.field or run.default_field()
    k, w, power, rk, rw = spectrum(run, field)
    _, seq = twrun.colormaps()
    fig, ax = twrun.figure(height_per_row=4.6)
    ax.grid(False)
    db = 10 * np.log10(np.maximum(power, 10 ** (a.floor_db / 10)))
    mesh = ax.pcolormesh(k, w, db, cmap=seq, vmin=a.floor_db, vmax=0, shading="nearest", rasterized=True)
    fig.colorbar(mesh, ax=ax, pad=0.015).set_label("relative power [dB]")
    if len(rk):
        ax.plot(rk, rw, "o", ms=3.5, mfc=twrun.PALETTE[1], mec=twrun.PAPER, mew=0.6, ls="none", label="ridge")
    model = run.h5.attrs.get("model", b"")
    model = model.decode() if isinstance(model, bytes) else str(model)
    ids = [] if a.branches == "none" else \
        [s for s in a.branches.split(",") if s] if a.branches else \
        (["mhd-fast", "mhd-alfven", "mhd-slow"] if model.startswith("mhd") else [])
    # Zoom on where the power is (within 40 dB of the peak), with a margin.
    strong = power >= 1e-4
    kz = a.k_max or 1.6 * max(float(np.max(np.abs(k[np.any(strong, axis=0)]))), 3 * abs(k[1] - k[0]))
    wz = a.omega_max or 1.6 * max(float(np.max(np.abs(w[np.any(strong, axis=1)]))), 3 * abs(w[1] - w[0]))
    bg = run.background()
    for i, fid in enumerate(ids):
        kk, ww = twdispersion.branch_curve(fid, bg, kz)
        color = twrun.PALETTE[(2 + i) % len(twrun.PALETTE)]
        ax.plot(kk, ww, "--", color=color, lw=1.1, label=fid)
        ax.plot(-kk, ww, "--", color=color, lw=1.1)
    ax.set_xlim(-kz, kz)
    ax.set_ylim(-wz if w.min() < 0 else 0, wz)
    ax.set_xlabel(twrun.label("k", "1" if run.is_normalized() else "rad/m"))
    ax.set_ylabel(twrun.label("ω", "1" if run.is_normalized() else "rad/s"))
    ax.set_title(f"ω–k spectrum: {field}")
    if len(rk) or ids:
        ax.legend(loc="upper right", fontsize=8, frameon=True, facecolor=twrun.PAPER, edgecolor="#d9d4c7")
    out = a.output or twrun.default_output(a.run, "omega_k", field)
    twrun.save(fig, out, run)
    print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
