/**
 * A split-charge batch header for the guided-fill tests: CH4, Ar to 400 Torr (charge 1 of 2), O2,
 * Ar to the final pressure (charge 2 of 2), from the demo recipe ch4-o2-ar-phi1 (1500 Torr in MT-1).
 */
import { planFill } from '../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../src/io/load.js';
import { headerFromPlan } from '../src/io/check.js';
import { withCharges, type LogHeader } from '../src/io/batch-log.js';
import { TORR } from './helpers.js';

export const SPLIT_STOP_TORR = 400;

/** the plan of the demo recipe with the order CH4, Ar@STOP, O2, Ar (STOP 400 Torr unless given), and its request */
export function splitPlan(stopTorr = SPLIT_STOP_TORR) {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  const byMain = (k: string) => req.input.sources.find((s) => s.mainSpecies === k)!;
  const ch4 = byMain('CH4');
  const ar = byMain('Ar');
  const o2 = byMain('O2');
  const input = {
    ...req.input,
    order: 'given' as const,
    sources: [ch4, ar, o2],
    charges: [{ source: ch4 }, { source: ar, stopPa: stopTorr * TORR }, { source: o2 }, { source: ar }],
  };
  const plan = planFill(input);
  return { plan, req: { ...req, input } };
}

export function splitHeader(stopTorr = SPLIT_STOP_TORR): LogHeader {
  const { plan, req } = splitPlan(stopTorr);
  return withCharges(headerFromPlan(plan, req, 'split-1', '2026-12-01T00:00:00Z'));
}
