"""Plain-Python peer of `flowzone run` on a synthetic bench field.

Usage: .venv/bin/python benches/python_peer.py FIELD_DIR [--limit K] [--write DIR] [--compare RUN_OUT/wells]

FIELD_DIR is a folder written by `flowzone demo --out FIELD_DIR --wells N`.
For every LAS file of the folder, in name order, in one process and one thread
(sequential, no multiprocessing): lasio read, then with numpy arrays

- shale volume: linear gamma-ray index, clipped to [0, 1];
- porosity: neutron-density mean, clipped to [0, phi-max], shale-corrected with
  what the method reads in shale, clipped to [0, PHIT];
- water saturation: Archie, clipped to [0, 1];

at the depths inside the zones of zones.csv (above the first top nothing is
interpreted, as in flowzone), leaving out samples whose inputs are outside
flowzone's physical ranges. Every parameter is read from FIELD_DIR/field.toml
([parameters.field]), so both tools use the same values. The curve names are the
ones the synthetic field uses (GR, RHOB, NPHI, RT, CALI, BS; no alias or unit
resolution). It prints the elapsed time and a one-line summary.

--write DIR writes each well's table as CSV to DIR (numpy.savetxt, 4 decimals:
DEPTH, the computed VSH, PHIT, PHIE, SW, BVW and the eight logs, 14 columns
against flowzone's 16), the same work flowzone's per-well CSV does.

--compare DIR reads flowzone's per-well CSV files of the same wells from DIR and
prints the largest difference of VSH, PHIE and SW (flowzone writes 4 decimals).
"""
import argparse
import csv
import math
import os
import sys
import time
import tomllib

import lasio
import numpy as np

# flowzone's physical input ranges (src/well/chain.rs): outside them a depth is not interpreted
RANGES = {
    "GR": (0.0, 1000.0),
    "RHOB": (1.0, 3.2),
    "NPHI": (-0.15, 1.0),
    "RT": (0.01, 100_000.0),
}


def parameters(field_dir):
    with open(os.path.join(field_dir, "field.toml"), "rb") as f:
        cfg = tomllib.load(f)
    p = cfg["parameters"]["field"]
    for key, want in [
        ("shale-model", "linear"),
        ("porosity-method", "neutron-density"),
        ("saturation-model", "archie"),
    ]:
        if p.get(key) != want:
            sys.exit(f"python_peer: field.toml {key} = {p.get(key)!r}; this peer does {want!r} only")
    tops = os.path.join(field_dir, cfg["zones"]["tops"])
    return p, tops


def first_tops(path):
    """Upper-cased well name -> shallowest zone top (MD, m)."""
    tops = {}
    with open(path, newline="") as f:
        for row in csv.DictReader(f):
            if row.get("DEPTH_UNIT", "M").upper() not in ("M", ""):
                sys.exit(f"python_peer: {path}: only metre tops are handled")
            well = row["WELL"].strip().upper()
            top = float(row["TOP_MD"])
            tops[well] = min(top, tops.get(well, math.inf))
    return tops


