"""Generate src/core/data/cross-virial-reference.json: cross second and third virial
coefficients B_ab(T), C_aab(T), C_abb(T) from the multi-fluid mixture models in CoolProp
(HEOS backend), for the pairs whose binary model is fitted to mixture data and behaves
like a virial expansion at zero density.

Why the test: statistical mechanics makes the zero-density B of a mixture exactly
quadratic in the mole fractions, B_mix = sum_i sum_j x_i x_j B_ij, and C exactly cubic
(Mason & Spurling, The Virial Equation of State, 1969 - from memory). A multi-fluid
Helmholtz model need not obey this: its reducing functions and departure terms are
fitted to dense-fluid data. So for each pair the script evaluates B_mix(x) and C_mix(x)
at several compositions and keeps the pair only when one composition-independent B_ab
(and, separately, one pair C_aab, C_abb) reproduces the model at every composition and
temperature within the tolerances below. Pairs with the library's default (all-unity,
unfitted) binary parameters are left out: for them the model is itself only a
combining rule, and mixwright's own rules are better founded.

Run:  python3 -m venv .venv-ref && .venv-ref/bin/pip install coolprop
      .venv-ref/bin/python scripts/reference/gen_cross_virial.py
"""
import itertools
import json

import CoolProp
import CoolProp.CoolProp as CP
import numpy as np

from coolprop_mix import FLUIDS, T_GRID

X_GRID = [0.05, 0.25, 0.5, 0.75, 0.95]
# acceptance: spread of the implied B_ab over compositions, and residual of the cubic C fit
B_SPREAD_ABS = 3.0  # cm3/mol
B_SPREAD_REL = 0.02
C_RESID_ABS = 50.0  # cm6/mol2
C_RESID_REL = 0.03
# the averaged pairs' C is kept only without a quantum gas: with He it made the He rows of the accuracy record
# worse (He-Ar, He-CH4: B spreads of 20 cm3/mol and more, so the library's C there is no better founded)
QUANTUM = {"He", "H2", "Ne"}
POLAR = {"H2O", "NH3", "CH3OH", "C2H5OH", "CH3OCH3"}  # C of polar species is not used by the model

CAS = {k: CP.get_fluid_param_string(v, "CAS") for k, v in FLUIDS.items()}
PAIRS = set(CP.get_global_param_string("mixture_binary_pairs_list").split(","))


def pair_param(p, q, key):
    try:
        return CP.get_mixture_binary_pair_data(CAS[p], CAS[q], key)
    except Exception:
        return None


def zero_density(fluids, x, T):
    st = CP.AbstractState("HEOS", "&".join(fluids))
    st.set_mole_fractions(x)
    st.specify_phase(CP.iphase_gas)
    st.update(CP.DmolarT_INPUTS, 1e-6, T)
    return st.Bvirial() * 1e6, st.Cvirial() * 1e12  # cm3/mol, cm6/mol2


def minimax_floor(values, weights):
    """smallest max_x w_x |v_x - c| over constants c: how close any composition-independent
    B_ab can come to the model's B_mix, cm3/mol"""
    best = float("inf")
    for i in range(len(values)):
        for j in range(len(values)):
            c = (weights[i] * values[i] + weights[j] * values[j]) / (weights[i] + weights[j])
            best = min(best, max(w * abs(v - c) for v, w in zip(values, weights)))
    return best


R = 8.314462618
P_FLOOR = 10e5  # Pa: the accuracy record's highest pressure


