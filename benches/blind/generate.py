"""Blind-test field generator: an invented field, "Ossel Bank", built by a
forward model written independently of flowzone's own demo model
(src/demo/synth.rs), with settings that differ from the demo's.

Usage: python generate.py OUT_DIR --seed S [--wells 16] [--cored 3]

Everything is made up: field, operator, wells, numbers. Per seed the field
draws its own class count (5-7), FZI ladder, Archie m and n by class, capillary
curves by class, bed thicknesses (0.2-9 m), tool blur and noise, and two or
three fault compartments, each with its own free water level. It writes:

  OUT_DIR/wells/*.las       logs (GR, RHOB, NPHI, RT, CALI, BS; mnemonics vary by well)
  OUT_DIR/core.csv          core plugs of the cored wells
  OUT_DIR/capillary.csv     mercury-air curves of plugs, by class
  OUT_DIR/pressures.csv     formation pressures (TVDSS) of some wells
  OUT_DIR/zones.csv         one reservoir zone per well
  OUT_DIR/field.toml        a flowzone config for the field
  OUT_DIR/truth/*.csv       per sample: DEPTH, TVDSS_M, CLASS, PHIE, VSH, SW, PERM_MD
  OUT_DIR/truth/steps.csv   the saturation steps of the truth, by kind
  OUT_DIR/truth/field.json  cored wells, compartments, FWLs, class table

Forward model (each a published relation, stated where used):
- permeability from FZI and effective porosity, k = 1014.24 FZI^2 phi^3/(1-phi)^2
  (Amaefule et al. 1993);
- Leverett J (Leverett 1941) with Brooks-Corey curves per class (Brooks & Corey
  1964), J = 0.216601 Pc[psi]/(sigma cos theta) sqrt(k[mD]/phi);
- resistivity from the modified Simandoux equation (the one the config asks
  flowzone to invert), neutron and density as volume mixes;
- each log blurred by a Gaussian with the tool's vertical resolution as its
  full width at half maximum (resistivity blurred as conductivity), then noise.
"""
import argparse
import json
import math
import os

import lasio
import numpy as np

FZI_K = 1014.24          # Amaefule et al. 1993
LEVERETT = 0.216601      # flowzone's exact constant (formulas.md 8.1)
PSI_PER_M_PER_GCC = 1.42233
STEP = 0.1524            # m (0.5 ft)
RHO_W, RHO_O = 1.06, 0.80
SIGMA_COS_RES = 24.0     # dyn/cm (oil-brine, scenario choice)
SIGMA_COS_HG = 480.0 * abs(math.cos(math.radians(140.0)))
RW, RSH, A = 0.05, 2.0, 1.0
GR_CLEAN, GR_SHALE = 30.0, 140.0
RHO_MA, RHO_SH, NPHI_SH, PHI_SH_BOUND = 2.65, 2.52, 0.33, 0.07
HI_OIL = 0.9
MNEMONICS = {
    "GR": ["GR", "GR_EDTC", "SGR", "ECGR"],
    "RHOB": ["RHOB", "RHOZ", "DEN"],
    "NPHI": ["NPHI", "TNPH", "NPOR"],
    "RT": ["RT", "ILD", "AT90", "RD"],
}
# tool vertical resolution (m, FWHM) and noise (1 sigma); scenario choices
RESOLUTION = {"GR": 0.45, "RHOB": 0.40, "NPHI": 0.55, "RT": 1.4}
NOISE = {"GR": 3.0, "RHOB": 0.015, "NPHI": 0.010, "RT": 0.04}


