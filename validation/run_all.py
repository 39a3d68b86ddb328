#!/usr/bin/python3
"""Run the validation suite: every case runs a model, measures the wave with
`tubewave measure`, and compares the figures with the model's analytic dispersion.

    /usr/bin/python3 validation/run_all.py [--quick] [--case PATTERN ...] [-j N] [--out DIR]
                                           [--tubewave PATH] [--list]

Cases are the TOML files in validation/cases/ (format: validation/README.md). Each case
expands into variants (resolutions, angles, wavelengths); variants run in parallel (-j,
default 2 processes, each tubewave run with one thread). Writes into --out (default
./validation-results): results.md and results.csv (case, quantity, measured, uncertainty,
analytic, relative error, tolerance, pass), dispersion.png (measured points over the
analytic branches) and runs/*.h5 (the runs, with their /measurements). Exit code 0 when
every check passes, 1 when one fails (or a run fails), 2 for bad case files or options.

Needs Debian's Python (/usr/bin/python3) with numpy, h5py and matplotlib; tomllib is in
the standard library from Python 3.11.
"""
import argparse
import concurrent.futures
import csv
import fnmatch
import json
import math
import os
import subprocess
import sys
import time
import tomllib

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, os.path.join(ROOT, "scripts-post"))

import twdispersion  # noqa: E402
import twrun  # noqa: E402

QUANTITIES = ("frequency", "angular_frequency", "wavenumber", "wavelength", "phase_speed", "group_speed",
              "damping_rate", "spatial_damping_rate", "damping_length")
CASE_KEYS = {"title", "model", "run", "set", "field", "measure", "reference", "given", "direction", "panel",
             "branches", "check", "variant", "timeout", "quick", "convergence"}
CONVERGENCE_KEYS = {"quantity", "variants", "order", "min_order"}
VARIANT_KEYS = {"name", "set", "quick", "tolerance", "measure", "panel"}
CHECK_KEYS = {"quantity", "tolerance", "absolute"}
MODES_KEYS = {"branch"}


class CaseError(Exception):
    """A case file that cannot be used: names the file and the key."""


def _require(cond, path, msg):
    if not cond:
        raise CaseError(f"{path}: {msg}")


