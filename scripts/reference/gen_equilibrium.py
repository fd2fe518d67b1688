"""Generate tests/fixtures/reference/equilibrium-cantera.json: constant-volume adiabatic
(UV) equilibrium end states and Chapman-Jouguet detonation states of tank mixtures,
computed with Cantera from exactly the NASA 7-coefficient data mixwright uses, with
the 1 bar standard state of NASA TM-4513 (Cantera's own nasa_gas.yaml leaves NASA7 at
its 1 atm default, which moves the dissociation equilibria by about 0.05 % in pressure),
(src/core/data/nasa7-thermo.json and nasa7-products.json): every C/H/O/N species of
both files plus the noble gases, and graphite C(gr) as a separate condensed phase.

UV: Cantera's gas-phase equilibrate('UV'). Where graphite is then stable (its chemical
potential below the carbon element potential of the gas), the gas + graphite
equilibrium is found with Cantera's gas-phase TV equilibrium inside two outer iterations:
the amount of graphite that brings the gas's carbon potential to graphite's, and the
temperature that gives the initial internal energy. (Cantera's multiphase solvers did
not converge on these states.) Where equilibrate('UV') fails, the same TV solve inside a
temperature iteration.

CJ: the minimum-velocity condition on the equilibrium Hugoniot (e.g. W. Fickett &
W.C. Davis, Detonation, 1979, ch. 2; Browne, Ziegler & Shepherd 2008): for a density ratio r = rho2/rho1 the
equilibrium state (T2, rho2) with h2 - h1 = (P2 - P1)(v1 + v2)/2 is found (Cantera
equilibrate('TV') at each trial T2), the wave speed is w1^2 = (P2 - P1)/(rho1^2 (v1 - v2)),
and the CJ state is the r that minimises w1 (Brent). Gas-phase only.

Run:  /work/.venv-ref/bin/python scripts/reference/gen_equilibrium.py
"""
import json
import math
import cantera as ct
import numpy as np

ROOT = "src/core/data/"
GAS_ELEMENTS = {"C", "H", "O", "N", "Ar", "He", "Ne", "Kr", "Xe"}
T0 = 298.15


def load(name):
    with open(ROOT + name) as f:
        return json.load(f)["species"]


def nasa_yaml(key, rec):
    r = rec["temperatureRanges"]
    c = rec["coefficients"]
    if len(r) == 2:
        mid = 1000.0 if r[0] < 1000.0 < r[1] else (r[0] + r[1]) / 2
        ranges, data = [r[0], mid, r[1]], [c[0], c[0]]
    else:
        ranges, data = r, c
    return {"name": key, "composition": rec["composition"],
            "thermo": {"model": "NASA7", "temperature-ranges": ranges, "data": data, "reference-pressure": 1e5}}


gas_data = {**load("nasa7-thermo.json"), **load("nasa7-products.json")}
GAS = [k for k, v in gas_data.items() if v.get("phase", "gas") == "gas" and set(v["composition"]) <= GAS_ELEMENTS]
gr = gas_data["C(gr)"]
elements = sorted({e for k in GAS for e in gas_data[k]["composition"]})
doc = {
    "phases": [
        {"name": "gas", "thermo": "ideal-gas", "elements": elements, "species": GAS, "state": {"T": 300.0, "P": 101325.0}},
        {"name": "graphite", "thermo": "fixed-stoichiometry", "elements": ["C"], "species": ["C(gr)"], "state": {"T": 300.0, "P": 101325.0}},
    ],
    "species": [nasa_yaml(k, gas_data[k]) for k in GAS]
    + [{**nasa_yaml("C(gr)", gr), "equation-of-state": {"model": "constant-volume", "density": 2260.0}}],
}
text = json.dumps(doc)
gas = ct.Solution(yaml=text, name="gas")
graphite = ct.Solution(yaml=text, name="graphite")


