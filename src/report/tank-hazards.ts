/**
 * The hazard marks of a tank as filled, from its re-checked composition (never the design): flammable
 * by itself, flammable in air (core/tank-gas.ts: the gas released into air passes through every
 * mixture of it with air), oxygen-enriched (the O2-equivalent above the state review's threshold).
 * The label prints the marks; the certificate and `check` give the findings behind them. A plan's
 * own flammable marks (its header findings) are kept where the as-filled gas does not show them:
 * the marks only ever add, never clear, what the plan found.
 */
import {
  assessFlammability,
  describeFinding,
  flammableInAir,
  inAirFinding,
  oxygenEnriched,
  oxygenEquivalent,
  THRESHOLDS,
  TORR_PA,
  type Finding,
} from '../core/index.js';
import type { CheckReport, LogView } from './check-types.js';

export const FLAMMABLE_MARK = 'FLAMMABLE GAS MIXTURE';
export const FLAMMABLE_IN_AIR_MARK = 'FLAMMABLE IN AIR - burns where it leaks or is vented into air';
export const NEAR_FLAMMABLE_MARK = 'NEAR THE FLAMMABLE LIMIT - handle as flammable';

/** the oxidizer mark of a gas above the oxygen-enrichment threshold of the state review */
export function oxidizerMark(oxygenFraction: number, y: Readonly<Record<string, number>>): string {
  const limit = THRESHOLDS.oxygenEnrichedAbove.value;
  const what = (y.N2O ?? 0) > 0 ? 'O2-equivalent' : 'O2';
  return `OXIDIZER - OXYGEN-ENRICHED: ${pct(oxygenFraction)} ${what} (above ${Number((limit * 100).toPrecision(4))} %)`;
}

export interface TankHazards {
  /** the label's hazard lines, strongest first; at least one */
  readonly marks: readonly string[];
  /** the as-filled findings behind the marks (flammable in air, oxygen-enriched), worded */
  readonly findings: readonly { readonly severity: string; readonly code: string; readonly text: string }[];
}

const pct = (x: number) => `${(x * 100).toPrecision(4)} %`;
const torr = (pa: number) => `${(pa / TORR_PA).toPrecision(6)} Torr`;

/** the composition as filled, and the state it stands at (after venting where it was read then) */
function asFilled(r: CheckReport) {
  const y: Record<string, number> = {};
  for (const [k, st] of Object.entries(r.result.composition)) if (st.value > 0) y[k] = st.value;
  const at = r.vent?.after ?? r.readings[r.readings.length - 1];
  return { y, temperatureK: at.temperatureK, pressurePa: at.pressurePa };
}

/** the tank's hazard marks and findings as filled (module comment) */
export function tankHazards(r: CheckReport, log?: LogView): TankHazards {
  const { y, temperatureK, pressurePa } = asFilled(r);
  const planned = new Set((log?.header.findings ?? []).map((f) => f.code));
  const marks: string[] = [];
  const findings: { severity: string; code: string; text: string }[] = [];
  let itself: string;
  try {
    itself = assessFlammability(y, temperatureK, pressurePa).verdict;
  } catch {
    itself = 'unknown';
  }
  let inAir: Finding | undefined;
  let inAirVerdict: string;
  try {
    inAirVerdict = flammableInAir(y, temperatureK).verdict;
    inAir = inAirFinding(y, temperatureK);
  } catch {
    inAirVerdict = 'unknown';
  }
  if (itself === 'flammable' || inAirVerdict === 'by-itself' || planned.has('flammable-mixture'))
    marks.push(FLAMMABLE_MARK);
  else if (inAirVerdict === 'flammable' || planned.has('flammable-in-air')) marks.push(FLAMMABLE_IN_AIR_MARK);
  else if (itself === 'within-margin' || itself === 'near-limit' || inAirVerdict === 'within-margin')
    marks.push(NEAR_FLAMMABLE_MARK);
  else if (itself === 'unknown' || inAirVerdict === 'unknown')
    marks.push('flammability not assessed - see the findings before use');
  if (inAir && !marks.includes(FLAMMABLE_MARK))
    findings.push({ severity: inAir.severity, code: inAir.code, text: describeFinding(inAir, torr) });
  const o2 = oxygenEquivalent(y);
  if (oxygenEnriched(y)) {
    marks.push(oxidizerMark(o2, y));
    const f: Finding = { severity: 'note', code: 'oxygen-enriched', oxygenFraction: o2 };
    findings.push({ severity: f.severity, code: f.code, text: describeFinding(f, torr) });
  }
  if (!marks.length) marks.push('see the findings and supplier safety data before use');
  return { marks, findings };
}