def load_cases(case_dir):
    """(variants, convergence studies) of every case file, in file and variant order."""
    variants, studies = [], []
    files = sorted(f for f in os.listdir(case_dir) if f.endswith(".toml"))
    for name in files:
        path = os.path.join(case_dir, name)
        try:
            with open(path, "rb") as fh:
                c = tomllib.load(fh)
        except tomllib.TOMLDecodeError as e:
            raise CaseError(f"{path}: {e}") from e
        stem = name[:-5]
        for k in c:
            _require(k in CASE_KEYS, path, f"unknown key '{k}' (known: {', '.join(sorted(CASE_KEYS))})")
        for k in ("run", "field", "reference", "check"):
            _require(k in c, path, f"missing key '{k}'")
        ref = c["reference"]
        _require(isinstance(ref, dict) and len(ref) == 1 and ("formula" in ref or "modes" in ref), path,
                 "reference must be {formula = \"ID\"} or {modes = {...}}")
        if "modes" in ref:
            _require(isinstance(ref["modes"], dict), path, "reference.modes must be a table, e.g. {branch = 2}")
            for k in ref["modes"]:
                _require(k in MODES_KEYS, path, f"reference.modes: unknown key '{k}' (known: {', '.join(sorted(MODES_KEYS))})")
            b = ref["modes"].get("branch")
            _require(b is None or (isinstance(b, int) and b >= 1), path,
                     "reference.modes.branch must be a forward branch number >= 1 (as tubewave modes numbers them)")
        if "formula" in ref:
            _require(ref["formula"] in twdispersion.FORMULAS, path,
                     f"reference.formula '{ref['formula']}' is not one of: {', '.join(sorted(twdispersion.FORMULAS))}")
        for b in c.get("branches", []):
            _require(b in twdispersion.FORMULAS, path, f"branches: '{b}' is not a formula id")
        given = c.get("given", "wavenumber")
        _require(given in ("wavenumber", "frequency"), path, "given must be 'wavenumber' or 'frequency'")
        direction = c.get("direction", "forward")
        _require(direction in ("forward", "backward"), path, "direction must be 'forward' or 'backward'")
        run = os.path.join(ROOT, c["run"])
        _require(os.path.isfile(run), path, f"run file '{c['run']}' does not exist")
        checks = []
        for ch in c["check"]:
            for k in ch:
                _require(k in CHECK_KEYS, path, f"check: unknown key '{k}'")
            _require(ch.get("quantity") in QUANTITIES, path,
                     f"check.quantity '{ch.get('quantity')}' is not one of: {', '.join(QUANTITIES)}")
            _require(isinstance(ch.get("tolerance"), (int, float)) and ch["tolerance"] > 0, path,
                     f"check '{ch['quantity']}': tolerance must be a number > 0")
            checks.append((ch["quantity"], float(ch["tolerance"]), bool(ch.get("absolute", False))))
        for v in c.get("variant", [{"name": "default"}]):
            for k in v:
                _require(k in VARIANT_KEYS, path, f"variant '{v.get('name')}': unknown key '{k}'")
            _require("name" in v, path, "every variant needs a name")
            tol = v.get("tolerance", {})
            for q in tol:
                _require(any(q == ch[0] for ch in checks), path, f"variant '{v['name']}': tolerance for unchecked '{q}'")
            variants.append({
                "id": f"{stem}/{v['name']}", "file": path, "title": c.get("title", stem), "model": c.get("model", ""),
                "run": run, "set": list(c.get("set", [])) + list(v.get("set", [])), "field": c["field"],
                "measure": list(c.get("measure", [])) + list(v.get("measure", [])), "reference": ref,
                "given": given, "direction": direction, "panel": v.get("panel", c.get("panel", stem)),
                "branches": list(c.get("branches", [ref["formula"]] if "formula" in ref else [])),
                "checks": [(q, float(tol.get(q, t)), ab) for q, t, ab in checks],
                "quick": bool(v.get("quick", c.get("quick", False))), "timeout": float(c.get("timeout", 900)),
            })
        names = [v["name"] for v in c.get("variant", [])]
        for cv in c.get("convergence", []):
            for k in cv:
                _require(k in CONVERGENCE_KEYS, path, f"convergence: unknown key '{k}'")
            _require(any(cv.get("quantity") == ch[0] for ch in checks), path,
                     f"convergence: quantity '{cv.get('quantity')}' is not checked")
            vs = cv.get("variants", [])
            _require(len(vs) >= 2 and all(n in names for n in vs), path,
                     "convergence.variants must name two or more variants, coarse to fine")
            _require(isinstance(cv.get("order"), (int, float)) and isinstance(cv.get("min_order"), (int, float)), path,
                     "convergence needs order (the design order) and min_order")
            studies.append({"case": stem, "quantity": cv["quantity"], "variants": [f"{stem}/{n}" for n in vs],
                            "order": float(cv["order"]), "min_order": float(cv["min_order"])})
    return variants, studies


def convergence_rows(studies, results):
    """Observed order of the error between the two finest variants of each study (each a
    doubling of the resolution): log2(e_coarse / e_fine), pass when >= min_order. Studies
    whose variants did not all run are left out."""
    err = {(r["case"], r["quantity"]): r["error"] for res in results for r in res["rows"]}
    rows = []
    for st in studies:
        e = [err.get((v, st["quantity"])) for v in st["variants"]]
        if any(x is None for x in e) and all((v, st["quantity"]) in err for v in st["variants"]):
            rows.append({"case": st["case"] + "/convergence", "quantity": st["quantity"] + " order", "measured": None,
                         "uncertainty": None, "analytic": st["order"], "error": None, "tolerance": st["min_order"],
                         "absolute": True, "units": "", "pass": False, "note": "a variant has no error to compare"})
            continue
        if any(x is None for x in e):
            continue
        coarse, fine = e[-2], e[-1]
        order = math.log2(coarse / fine) if coarse > 0 and fine > 0 else float("nan")
        names = " → ".join(v.split("/")[-1] for v in st["variants"][-2:])
        rows.append({"case": st["case"] + "/convergence", "quantity": f"{st['quantity']} order ({names})",
                     "measured": order, "uncertainty": None, "analytic": st["order"], "error": None,
                     "tolerance": st["min_order"], "absolute": True, "units": "", "pass": bool(order >= st["min_order"]),
                     "note": "" if order >= st["min_order"] else f"observed order {order:.2f} below {st['min_order']:g}",
                     "minimum": True})
    return rows


def _tail(text, n=3):
    lines = [ln for ln in text.strip().splitlines() if ln.strip()]
    return " / ".join(lines[-n:])