def brentq(f, a, b, tol=1e-10, maxit=200):
    fa, fb = f(a), f(b)
    if fa * fb > 0:
        raise ValueError("not bracketed")
    c, fc = a, fa
    d = e = b - a
    for _ in range(maxit):
        if fb * fc > 0:
            c, fc = a, fa
            d = e = b - a
        if abs(fc) < abs(fb):
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        tol1 = 2e-16 * abs(b) + 0.5 * tol
        m = 0.5 * (c - b)
        if abs(m) <= tol1 or fb == 0:
            return b
        if abs(e) >= tol1 and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:
                p, q = 2 * m * s, 1 - s
            else:
                q, r = fa / fc, fb / fc
                p = s * (2 * m * q * (q - r) - (b - a) * (r - 1))
                q = (q - 1) * (r - 1) * (s - 1)
            if p > 0:
                q = -q
            p = abs(p)
            if 2 * p < min(3 * m * q - abs(tol1 * q), abs(e * q)):
                e, d = d, p / q
            else:
                d = e = m
        else:
            d = e = m
        a, fa = b, fb
        b += d if abs(d) > tol1 else math.copysign(tol1, m)
        fb = f(b)
    return b


def golden_min(f, a, b, tol=1e-9):
    g = (math.sqrt(5) - 1) / 2
    c, d = b - g * (b - a), a + g * (b - a)
    fc, fd = f(c), f(d)
    while b - a > tol:
        if fc < fd:
            b, d, fd = d, c, fc
            c = b - g * (b - a)
            fc = f(c)
        else:
            a, c, fc = c, d, fd
            d = a + g * (b - a)
            fd = f(d)
    return (a + b) / 2


def carbon_potential():
    """lambda_C / RT of the gas at equilibrium, from a_j . lambda = mu_j / RT (least squares)"""
    keep = [j for j in range(gas.n_species) if gas.X[j] > 1e-200]
    a = np.array([[gas.n_atoms(j, e) for e in range(gas.n_elements)] for j in keep])
    mu = gas.chemical_potentials[keep] / (ct.gas_constant * gas.T)
    return np.linalg.lstsq(a, mu, rcond=None)[0][gas.element_index("C")]


def graphite_stable():
    if gas.elemental_mole_fraction("C") <= 0:
        return False
    graphite.TP = gas.T, gas.P
    return carbon_potential() > graphite.chemical_potentials[0] / (ct.gas_constant * gas.T)


def uv_with_graphite(x0, p0, t_guess):
    """gas + graphite at the initial internal energy in the tank volume, per kmol of initial gas.
    For a trial T and graphite amount n_gr the gas holds the other atoms (Cantera TV
    equilibrium); n_gr is set so the gas's carbon potential equals graphite's, then T so
    the internal energy is the initial one."""
    gas.TPX = T0, p0, x0
    u0 = gas.int_energy_mole  # J/kmol
    v0 = ct.gas_constant * T0 / p0  # m3 per kmol of initial gas
    m0 = gas.mean_molecular_weight  # kg per kmol of initial gas
    b = {e: sum(x0.get(k, 0.0) * gas.n_atoms(k, e) for k in x0) for e in gas.element_names}
    mc = graphite.molecular_weights[0]
    atom = {"C": ("C", 1), "H": ("H2", 2), "O": ("O2", 2), "N": ("N2", 2)}
    state = {}

    def gas_tv(t, n_gr):
        x = {}
        for e, v in b.items():
            if v <= 0:
                continue
            sp, k = atom.get(e, (e, 1))
            x[sp] = x.get(sp, 0.0) + (v - (n_gr if e == "C" else 0.0)) / k
        gas.TDX = t, (m0 - n_gr * mc) / v0, x
        gas.equilibrate("TV", rtol=1e-13, max_steps=5000)

    def at_temperature(t):
        graphite.TP = t, p0
        g_gr = graphite.chemical_potentials[0] / (ct.gas_constant * t)

        def excess(n_gr):
            gas_tv(t, n_gr)
            return carbon_potential() - g_gr
        gas_tv(t, 0.0)
        if carbon_potential() <= g_gr:
            n_gr = 0.0
        else:
            n_gr = brentq(excess, 0.0, b["C"] * (1 - 1e-9), tol=1e-15)
        gas_tv(t, n_gr)
        u = gas.int_energy_mass * gas.density * v0 + n_gr * graphite.int_energy_mole
        state.update(T=t, P=gas.P, n_gr=n_gr)
        return u - u0

    brentq(at_temperature, max(800.0, t_guess - 1000.0), min(4900.0, t_guess + 1000.0), tol=1e-9)
    at_temperature(state["T"])
    return state


