"""Score a run on a blind field against its truth, on the uncored wells only.

Usage: python score.py FIELD_DIR RUN_OUT [--json]

FIELD_DIR is a folder written by generate.py; RUN_OUT the output folder of
`flowzone run --config FIELD_DIR/field.toml` (or of rf_peer.py, which writes
the same wells/*.csv columns). Figures (depths inside the zone whose truth is
reservoir rock, class >= 1):

- class exact and within one (a depth without a class counts as wrong);
- SW RMSE (v/v) and log10 PERM RMSE (depths where the run gives a value);
- rock-quality and fluid-contact steps: precision and recall, a run's step
  matching a truth step of the same kind within 1.0 m of MD (contacts.csv);
- wells whose logs are "not lined up" with their compartment's FWL
  (contacts.json), out of all wells: every compartment here has one FWL;
- how often a well's implied-FWL range holds the compartment's true FWL.
"""
import csv
import json
import math
import os
import sys

TOL_M = 1.0


def read_csv(path):
    with open(path) as f:
        return list(csv.DictReader(f))


def num(s):
    try:
        v = float(s)
        return v if math.isfinite(v) else None
    except (TypeError, ValueError):
        return None


def score(field, run):
    info = json.load(open(os.path.join(field, "truth", "field.json")))
    cored = {w.lower() for w in info["cored"]}
    zones = {r["WELL"]: float(r["TOP_MD"]) for r in read_csv(os.path.join(field, "zones.csv"))}
    n = exact = within = 0
    sw_se, sw_n, k_se, k_n = 0.0, 0, 0.0, 0
    for name in sorted(os.listdir(os.path.join(field, "wells"))):
        stem = name[:-4]
        if stem in cored:
            continue
        well = stem.upper()
        truth = {round(float(r["DEPTH"]), 2): r for r in read_csv(os.path.join(field, "truth", stem + ".csv"))}
        path = os.path.join(run, "wells", stem + ".csv")
        if not os.path.exists(path):
            continue
        for r in read_csv(path):
            d = round(float(r["DEPTH"]), 2)
            t = truth.get(d)
            if t is None or d < zones[well] or int(t["CLASS"]) < 1:
                continue
            tc = int(t["CLASS"])
            c = num(r.get("CLASS"))
            n += 1
            if c is not None and c >= 1:
                exact += int(round(c) == tc)
                within += int(abs(round(c) - tc) <= 1)
            sw = num(r.get("SW"))
            if sw is not None:
                sw_se += (sw - float(t["SW"])) ** 2
                sw_n += 1
            k, tk = num(r.get("PERM")), num(t["PERM_MD"])
            if k is not None and k > 0 and tk and tk > 0:
                k_se += (math.log10(k) - math.log10(tk)) ** 2
                k_n += 1
    out = {
        "depths": n,
        "class_exact": exact / n if n else float("nan"),
        "class_within_one": within / n if n else float("nan"),
        "sw_rmse": math.sqrt(sw_se / sw_n) if sw_n else float("nan"),
        "log10_perm_rmse": math.sqrt(k_se / k_n) if k_n else float("nan"),
    }
    truth_steps = [r for r in read_csv(os.path.join(field, "truth", "steps.csv")) if r["WELL"].lower() not in cored]
    cpath = os.path.join(run, "contacts.csv")
    run_steps = [r for r in read_csv(cpath) if r["WELL"].lower() not in cored] if os.path.exists(cpath) else []
    for kind, key in [("rock-quality", "rock"), ("fluid-contact", "contact")]:
        ts = [(r["WELL"], float(r["DEPTH"])) for r in truth_steps if r["KIND"] == kind]
        rs = [(r["WELL"], float(r["DEPTH"])) for r in run_steps if r["KIND"] == kind]
        hit = lambda a, pool: any(w == a[0] and abs(d - a[1]) <= TOL_M for w, d in pool)
        out[f"{key}_precision"] = sum(hit(s, ts) for s in rs) / len(rs) if rs else float("nan")
        out[f"{key}_recall"] = sum(hit(s, rs) for s in ts) / len(ts) if ts else float("nan")
        out[f"{key}_truth_steps"] = len(ts)
    flagged = 0
    covered = ranged = 0
    true_fwl = {c["name"]: c["fwl"] for c in info["compartments"]}
    jpath = os.path.join(run, "contacts.json")
    if os.path.exists(jpath):
        for comp in json.load(open(jpath)).get("compartments", []):
            for _, w in comp.get("wells", []):
                flagged += int(w.get("agrees") is False)
                up, lo = w.get("upper"), w.get("lower")
                if up is not None and lo is not None and comp["name"] in true_fwl:
                    ranged += 1
                    covered += int(up <= true_fwl[comp["name"]] <= lo)
    out["wells_flagged"] = flagged
    # share of wells whose implied-FWL range holds the field's true FWL
    out["fwl_range_coverage"] = covered / ranged if ranged else float("nan")
    out["wells"] = len(os.listdir(os.path.join(field, "wells")))
    return out


if __name__ == "__main__":
    r = score(sys.argv[1], sys.argv[2])
    if "--json" in sys.argv:
        print(json.dumps(r))
    else:
        for k, v in r.items():
            print(f"{k:24s} {v:.3f}" if isinstance(v, float) else f"{k:24s} {v}")