def analytic(v, figures, bg, tubewave):
    """Analytic values of every quantity for this variant, or (None, reason)."""
    ref = v["reference"]
    if "modes" in ref:
        return modes_reference(v, figures, tubewave)
    fid = ref["formula"]
    sign = 1.0 if v["direction"] == "forward" else -1.0
    if v["given"] == "frequency":
        w = figures["angular_frequency"]["value"]
        if w is None:
            return None, "no measured frequency to evaluate the formula at"
        q = twdispersion.given_frequency(fid, bg, abs(w))
    else:
        k = figures["wavenumber"]["value"]
        if k is None:
            return None, "no measured wavenumber to evaluate the formula at"
        q = twdispersion.given_wavenumber(fid, bg, abs(k))
    for name in ("wavenumber", "phase_speed", "group_speed"):
        if name in q:
            q[name] *= sign
    return q, ""


def _modes_json(v, tubewave, extra):
    """`tubewave modes` on the variant's run file (with its --set overrides) as JSON."""
    cmd = [tubewave, "modes", v["run"]]
    for s in v["set"]:
        cmd += ["--set", s]
    p = subprocess.run(cmd + extra + ["--json"], capture_output=True, text=True, timeout=120)
    if p.returncode != 0:
        raise RuntimeError(f"tubewave modes failed (exit {p.returncode}): {_tail(p.stdout + p.stderr)}")
    return json.loads(p.stdout)


def modes_reference(v, figures, tubewave):
    """Analytic values from the eigenvalues of the model's linearized equations, computed by
    `tubewave modes` for the run's own plasma (at x_min) and k_perp: at the measured |k| the
    forward branch `branch` (default: the one nearest the measured frequency), or at the
    measured frequency the complex root nearest the measured wavenumber. Also the branch's
    curve omega(k) for the dispersion figure."""
    spec = v["reference"]["modes"]
    sign = 1.0 if v["direction"] == "forward" else -1.0
    try:
        if v["given"] == "frequency":
            w = figures["angular_frequency"]["value"]
            km = figures["wavenumber"]["value"]
            if w is None or km is None:
                return None, "no measured frequency and wavenumber to compare with tubewave modes"
            roots = _modes_json(v, tubewave, ["--freq", repr(abs(w) / (2 * math.pi))])["frequencies"][0]["roots"]
            roots = [r for r in roots if r["wavenumber"] > 0] or roots
            if not roots:
                return None, "tubewave modes found no wavenumber at this frequency"
            r = min(roots, key=lambda r: abs(r["wavenumber"] - abs(km)))
            q = {"angular_frequency": abs(w), "frequency": abs(w) / (2 * math.pi), "wavenumber": sign * r["wavenumber"],
                 "wavelength": r["wavelength"], "phase_speed": sign * r["phase_speed"],
                 "spatial_damping_rate": r["spatial_damping_rate"], "damping_length": r["damping_length"]}
            return q, ""
        k = figures["wavenumber"]["value"]
        if k is None:
            return None, "no measured wavenumber to evaluate tubewave modes at"
        k = abs(k)
        fwd = [b for b in _modes_json(v, tubewave, ["--k", repr(k)])["wavenumbers"][0]["branches"]
               if b["direction"] == "forward"]
        if "branch" in spec:
            match = [b for b in fwd if b["number"] == spec["branch"]]
            if not match:
                return None, f"tubewave modes has no forward branch {spec['branch']} at k = {k:g}"
            b = match[0]
        else:
            wm = figures["angular_frequency"]["value"]
            if wm is None:
                return None, "no measured frequency to choose the nearest branch of tubewave modes"
            b = min(fwd, key=lambda b: abs(b["angular_frequency"] - abs(wm)))
        # The branch's curve omega(k) for the figure, followed from the measured k by
        # continuity (numbers change where other branches stop propagating).
        scan = _modes_json(v, tubewave, ["--k", f"{k / 40!r}:{1.15 * k!r}:47"])["wavenumbers"]
        rows = [(r["k"], [c["angular_frequency"] for c in r["branches"] if c["direction"] == "forward"]) for r in scan]
        start = min(range(len(rows)), key=lambda i: abs(rows[i][0] - k))
        curve = {}
        for order in (range(start, len(rows)), range(start, -1, -1)):
            w_prev = b["angular_frequency"] * rows[start][0] / k
            for i in order:
                if not rows[i][1]:
                    break
                w_prev = min(rows[i][1], key=lambda w: abs(w - w_prev))
                curve[rows[i][0]] = w_prev
        curve = sorted(curve.items())
        q = {"wavenumber": sign * k, "wavelength": 2 * math.pi / k, "angular_frequency": b["angular_frequency"],
             "frequency": b["frequency"], "phase_speed": sign * b["phase_speed"],
             "group_speed": sign * b["group_speed"], "damping_rate": b["damping_rate"],
             "_curve": curve, "_branch": b["number"]}
        return q, ""
    except (RuntimeError, subprocess.TimeoutExpired, KeyError, IndexError, ValueError) as e:
        return None, f"reference 'modes': {e}"