def uv(x0, p0):
    gas.TPX = T0, p0, x0
    u0, rho0 = gas.int_energy_mass, gas.density
    try:
        gas.equilibrate("UV", rtol=1e-12, max_steps=5000, max_iter=500)
    except ct.CanteraError:
        # Cantera's element-potential solver gave up; its fallback has no UV: TV inside a T iteration
        def err(t):
            gas.TDX = t, rho0, x0
            gas.equilibrate("TV", rtol=1e-13, max_steps=5000)
            return gas.int_energy_mass - u0
        err(brentq(err, 1000.0, 5900.0, tol=1e-9))
    if not graphite_stable():
        return {"T": gas.T, "P": gas.P, "graphite_mol_per_mol": 0.0, "X": {k: v for k, v in zip(gas.species_names, gas.X) if v > 1e-6}}
    s = uv_with_graphite(x0, p0, gas.T)
    return {"T": s["T"], "P": s["P"], "graphite_mol_per_mol": float(s["n_gr"]),
            "X": {k: v for k, v in zip(gas.species_names, gas.X) if v > 1e-6}}


def cj(x0, p0):
    gas.TPX = T0, p0, x0
    rho1, h1, p1 = gas.density, gas.enthalpy_mass, gas.P
    v1 = 1.0 / rho1

    def hugoniot(r):
        rho2 = r * rho1
        v2 = 1.0 / rho2

        def err(t):
            gas.TDX = t, rho2, x0
            gas.equilibrate("TV", rtol=1e-12, max_steps=5000)
            return gas.enthalpy_mass - h1 - 0.5 * (gas.P - p1) * (v1 + v2)
        t = brentq(err, 1000.0, 5900.0, tol=1e-9)
        err(t)
        w2 = (gas.P - p1) / (rho1 * rho1 * (v1 - v2))
        return w2, gas.T, gas.P

    r = golden_min(lambda rr: hugoniot(rr)[0], 1.2, 2.6, tol=1e-8)
    w2, t, p = hugoniot(r)
    return {"P": p, "T": t, "velocity_m_per_s": math.sqrt(w2), "density_ratio": r}


def air(f, rest=None):
    return {"O2": 0.21 * (1 - f), "N2": 0.79 * (1 - f), **(rest or {})}


def x_stoich_air(z):
    return 1.0 / (1 + z / 0.21)


