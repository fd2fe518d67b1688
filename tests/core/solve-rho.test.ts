// The re-check's density solver: one options object, the mixing rules of mixture-eos, and a typed
// refusal when it does not converge.
import { describe, expect, it } from 'vitest';
import { solveRho } from '../../src/core/recheck.js';
import { bMixOf, cMixOf } from '../../src/core/mixture-eos.js';
import { describeProblem, ProblemError, R } from '../../src/core/index.js';

const one = (v: number) => Float64Array.of(v);

describe('solveRho', () => {
  it('pure gas with C = 0: the root of the truncated virial equation, rho = (-1 + sqrt(1 + 4 B P / RT)) / (2 B)', () => {
    // reference: the quadratic B R T rho^2 + R T rho - P = 0 solved in closed form (algebra), to 1e-12
    const P = 2e5;
    const T = 298.15;
    const B = -4.3e-5; // m3/mol, about CH4's at 298 K (from memory; any value serves the algebra)
    const rho = solveRho({
      pressurePa: P,
      temperatureK: T,
      nPrev: one(0),
      rhoPrev: 0,
      w: one(1),
      B: one(B),
      cbrtC: one(0),
      cPairs: one(0),
      y: new Float64Array(1),
    });
    const closed = (-1 + Math.sqrt(1 + (4 * B * P) / (R * T))) / (2 * B);
    expect(Math.abs(rho / closed - 1)).toBeLessThan(1e-12);
  });

  it('a mixture fill with C and pair terms: the density satisfies the virial equation through bMixOf and cMixOf', () => {
    // reference: the equation solved, P = rho R T (1 + B_mix(y) rho + C_mix(y) rho^2) with y = n / rho,
    // evaluated by mixture-eos's own mixing rules (not the solver's polynomial form), residual within 1e-12 of P;
    // coefficients of the size of CH4/O2/Ar near 300 K (from memory; any values serve the algebra)
    const S = 3;
    const B = Float64Array.of(
      -4.3e-5,
      -3.2e-5,
      -2.8e-5,
      -3.2e-5,
      -1.6e-5,
      -1.7e-5,
      -2.8e-5,
      -1.7e-5,
      -1.6e-5,
    );
    const cbrtC = Float64Array.of(Math.cbrt(2.8e-9), Math.cbrt(1.2e-9), Math.cbrt(1.0e-9));
    const cPairs = new Float64Array(S * S);
    cPairs[0 * S + 1] = 3 * 1.5e-10;
    cPairs[1 * S + 0] = 3 * -0.8e-10;
    const nPrev = Float64Array.of(4.1, 0, 36.9); // mol/m3: CH4 and Ar in the tank before the fill
    const rhoPrev = 41;
    const w = Float64Array.of(0, 1, 0); // the fill: O2
    const T = 295.15;
    const P = 3.2e5;
    const y = new Float64Array(S);
    const rho = solveRho({ pressurePa: P, temperatureK: T, nPrev, rhoPrev, w, B, cbrtC, cPairs, y });
    const n = Array.from({ length: S }, (_, i) => nPrev[i] + (rho - rhoPrev) * w[i]);
    const yy = n.map((v) => v / rho);
    const back = rho * R * T * (1 + bMixOf(yy, B, S) * rho + cMixOf(yy, cbrtC, cPairs, S) * rho * rho);
    expect(Math.abs(back / P - 1)).toBeLessThan(1e-12);
    // the composition it hands back is n / rho
    for (let i = 0; i < S; i++) expect(Math.abs(y[i] - yy[i])).toBeLessThan(1e-15);
  });

  it('raises not-converged (typed, worded) when the virial series has no gas root: P above its maximum', () => {
    // P(rho) = rho R T (1 + B rho) peaks at rho = -1/(2B): P_max = -R T / (4 B); ask for twice that
    const T = 300;
    const B = -1e-3;
    const P = 2 * ((-R * T) / (4 * B));
    let caught: unknown;
    try {
      solveRho({
        pressurePa: P,
        temperatureK: T,
        nPrev: one(0),
        rhoPrev: 0,
        w: one(1),
        B: one(B),
        cbrtC: one(0),
        cPairs: one(0),
        y: new Float64Array(1),
      });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ProblemError);
    const p = (caught as ProblemError).problem;
    expect(p.code).toBe('not-converged');
    if (p.code === 'not-converged') {
      expect(p.iterations).toBe(30);
      expect(p.tolerance).toBe(1e-13);
    }
    expect(describeProblem(p)).toMatch(/^the density after a fill \(re-check\) did not converge/);
  });

  it("bMixOf's documented example: y = (0.5, 0.5), B = [[-40, -20], [-20, 10]] cm3/mol -> -17.5 cm3/mol", () => {
    // reference: B_mix = sum_ij y_i y_j B_ij by hand: 0.25 (-40) + 2 (0.25) (-20) + 0.25 (10) = -17.5
    expect(bMixOf([0.5, 0.5], [-40, -20, -20, 10], 2)).toBeCloseTo(-17.5, 12);
    // cMixOf without pair departures is the cube-root rule: (0.5 * 2 + 0.5 * 3)^3 = 15.625
    expect(cMixOf([0.5, 0.5], [2, 3], [0, 0, 0, 0], 2)).toBeCloseTo(15.625, 12);
  });
});