def run_variant(v, tubewave, out_dir):
    """Run, measure and compare one variant. Returns a dict of rows and a plot point."""
    t0 = time.time()
    h5 = os.path.join(out_dir, "runs", v["id"].replace("/", "__") + ".h5")
    env = dict(os.environ, OMP_NUM_THREADS="1")
    rows = []

    def fail_all(note):
        for q, tol, ab in v["checks"]:
            rows.append({"case": v["id"], "quantity": q, "measured": None, "uncertainty": None, "analytic": None,
                         "error": None, "tolerance": tol, "absolute": ab, "units": "", "pass": False, "note": note})
        return {"variant": v, "rows": rows, "point": None, "seconds": time.time() - t0}

    cmd = [tubewave, "run", v["run"], "-o", h5, "--quiet", "--threads", "1"]
    for s in v["set"]:
        cmd += ["--set", s]
    try:
        p = subprocess.run(cmd, capture_output=True, text=True, env=env, timeout=v["timeout"])
    except subprocess.TimeoutExpired:
        return fail_all(f"run timed out after {v['timeout']} s")
    if p.returncode != 0:
        return fail_all(f"run failed (exit {p.returncode}): {_tail(p.stdout + p.stderr)}")
    cmd = [tubewave, "measure", h5, "--field", v["field"], "--json"] + v["measure"]
    p = subprocess.run(cmd, capture_output=True, text=True, env=env, timeout=v["timeout"])
    if p.returncode != 0:
        return fail_all(f"measure failed (exit {p.returncode}): {_tail(p.stdout + p.stderr)}")
    figures = json.loads(p.stdout)["figures"]
    run = twrun.open_run(h5)
    bg = run.background()
    run.close()
    ref, why = analytic(v, figures, bg, tubewave)
    for q, tol, ab in v["checks"]:
        f = figures[q]
        row = {"case": v["id"], "quantity": q, "measured": f["value"], "uncertainty": f["uncertainty"],
               "analytic": None, "error": None, "tolerance": tol, "absolute": ab, "units": f["units"],
               "pass": False, "note": ""}
        if ref is None:
            row["pass"] = None  # skipped: no reference
            row["note"] = why
        elif f["value"] is None:
            row["note"] = "not measured: " + f["method"]
        elif q not in ref:
            row["note"] = f"the reference gives no {q} here"
        else:
            a = ref[q]
            row["analytic"] = a
            err = abs(f["value"] - a) if ab or a == 0 else abs(f["value"] - a) / abs(a)
            row["error"] = err
            row["pass"] = bool(err <= tol)
        rows.append(row)
    k, w = figures["wavenumber"], figures["angular_frequency"]
    point = None
    if k["value"] is not None and w["value"] is not None:
        point = {"panel": v["panel"], "branches": v["branches"], "bg": bg, "k": abs(k["value"]),
                 "k_sigma": k["uncertainty"], "omega": abs(w["value"]), "omega_sigma": w["uncertainty"],
                 "formula": v["reference"].get("formula"), "normalized": bg.get("normalized", False),
                 "case": v["id"], "modes_curve": (ref or {}).get("_curve"),
                 "modes_label": f"modes branch {ref['_branch']}" if ref and "_branch" in ref else None}
    return {"variant": v, "rows": rows, "point": point, "seconds": time.time() - t0}


def _fmt(x, digits=7):
    if x is None:
        return "—"
    if isinstance(x, float) and (math.isinf(x) or math.isnan(x)):
        return str(x)
    return f"{x:.{digits}g}"


