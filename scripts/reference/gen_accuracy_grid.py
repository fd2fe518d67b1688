"""Generate tests/fixtures/reference/accuracy-grid-coolprop.json: cumulative fill readings
from the CoolProp HEOS mixture model over a grid of designs, temperatures and final
pressures, for the accuracy record (scripts/accuracy.ts).

Run:  .venv-ref/bin/python scripts/reference/gen_accuracy_grid.py
"""
import json
import CoolProp
import CoolProp.CoolProp as CP
from coolprop_mix import FLUIDS, density as density_at, pressure as state, zero_density

BAR = 1e5
DESIGNS = [
    # (id, composition, fill order, bath kind)
    ("ch4-o2-ar98", {"CH4": 0.02 / 3, "O2": 0.04 / 3, "Ar": 0.98}, ["CH4", "Ar", "O2"], "Ar"),
    ("ch4-o2-ar85", {"CH4": 0.05, "O2": 0.10, "Ar": 0.85}, ["CH4", "Ar", "O2"], "Ar"),
    ("ng-air", {"CH4": 0.0652286, "C2H6": 0.0072476, "O2": 0.1947798, "N2": 0.7327440}, ["C2H6", "CH4", "O2", "N2"], "N2"),
    ("h2-o2-n2", {"H2": 0.04, "O2": 0.02, "N2": 0.94}, ["H2", "O2", "N2"], "N2"),
    ("ch4-o2-he-ar", {"CH4": 0.01, "O2": 0.02, "He": 0.30, "Ar": 0.67}, ["CH4", "He", "Ar", "O2"], "He"),
    ("ch4-o2-he", {"CH4": 0.01, "O2": 0.02, "He": 0.97}, ["CH4", "He", "O2"], "He"),
    ("ch4-o2-he90-ar", {"CH4": 0.01, "O2": 0.02, "He": 0.90, "Ar": 0.07}, ["CH4", "Ar", "He", "O2"], "He"),
    ("co2-rich", {"CH4": 0.02, "O2": 0.04, "CO2": 0.50, "Ar": 0.44}, ["CH4", "CO2", "Ar", "O2"], "CO2"),
    ("nc7-o2-n2", {"n-C7H16": 0.002, "O2": 0.022, "N2": 0.976}, ["n-C7H16", "N2", "O2"], "heavy"),
    # CO2 and size-asymmetric pairs (cross B from composition averages or the fitted rule)
    ("c2h6-o2-co2", {"C2H6": 0.5 / 9.75, "O2": 0.5 * 8.75 / 9.75, "CO2": 0.5}, ["C2H6", "CO2", "O2"], "CO2"),
    ("c3h8-o2-co2", {"C3H8": 0.02, "O2": 0.20, "CO2": 0.78}, ["C3H8", "CO2", "O2"], "CO2"),
    ("c3h8-o2-n2", {"C3H8": 0.02, "O2": 0.20, "N2": 0.78}, ["C3H8", "N2", "O2"], "heavy"),
    ("nc4-o2-n2", {"n-C4H10": 0.01, "O2": 0.10, "N2": 0.89}, ["n-C4H10", "N2", "O2"], "heavy"),
    ("nc7-o2-co2", {"n-C7H16": 0.002, "O2": 0.022, "CO2": 0.976}, ["n-C7H16", "CO2", "O2"], "heavy"),
    # a He bath whose pairs the library gives as (near) virial expansions: He-N2 (fitted, implied B_12 spread
    # about 1 cm3/mol), H2-N2 (fitted, quadratic), H2-He (default parameters, spread 0.2 cm3/mol); with O2, CH4 or
    # Ar the He pairs spread by 6-12 cm3/mol, so He baths are judged on this design (a fuel premix without oxidizer)
    ("h2-he-n2", {"H2": 0.04, "He": 0.48, "N2": 0.48}, ["H2", "He", "N2"], "He"),
    # CO2 as diluent of a fuel-air mixture: N2-CO2 and O2-CO2 (both fitted in the library, not quadratic)
    ("ch4-air-co2", {"CH4": 0.03, "O2": 0.14, "N2": 0.53, "CO2": 0.30}, ["CH4", "CO2", "O2", "N2"], "CO2"),
]
TEMPS = [250.0, 300.0, 350.0]
PRESSURES = [1 * BAR, 3 * BAR, 10 * BAR]

def psat(fluid, T):
    try:
        return CP.PropsSI("P", "T", T, "Q", 0, fluid)
    except Exception:
        return float("inf")


def diagnosis(y, rho, p, T):
    """what the reading is made of in the library: its zero-density B_mix and C_mix at the composition, the
    rest of Z beyond them at the reading's density, and for each pair the B_ab implied by the binary model at
    the pair's own share (x_a / (x_a + x_b)); used by scripts/accuracy-lib.ts to split a target's error"""
    b, c = zero_density(y, T)
    z = p / (rho * 8.314462618 * T)
    pairs = {}
    keys = list(y)
    for i, a in enumerate(keys):
        for bk in keys[i + 1:]:
            xa = y[a] / (y[a] + y[bk])
            bm, _ = zero_density({a: xa, bk: 1 - xa}, T)
            ba, _ = zero_density({a: 1.0}, T)
            bb, _ = zero_density({bk: 1.0}, T)
            pairs[f"{a}|{bk}"] = round((bm - xa * xa * ba - (1 - xa) ** 2 * bb) / (2 * xa * (1 - xa)), 4)
    return {"B_mix_cm3_per_mol": round(b, 4), "C_mix_cm6_per_mol2": round(c, 2),
            "Z_beyond_C": float(f"{z - 1 - b * 1e-6 * rho - c * 1e-12 * rho * rho:.4g}"), "pair_B_cm3_per_mol": pairs}


cases = []
for did, x, order, bath in DESIGNS:
    for T in TEMPS:
        for P in PRESSURES:
            # skip states where a vapour would be above half its saturation pressure
            if any(k in ("n-C7H16", "n-C4H10", "CO2", "C2H6", "C3H8", "C2H4") and x[k] * P > 0.5 * psat(FLUIDS[k], T) for k in x):
                continue
            rho_f = density_at(x, P, T)
            # skip states the planner refuses: its truncated virial model is trusted within 5 % of ideal gas
            if P / (rho_f * 8.314462618 * T) < 0.95:
                continue
            cum, readings = {}, []
            for sp in order:
                cum[sp] = x[sp]
                rho = rho_f * sum(cum.values())
                p = state(dict(cum), rho, T)
                readings.append({"species": sp, "pressure_Pa": p, **diagnosis(dict(cum), rho, p, T)})
            cases.append({"id": f"{did}-{int(T)}K-{int(P / BAR)}bar", "design": did, "bath": bath, "composition": x,
                          "order": order, "temperature_K": T, "final_pressure_Pa": P, "final_density_mol_per_m3": rho_f,
                          "readings": readings})
out = {"generator": "scripts/reference/gen_accuracy_grid.py", "library": f"CoolProp {CoolProp.__version__} HEOS mixture model", "cases": cases}
with open("tests/fixtures/reference/accuracy-grid-coolprop.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("cases", len(cases))
