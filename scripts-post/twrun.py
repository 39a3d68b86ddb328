#!/usr/bin/python3
"""Read a tubewave run file (HDF5) for post-processing, and the one look of our plots.

Shared by every script in scripts-post/ and by validation/run_all.py. Depends only on the
documented output layout (README, "Output file"). Run with Debian's Python,
/usr/bin/python3 (numpy, h5py and matplotlib from the Debian packages python3-numpy,
python3-h5py, python3-matplotlib; the `python3` first on some PATHs lacks them).

    import twrun
    run = twrun.open_run("demo_column.h5")   # refuses incomplete files unless allowed
    x, t, vy = run.grid_x(), run.snapshot_times(), run.snapshots("velocity_y")

Complex fields of linearized runs are stored as NAME_re / NAME_im pairs; field_names()
lists such a pair as NAME, and snapshots(NAME) / probes(NAME) return complex arrays.

Plot style: PALETTE (line colours), DIVERGING and SEQUENTIAL (colour maps), figure() and
save() give every script the same layout: a warm paper background, a left-aligned title
with the run's title, labelled axes with SI units from the datasets' "units" attributes,
and a footer naming the file.
"""
import os
import re
import sys

import h5py
import numpy as np


class IncompleteRun(Exception):
    """The file's root attribute complete != 1: the run failed, stopped or is running."""


def _text(v):
    return v.decode() if isinstance(v, bytes) else str(v)


