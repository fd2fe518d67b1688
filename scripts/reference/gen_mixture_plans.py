"""Generate tests/fixtures/reference/mixture-plans-coolprop.json: cumulative fill
readings computed with the CoolProp HEOS multi-fluid mixture model (GERG-2008-type
departure functions) for a few fill designs, as an outside reference for the
planner's real-gas targets and for the re-check of logged readings.

Run:  .venv-ref/bin/python scripts/reference/gen_mixture_plans.py
"""
import json
import CoolProp
import CoolProp.CoolProp as CP
from coolprop_mix import FLUIDS, density as density_at, pressure as state

TORR = 101325.0 / 760.0

CASES = [
    {"id": "ch4-o2-ar-1000torr", "x": {"CH4": 0.05, "O2": 0.10, "Ar": 0.85}, "order": ["CH4", "O2", "Ar"], "T": 298.15, "P": 1000 * TORR},
    {"id": "h2-o2-ar-1500torr", "x": {"H2": 0.04, "O2": 0.02, "Ar": 0.94}, "order": ["H2", "O2", "Ar"], "T": 295.15, "P": 1500 * TORR},
    {"id": "ch4-air-3bar", "x": {"CH4": 0.0950226, "O2": 0.1900452, "N2": 0.7149322}, "order": ["CH4", "O2", "N2"], "T": 296.15, "P": 3.0e5},
    {"id": "c3h8-o2-n2-2bar", "x": {"C3H8": 0.02, "O2": 0.10, "N2": 0.88}, "order": ["C3H8", "O2", "N2"], "T": 298.15, "P": 2.0e5},
    {"id": "ch4-o2-co2-ar-5bar", "x": {"CH4": 0.03, "O2": 0.06, "CO2": 0.20, "Ar": 0.71}, "order": ["CH4", "O2", "CO2", "Ar"], "T": 300.0, "P": 5.0e5},
    {"id": "c2h6-o2-he-ar-4bar", "x": {"C2H6": 0.01, "O2": 0.035, "He": 0.20, "Ar": 0.755}, "order": ["C2H6", "O2", "He", "Ar"], "T": 298.15, "P": 4.0e5},
    # re-check cases: CO2-rich and heavy fuels at several bar, and a temperature drift between readings
    {"id": "nc7h16-o2-n2-3bar", "x": {"n-C7H16": 0.008, "O2": 0.088, "N2": 0.904}, "order": ["n-C7H16", "N2", "O2"], "T": 300.0, "P": 3.0e5},
    {"id": "c3h8-o2-ar-5bar", "x": {"C3H8": 0.04, "O2": 0.20, "Ar": 0.76}, "order": ["C3H8", "Ar", "O2"], "T": 298.15, "P": 5.0e5},
    {"id": "co2-ch4-o2-ar-6bar", "x": {"CH4": 0.02, "O2": 0.04, "CO2": 0.30, "Ar": 0.64}, "order": ["CH4", "CO2", "Ar", "O2"], "T": 300.0, "P": 6.0e5},
    {"id": "ch4-o2-ar-drift", "x": {"CH4": 0.05, "O2": 0.10, "Ar": 0.85}, "order": ["CH4", "Ar", "O2"], "T": [297.0, 297.6, 298.4], "P": 1000 * TORR},
]

out = {"generator": "scripts/reference/gen_mixture_plans.py",
       "library": f"CoolProp {CoolProp.__version__} HEOS mixture model",
       "note": "cumulative absolute readings after each fill of pure gases into an evacuated rigid tank at constant T; V cancels (amounts per m3)",
       "cases": []}
for c in CASES:
    temps = c["T"] if isinstance(c["T"], list) else [c["T"]] * len(c["order"])
    rho_f = density_at(c["x"], c["P"], temps[-1])
    cum = {}
    readings = []
    for sp, t in zip(c["order"], temps):
        cum[sp] = c["x"][sp]
        frac = sum(cum.values())
        rho = rho_f * frac
        readings.append({"species": sp, "pressure_Pa": state(dict(cum), rho, t), "temperature_K": t, "density_mol_per_m3": rho})
    out["cases"].append({"id": c["id"], "composition": c["x"], "order": c["order"], "temperature_K": temps[-1],
                         "final_pressure_Pa": c["P"], "final_density_mol_per_m3": rho_f, "readings": readings})
with open("tests/fixtures/reference/mixture-plans-coolprop.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("ok", len(out["cases"]))
