"""Generate tests/fixtures/reference/csv-charges-coolprop.json: cumulative fill readings
of fills in which a source is charged more than once (split diluent) or is a premixed
cylinder (synthetic air), computed with the CoolProp HEOS multi-fluid mixture model, as an
outside reference for the re-check of CSV rows that repeat a source or name a premix.

Each case lists its charges in fill order: the source's composition and the share z of the
final amount it delivers (sum 1). The final density follows from the final composition at
P and T; the reading after charge k is the pressure of the gas delivered so far at the
density it has in the tank (rigid tank, constant T; the volume cancels).

Run from the repository root:  /work/.venv-ref/bin/python scripts/reference/gen_csv_charges.py
"""
import json
import CoolProp
from coolprop_mix import density as density_at, pressure as state

TORR = 101325.0 / 760.0
AIR = {"O2": 0.21, "N2": 0.79}

CASES = [
    # CH4 / O2 in 98 % Ar, the Ar split in two charges around the O2 fill (about 400 Torr first)
    {"id": "ch4-o2-ar-split-1500torr", "T": 298.15, "P": 1500 * TORR,
     "charges": [("cyl-CH4", {"CH4": 1.0}, 0.02 / 3),
                 ("cyl-Ar", {"Ar": 1.0}, 0.26),
                 ("cyl-O2", {"O2": 1.0}, 0.04 / 3),
                 ("cyl-Ar", {"Ar": 1.0}, 0.98 - 0.26)]},
    # CH4 / C2H6 0.9 / 0.1 in synthetic air at phi 0.8: the air is one premix charge
    {"id": "ng-air-premix-500torr", "T": 296.65, "P": 500 * TORR,
     "charges": [("cyl-C2H6", {"C2H6": 1.0}, 0.00724763),
                 ("cyl-CH4", {"CH4": 1.0}, 0.0652286),
                 ("cyl-air", AIR, 1 - 0.00724763 - 0.0652286)]},
]

out = {"generator": "scripts/reference/gen_csv_charges.py",
       "library": f"CoolProp {CoolProp.__version__} HEOS mixture model",
       "note": "cumulative absolute readings after each charge into an evacuated rigid tank at constant T; "
               "a source may be charged more than once; amounts per m3",
       "cases": []}
for c in CASES:
    final = {}
    for _, w, z in c["charges"]:
        for k, v in w.items():
            final[k] = final.get(k, 0.0) + z * v
    rho_f = density_at(final, c["P"], c["T"])
    cum = {}
    done = 0.0
    readings = []
    for source, w, z in c["charges"]:
        for k, v in w.items():
            cum[k] = cum.get(k, 0.0) + z * v
        done += z
        rho = rho_f * done
        readings.append({"source": source, "composition": w, "pressure_Pa": state(dict(cum), rho, c["T"]),
                         "temperature_K": c["T"], "density_mol_per_m3": rho})
    out["cases"].append({"id": c["id"], "composition": final, "temperature_K": c["T"],
                         "final_pressure_Pa": c["P"], "final_density_mol_per_m3": rho_f, "readings": readings})
with open("tests/fixtures/reference/csv-charges-coolprop.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("ok", len(out["cases"]))