def write_tables(results, extra_rows, out_dir, elapsed, jobs):
    rows = [r for res in results for r in res["rows"]] + extra_rows
    with open(os.path.join(out_dir, "results.csv"), "w", newline="") as fh:
        w = csv.writer(fh)
        w.writerow(["case", "quantity", "measured", "uncertainty", "analytic", "relative_error", "tolerance", "pass",
                    "units", "note"])
        for r in rows:
            w.writerow([r["case"], r["quantity"], "" if r["measured"] is None else repr(r["measured"]),
                        "" if r["uncertainty"] is None else repr(r["uncertainty"]),
                        "" if r["analytic"] is None else repr(float(r["analytic"])),
                        "" if r["error"] is None else repr(float(r["error"])), repr(r["tolerance"]),
                        {True: "pass", False: "FAIL", None: "skipped"}[r["pass"]], r["units"], r["note"]])
    n_pass = sum(1 for r in rows if r["pass"] is True)
    n_fail = sum(1 for r in rows if r["pass"] is False)
    n_skip = sum(1 for r in rows if r["pass"] is None)
    lines = ["# tubewave validation results", "",
             f"{len(results)} runs, {len(rows)} checks: {n_pass} passed, {n_fail} failed, {n_skip} skipped "
             f"({elapsed:.0f} s wall with {jobs} parallel runs).", "",
             "Relative error = |measured − analytic| / |analytic| (absolute where the tolerance says so). "
             "Uncertainty: the measurement's one-sigma statistical error. The analytic value is the case's "
             "formula at the measured wavenumber (initial-value runs) or at the drive frequency (driven runs). "
             "An \"order\" row is the observed convergence order of that error between the two finest "
             "resolutions of a study; its analytic column is the scheme's design order.", "",
             "| case | quantity | measured | ± | analytic | relative error | tolerance | pass |",
             "|---|---|---|---|---|---|---|---|"]
    for r in rows:
        tol = ("≥ " if r.get("minimum") else "") + _fmt(r["tolerance"], 3) + \
            (" (abs)" if r["absolute"] and not r.get("minimum") else "")
        mark = {True: "pass", False: "**FAIL**", None: "skipped"}[r["pass"]]
        units = f" {r['units']}" if r["units"] and r["units"] != "1" and r["measured"] is not None else ""
        lines.append(f"| {r['case']} | {r['quantity']} | {_fmt(r['measured'])}{units} | {_fmt(r['uncertainty'], 2)} | "
                     f"{_fmt(r['analytic'])} | {_fmt(r['error'], 3)} | {tol} | {mark} |")
    notes = [r for r in rows if r["note"]]
    if notes:
        lines += ["", "## Notes", ""]
        for r in notes:
            lines.append(f"- {r['case']}, {r['quantity']}: {r['note']}")
    with open(os.path.join(out_dir, "results.md"), "w") as fh:
        fh.write("\n".join(lines) + "\n")
    return n_pass, n_fail, n_skip


