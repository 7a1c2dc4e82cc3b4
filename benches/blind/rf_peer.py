"""The careful Python peer on a blind field: lasio + numpy + a scikit-learn
random forest on GR, RHOB, NPHI and log10 RT at the core depths.

Usage: python rf_peer.py FIELD_DIR OUT_DIR [--class-exponents]

For every well: VSH from the linear gamma-ray index, PHIE from the
neutron-density mean corrected for shale (the parameters of FIELD_DIR/field.toml),
a class from the forest (trained on the cored wells' plugs, each plug's class
from the config's FZI ladder), SW from the modified Simandoux equation with
m = n = 2 or, with --class-exponents, the class's m and n from the config,
and PERM from the class's mean core FZI and PHIE (k = 1014.24 FZI^2
phi^3/(1-phi)^2, Amaefule et al. 1993). Writes OUT_DIR/wells/<stem>.csv with
DEPTH, CLASS, SW, PERM for score.py. No steps, no contacts: the peer has no audit.
"""
import argparse
import bisect
import csv
import math
import os
import tomllib

import lasio
import numpy as np
from sklearn.ensemble import RandomForestClassifier

ALIASES = {
    "GR": ["GR", "GR_EDTC", "SGR", "ECGR"],
    "RHOB": ["RHOB", "RHOZ", "DEN"],
    "NPHI": ["NPHI", "TNPH", "NPOR"],
    "RT": ["RT", "ILD", "AT90", "RD"],
}


def curve(las, key):
    for m in ALIASES[key]:
        if m in las.keys():
            return np.asarray(las[m], float)
    raise KeyError(key)


def simandoux(phi, rt, vsh, p, m, n):
    """Modified Simandoux solved for SW by bisection (monotonic in SW)."""
    a_term = phi ** m / (p["archie-a"] * p["rw-ohmm"] * (1 - np.minimum(vsh, 0.99)))
    c = 1 / rt
    lo, hi = np.zeros_like(phi), np.ones_like(phi)
    for _ in range(40):
        mid = 0.5 * (lo + hi)
        f = a_term * mid ** n + vsh * mid / p["rsh-ohmm"] - c
        hi = np.where(f > 0, mid, hi)
        lo = np.where(f > 0, lo, mid)
    return 0.5 * (lo + hi)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("field")
    ap.add_argument("out")
    ap.add_argument("--class-exponents", action="store_true")
    a = ap.parse_args()
    cfg = tomllib.load(open(os.path.join(a.field, "field.toml"), "rb"))
    p = cfg["parameters"]["field"]
    bounds = cfg["classes"]["scheme"]["fzi"]["bounds"]
    cls_p = cfg["parameters"].get("class", {})
    tops = {r["WELL"]: float(r["TOP_MD"]) for r in csv.DictReader(open(os.path.join(a.field, "zones.csv")))}
    core = list(csv.DictReader(open(os.path.join(a.field, "core.csv"))))
    wells = {}
    for name in sorted(os.listdir(os.path.join(a.field, "wells"))):
        las = lasio.read(os.path.join(a.field, "wells", name))
        gr, rhob, nphi, rt = (curve(las, k) for k in ("GR", "RHOB", "NPHI", "RT"))
        vsh = np.clip((gr - p["gr-clean-gapi"]) / (p["gr-shale-gapi"] - p["gr-clean-gapi"]), 0, 1)
        rho_ma, rho_f = 2.65, p["rho-fluid-gcc"]
        phit = np.clip(0.5 * (nphi + (rho_ma - rhob) / (rho_ma - rho_f)), 0, 0.5)
        phi_sh = 0.5 * (p["nphi-shale-vv"] + (rho_ma - p["rho-shale-gcc"]) / (rho_ma - rho_f))
        phie = np.clip(phit - vsh * phi_sh, 0, None)
        x = np.column_stack([gr, rhob, nphi, np.log10(np.maximum(rt, 1e-3))])
        wells[str(las.well["WELL"].value)] = (name[:-4], las.index, x, vsh, phie, rt)
    # training: each plug's log features at its depth, class from the ladder
    xs, ys, fzi_by = [], [], {}
    for r in core:
        phi, k = float(r["POROSITY_FRAC"]), float(r["PERM_MD"])
        fzi = 0.0314 * math.sqrt(k / phi) * (1 - phi) / phi
        c = bisect.bisect_right(bounds, fzi) + 1
        fzi_by.setdefault(c, []).append(math.log(fzi))
        _, md, x, *_ = wells[r["WELL"]]
        i = int(np.argmin(abs(md - float(r["DEPTH_MD"]))))
        xs.append(x[i])
        ys.append(c)
    forest = RandomForestClassifier(n_estimators=200, min_samples_leaf=2, random_state=0)
    forest.fit(np.array(xs), np.array(ys))
    fzi_mean = {c: math.exp(np.mean(v)) for c, v in fzi_by.items()}
    os.makedirs(os.path.join(a.out, "wells"), exist_ok=True)
    for well, (stem, md, x, vsh, phie, rt) in wells.items():
        ok = np.isfinite(x).all(axis=1) & (md >= tops[well]) & (phie > 0)
        cls = np.zeros(md.size, int)
        cls[ok] = forest.predict(x[ok])
        m = np.full(md.size, p["archie-m"])
        n = np.full(md.size, p["archie-n"])
        if a.class_exponents:
            for c, e in cls_p.items():
                m[cls == int(c)] = e["archie-m"]
                n[cls == int(c)] = e["archie-n"]
        sw = np.full(md.size, np.nan)
        sw[ok] = simandoux(phie[ok], rt[ok], vsh[ok], {**p, "archie-a": p.get("archie-a", 1.0)}, m[ok], n[ok])
        fzi = np.array([fzi_mean.get(c, np.nan) for c in cls])
        perm = np.where(ok, 1014.24 * fzi ** 2 * phie ** 3 / (1 - phie) ** 2, np.nan)
        with open(os.path.join(a.out, "wells", stem + ".csv"), "w") as f:
            f.write("DEPTH,CLASS,SW,PERM\n")
            for i in range(md.size):
                c = cls[i] if ok[i] else ""
                f.write(f"{md[i]:.4f},{c},{sw[i]:.5f},{perm[i]:.6g}\n")


if __name__ == "__main__":
    main()
