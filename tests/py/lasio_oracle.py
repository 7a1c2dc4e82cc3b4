"""Reference LAS reader for flowzone's interoperability tests.

Uses lasio (PyPI), the general-purpose Python LAS reader, as an independent
implementation:

  lasio_oracle.py dump FILE         print FILE as JSON, as lasio reads it
  lasio_oracle.py write SPEC OUT    write a LAS 2.0 file with lasio from a JSON spec

JSON for `dump`: {"version", "wrap", "null", "well": {MNEM: value},
"curves": [{"mnemonic", "unit", "data": [number or null]}]}.
"""

import json
import math
import sys

import lasio


def clean(values):
    out = []
    for v in values:
        try:
            f = float(v)
        except (TypeError, ValueError):
            out.append(None)
            continue
        out.append(None if math.isnan(f) else f)
    return out


def dump(path):
    las = lasio.read(path, engine="normal") if _is_wrapped(path) else lasio.read(path)
    curves = []
    for c in las.curves:
        curves.append({"mnemonic": c.mnemonic, "original": c.original_mnemonic, "unit": c.unit, "data": clean(c.data)})
    well = {item.mnemonic: str(item.value) for item in las.well}
    version = {item.mnemonic: str(item.value) for item in las.version}
    json.dump({"version": version.get("VERS"), "wrap": version.get("WRAP"), "well": well, "curves": curves}, sys.stdout)


def _is_wrapped(path):
    with open(path, "rb") as f:
        head = f.read(4000).decode("latin-1").upper()
    for line in head.splitlines():
        s = line.strip()
        if s.startswith("WRAP"):
            return "YES" in s.split(":")[0]
    return False


def write(spec_path, out_path):
    with open(spec_path) as f:
        spec = json.load(f)
    las = lasio.LASFile()
    for mnem, value in spec.get("well", {}).items():
        las.well[mnem] = lasio.HeaderItem(mnem, value=value)
    for c in spec["curves"]:
        data = [float("nan") if v is None else v for v in c["data"]]
        las.append_curve(c["mnemonic"], data, unit=c.get("unit", ""), descr=c.get("descr", ""))
    with open(out_path, "w") as f:
        las.write(f, version=2.0)


if __name__ == "__main__":
    if sys.argv[1] == "dump":
        dump(sys.argv[2])
    elif sys.argv[1] == "write":
        write(sys.argv[2], sys.argv[3])
    else:
        sys.exit("usage: lasio_oracle.py dump FILE | write SPEC OUT")
