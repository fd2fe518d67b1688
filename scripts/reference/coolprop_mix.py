"""Shared helpers of the reference-data generators: gas-phase states of a mixture in CoolProp's HEOS model."""
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
T_GRID = [230.0 + 10.0 * i for i in range(26)]  # 230 .. 480 K, the grid of the virial tables


def _state(x):
    keys = [k for k in x if x[k] > 0]
    st = CP.AbstractState("HEOS", "&".join(FLUIDS[k] for k in keys))
    tot = sum(x[k] for k in keys)
    st.set_mole_fractions([x[k] / tot for k in keys])
    st.specify_phase(CP.iphase_gas)
    return st


def pressure(x, rho, T):
    """absolute pressure, Pa, of composition x (need not be normalised) at molar density rho, mol/m3, and T, K"""
    st = _state(x)
    st.update(CP.DmolarT_INPUTS, rho, T)
    return st.p()


def density(x, P, T):
    """molar density, mol/m3, at pressure P, Pa, and T, K"""
    st = _state(x)
    st.update(CP.PT_INPUTS, P, T)
    return st.rhomolar()


def zero_density(x, T):
    """zero-density B_mix, cm3/mol, and C_mix, cm6/mol2, of composition x at T, K"""
    st = _state(x)
    st.update(CP.DmolarT_INPUTS, 1e-6, T)
    return st.Bvirial() * 1e6, st.Cvirial() * 1e12