def analyse(a, b):
    fa, fb = FLUIDS[a], FLUIDS[b]
    Bs, Caab, Cabb, Bavg, Bu, Bmin, Bmax = [], [], [], [], [], [], []
    worst_b, worst_c, floor_z = 0.0, 0.0, 0.0
    b_ok, c_ok = True, a not in POLAR and b not in POLAR
    for T in T_GRID:
        ba, ca = zero_density([fa], [1.0], T)
        bb, cb = zero_density([fb], [1.0], T)
        mix = [zero_density([fa, fb], [x, 1 - x], T) for x in X_GRID]
        implied = [(m[0] - x * x * ba - (1 - x) ** 2 * bb) / (2 * x * (1 - x)) for x, m in zip(X_GRID, mix)]
        # least squares on B_mix itself: weights 2x(1-x)
        w = np.array([2 * x * (1 - x) for x in X_GRID])
        bab = float(np.dot(w * w, implied) / np.dot(w, w))
        spread = max(implied) - min(implied)
        # where no composition-independent B_ab reproduces the model: the same least-squares fit of B_mix over
        # composition (the constant B_ab that leaves the least error in B_mix, weights (2x(1-x))^2 on the implied
        # values), and a standard uncertainty covering their spread: half the range, or the standard deviation
        # if larger. (An unweighted mean gives the ends, where the implied values are divided by a small
        # 2x(1-x), the same say as the middle: CO2-Ar at 250 K -66.1 against the fit's -64.6 cm3/mol.)
        Bavg.append(round(bab, 4))
        Bu.append(round(max(spread / 2, float(np.std(implied, ddof=1))), 4))
        Bmin.append(round(min(implied), 4))
        Bmax.append(round(max(implied), 4))
        worst_b = max(worst_b, spread)
        if 250.0 <= T <= 350.0:
            # the least error in Z at 10 bar that any composition-independent B_ab leaves
            floor_b = minimax_floor(implied, [2 * x * (1 - x) for x in X_GRID])
            floor_z = max(floor_z, floor_b * 1e-6 * P_FLOOR / (R * T))
        if spread > max(B_SPREAD_ABS, B_SPREAD_REL * abs(bab)):
            b_ok = False
        Bs.append(round(bab, 4))
        # C_mix = x^3 C_a + 3x^2(1-x) C_aab + 3x(1-x)^2 C_abb + (1-x)^3 C_b
        A = np.array([[3 * x * x * (1 - x), 3 * x * (1 - x) ** 2] for x in X_GRID])
        rhs = np.array([m[1] - x ** 3 * ca - (1 - x) ** 3 * cb for x, m in zip(X_GRID, mix)])
        sol, *_ = np.linalg.lstsq(A, rhs, rcond=None)
        resid = np.abs(A @ sol - rhs)
        scale = np.array([abs(m[1]) for m in mix])
        worst_c = max(worst_c, float(resid.max()))
        if np.any(resid > np.maximum(C_RESID_ABS, C_RESID_REL * scale)):
            c_ok = False
        Caab.append(round(float(sol[0]), 2))
        Cabb.append(round(float(sol[1]), 2))
    return b_ok, c_ok, Bs, Caab, Cabb, worst_b, worst_c, floor_z, Bavg, Bu, (Bmin, Bmax)