CASES = [
    # name, composition, initial pressure Pa, what it covers, cj?
    ("stoichiometric CH4-air, 1 atm", {"CH4": x_stoich_air(2), **air(x_stoich_air(2))}, 101325.0, "stoichiometric, N2 bath", False),
    ("stoichiometric CH4-O2, 1 bar", {"CH4": 1 / 3, "O2": 2 / 3}, 1e5, "undiluted fuel/O2", True),
    ("stoichiometric H2-air, 1 bar", {"H2": x_stoich_air(0.5), **air(x_stoich_air(0.5))}, 1e5, "stoichiometric, N2 bath", True),
    ("stoichiometric H2-O2, 0.1 bar", {"H2": 2 / 3, "O2": 1 / 3}, 1e4, "undiluted, low pressure", True),
    ("lean CH4/O2/Ar 2.5/10/87.5 %, 1333 hPa", {"CH4": 0.025, "O2": 0.10, "Ar": 0.875}, 133322.0, "lean (phi 0.5), Ar bath", False),
    ("rich C2H4/O2/N2 24/24/52 %, 0.95 bar", {"C2H4": 0.24, "O2": 0.24, "N2": 0.52}, 95000.0, "rich (phi 3), N2 bath: the issue's case", True),
    ("very rich C2H4/O2 60/40 %, 1 bar", {"C2H4": 0.60, "O2": 0.40}, 1e5, "very rich, graphite forms", False),
    ("very rich C3H8/O2/N2 30/30/40 %, 2 bar", {"C3H8": 0.30, "O2": 0.30, "N2": 0.40}, 2e5, "very rich, graphite forms", False),
    ("stoichiometric C3H8/O2 in CO2, 4/20/76 %, 10 bar", {"C3H8": 0.04, "O2": 0.20, "CO2": 0.76}, 1e6, "CO2 bath, 10 bar", False),
    ("H2/O2/He 20/10/70 %, 5 bar", {"H2": 0.20, "O2": 0.10, "He": 0.70}, 5e5, "He bath, 5 bar", True),
    ("rich CH4/O2/CO2 phi 1.5, 15/20/65 %, 2 bar", {"CH4": 0.15, "O2": 0.20, "CO2": 0.65}, 2e5, "rich, CO2 bath", False),
    ("stoichiometric C2H2/O2/Ar 4/10/86 %, 0.5 bar", {"C2H2": 0.04, "O2": 0.10, "Ar": 0.86}, 5e4, "Ar bath, acetylene", True),
    ("lean H2-air 10 % H2, 10 bar", {"H2": 0.10, **air(0.10)}, 1e6, "lean, 10 bar", False),
    ("stoichiometric C3H8-O2, 1 bar", {"C3H8": 1 / 6, "O2": 5 / 6}, 1e5, "undiluted fuel/O2", True),
    ("stoichiometric C2H4-air, 1 atm", {"C2H4": x_stoich_air(3), **air(x_stoich_air(3))}, 101325.0, "stoichiometric, N2 bath", True),
    ("H2/N2O/Ar 10/10/80 %, 1 bar", {"H2": 0.10, "N2O": 0.10, "Ar": 0.80}, 1e5, "N2O oxidizer, Ar bath", False),
    ("trace CH4 in air, 10 ppm, 1 bar", {"CH4": 1e-5, **air(1e-5)}, 1e5, "too little fuel to matter", False),
    ("rich H2-air 60 % H2, 1 bar", {"H2": 0.60, **air(0.60)}, 1e5, "rich", False),
]

out_cases = []
for name, x0, p0, what, want_cj in CASES:
    s = uv(x0, p0)
    c = {"name": name, "covers": what, "X0": x0, "T0_K": T0, "P0_Pa": p0,
         "uv_P_Pa": s["P"], "uv_T_K": s["T"], "uv_graphite": bool(s["graphite_mol_per_mol"] > 1e-9),
         "uv_graphite_mol_per_mol_initial": s["graphite_mol_per_mol"]}
    gas.TPX = T0, p0, x0
    try:
        gas.equilibrate("HP", rtol=1e-12, max_steps=5000, max_iter=500)
        if not graphite_stable():
            c["hp_T_K"] = gas.T
    except ct.CanteraError:
        pass
    if want_cj:
        j = cj(x0, p0)
        c.update({"cj_P_Pa": j["P"], "cj_T_K": j["T"], "cj_velocity_m_per_s": j["velocity_m_per_s"], "cj_density_ratio": j["density_ratio"]})
    out_cases.append(c)
    print(f"{name:52s} UV {s['P']/p0:8.4f} x P0 {s['T']:8.1f} K gr {s['graphite_mol_per_mol']:.4f}" + (f"  CJ {c['cj_P_Pa']/p0:7.3f} x P0 {c['cj_T_K']:7.1f} K {c['cj_velocity_m_per_s']:7.1f} m/s" if want_cj else ""))

out = {
    "generator": "scripts/reference/gen_equilibrium.py",
    "library": f"Cantera {ct.__version__}",
    "species": GAS + ["C(gr)"],
    "method": "HP (gas-only states): equilibrate('HP'); UV: Cantera equilibrate('UV') (gas; TV inside a T iteration where it fails), gas TV equilibrium inside graphite-amount and T iterations where graphite is stable; CJ: minimum wave speed on the equilibrium Hugoniot (equilibrate('TV')), golden-section in rho2/rho1",
    "cases": out_cases,
}
with open("tests/fixtures/reference/equilibrium-cantera.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
