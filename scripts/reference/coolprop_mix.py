"""Shared helpers of the reference-data generators: gas-phase states of a mixture in CoolProp's HEOS model."""
import CoolProp.CoolProp as CP

NAMES = {"CH4": "Methane", "O2": "Oxygen", "Ar": "Argon", "N2": "Nitrogen", "He": "Helium", "H2": "Hydrogen",
         "CO2": "CarbonDioxide", "C3H8": "Propane", "C2H6": "Ethane", "C2H4": "Ethylene", "n-C7H16": "n-Heptane"}


def _state(x):
    keys = [k for k in x if x[k] > 0]
    st = CP.AbstractState("HEOS", "&".join(NAMES[k] for k in keys))
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
