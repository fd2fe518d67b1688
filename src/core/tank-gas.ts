/**
 * The hazards of a finished tank gas as it leaves the tank: flammable by itself, flammable in air,
 * oxygen-enriched. A gas that does not burn by itself can burn where it meets air: fuel in an inert
 * gas (10 % H2 in Ar) has no oxidizer; a fuel-rich gas (50 % CH4, 5 % O2, 45 % Ar) is above its
 * upper limit. Released into air (a leak, a vent, a tank opened), the gas passes through every
 * mixture (1 - a) tank gas + a air, a from 0 to 1; it is flammable in air when any point of that
 * mixing line lies inside the flammable region. The line is walked by the fill-path review
 * (fill-path.ts reviewSegment: samples, the envelope's thin crossings, the flame temperature's peak,
 * the boundaries bisected), each point judged by assessFlammability, as every tank state is. This is
 * the principle by which a gas mixture is classed flammable when it is flammable in air (ISO 10156,
 * from memory; common practice in gas classification).
 *
 * Oxygen enrichment: the O2-equivalent (O2 plus N2O_OXYGEN_EQUIVALENT x N2O) above
 * OXYGEN_ENRICHED_ABOVE, the threshold of the state review (safety.ts `oxygen-enriched`).
 *
 * Computed once per plan or label (plan/review.ts, the report layer), never inside the sequence
 * search; a small cache keeps a label and its certificate from walking the same line twice.
 */
import type { Fractions } from './composition.js';
import type { Finding } from './findings.js';
import { reviewSegment, type SegmentReview } from './fill-path.js';
import { flammabilityNumbers } from './safety.js';
import {
  N2O_OXYGEN_EQUIVALENT,
  OXYGEN_ENRICHED_ABOVE,
  RELEASE_AIR_OXYGEN,
  RELEASE_PRESSURE_PA,
} from './thresholds.js';

/** the air a released tank gas mixes with (thresholds.ts releaseAirOxygen; the rest N2) */
export const RELEASE_AIR: Fractions = { O2: RELEASE_AIR_OXYGEN, N2: 1 - RELEASE_AIR_OXYGEN };

/**
 * 'flammable': some mixture of the gas with air is flammable while the gas itself (at the release
 * pressure) is not; 'by-itself': the gas is flammable undiluted; 'within-margin': no point of the
 * line is flammable, but one lies inside the flammability data's uncertainty margin (not shown
 * non-flammable); 'not-found': the walk found no flammable point and none inside the margin
 */
export type InAirVerdict = 'by-itself' | 'flammable' | 'within-margin' | 'not-found';

export interface InAirReview {
  readonly verdict: InAirVerdict;
  /** the share of tank gas in its mixture with air over which the line is flammable (largest first) */
  readonly tankShare?: readonly [number, number];
  /** the line's worst point (flammable) or its point closest to the limits inside the margin */
  readonly at?: SegmentReview['worst'];
}

function normalised(y: Fractions): Fractions {
  let s = 0;
  for (const k in y) if (y[k] > 0) s += y[k];
  const out: Record<string, number> = {};
  for (const k in y) if (y[k] > 0) out[k] = y[k] / s;
  return out;
}

const cache = new Map<string, InAirReview>();
const CACHE_KEPT = 64;

/**
 * The tank gas released into air at `temperatureK` (module comment): the mixing line tank gas -> air
 * at the release pressure, u = a the air's share.
 * Example: flammableInAir({ H2: 0.1, Ar: 0.9 }, 295.15).verdict -> 'flammable' (H2 reaches its LFL of
 * 4 % in air with 60 % air and 8.4 % O2, above its LOC of 5 %).
 */
export function flammableInAir(y: Fractions, temperatureK: number): InAirReview {
  const gas = normalised(y);
  const key = JSON.stringify([gas, temperatureK]);
  const hit = cache.get(key);
  if (hit) return hit;
  const line = reviewSegment(gas, RELEASE_AIR, () => RELEASE_PRESSURE_PA, temperatureK, true);
  let out: InAirReview;
  if (line.ranks.start > 0) out = { verdict: 'by-itself', at: line.worst };
  else if (line.rank > 0 && line.flammableU)
    out = {
      verdict: 'flammable',
      tankShare: [1 - line.flammableU[0], 1 - line.flammableU[1]],
      at: line.worst,
    };
  else if (line.withinMargin) out = { verdict: 'within-margin', at: line.withinMargin };
  else out = { verdict: 'not-found' };
  if (cache.size >= CACHE_KEPT) cache.clear();
  cache.set(key, out);
  return out;
}

/** O2-equivalent mole fraction of a gas: O2 plus N2O_OXYGEN_EQUIVALENT x N2O (safety.ts, as the state review) */
export function oxygenEquivalent(y: Fractions): number {
  return (y.O2 ?? 0) + N2O_OXYGEN_EQUIVALENT * (y.N2O ?? 0);
}

/** above the enrichment threshold of the state review (thresholds.ts oxygenEnrichedAbove) */
export function oxygenEnriched(y: Fractions): boolean {
  return oxygenEquivalent(normalised(y)) > OXYGEN_ENRICHED_ABOVE;
}

/**
 * The finding of a finished gas that is flammable in air but not by itself (`flammable-in-air`), or
 * whose mixing line with air comes inside the data's margin (`near-flammable-in-air`); none where the
 * gas burns by itself (its own `flammable-mixture` says so) or the walk found neither
 */
export function inAirFinding(y: Fractions, temperatureK: number): Finding | undefined {
  const r = flammableInAir(y, temperatureK);
  if (!r.at) return undefined;
  const nums = flammabilityNumbers(r.at.assessment, r.at.pressurePa);
  if (r.verdict === 'flammable' && r.tankShare)
    return {
      severity: 'warning',
      code: 'flammable-in-air',
      tankShareFrom: r.tankShare[1],
      tankShareTo: r.tankShare[0],
      tankShare: 1 - r.at.u,
      ...nums,
    };
  if (r.verdict === 'within-margin')
    return { severity: 'warning', code: 'near-flammable-in-air', tankShare: 1 - r.at.u, ...nums };
  return undefined;
}
