"""Generate tests/fixtures/reference/premix-log-coolprop.json: the demo premix tank (MT-2, the O2-in-Ar
premix of batches/demo-premix-o2-ar-mt2.jsonl) before and after the demo batch of
batches/demo-ch4-phi1-from-premix.jsonl drew from it, with the CoolProp HEOS multi-fluid mixture model,
as an outside reference for the amount a batch drew (the batch tank's density before and after its
premix fill) and the premix tank's pressure after the draw.

The batch tank: pure CH4 to its first reading, Ar to its second, the premix (the premix log's planned
composition) to its third, at each reading's temperature; the amount of each fill is found by bisection
on the HEOS pressure. Cylinder impurities (ppm) are left out.

Run (from the repository root):  /work/.venv-ref/bin/python scripts/reference/gen_premix_log.py
"""
import json
import CoolProp
from coolprop_mix import density, pressure

PREMIX_LOG = "batches/demo-premix-o2-ar-mt2.jsonl"
BATCH_LOG = "batches/demo-ch4-phi1-from-premix.jsonl"


def lines(path):
    with open(path) as f:
        return [json.loads(l) for l in f if l.strip()]


def fill_to(before, gas, P, T):
    """amounts per m3 after adding gas (fractions) to `before` (amounts per m3) until the pressure is P"""
    lo, hi = 0.0, 2 * P / (8.314462618 * T)
    for _ in range(200):
        mid = (lo + hi) / 2
        cum = dict(before)
        for k, v in gas.items():
            cum[k] = cum.get(k, 0.0) + mid * v
        if pressure(cum, sum(cum.values()), T) < P:
            lo = mid
        else:
            hi = mid
    cum = dict(before)
    for k, v in gas.items():
        cum[k] = cum.get(k, 0.0) + lo * v
    return cum


premix = lines(PREMIX_LOG)
ph = premix[0]
x_premix = {k: v for k, v in ph["design"]["composition"].items() if v > 0}
last = [e for e in premix if e["kind"] == "reading"][-1]
batch = lines(BATCH_LOG)
bh = batch[0]
src = {s["id"]: s for s in bh["sources"]}
readings = [e for e in batch if e["kind"] == "reading"]
n = {}
drawn = 0.0
for r in readings:
    s = src[r["source"]]
    gas = x_premix if s["kind"] == "premix" else {s["main_species"]: 1.0}
    before = sum(n.values())
    n = fill_to(n, gas, r["pressure_Pa"], r["temperature_K"])
    if s["kind"] == "premix":
        drawn += (sum(n.values()) - before) * bh["tank"]["volume_m3"]

V = ph["tank"]["volume_m3"]
T = last["temperature_K"]
n0 = density(x_premix, last["pressure_Pa"], T) * V
n1 = n0 - drawn
out = {
    "library": f"CoolProp {CoolProp.__version__} HEOS mixture model",
    "premix_log": PREMIX_LOG,
    "batch_log": BATCH_LOG,
    "premix_composition": x_premix,
    "premix_volume_m3": V,
    "premix_temperature_K": T,
    "premix_last_reading_Pa": last["pressure_Pa"],
    "premix_amount_mol": n0,
    "drawn_mol": drawn,
    "premix_after_draw_Pa": pressure({k: v * n1 / V for k, v in x_premix.items()}, n1 / V, T),
}
with open("tests/fixtures/reference/premix-log-coolprop.json", "w") as f:
    json.dump(out, f, indent=1)
print(json.dumps(out, indent=1))
