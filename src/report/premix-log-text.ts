/**
 * A batch drawn from an existing premix tank (`--premix-log`, recipe `premix.log`) in the plan's
 * text, JSON and sheet: the premix log, its re-checked composition +- U, the premix tank's
 * pressure (last reading, less what other batches drew, and after this batch). Each returns
 * nothing for a plan without a premix log.
 */
import type { Plan } from '../core/index.js';
import { fixedSig, pressure, tankName } from './format.js';
import type { PressureUnit } from './units.js';

type Use = NonNullable<Plan['premixLog']>;

/** one gas a line: ["O2 0.134230 +- 0.00035", "Ar 0.865769 +- 0.00035"] (U with k = 2) */
export function premixLogFractions(p: Use): string[] {
  return Object.entries(p.composition)
    .filter(([, v]) => v >= 1e-4)
    .map(([k, v]) => `${k} ${fixedSig(v, 6)} +- ${fixedSig(2 * (p.u[k] ?? 0), 2)}`);
}

/** "O2 0.134230 +- 0.00035  Ar 0.865769 +- 0.00035" (U with k = 2) */
export function premixLogComposition(p: Use): string {
  return premixLogFractions(p).join('  ');
}

/** "less 0.0802 mol drawn by batches/b.jsonl" */
function drawsText(p: Use): string {
  // draws are known only from the batch logs beside the premix log: a copied or moved log has none
  if (!p.draws.length)
    return (
      'no other batch log in its folder draws from it; draws recorded by logs kept elsewhere are not ' +
      "counted: read the premix tank's own gauge before this batch"
    );
  const mol = p.draws.reduce((a, d) => a + d.mol, 0);
  return `less ${fixedSig(mol, 3)} mol drawn by ${p.draws.map((d) => d.log).join(', ')}`;
}

/** the plan text's lines: the log and its composition, the premix tank's pressures */
export function premixLogLines(plan: Plan, unit: PressureUnit): string[] {
  const p = plan.premixLog;
  if (!p) return [];
  const d = p.delivery;
  return [
    `Premix log  ${p.log} (${p.source.id}, tank ${tankName(p.tank.id)}, ` +
      `last entry ${p.lastEntrySha256.slice(0, 12)}): ` +
      `${premixLogComposition(p)}  (re-checked by check's model, U with k = 2; carried into the batch's budget)`,
    `Premix tank ${tankName(p.tank.id)}: ${pressure(p.lastReadingPa, unit, 5)} at its last reading, ` +
      `${pressure(d.startPa, unit, 5)} before this batch (${drawsText(p)}), ` +
      `${pressure(d.endPa, unit, 5)} after delivering ${fixedSig(d.deliveredMol, 3)} mol (settled; ` +
      `${pressure(d.endFastPa, unit, 5)} at ${fixedSig(d.endFastK, 4)} K if delivered fast); ` +
      `it must stay above ${pressure(d.requiredPa, unit, 5)} (target ${pressure(d.targetPa, unit, 5)} + 10 %)`,
    '',
  ];
}

/** `premix_log` of plan --json: null without one */
export function premixLogJson(plan: Plan): object | null {
  const p = plan.premixLog;
  if (!p) return null;
  const d = p.delivery;
  return {
    path: p.log,
    last_entry_sha256: p.lastEntrySha256,
    source: p.source.id,
    tank: p.tank.id,
    composition: p.composition,
    u: p.u,
    last_reading_Pa: p.lastReadingPa,
    pressure_before_Pa: d.startPa,
    pressure_after_Pa: d.endPa,
    pressure_after_fast_Pa: d.endFastPa,
    delivered_mol: d.deliveredMol,
    target_Pa: d.targetPa,
    required_Pa: d.requiredPa,
    subtracted: p.draws.map((x) => ({ log: x.log, drawn_mol: x.mol })),
  };
}
