"""Generate tests/fixtures/reference/flame-cantera.json: complete-combustion
(frozen product composition) adiabatic flame temperatures at constant pressure and
closed-vessel (constant volume) end states, and equilibrium values for comparison,
computed with Cantera and its NASA-polynomial species data (nasa_gas.yaml).

Run:  .venv-ref/bin/python scripts/reference/gen_flame.py
"""
import json
import cantera as ct

ALL = {s.name: s for s in ct.Species.list_from_file("nasa_gas.yaml")}
NAMES = ["CH4", "H2", "O2", "N2", "Ar", "CO2", "H2O", "CO", "H", "O", "OH", "HO2", "H2O2", "NO"]
gas = ct.Solution(thermo="ideal-gas", species=[ALL[n] for n in NAMES])
T0, P0 = 298.15, ct.one_atm

def case(name, reactants, products):
    gas.TPX = T0, P0, reactants
    h0, u0, v0 = gas.enthalpy_mass, gas.int_energy_mass, gas.volume_mass
    n_r = 1.0 / gas.mean_molecular_weight
    gas.TPX = 1500.0, P0, products
    gas.HP = h0, P0                 # frozen composition: only T changes
    t_hp = gas.T
    gas.TPX = 1500.0, P0, products
    gas.UV = u0, v0                 # frozen composition, constant volume
    t_uv, p_uv = gas.T, gas.P
    gas.TPX = T0, P0, reactants
    gas.equilibrate("HP")
    t_eq = gas.T
    gas.TPX = T0, P0, reactants
    gas.equilibrate("UV")
    p_eq = gas.P
    return {"name": name, "reactants": reactants, "products": products, "T0_K": T0,
            "flame_K_complete": t_hp, "closed_vessel_K_complete": t_uv, "closed_vessel_pressure_ratio_complete": p_uv / P0,
            "flame_K_equilibrium": t_eq, "closed_vessel_pressure_ratio_equilibrium": p_eq / P0}

x = 1.0 / (1 + 2 / 0.21)
air = lambda f: {"O2": 0.21 * (1 - f), "N2": 0.79 * (1 - f)}
cases = [
    case("stoichiometric CH4-air", {"CH4": x, **air(x)}, {"CO2": x, "H2O": 2 * x, "N2": 0.79 * (1 - x)}),
]
xh = 1.0 / (1 + 0.5 / 0.21)
cases.append(case("stoichiometric H2-air", {"H2": xh, **air(xh)}, {"H2O": xh, "N2": 0.79 * (1 - xh)}))
cases.append(case("CH4/O2/Ar 0.05/0.10/0.85", {"CH4": 0.05, "O2": 0.10, "Ar": 0.85}, {"CO2": 0.05, "H2O": 0.10, "Ar": 0.85}))
out = {"generator": "scripts/reference/gen_flame.py", "library": f"Cantera {ct.__version__} (nasa_gas.yaml)", "cases": cases}
with open("tests/fixtures/reference/flame-cantera.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
for c in cases:
    print(c["name"], round(c["flame_K_complete"], 2), round(c["closed_vessel_pressure_ratio_complete"], 4), round(c["flame_K_equilibrium"], 1), round(c["closed_vessel_pressure_ratio_equilibrium"], 3))