def classes(rng):
    """Class table, poorest first: FZI bounds, centres, phie, VSH, m, n, BC J curve."""
    k = int(rng.integers(5, 8))
    lo, hi = rng.uniform(0.2, 0.35), rng.uniform(6.0, 10.0)
    edges = np.geomspace(lo, hi, k + 1)
    table = []
    for c in range(k):
        f = c / (k - 1)
        table.append({
            "class": c + 1,
            "fzi_lo": float(edges[c]), "fzi_hi": float(edges[c + 1]),
            "fzi": float(math.sqrt(edges[c] * edges[c + 1])),
            "phie": 0.08 + 0.17 * f + rng.normal(0, 0.008),
            "vsh": (max(0.0, 0.30 - 0.28 * f), max(0.04, 0.40 - 0.32 * f)),
            "m": 2.25 - 0.45 * f + rng.normal(0, 0.03),
            "n": 2.40 - 0.65 * f + rng.normal(0, 0.04),
            "jd": 0.07 - 0.05 * f,
            "lam": 0.9 + 1.5 * f,
            "swirr": 0.36 - 0.28 * f,
        })
    return table


def bc_sw(j, cl):
    """Brooks-Corey in J: Sw = Swirr + (1 - Swirr)(Jd/J)^lambda above entry, 1 below."""
    j = np.asarray(j, float)
    out = np.ones_like(j)
    above = j > cl["jd"]
    out[above] = cl["swirr"] + (1 - cl["swirr"]) * (cl["jd"] / j[above]) ** cl["lam"]
    return out


def beds(rng, top, base, ncls):
    """Bed sequence (top, base, class) from top to base: class 0 is shale;
    thicknesses log-normal (median 1.4 m, 0.2-9 m); a class tends to follow a
    neighbouring one."""
    out, z, c = [], top, int(rng.integers(1, ncls + 1))
    while z < base:
        h = float(np.clip(rng.lognormal(math.log(1.4), 0.8), 0.2, 9.0))
        r = rng.random()
        if r < 0.12:
            c = 0
        elif c == 0 or r < 0.45:
            c = int(rng.integers(1, ncls + 1))
        else:
            c = int(np.clip(c + rng.choice([-2, -1, 1, 2]), 1, ncls))
        out.append((z, min(z + h, base), c))
        z += h
    return out


def blur(values, fwhm):
    sigma = fwhm / 2.3548 / STEP
    half = max(1, int(3 * sigma))
    x = np.arange(-half, half + 1)
    w = np.exp(-0.5 * (x / sigma) ** 2)
    w /= w.sum()
    padded = np.pad(values, half, mode="edge")
    return np.convolve(padded, w, mode="valid")


