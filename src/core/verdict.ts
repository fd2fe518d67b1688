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
}

export interface CheckVerdict {
  readonly verdict: VerdictKind;
  readonly deviations: readonly SpeciesDeviation[];
  readonly phiDeviation?: number;
  readonly diluentDeviation?: number;
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
