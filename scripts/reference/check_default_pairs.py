"""How good is the reference library's default (unfitted) binary model as a cross second virial coefficient?

The library has no fitted model for O2 with C2H6, C3H8 or the heavier alkanes: for those pairs its B_mix comes
from default parameters (betaT = gammaT = betaV = gammaV = 1, no departure function), itself a combining rule.
This script takes pairs the library does fit (N2 and CO with C2H6 and C3H8, and O2 with CH4 and CO2), sets the
same default parameters, and prints the composition-averaged implied B_12 (the least-squares fit of B_mix over
composition, as gen_cross_virial.py) with and without the fit, and the spread of the implied values. It also
prints the spread of the unfitted O2 pairs themselves. Used for the accuracy section of README.md; nothing is
written.

Run:  /work/.venv-ref/bin/python scripts/reference/check_default_pairs.py
"""
import CoolProp.CoolProp as CP
import numpy as np

from coolprop_mix import FLUIDS

X = [0.05, 0.25, 0.5, 0.75, 0.95]
DEFAULTS = (("betaT", 1.0), ("gammaT", 1.0), ("betaV", 1.0), ("gammaV", 1.0), ("Fij", 0.0))


def b_zero(fluids, x, T, default):
    st = CP.AbstractState("HEOS", "&".join(fluids))
    if default:
        for k, v in DEFAULTS:
            st.set_binary_interaction_double(0, 1, k, v)
    st.set_mole_fractions(x)
    st.specify_phase(CP.iphase_gas)
    st.update(CP.DmolarT_INPUTS, 1e-6, T)
    return st.Bvirial() * 1e6


def implied(a, b, T, default=False):
    fa, fb = FLUIDS[a], FLUIDS[b]
    ba, bb = b_zero([fa], [1.0], T, False), b_zero([fb], [1.0], T, False)
    vals = [(b_zero([fa, fb], [x, 1 - x], T, default) - x * x * ba - (1 - x) ** 2 * bb) / (2 * x * (1 - x)) for x in X]
    w = np.array([2 * x * (1 - x) for x in X])
    return float(np.dot(w * w, vals) / np.dot(w, w)), min(vals), max(vals)


print("fitted pairs: library fit vs the same pair with default parameters (cm3/mol; [range over x_a 0.05-0.95])")
for a, b in [("N2", "C2H6"), ("N2", "C3H8"), ("CO", "C2H6"), ("CO", "C3H8"), ("O2", "CH4"), ("O2", "CO2")]:
    for T in (250.0, 300.0, 350.0):
        f, d = implied(a, b, T), implied(a, b, T, True)
        print(f"  {a}-{b} {T:.0f} K: fitted {f[0]:8.1f} [{f[1]:.1f}, {f[2]:.1f}]   default {d[0]:8.1f} [{d[1]:.1f}, {d[2]:.1f}]")
print("unfitted pairs (the library's default is all it has): implied B_12 over x_a = " + str(X))
for a, b in [("O2", "C2H6"), ("O2", "C3H8"), ("O2", "n-C4H10")]:
    for T in (250.0, 300.0, 350.0):
        fa, fb = FLUIDS[a], FLUIDS[b]
        ba, bb = b_zero([fa], [1.0], T, False), b_zero([fb], [1.0], T, False)
        vals = [(b_zero([fa, fb], [x, 1 - x], T, False) - x * x * ba - (1 - x) ** 2 * bb) / (2 * x * (1 - x)) for x in X]
        print(f"  {a}-{b} {T:.0f} K: " + ", ".join(f"{v:.1f}" for v in vals))