def well(rng, name, cls, comp, top_tvdss, kb):
    ncls = len(cls)
    res_top, res_base = top_tvdss, top_tvdss + float(rng.uniform(70, 95))
    tv = np.arange(res_top - 40.0, res_base + 30.0, STEP)
    bed = beds(rng, res_top, res_base, ncls)
    cls_of = np.zeros(tv.size, int)
    phie = np.full(tv.size, 0.02)
    vsh = np.full(tv.size, 0.9)
    fzi = np.full(tv.size, 0.1)
    bed_id = np.full(tv.size, -1)
    for i, (a, b, c) in enumerate(bed):
        sel = (tv >= a) & (tv < b)
        bed_id[sel] = i
        if c == 0:
            vsh[sel] = rng.uniform(0.75, 1.0)
            phie[sel] = rng.uniform(0.0, 0.03)
            continue
        cl = cls[c - 1]
        cls_of[sel] = c
        lf = rng.uniform(math.log(cl["fzi_lo"]) + 0.1 * (math.log(cl["fzi_hi"] / cl["fzi_lo"])),
                         math.log(cl["fzi_hi"]) - 0.1 * (math.log(cl["fzi_hi"] / cl["fzi_lo"])))
        fzi[sel] = math.exp(lf)
        phie[sel] = float(np.clip(cl["phie"] + rng.normal(0, 0.015), 0.04, 0.32))
        vsh[sel] = rng.uniform(*cl["vsh"])
    k = FZI_K * fzi ** 2 * phie ** 3 / (1 - phie) ** 2
    h = comp["fwl"] - tv
    sw = np.ones(tv.size)
    for c in range(1, ncls + 1):
        sel = (cls_of == c) & (h > 0)
        pc = h[sel] * (RHO_W - RHO_O) * PSI_PER_M_PER_GCC
        j = LEVERETT * pc / SIGMA_COS_RES * np.sqrt(k[sel] / phie[sel])
        sw[sel] = bc_sw(j, cls[c - 1])
    m = np.array([cls[c - 1]["m"] if c else 2.0 for c in cls_of])
    n = np.array([cls[c - 1]["n"] if c else 2.0 for c in cls_of])
    # modified Simandoux: 1/Rt = phi^m Sw^n / (a Rw (1 - Vsh)) + Vsh Sw / Rsh
    cond = phie ** m * sw ** n / (A * RW * (1 - np.minimum(vsh, 0.99))) + vsh * sw / RSH
    rho_fl = sw * RHO_W + (1 - sw) * RHO_O
    vma = np.clip(1 - vsh - phie, 0, 1)
    logs = {
        "GR": GR_CLEAN + vsh * (GR_SHALE - GR_CLEAN),
        "RHOB": vsh * RHO_SH + vma * RHO_MA + phie * rho_fl,
        "NPHI": vsh * NPHI_SH + phie * (sw + (1 - sw) * HI_OIL),
    }
    out = {}
    for key, v in logs.items():
        res = RESOLUTION[key] * rng.uniform(0.85, 1.2)
        out[key] = blur(v, res) + rng.normal(0, NOISE[key], tv.size)
    c_blur = blur(cond, RESOLUTION["RT"] * rng.uniform(0.85, 1.2))
    out["RT"] = np.exp(np.log(1 / c_blur) + rng.normal(0, NOISE["RT"], tv.size))
    out["CALI"] = 8.5 + rng.normal(0, 0.03, tv.size)
    out["BS"] = np.full(tv.size, 8.5)
    md = tv + kb
    truth = {
        "DEPTH": md, "TVDSS_M": tv, "CLASS": cls_of, "PHIE": phie, "VSH": vsh,
        "SW": sw, "PERM_MD": np.where(cls_of > 0, k, np.nan), "BED": bed_id,
    }
    return {"name": name, "md": md, "tv": tv, "logs": out, "truth": truth, "beds": bed,
            "res_top": res_top, "res_base": res_base, "kb": kb, "comp": comp["name"]}


def truth_steps(w, min_bed=0.6, min_step=0.10):
    """Saturation steps of the truth: a rock-quality step where the class
    changes between two beds at least `min_bed` thick whose mean SW differ by
    at least `min_step`; a fluid-contact step where SW reaches 1 inside one
    bed (the class's contact, FWL minus its entry height) with at least
    `min_step` of contrast 0.6 m above it."""
    t = w["truth"]
    steps = []
    beds_ = w["beds"]
    for (a0, b0, c0), (a1, b1, c1) in zip(beds_, beds_[1:]):
        if c0 == c1 or b0 - a0 < min_bed or b1 - a1 < min_bed:
            continue
        s0 = t["SW"][(t["TVDSS_M"] >= a0) & (t["TVDSS_M"] < b0)].mean()
        s1 = t["SW"][(t["TVDSS_M"] >= a1) & (t["TVDSS_M"] < b1)].mean()
        if abs(s0 - s1) >= min_step:
            steps.append(("rock-quality", b0 + w["kb"]))
    sw, tv = t["SW"], t["TVDSS_M"]
    for a, b, c in beds_:
        if c == 0:
            continue
        sel = np.where((tv >= a) & (tv < b))[0]
        if sel.size < 2:
            continue
        wet = sel[sw[sel] >= 0.999]
        dry = sel[sw[sel] < 0.999]
        if wet.size == 0 or dry.size == 0:
            continue
        z = tv[wet[0]]
        if z - a < min_bed / 2 or b - z < min_bed / 2:
            continue
        above = sel[(tv[sel] >= z - 0.6) & (tv[sel] < z - 0.3)]
        if above.size and 1 - sw[above].mean() >= min_step:
            steps.append(("fluid-contact", z + w["kb"]))
    return steps


