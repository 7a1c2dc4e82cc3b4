"""Blind-test benchmark: flowzone against the Python random-forest peer on
invented fields it was never tuned on, scored on the uncored wells.

Usage: .venv/bin/python benches/blind/run.py [--seeds 1 2 3 4 5] [--flowzone target/release/flowzone]
                                              [--work DIR] [--set KEY=VALUE ...]

For each seed: generate.py writes a field, `flowzone run` interprets it,
rf_peer.py runs the peer (m = n = 2, and the class exponents), score.py
scores all three. Prints a markdown table of the mean and the standard
deviation over the seeds. --set adds a line under [predictor] of each
field.toml (to compare settings without editing the generator). Needs
numpy, lasio and scikit-learn (benches/blind/requirements.txt).
"""
import argparse
import json
import os
import statistics
import subprocess
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
ROWS = [
    ("class exact", "class_exact"),
    ("class within one", "class_within_one"),
    ("SW RMSE (v/v)", "sw_rmse"),
    ("log10 PERM RMSE", "log10_perm_rmse"),
    ("rock-quality steps, precision", "rock_precision"),
    ("rock-quality steps, recall", "rock_recall"),
    ("fluid-contact steps, precision", "contact_precision"),
    ("fluid-contact steps, recall", "contact_recall"),
    ("wells flagged, one FWL per compartment", "wells_flagged"),
    ("implied-FWL range holds the true FWL", "fwl_range_coverage"),
]


def py(*args):
    subprocess.run([sys.executable, *args], check=True)


def score(field, out):
    r = subprocess.run([sys.executable, os.path.join(HERE, "score.py"), field, out, "--json"],
                       check=True, capture_output=True, text=True)
    return json.loads(r.stdout)


def cell(values):
    v = [x for x in values if x == x]
    if not v:
        return "-"
    if len(v) == 1:
        return f"{v[0]:.3f}"
    return f"{statistics.mean(v):.3f} ± {statistics.stdev(v):.3f}"


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--seeds", type=int, nargs="+", default=[1, 2, 3, 4, 5])
    ap.add_argument("--flowzone", default="target/release/flowzone")
    ap.add_argument("--work", default="target/blind")
    ap.add_argument("--set", action="append", default=[], help="KEY=VALUE under [predictor]")
    a = ap.parse_args()
    results = {"flowzone": [], "peer, m = n = 2": [], "peer, class m, n": []}
    for seed in a.seeds:
        field = os.path.join(a.work, f"field-{seed}")
        py(os.path.join(HERE, "generate.py"), field, "--seed", str(seed))
        if a.set:
            cfg = os.path.join(field, "field.toml")
            text = open(cfg).read().replace("[predictor]\n", "[predictor]\n" + "\n".join(a.set) + "\n", 1)
            open(cfg, "w").write(text)
        out = os.path.join(a.work, f"run-{seed}")
        subprocess.run([a.flowzone, "run", "--config", os.path.join(field, "field.toml"), "--out", out,
                        "--overwrite", "--quiet"], check=True)
        results["flowzone"].append(score(field, out))
        for label, extra in [("peer, m = n = 2", []), ("peer, class m, n", ["--class-exponents"])]:
            pout = os.path.join(a.work, f"peer-{seed}-{len(extra)}")
            py(os.path.join(HERE, "rf_peer.py"), field, pout, *extra)
            results[label].append(score(field, pout))
        print(f"seed {seed}: flowzone class exact {results['flowzone'][-1]['class_exact']:.3f}", file=sys.stderr)
    names = list(results)
    print(f"Blind wells of {len(a.seeds)} fields (seeds {', '.join(map(str, a.seeds))}); mean ± sd over seeds\n")
    print("| figure | " + " | ".join(names) + " |")
    print("|---|" + "---|" * len(names))
    for label, key in ROWS:
        cells = []
        for name in names:
            rs = results[name]
            if key.startswith(("rock", "contact", "wells", "fwl")) and name != "flowzone":
                cells.append("none")
            else:
                cells.append(cell([float(r[key]) for r in rs]))
        print(f"| {label} | " + " | ".join(cells) + " |")
    n_wells = results["flowzone"][0]["wells"]
    print(f"\n{n_wells} wells per field; truth steps per field (uncored wells): rock-quality "
          f"{cell([r['rock_truth_steps'] for r in results['flowzone']])}, fluid-contact "
          f"{cell([r['contact_truth_steps'] for r in results['flowzone']])}")


if __name__ == "__main__":
    main()