out = {
    "generator": "scripts/reference/gen_cross_virial.py",
    "library": f"CoolProp {CoolProp.__version__} (HEOS backend, multi-fluid mixture models)",
    "units": {"temperature": "K", "B": "cm3/mol", "C": "cm6/mol2"},
    "temperatures_K": T_GRID,
    "compositions": X_GRID,
    "acceptance": {
        "B_spread": f"max - min of the implied B_ab over the compositions <= max({B_SPREAD_ABS} cm3/mol, {B_SPREAD_REL} |B_ab|) at every temperature",
        "B_average": "pairs fitted to mixture data whose implied B_ab is not composition-independent: B_ab = least-squares fit of B_mix over the compositions (weights (2x(1-x))^2 on the implied values) at each temperature, u(B_ab) = max(half their range, their standard deviation); B_min, B_max: the range of the implied values (mixwright uses the fitted rule instead only where the rule lies within 2 of its own u of that range)",
        "unfitted": "pairs with the library's default binary parameters are not used; their B (least-squares fit as for B_average) and B_u (its spread) are recorded only to show how far the library's B_mix of such a pair is from a virial expansion",
        "C_residual": f"residual of the cubic fit <= max({C_RESID_ABS} cm6/mol2, {C_RESID_REL} |C_mix|) at every composition and temperature; polar species excluded",
    },
    "pairs": {},
    "averaged": {},
    "left_out": {},
}
for a, b in itertools.combinations(FLUIDS, 2):
    if CAS[a] + "&" + CAS[b] in PAIRS:
        p, q = a, b
    elif CAS[b] + "&" + CAS[a] in PAIRS:
        p, q = b, a
    else:
        continue
    model = pair_param(p, q, "BibTeX") or "unknown"
    params = [pair_param(p, q, k) for k in ("betaT", "gammaT", "betaV", "gammaV")]
    fparam = pair_param(p, q, "F")
    key = f"{a}|{b}"
    b_ok, c_ok, Bs, Caab, Cabb, worst_b, worst_c, floor_z, Bavg, Bu, (Bmin, Bmax) = analyse(a, b)
    if all(v is not None and float(v) == 1.0 for v in params) and (fparam is None or float(fparam) == 0.0):
        # not used by mixwright (the library's own default rule, not data); its spread over composition is recorded
        # so that the accuracy record can say where a reference reading rests on a pair that is no virial expansion
        out["left_out"][key] = {"model": model, "kind": "unfitted", "reason": "default (unfitted) binary parameters",
                                "B_spread_max": round(worst_b, 2), "least_Z_error_10bar": float(f"{floor_z:.3g}"),
                                "B": Bavg, "B_u": Bu}
        continue
    if not b_ok:
        # fitted to mixture data, but B_mix not quadratic: the composition average with its spread as
        # uncertainty; mixwright uses it at a temperature only where that uncertainty is below the rule's
        out["averaged"][key] = {"a": a, "b": b, "model": model, "method": "composition-average",
                                "reason": f"zero-density B not quadratic in composition: implied B_ab spreads up to {worst_b:.1f} cm3/mol",
                                "least_Z_error_10bar": float(f"{floor_z:.3g}"), "B_spread_max": round(worst_b, 2), "B": Bavg, "B_u": Bu,
                                "B_min": Bmin, "B_max": Bmax}
        if c_ok and not ({a, b} & QUANTUM):
            # its C_mix is nevertheless cubic in composition within the acceptance: the pair C are tabulated
            out["averaged"][key].update({"C_residual_max": round(worst_c, 1), "C_aab": Caab, "C_abb": Cabb})
        continue
    entry = {"a": a, "b": b, "model": model, "method": "quadratic", "B_spread_max": round(worst_b, 2), "B": Bs}
    if c_ok:
        entry.update({"C_residual_max": round(worst_c, 1), "C_aab": Caab, "C_abb": Cabb})
    out["pairs"][key] = entry

with open("src/core/data/cross-virial-reference.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("pairs kept", len(out["pairs"]), "with C", sum(1 for e in out["pairs"].values() if "C_aab" in e), "averaged", len(out["averaged"]), "left out", len(out["left_out"]))

# check points for tests/core/virial-cross.test.ts: off-grid temperatures and compositions
CHECK_T = [255.0, 298.15, 345.0]
CHECK_X = [0.1, 0.3, 0.7, 0.9]
checks = []
for key, e in list(out["pairs"].items()) + list(out["averaged"].items()):
    a, b = e["a"], e["b"]
    for T in CHECK_T:
        for x in CHECK_X:
            Bm, Cm = zero_density([FLUIDS[a], FLUIDS[b]], [x, 1 - x], T)
            checks.append({"a": a, "b": b, "x_a": x, "temperature_K": T, "B_mix": round(Bm, 4), "C_mix": round(Cm, 2)})
with open("tests/fixtures/reference/cross-virial-check.json", "w") as f:
    json.dump({"generator": "scripts/reference/gen_cross_virial.py", "library": out["library"], "units": out["units"], "points": checks}, f, indent=1)
    f.write("\n")
print("check points", len(checks))

# the combining rule's calibration on the table just written (the rule lives in the TypeScript core)
import subprocess  # noqa: E402
subprocess.run(["npx", "tsx", "scripts/cross-rule.ts"], check=False)