def interpret(las, p, first_top):
    """VSH, PHIT, PHIE, SW, BVW and the bad-hole flag of one well (numpy arrays)."""
    depth = las.index
    curve = {m: las[m] for m in ("GR", "RHOB", "NPHI", "RT", "CALI", "BS")}
    ok = depth >= first_top
    for m, (lo, hi) in RANGES.items():
        v = curve[m]
        ok &= ~(np.isfinite(v) & ((v < lo) | (v > hi)))
    gr, rhob, nphi, rt = (np.where(ok, curve[m], np.nan) for m in ("GR", "RHOB", "NPHI", "RT"))

    gr_c, gr_s = p["gr-clean-gapi"], p["gr-shale-gapi"]
    vsh = np.clip((gr - gr_c) / (gr_s - gr_c), 0.0, 1.0)

    rho_ma, rho_f = p["rho-matrix-gcc"], p["rho-fluid-gcc"]
    phi_d = (rho_ma - rhob) / (rho_ma - rho_f)
    phit = np.clip(0.5 * (nphi + phi_d), 0.0, p.get("phi-max-vv", 0.5))
    phi_d_sh = (rho_ma - p["rho-shale-gcc"]) / (rho_ma - rho_f)
    phi_sh = 0.5 * (p["nphi-shale-vv"] + phi_d_sh)
    phie = np.minimum(np.maximum(phit - vsh * phi_sh, 0.0), phit)

    a, m, n = p.get("archie-a", 1.0), p.get("archie-m", 2.0), p.get("archie-n", 2.0)
    rw = p["rw-ohmm"]
    defined = (phie > 0) & (rt > 0)
    sw = np.full_like(phie, np.nan)
    sw[defined] = (a * rw / (phie[defined] ** m * rt[defined])) ** (1.0 / n)
    sw = np.clip(sw, 0.0, 1.0)
    bvw = phie * sw
    bad_hole = (curve["CALI"] - curve["BS"]) > p.get("bad-hole-in", 1.0)
    return {"VSH": vsh, "PHIT": phit, "PHIE": phie, "SW": sw, "BVW": bvw, "BAD_HOLE": bad_hole}


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("field_dir")
    ap.add_argument("--limit", type=int, default=None, help="only the first K wells")
    ap.add_argument("--write", default=None, help="write each well's CSV to this folder")
    ap.add_argument("--compare", default=None, help="flowzone run's OUT/wells folder")
    args = ap.parse_args()

    start = time.perf_counter()
    p, tops_path = parameters(args.field_dir)
    tops = first_tops(tops_path)
    files = sorted(f for f in os.listdir(args.field_dir) if f.lower().endswith(".las"))
    if args.limit is not None:
        files = files[: args.limit]
    if not files:
        sys.exit(f"python_peer: no LAS files in {args.field_dir}")
    if args.write:
        os.makedirs(args.write, exist_ok=True)
    wells = samples = interpreted = 0
    sum_phie = sum_sw = 0.0
    worst = {"VSH": 0.0, "PHIE": 0.0, "SW": 0.0}
    with np.errstate(invalid="ignore", divide="ignore"):
        for name in files:
            las = lasio.read(os.path.join(args.field_dir, name))
            well = str(las.well["WELL"].value).strip().upper()
            out = interpret(las, p, tops.get(well, math.inf))
            wells += 1
            samples += len(las.index)
            good = np.isfinite(out["SW"])
            interpreted += int(good.sum())
            sum_phie += float(np.nansum(out["PHIE"]))
            sum_sw += float(np.nansum(out["SW"]))
            if args.write:
                logs = [c.mnemonic for c in las.curves[1:]]
                table = np.column_stack(
                    [las.index] + [out[c] for c in ("VSH", "PHIT", "PHIE", "SW", "BVW")] + [las[m] for m in logs]
                )
                np.savetxt(
                    os.path.join(args.write, name[:-4] + ".csv"),
                    table,
                    fmt="%.4f",
                    delimiter=",",
                    header=",".join(["DEPTH", "VSH", "PHIT", "PHIE", "SW", "BVW"] + logs),
                    comments="",
                )
            if args.compare:
                theirs = np.genfromtxt(
                    os.path.join(args.compare, name[:-4].lower() + ".csv"),
                    delimiter=",",
                    names=True,
                )
                for c in worst:
                    d = np.abs(out[c] - theirs[c])
                    both_nan = np.isnan(out[c]) & np.isnan(theirs[c])
                    one_nan = np.isnan(out[c]) != np.isnan(theirs[c])
                    if one_nan.any():
                        worst[c] = math.inf
                    else:
                        worst[c] = max(worst[c], float(np.max(np.where(both_nan, 0.0, d))))
    elapsed = time.perf_counter() - start
    print(
        f"python peer (lasio {lasio.__version__}, numpy {np.__version__}, sequential, 1 process): "
        f"{wells} wells, {samples} samples ({interpreted} with SW), "
        f"mean PHIE {sum_phie / max(interpreted, 1):.4f}, mean SW {sum_sw / max(interpreted, 1):.4f}, "
        f"{elapsed:.2f} s"
    )
    if args.compare:
        diffs = ", ".join(f"{c} {v:.2g}" for c, v in worst.items())
        print(f"largest difference from flowzone over {wells} wells: {diffs}")
        if any(v > 1e-3 for v in worst.values()):
            sys.exit("python_peer: the peer and flowzone disagree (parameters differ?)")


if __name__ == "__main__":
    main()
