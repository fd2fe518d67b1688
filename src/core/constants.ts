/** Molar gas constant, J/(mol K): N_A k with the exact SI 2019 values (CODATA 2018). */
export const R = 8.31446261815324;
/** standard atmosphere, Pa (exact) */
export const ATM_PA = 101325;
/** 1 Torr = 101325/760 Pa exactly */
export const TORR_PA = 101325 / 760;
