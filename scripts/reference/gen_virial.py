"""Generate src/core/data/virial-reference.json: pure-fluid second and third
virial coefficients B(T), C(T) evaluated from the reference equations of state
in CoolProp (HEOS backend), on a temperature grid.

Run:  python3 -m venv .venv-ref && .venv-ref/bin/pip install coolprop
      .venv-ref/bin/python scripts/reference/gen_virial.py
"""
import json
import CoolProp
import CoolProp.CoolProp as CP

# species key -> CoolProp fluid name
FLUIDS = {
    "H2": "Hydrogen", "He": "Helium", "Ne": "Neon", "Ar": "Argon", "Kr": "Krypton",
    "Xe": "Xenon", "N2": "Nitrogen", "O2": "Oxygen", "CO": "CarbonMonoxide",
    "CO2": "CarbonDioxide", "H2O": "Water", "NH3": "Ammonia", "N2O": "NitrousOxide",
    "CH4": "Methane", "C2H6": "Ethane", "C2H4": "Ethylene", "C3H8": "Propane",
    "C3H6": "Propylene", "n-C4H10": "n-Butane", "i-C4H10": "IsoButane",
    "n-C5H12": "n-Pentane", "n-C7H16": "n-Heptane", "C7H8": "Toluene",
    "CH3OH": "Methanol", "C2H5OH": "Ethanol", "CH3OCH3": "DimethylEther",
    "SF6": "SulfurHexafluoride",
}
T_GRID = [230.0 + 10.0 * i for i in range(26)]  # 230 .. 480 K

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
