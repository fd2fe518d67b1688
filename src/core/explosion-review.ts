/**
 * The two explosion findings of a flammable tank state: the closed-vessel pressure
 * (constant-volume adiabatic equilibrium, complete combustion kept as a cross-check)
 * and detonation (published limits or the conservative rule; Chapman-Jouguet and
 * reflected pressure from the equilibrium Hugoniot). Called by the safety review for
 * states it finds flammable only; both results are cached per composition and pressure,
 * because the order advice reviews the same states many times.
 */
import type { Fractions } from './composition.js';
import type { Finding } from './findings.js';
import { closedVesselCombustion } from './combustion.js';
import { equilibriumHP, equilibriumUV } from './equilibrium.js';
import { chapmanJouguet, detonability } from './detonation.js';
import { ProblemError } from './problems.js';
import { describeProblem } from './messages.js';

interface StateLike {
  readonly composition: Fractions;
  readonly pressurePa: number;
}

function why(e: unknown): string {
  if (e instanceof ProblemError) return describeProblem(e.problem);
  throw e;
}

/** closed-vessel end state of a flammable state, judged against the working limit (danger above it, else a note) */
export function closedVesselFinding(
  s: StateLike,
  temperatureK: number,
  workingLimitPa: number | undefined,
  step: number | undefined,
): Finding {
  const cc = closedVesselCombustion(s.composition, temperatureK);
  const completePa = s.pressurePa * cc.pressureRatio;
  let peakPa = completePa;
  let extra: Record<string, unknown> = {
    method: 'complete-combustion',
    completePa,
    completeK: cc.temperatureK,
  };
  try {
    const eq = equilibriumUV(s.composition, temperatureK, s.pressurePa);
    peakPa = eq.pressurePa;
    extra = {
      method: 'equilibrium',
      temperatureK: eq.temperatureK,
      completePa,
      completeK: cc.temperatureK,
      graphiteMol: eq.graphiteMol,
    };
  } catch (e) {
    extra = { ...extra, equilibriumMissing: why(e) };
  }
  const over = workingLimitPa !== undefined && peakPa > workingLimitPa;
  return {
    severity: over ? 'danger' : 'note',
    code: 'closed-vessel-pressure',
    step,
    fromPa: s.pressurePa,
    peakPa,
    limitPa: workingLimitPa,
    ...extra,
  };
}

/**
 * the quick CJ estimate's reflected pressure differs from the full one by far less than this
 * share (tests/core/detonation-quick.test.ts measures it), so a quick estimate further than
 * this from the working limit is on the same side of it as the full one
 */
export const QUICK_CJ_MARGIN = 0.02;

/** the reflected pressure by the quick CJ estimate when it is clearly on one side of the limit, else undefined */
function quickReflected(s: StateLike, temperatureK: number, limitPa: number): number | undefined {
  let r: number;
  try {
    r = chapmanJouguet(s.composition, temperatureK, s.pressurePa, 'quick').reflectedPa;
  } catch (e) {
    if (e instanceof ProblemError) return undefined; // the full search says why
    throw e;
  }
  return Math.abs(r - limitPa) > QUICK_CJ_MARGIN * limitPa ? r : undefined;
}

/**
 * detonation finding of a flammable state, or none. Severity: undiluted fuel/O2 inside the
 * limits is a danger whatever the rating (common practice); a diluted detonable state is a
 * danger when the reflected pressure exceeds the working limit, else a warning with the numbers.
 * `detail` 'severity' (the order advice and the sequence search) gives the severity without the
 * CJ numbers, by the quick estimate where that decides it.
 */
export function detonationFinding(
  s: StateLike,
  temperatureK: number,
  workingLimitPa: number | undefined,
  step: number | undefined,
  detail: 'full' | 'severity' = 'full',
): Finding | undefined {
  const d = detonability(s.composition);
  if (!d.detonable) return undefined;
  let cj: Record<string, number> = {};
  let cjMissing: string | undefined;
  let reflectedPa: number | undefined;
  // the severity alone: undiluted, or no working limit, needs no CJ state; else the quick estimate
  // decides unless it is within QUICK_CJ_MARGIN of the limit (then the full one)
  const quick = detail === 'severity';
  if (!quick || (!d.undiluted && workingLimitPa !== undefined))
    try {
      const c = quick ? quickReflected(s, temperatureK, workingLimitPa!) : undefined;
      if (c !== undefined) reflectedPa = c;
      else {
        const c = chapmanJouguet(s.composition, temperatureK, s.pressurePa);
        reflectedPa = c.reflectedPa;
        if (!quick)
          cj = {
            cjPa: c.pressurePa,
            cjK: c.temperatureK,
            cjVelocityMPerS: c.velocityMPerS,
            reflectedPa: c.reflectedPa,
          };
      }
    } catch (e) {
      cjMissing = why(e);
    }
  // without a CJ estimate, or without a rating, the tank cannot be shown to hold it: danger for undiluted, else warning
  const over = workingLimitPa !== undefined && reflectedPa !== undefined && reflectedPa > workingLimitPa;
  const severity = d.undiluted || over ? 'danger' : 'warning';
  return {
    severity,
    code: 'detonable-state',
    step,
    inertFraction: d.inertFraction,
    pressurePa: s.pressurePa,
    basis: d.basis,
    undiluted: d.undiluted,
    phi: d.phi,
    phiLow: d.limits?.phiLow,
    phiHigh: d.limits?.phiHigh,
    limitSources: d.limits
      ? [...new Set(d.limits.records.flatMap((r) => [r.low.source, r.high.source]))]
      : undefined,
    limitsIn: d.limits?.records.map((r) => r.oxidizer),
    limitPa: workingLimitPa,
    cjMissing,
    ...cj,
  };
}

/** equilibrium adiabatic flame temperature at constant pressure, or undefined where the data are missing */
export function equilibriumFlameK(
  y: Fractions,
  temperatureK: number,
  pressurePa: number,
): number | undefined {
  try {
    return equilibriumHP(y, temperatureK, pressurePa).temperatureK;
  } catch (e) {
    why(e);
    return undefined;
  }
}
