"""Generate tests/fixtures/reference/split-charges-coolprop.json: the readings of a fill with a
split diluent charge (CH4, Ar up to a stop reading, O2, then Ar to the final pressure) computed
with the CoolProp HEOS multi-fluid mixture model, as an outside reference for the planner's
split-charge amounts and targets. Pure gases into an evacuated rigid tank at constant T; the
volume cancels (amounts per m3). The Ar of the stop is found by bisection on the HEOS pressure.

Run (from the repository root):  /work/.venv-ref/bin/python scripts/reference/gen_split_charges.py
"""
import json
import CoolProp
from coolprop_mix import density as density_at, pressure as state

TORR = 101325.0 / 760.0

CASES = [
    {"id": "ch4-ar400-o2-ar-1000torr", "x": {"CH4": 0.05, "O2": 0.10, "Ar": 0.85}, "T": 298.15,
     "P": 1000 * TORR, "stop_Pa": 400 * TORR},
    {"id": "ch4-ar600-o2-ar-3bar", "x": {"CH4": 0.02, "O2": 0.04, "Ar": 0.94}, "T": 298.15,
     "P": 3.0e5, "stop_Pa": 6.0e4},
]


def stop_amount(before, species, stop, T, hi):
    """amount per m3 of `species` that brings `before` (amounts per m3) to `stop` Pa"""
    lo = 0.0
    for _ in range(200):
        mid = (lo + hi) / 2
        cum = dict(before)
        cum[species] = cum.get(species, 0.0) + mid
        if state(cum, sum(cum.values()), T) < stop:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


out = {"generator": "scripts/reference/gen_split_charges.py",
       "library": f"CoolProp {CoolProp.__version__} HEOS mixture model",
       "note": "readings after each charge of CH4, Ar (to stop_Pa), O2, Ar; amounts per m3",
       "cases": []}
for c in CASES:
    x, T = c["x"], c["T"]
    rho_f = density_at(x, c["P"], T)
    n = {k: v * rho_f for k, v in x.items()}
    cum = {"CH4": n["CH4"]}
    readings = [state(dict(cum), sum(cum.values()), T)]
    ar1 = stop_amount(cum, "Ar", c["stop_Pa"], T, n["Ar"])
    cum["Ar"] = ar1
    readings.append(state(dict(cum), sum(cum.values()), T))
    cum["O2"] = n["O2"]
    readings.append(state(dict(cum), sum(cum.values()), T))
    cum["Ar"] = n["Ar"]
    readings.append(state(dict(cum), sum(cum.values()), T))
    out["cases"].append({"id": c["id"], "composition": x, "temperature_K": T, "final_pressure_Pa": c["P"],
                         "stop_Pa": c["stop_Pa"], "final_density_mol_per_m3": rho_f,
                         "first_ar_share": ar1 / n["Ar"], "readings_Pa": readings})
with open("tests/fixtures/reference/split-charges-coolprop.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("ok", len(out["cases"]))
