"""Generate src/core/data/virial-reference.json: pure-fluid second and third
virial coefficients B(T), C(T) evaluated from the reference equations of state
in CoolProp (HEOS backend), on a temperature grid.

Run:  python3 -m venv .venv-ref && .venv-ref/bin/pip install coolprop
      .venv-ref/bin/python scripts/reference/gen_virial.py
"""
import json
import CoolProp
import CoolProp.CoolProp as CP

from coolprop_mix import FLUIDS, T_GRID

out = {
    "generator": "scripts/reference/gen_virial.py",
    "library": f"CoolProp {CoolProp.__version__} (HEOS backend, reference equations of state)",
    "units": {"temperature": "K", "B": "cm3/mol", "C": "cm6/mol2"},
    "temperatures_K": T_GRID,
    "species": {},
}
for key, fluid in FLUIDS.items():
    st = CP.AbstractState("HEOS", fluid)
    bs, cs = [], []
    for t in T_GRID:
        st.update(CP.DmolarT_INPUTS, 1e-6, t)
        bs.append(round(st.Bvirial() * 1e6, 4))   # m3/mol -> cm3/mol
        cs.append(round(st.Cvirial() * 1e12, 2))  # m6/mol2 -> cm6/mol2
    out["species"][key] = {"fluid": fluid, "B": bs, "C": cs}

with open("src/core/data/virial-reference.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote", len(out["species"]), "species")