class Run:
    def __init__(self, path, allow_incomplete=False):
        self.path = path
        self.h5 = h5py.File(path, "r")
        if _text(self.h5.attrs.get("format", "")) != "tubewave-run":
            raise ValueError(f"{path}: not a tubewave run file")
        if int(self.h5.attrs.get("complete", 0)) != 1 and not allow_incomplete:
            outcome = self.status().get("outcome", "unknown")
            raise IncompleteRun(f"{path}: the run is not complete (outcome: {outcome})")

    def close(self):
        self.h5.close()

    # --- metadata ---------------------------------------------------------------------
    def status(self):
        return {k: (_text(v) if isinstance(v, (bytes, str)) else v) for k, v in self.h5["status"].attrs.items()} \
            if "status" in self.h5 else {}

    def title(self):
        return _text(self.h5.attrs.get("title", ""))

    def run_file_text(self):
        return self.h5["provenance/run_file"].asstr()[()]

    def resolved_run_file(self):
        p = "provenance/resolved_run_file"
        return self.h5[p].asstr()[()] if p in self.h5 else ""

    def is_normalized(self):
        """True for a run in code units (units: normalized): lengths and times are not m, s."""
        return re.search(r"^units:\s*normalized\s*$", self.resolved_run_file(), re.M) is not None

    def parameters(self):
        """Every scalar of /parameters as a float, by name."""
        g = self.h5.get("parameters", {})
        return {k: float(g[k][()]) for k in g}

    def parameter(self, name):
        return float(self.h5["parameters/" + name][()])

    def units(self, path):
        """The CF units attribute of a dataset ("" if none); "1" in a normalized run for
        lengths and times, whose datasets say m and s."""
        u = _text(self.h5[path].attrs.get("units", ""))
        if self.is_normalized() and u in ("m", "s"):
            return "1"
        return u

    # --- grid and series --------------------------------------------------------------
    def grid_x(self):
        return self.h5["grid/x"][:]

    def _raw_fields(self, series):
        return [k for k in self.h5[series].keys() if k not in ("time", "step")] if series in self.h5 else []

    def fields(self, series="snapshots"):
        """Dataset names of a series, as stored (re/im parts separately)."""
        return self._raw_fields(series)

    def field_names(self, series="snapshots"):
        """Field names with each NAME_re / NAME_im pair as one complex field NAME."""
        raw = self._raw_fields(series)
        out = []
        for n in raw:
            if n.endswith("_re") and n[:-3] + "_im" in raw:
                out.append(n[:-3])
            elif n.endswith("_im") and n[:-3] + "_re" in raw:
                continue
            else:
                out.append(n)
        return out

    def is_complex(self, field, series="snapshots"):
        raw = self._raw_fields(series)
        return field not in raw and field + "_re" in raw and field + "_im" in raw

    def field_units(self, field, series="snapshots"):
        name = field + "_re" if self.is_complex(field, series) else field
        return self.units(f"{series}/{name}")

    def _series(self, series, field):
        if self.is_complex(field, series):
            return self.h5[f"{series}/{field}_re"][:] + 1j * self.h5[f"{series}/{field}_im"][:]
        if f"{series}/{field}" not in self.h5:
            raise KeyError(f"{self.path}: no field '{field}' in /{series}; fields: {', '.join(self.field_names(series))}")
        return self.h5[f"{series}/{field}"][:]

    def snapshot_times(self):
        return self.h5["snapshots/time"][:]

    def snapshots(self, field):
        """Array [n_snapshots, n_cells] (complex for a re/im pair)."""
        return self._series("snapshots", field)

    def probe_times(self):
        return self.h5["probes/time"][:] if "probes" in self.h5 else np.zeros(0)

    def probes(self, field):
        """Array [n_samples, n_probes] (complex for a re/im pair)."""
        return self._series("probes", field)

    def probe_positions(self):
        """Probe positions from /grid/probe_x if the file has it, else from the resolved
        run file's output.probes (a list of numbers); None when unknown."""
        if "grid/probe_x" in self.h5:
            return self.h5["grid/probe_x"][:]
        text = self.resolved_run_file()
        try:
            import yaml  # optional (python3-yaml); the fallback below reads the usual form
            doc = yaml.safe_load(text)
            pr = doc.get("output", {}).get("probes")
            if isinstance(pr, list) and all(isinstance(v, (int, float)) for v in pr):
                return np.array(pr, dtype=float)
        except Exception:
            pass
        m = re.search(r"^output:\s*\n((?:[ \t]+.*\n?)*)", text, re.M)
        if m:
            p = re.search(r"^[ \t]+probes:\s*\[([^\]]*)\]", m.group(1), re.M)
            if p:
                vals = [v for v in p.group(1).split(",") if v.strip()]
                return np.array([float(v) for v in vals])
        return None

    def default_field(self):
        """The field whose fluctuations are the largest fraction of its magnitude (the same
        choice as `tubewave measure` without --field)."""
        best, score = None, -1.0
        for f in self.field_names():
            v = self.snapshots(f)
            rms = np.sqrt(np.mean(np.abs(v) ** 2))
            if rms == 0:
                continue
            s = np.std(v) / rms
            if s > score * (1 + 1e-9):
                best, score = f, s
        return best

    def history_columns(self):
        return self._raw_fields("history")

    def history(self, column):
        return self.h5["history/" + column][:]

    def history_times(self):
        return self.h5["history/time"][:]

    # --- derived ----------------------------------------------------------------------
    def background(self):
        """Everything an analytic dispersion relation may need (twdispersion.py): every
        /parameters value, and "initial_mean_FIELD" for each snapshot field (its mean over
        the tube at the first snapshot: the background of a wave that fills the tube with
        whole wavelengths, or of a uniform column before a drive starts)."""
        bg = self.parameters()
        for f in self.field_names():
            first = self.h5["snapshots/" + (f + "_re" if self.is_complex(f) else f)][0, :]
            bg["initial_mean_" + f] = float(np.mean(first))
        bg["normalized"] = self.is_normalized()
        return bg

    def measurement(self, field):
        """Results of `tubewave measure` for a field: {name: (value, uncertainty, units,
        method)}, or None if the file has none."""
        p = "measurements/" + field
        if p not in self.h5:
            return None
        out = {}
        for k, d in self.h5[p].items():
            if isinstance(d, h5py.Dataset) and d.shape == ():
                out[k] = (float(d[()]), float(d.attrs.get("uncertainty", np.nan)),
                          _text(d.attrs.get("units", "")), _text(d.attrs.get("method", "")))
        return out


def open_run(path, allow_incomplete=False):
    return Run(path, allow_incomplete)


# --- The look of our plots ---------------------------------------------------------------

PAPER = "#fbfaf6"       # figure background
INK = "#1d2433"         # text, axes, the first line
PALETTE = ["#1d2433", "#0f7c8c", "#d9822b", "#a8324a", "#5c8a3a", "#6a4c93", "#8a8f98"]
_DIVERGING = ["#0a4652", "#2f95a6", "#bfe0e0", "#f6f3ec", "#f2cf9a", "#d9822b", "#7d2a14"]
_SEQUENTIAL = ["#f6f3ec", "#f2cf9a", "#d9822b", "#a8324a", "#3a1f3d", "#10131c"]

