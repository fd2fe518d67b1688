/**
 * The verdict of a re-check: each design species' actual fraction against its
 * tolerance, with the expanded uncertainty (k = 2) as a guard band:
 *  - pass: every |deviation| + U within the tolerance;
 *  - pass-uncertain: every |deviation| within the tolerance, but the uncertainty
 *    reaches past it for some species (the measurement cannot prove conformity);
 *  - fail: some |deviation| beyond the tolerance (exit code 4).
 */
import type { Design } from './composition.js';
import type { Tolerance } from './planner.js';
import type { UncertaintyResult } from './uncertainty.js';

export type VerdictKind = 'pass' | 'pass-uncertain' | 'fail' | 'no-design';

export interface SpeciesDeviation {
  readonly species: string;
  readonly design: number;
  readonly actual: number;
  readonly deviation: number;
  readonly tolerance: number;
  readonly expandedU: number;
  readonly within: boolean;
  readonly provenWithin: boolean;
  /** the lines of the readings past their gauge's full scale this fraction rests on (never proven within then) */
  readonly pastRange?: readonly number[];
}

/** a reading the composition is computed from that went past its gauge's full scale: not trustworthy */
export interface ReadingPastRange {
  /** the fill it ends (null: the starting pressure of a top-up) */
  readonly step: number | null;
  readonly line: number;
  readonly gauge: string;
}

export interface CheckVerdict {
  readonly verdict: VerdictKind;
  readonly deviations: readonly SpeciesDeviation[];
  readonly phiDeviation?: number;
  readonly diluentDeviation?: number;
  /** the readings past their gauge's range the composition rests on (absent or empty: none) */
  readonly pastRange?: readonly ReadingPastRange[];
}

export function judge(result: UncertaintyResult, design: Design | undefined, tol: Tolerance): CheckVerdict {
  if (!design) return { verdict: 'no-design', deviations: [] };
  const deviations: SpeciesDeviation[] = [];
  for (const [k, xd] of Object.entries(design.composition)) {
    if (!(xd > 0)) continue;
    const st = result.composition[k];
    const actual = st?.value ?? 0;
    const U = 2 * (st?.u ?? 0);
    const t = Math.max(tol.relative * xd, tol.absolute);
    const d = actual - xd;
    deviations.push({
      species: k,
      design: xd,
      actual,
      deviation: d,
      tolerance: t,
      expandedU: U,
      within: Math.abs(d) <= t,
      provenWithin: Math.abs(d) + U <= t,
    });
  }
  const verdict: VerdictKind = deviations.every((d) => d.within)
    ? deviations.every((d) => d.provenWithin)
      ? 'pass'
      : 'pass-uncertain'
    : 'fail';
  return {
    verdict,
    deviations,
    phiDeviation: design.phi !== undefined && result.phi ? result.phi.value - design.phi : undefined,
    diluentDeviation: result.diluentFraction
      ? result.diluentFraction.value - design.diluentFraction
      : undefined,
  };
}

/**
 * The verdict with the readings past their gauge's full scale marked: a reading beyond the range of
 * its gauge is not trustworthy, so no fraction that depends on it is shown within tolerance, whatever
 * the numbers give. Fill k's reading sets the amounts of fill k and fill k + 1 (each the difference of
 * two readings), so the fractions of the gases of those two fills depend on it; the last reading (the
 * total) and the starting pressure of a top-up (`step` null) concern every fraction. A composition
 * that was within tolerance becomes `pass-uncertain` (not shown within tolerance); a fail stays one.
 */
export function withReadingsPastRange(
  v: CheckVerdict,
  fills: readonly {
    readonly step: number;
    readonly source: { readonly composition: Record<string, number> };
  }[],
  past: readonly ReadingPastRange[],
): CheckVerdict {
  if (!past.length) return v;
  const gasesOf = (i: number) =>
    Object.entries(fills[i]?.source.composition ?? {})
      .filter(([, x]) => x > 0)
      .map(([k]) => k);
  const linesOf = new Map<string, number[]>();
  for (const p of past) {
    const k = p.step === null ? -1 : fills.findIndex((f) => f.step === p.step);
    const every = k < 0 || k === fills.length - 1;
    const gases = new Set(every ? v.deviations.map((d) => d.species) : [...gasesOf(k), ...gasesOf(k + 1)]);
    for (const g of gases) linesOf.set(g, [...(linesOf.get(g) ?? []), p.line]);
  }
  const deviations = v.deviations.map((d) => {
    const lines = linesOf.get(d.species);
    return lines ? { ...d, provenWithin: false, pastRange: lines } : d;
  });
  const verdict = v.verdict === 'pass' && deviations.some((d) => d.pastRange) ? 'pass-uncertain' : v.verdict;
  return { ...v, verdict, deviations, pastRange: past };
}

/** a design fraction against its tolerance, for a composition with no uncertainty (an estimate) */
export interface FractionAgainstTolerance {
  readonly species: string;
  /** the fraction less its design value, mole fraction */
  readonly deviation: number;
  readonly design: number;
  /** the allowed |deviation|: max(relative x design, absolute) */
  readonly tolerance: number;
  readonly within: boolean;
}

/**
 * The design fraction furthest from its design value, measured in its own tolerance (max(relative x
 * design, absolute), as `judge`), in a composition estimated without uncertainty (a batch with air
 * leaked in, say).
 * Example: worstAgainstTolerance({ CH4: 0.4985, Ar: 0.5035 }, designMixture({ kind: 'fractions',
 *   fractions: { CH4: 0.5, Ar: 0.5 } }), { relative: 0.005, absolute: 0 }) -> { species: 'Ar',
 *   deviation: 0.0035, tolerance: 0.0025, within: false } (by hand: Ar 0.0035 off is the worse of the
 *   two, beyond 0.5 % of 0.5)
 */
export function worstAgainstTolerance(
  composition: Readonly<Record<string, number>>,
  design: Design,
  tol: Tolerance,
): FractionAgainstTolerance | undefined {
  let worst: FractionAgainstTolerance | undefined;
  for (const [k, xd] of Object.entries(design.composition)) {
    if (!(xd > 0)) continue;
    const deviation = (composition[k] ?? 0) - xd;
    const tolerance = Math.max(tol.relative * xd, tol.absolute);
    const f = { species: k, deviation, design: xd, tolerance, within: Math.abs(deviation) <= tolerance };
    if (!worst || Math.abs(deviation) / tolerance > Math.abs(worst.deviation) / worst.tolerance) worst = f;
  }
  return worst;
}