def write_las(path, w, rng):
    las = lasio.LASFile()
    las.well["WELL"].value = w["name"]
    las.well["COMP"].value = "Fenwick Marsh Energy (invented)"
    las.well["FLD"].value = "Ossel Bank (invented)"
    las.well["NULL"].value = -999.25
    las.params.append(lasio.HeaderItem("EKB", unit="M", value=round(w["kb"], 2), descr="kelly bushing elevation"))
    las.append_curve("DEPT", np.round(w["md"], 4), unit="M", descr="measured depth")
    units = {"GR": "GAPI", "RHOB": "G/CC", "NPHI": "V/V", "RT": "OHMM", "CALI": "IN", "BS": "IN"}
    for key in ["GR", "RHOB", "NPHI", "RT", "CALI", "BS"]:
        mnem = key if key not in MNEMONICS else MNEMONICS[key][int(rng.integers(len(MNEMONICS[key])))]
        las.append_curve(mnem, np.round(w["logs"][key], 5), unit=units[key], descr=key)
    with open(path, "w") as f:
        las.write(f, version=2.0)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("out")
    ap.add_argument("--seed", type=int, required=True)
    ap.add_argument("--wells", type=int, default=16)
    ap.add_argument("--cored", type=int, default=3)
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    cls = classes(rng)
    ncomp = int(rng.integers(2, 4))
    comps = [{"name": f"Block-{chr(65 + i)}", "fwl": 2080.0 + 14.0 * i + float(rng.uniform(-3, 3)),
              "p_fwl": 3010.0 + 25.0 * i} for i in range(ncomp)]
    names = [f"OB-{i + 1:02d}" for i in range(a.wells)]
    cored = sorted(rng.choice(a.wells, size=a.cored, replace=False).tolist())
    os.makedirs(os.path.join(a.out, "wells"), exist_ok=True)
    os.makedirs(os.path.join(a.out, "truth"), exist_ok=True)
    wells = []
    for i, name in enumerate(names):
        comp = comps[i % ncomp]
        top = comp["fwl"] - float(rng.uniform(45, 70))
        w = well(rng, name, cls, comp, top, kb=float(rng.uniform(22, 32)))
        write_las(os.path.join(a.out, "wells", f"{name.lower()}.las"), w, rng)
        wells.append(w)
        t = w["truth"]
        with open(os.path.join(a.out, "truth", f"{name.lower()}.csv"), "w") as f:
            f.write("DEPTH,TVDSS_M,CLASS,PHIE,VSH,SW,PERM_MD\n")
            for r in range(w["md"].size):
                f.write(f"{t['DEPTH'][r]:.4f},{t['TVDSS_M'][r]:.4f},{t['CLASS'][r]},{t['PHIE'][r]:.5f},"
                        f"{t['VSH'][r]:.5f},{t['SW'][r]:.5f},{t['PERM_MD'][r]:.6g}\n")
    with open(os.path.join(a.out, "truth", "steps.csv"), "w") as f:
        f.write("WELL,KIND,DEPTH\n")
        for w in wells:
            for kind, d in truth_steps(w):
                f.write(f"{w['name']},{kind},{d:.4f}\n")
    # core plugs: every ~0.3 m inside beds (0.15 m from a boundary), measured with noise
    with open(os.path.join(a.out, "core.csv"), "w") as f:
        f.write("WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD\n")
        for i in cored:
            w = wells[i]
            t = w["truth"]
            for a0, b0, c in w["beds"]:
                if c == 0 or b0 - a0 < 0.4:
                    continue
                for z in np.arange(a0 + 0.15, b0 - 0.15, 0.3):
                    r = int(np.argmin(abs(w["tv"] - z)))
                    phi = t["PHIE"][r] + rng.normal(0, 0.008)
                    k = t["PERM_MD"][r] * 10 ** rng.normal(0, 0.08)
                    f.write(f"{w['name']},{w['md'][r]:.3f},{phi:.4f},{k:.5g}\n")
    # capillary plugs: three per class from the cored wells, mercury-air
    with open(os.path.join(a.out, "capillary.csv"), "w") as f:
        f.write("SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,SW_FRAC,SYSTEM\n")
        s = 0
        for cl in cls:
            cands = [(i, r) for i in cored for r in np.where(wells[i]["truth"]["CLASS"] == cl["class"])[0]]
            if not cands:
                continue
            for pick in rng.choice(len(cands), size=min(3, len(cands)), replace=False):
                i, r = cands[int(pick)]
                w, t = wells[i], wells[i]["truth"]
                phi, k = t["PHIE"][r], t["PERM_MD"][r]
                s += 1
                for pc in np.geomspace(2.0, 2000.0, 14):
                    j = LEVERETT * pc / SIGMA_COS_HG * math.sqrt(k / phi)
                    sw = float(np.clip(bc_sw([j], cl)[0] + rng.normal(0, 0.008), 0, 1))
                    f.write(f"CAP-{s:02d},{w['name']},{w['md'][r]:.2f},{phi:.4f},{k:.5g},{pc:.3f},{sw:.4f},mercury-air\n")
    # pressures: one well of each compartment, 8 points across its FWL
    with open(os.path.join(a.out, "pressures.csv"), "w") as f:
        f.write("WELL,TVDSS_M,PRESSURE_PSI\n")
        for ci, comp in enumerate(comps):
            members = [w for w in wells if w["comp"] == comp["name"]][:2]
            for w in members:
                for z in np.linspace(comp["fwl"] - 25, comp["fwl"] + 20, 8):
                    g = RHO_O if z < comp["fwl"] else RHO_W
                    p = comp["p_fwl"] + g * PSI_PER_M_PER_GCC * (z - comp["fwl"]) + rng.normal(0, 0.05)
                    f.write(f"{w['name']},{z:.2f},{p:.3f}\n")
    with open(os.path.join(a.out, "zones.csv"), "w") as f:
        f.write("WELL,ZONE,TOP_MD\n")
        for w in wells:
            f.write(f"{w['name']},Ossel,{w['res_top'] + w['kb'] - 2.0:.2f}\n")
    bounds = [round(c["fzi_hi"], 3) for c in cls[:-1]]
    lines = [
        "# Blind-test field (invented): written by benches/blind/generate.py",
        "[project]", 'name = "Ossel Bank (blind test)"', 'depth-unit = "m"', "",
        "[input]", 'wells = ["wells"]', "", "[output]", 'formats = ["csv"]', "decimals = 5", "",
        "[zones]", 'tops = "zones.csv"', "",
        "[parameters.field]",
        f"gr-clean-gapi = {GR_CLEAN}", f"gr-shale-gapi = {GR_SHALE}", 'porosity-method = "neutron-density"',
        'matrix = "sandstone"', f"rho-fluid-gcc = {RHO_W}", f"rho-shale-gcc = {RHO_SH}",
        f"nphi-shale-vv = {NPHI_SH}", "dt-shale-usft = 100", f"rw-ohmm = {RW}",
        "archie-a = 1.0", "archie-m = 2.0", "archie-n = 2.0",
        'saturation-model = "simandoux-modified"', f"rsh-ohmm = {RSH}", "",
        "[core]", 'file = "core.csv"', "",
        "[classes]", 'use = "fzi"', 'perm-method = "fzi"', "",
        "[classes.scheme.fzi]", 'kind = "fzi-ladder"', f"bounds = {bounds}", "",
        "[predictor]", 'features = ["VSH", "PHIE", "RHOB", "NPHI", "LOG10_RT"]', "",
    ]
    for c in cls:
        lines += [f'[parameters.class."{c["class"]}"]', f"archie-m = {c['m']:.3f}", f"archie-n = {c['n']:.3f}", ""]
    lines += ["[capillary]", 'file = "capillary.csv"', "", "[pressures]", 'file = "pressures.csv"', ""]
    for comp in comps:
        members = [w["name"] for w in wells if w["comp"] == comp["name"]]
        lines += [f'[compartments."{comp["name"]}"]', f"wells = {json.dumps(members)}", ""]
    with open(os.path.join(a.out, "field.toml"), "w") as f:
        f.write("\n".join(lines))
    with open(os.path.join(a.out, "truth", "field.json"), "w") as f:
        json.dump({"seed": a.seed, "cored": [names[i] for i in cored], "classes": cls,
                   "compartments": comps}, f, indent=1)


if __name__ == "__main__":
    main()