_DIVERGING_CMAP = None
_SEQUENTIAL_CMAP = None


def colormaps():
    """(diverging, sequential) colour maps of our own: teal through paper to rust for signed
    fields, paper through amber and wine to ink for powers."""
    global _DIVERGING_CMAP, _SEQUENTIAL_CMAP
    if _DIVERGING_CMAP is None:
        from matplotlib.colors import LinearSegmentedColormap
        _DIVERGING_CMAP = LinearSegmentedColormap.from_list("tubewave_diverging", _DIVERGING)
        _SEQUENTIAL_CMAP = LinearSegmentedColormap.from_list("tubewave_sequential", _SEQUENTIAL)
    return _DIVERGING_CMAP, _SEQUENTIAL_CMAP


def _matplotlib():
    import matplotlib
    matplotlib.use("Agg")  # PNG files; no display needed
    import matplotlib.pyplot as plt
    from cycler import cycler
    plt.rcParams.update({
        "figure.facecolor": PAPER, "axes.facecolor": PAPER, "savefig.facecolor": PAPER,
        "axes.edgecolor": INK, "axes.labelcolor": INK, "text.color": INK,
        "xtick.color": INK, "ytick.color": INK, "axes.prop_cycle": cycler(color=PALETTE),
        "axes.spines.top": False, "axes.spines.right": False, "axes.grid": True,
        "grid.color": "#d9d4c7", "grid.linestyle": ":", "grid.linewidth": 0.8,
        "axes.titlelocation": "left", "axes.titlesize": 11, "axes.titleweight": "bold",
        "axes.labelsize": 10, "font.size": 9.5, "legend.frameon": False,
        "lines.linewidth": 1.4, "figure.dpi": 110, "savefig.dpi": 130,
    })
    return plt


def figure(nrows=1, ncols=1, width=7.5, height_per_row=3.2, **kw):
    """A figure with our layout: (fig, axes) with axes squeezed as in plt.subplots."""
    plt = _matplotlib()
    return plt.subplots(nrows, ncols, figsize=(width, 0.9 + height_per_row * nrows), squeeze=kw.pop("squeeze", True),
                        **kw)


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def pretty_units(units):
    """CF units text for an axis: "m^-3" -> "m⁻³", "kg m^-1 s^-1" -> "kg m⁻¹ s⁻¹"."""
    return re.sub(r"\^(-?\d+)", lambda m: m.group(1).translate(_SUPERSCRIPT), units)


def label(quantity, units):
    """Axis label "quantity [units]"; "quantity [1]" for dimensionless and code units."""
    u = pretty_units(units) if units else "1"
    return f"{quantity} [{u}]"


def save(fig, path, run=None, heading=None):
    """Title, footer and a PNG at `path` (the format follows the extension)."""
    if heading:
        fig.suptitle(heading, x=0.012, ha="left", fontsize=12, fontweight="bold", color=INK)
    if run is not None:
        fig.text(0.995, 0.006, f"tubewave · {os.path.basename(run.path)}" + (f" · {run.title()}" if run.title() else ""),
                 ha="right", va="bottom", fontsize=7.5, color=PALETTE[-1])
    fig.tight_layout(rect=(0, 0.02, 1, 0.97 if heading else 1))
    fig.savefig(path)
    _matplotlib().close(fig)
    return path


def default_output(run_path, kind, field=None):
    """RUN.KIND[.FIELD].png next to the run file."""
    stem = os.path.splitext(run_path)[0]
    return f"{stem}.{kind}" + (f".{field}" if field else "") + ".png"


def script_arguments(description, field=True):
    """The options every script shares: RUN, -o/--output, and --field."""
    import argparse
    p = argparse.ArgumentParser(description=description)
    p.add_argument("run", metavar="RUN.h5", help="a tubewave run file")
    p.add_argument("-o", "--output", help="image file (default: RUN.KIND.FIELD.png next to the run file)")
    if field:
        p.add_argument("--field", help="field to plot (default: the one whose fluctuations dominate, as measure picks)")
    p.add_argument("--allow-incomplete", action="store_true", help="also plot a run that did not complete")
    return p


def part(values, which):
    """A plottable real view of possibly complex values: re, im, abs (default re)."""
    if not np.iscomplexobj(values):
        return values
    return {"re": values.real, "im": values.imag, "abs": np.abs(values)}[which]


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
    print(f"  fields: {', '.join(run.field_names())}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