def write_figure(results, out_dir):
    """One panel per case panel: measured (|k|, |omega|) over the analytic branches."""
    points = [res["point"] for res in results if res["point"] is not None]
    if not points:
        return None
    panels = []
    for p in points:
        if p["panel"] not in panels:
            panels.append(p["panel"])
    ncols = min(3, len(panels))
    nrows = (len(panels) + ncols - 1) // ncols
    fig, axes = twrun.figure(nrows, ncols, width=4.2 * ncols, height_per_row=3.3, squeeze=False)
    for i, name in enumerate(panels):
        ax = axes[i // ncols][i % ncols]
        pts = [p for p in points if p["panel"] == name]
        kmax = 1.15 * max(p["k"] for p in pts)
        branches = []
        for p in pts:
            for b in p["branches"]:
                if b not in branches:
                    branches.append(b)
        colour = {b: twrun.PALETTE[(1 + j) % len(twrun.PALETTE)] for j, b in enumerate(branches)}
        for b in branches:
            k, w = twdispersion.branch_curve(b, pts[0]["bg"], kmax)
            ax.plot(k, w, "-", color=colour[b], lw=1.2, alpha=0.85, label=b)
        drawn = set()
        for p in pts:  # branches of `tubewave modes` (modes references), one curve per label
            if p.get("modes_curve") and p["modes_label"] not in drawn:
                drawn.add(p["modes_label"])
                kk, ww = zip(*p["modes_curve"])
                ax.plot(kk, ww, "--", color=twrun.PALETTE[(len(branches) + len(drawn)) % len(twrun.PALETTE)],
                        lw=1.2, alpha=0.85, label=p["modes_label"])
        for p in pts:
            c = colour.get(p["formula"], twrun.INK)
            ax.errorbar(p["k"], p["omega"], xerr=p["k_sigma"] or 0, yerr=p["omega_sigma"] or 0, fmt="o", ms=4.5,
                        mfc=twrun.PAPER, mec=c, ecolor=c, mew=1.3)
        unit = "1" if pts[0]["normalized"] else None
        ax.set_xlabel(twrun.label("k", unit or "rad/m"))
        ax.set_ylabel(twrun.label("ω", unit or "rad/s"))
        ax.set_title(name, fontsize=10)
        ax.set_xlim(0, kmax)
        ax.set_ylim(0, None)
        ax.legend(loc="upper left", fontsize=7.5)
    for j in range(len(panels), nrows * ncols):
        axes[j // ncols][j % ncols].set_visible(False)
    path = os.path.join(out_dir, "dispersion.png")
    twrun.save(fig, path, heading="Measured dispersion (circles) over the analytic branches (lines)")
    return path


def find_tubewave():
    for c in (os.path.join(ROOT, "build", "release", "src", "tubewave"), os.path.join(ROOT, "build", "src", "tubewave")):
        if os.access(c, os.X_OK):
            return c
    return "tubewave"


def main(argv):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0], formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--quick", action="store_true", help="only the variants marked quick (the CI subset)")
    ap.add_argument("--case", action="append", default=[], metavar="PATTERN",
                    help="only variants whose id (FILE/VARIANT) matches this shell pattern (repeatable)")
    ap.add_argument("-j", "--jobs", type=int, default=2, help="runs at once (default 2)")
    ap.add_argument("--out", default="validation-results", help="output directory (default ./validation-results)")
    ap.add_argument("--tubewave", default=None, help="the tubewave executable (default: build/release/src/tubewave, "
                                                       "build/src/tubewave, or PATH)")
    ap.add_argument("--cases", default=os.path.join(HERE, "cases"), help="directory of case files")
    ap.add_argument("--list", action="store_true", help="list the variants and exit")
    a = ap.parse_args(argv[1:])
    try:
        variants, studies = load_cases(a.cases)
    except CaseError as e:
        print(f"run_all: error: {e}", file=sys.stderr)
        return 2
    if a.quick:
        variants = [v for v in variants if v["quick"]]
    if a.case:
        variants = [v for v in variants if any(fnmatch.fnmatchcase(v["id"], p) for p in a.case)]
    if not variants:
        print("run_all: error: no case matches", file=sys.stderr)
        return 2
    if a.list:
        for v in variants:
            print(f"{v['id']:40s} {'quick' if v['quick'] else '':5s} {v['title']}")
        return 0
    tubewave = a.tubewave or find_tubewave()
    os.makedirs(os.path.join(a.out, "runs"), exist_ok=True)
    t0 = time.time()
    results = []
    with concurrent.futures.ProcessPoolExecutor(max_workers=max(1, a.jobs)) as pool:
        futures = [pool.submit(run_variant, v, tubewave, a.out) for v in variants]
        for fut in futures:
            res = fut.result()
            results.append(res)
            ok = all(r["pass"] is not False for r in res["rows"])
            print(f"{'ok  ' if ok else 'FAIL'} {res['variant']['id']:40s} {res['seconds']:6.1f} s", flush=True)
            if not ok:
                for r in res["rows"]:
                    if r["pass"] is False:
                        print(f"       {r['quantity']}: measured {_fmt(r['measured'])}, analytic {_fmt(r['analytic'])}, "
                              f"error {_fmt(r['error'], 3)} > {r['tolerance']:g} {r['note']}", flush=True)
    elapsed = time.time() - t0
    extra = convergence_rows(studies, results)
    for r in extra:
        print(f"{'ok  ' if r['pass'] else 'FAIL'} {r['case']:40s} {r['quantity']}: {_fmt(r['measured'], 3)}", flush=True)
    n_pass, n_fail, n_skip = write_tables(results, extra, a.out, elapsed, a.jobs)
    fig = write_figure(results, a.out)
    print(f"run_all: {n_pass} passed, {n_fail} failed, {n_skip} skipped in {elapsed:.0f} s; "
          f"wrote {os.path.join(a.out, 'results.md')}, results.csv" + (", dispersion.png" if fig else ""))
    return 0 if n_fail == 0 else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv))
