/** The plan as a readable table for the terminal. */
import { describeFinding, STANDING_CAUTION, type Finding, type Plan, type Severity } from '../core/index.js';
import { fromPa, isPressureUnit, type PressureUnit } from './units.js';
import { decimalsFor, fixedSig, padTable, pressure, signed, tankName, tankRating } from './format.js';
import type { PlanMeta } from './plan-json.js';
import { predictedLines } from './predicted-text.js';
import { chargeName, chargeShort, chargeWords, isSplit } from './charges.js';
import { twoStageDeliveryLines, twoStageHead } from './two-stage-text.js';
import { premixLogLines } from './premix-log-text.js';
import { dangerHeadline, toleranceHeadline } from './headlines.js';

function formatFractions(x: Readonly<Record<string, number>>): string {
  return Object.entries(x)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => `${k} ${fixedSig(v, 6)}`)
    .join('  ');
}

/** where the cross coefficients of the design's own species come from (impurity pairs left out) */
function virialSummary(plan: Plan): string {
  const major = new Set(Object.keys(plan.design.composition));
  const cross = plan.virial.entries.filter((e) => e.i !== e.j && major.has(e.i) && major.has(e.j));
  const fromModel = cross.filter((e) => e.method === 'reference-mixture');
  const averaged = cross.filter((e) => e.method === 'reference-mixture-average');
  const byRule = cross.filter(
    (e) => e.method !== 'reference-mixture' && e.method !== 'reference-mixture-average',
  );
  const list = (es: typeof cross) => es.map((e) => `${e.i}-${e.j}`).join(', ');
  const parts = [`B_mix ${(plan.final.bMixM3PerMol * 1e6).toFixed(2)} cm3/mol`];
  if (fromModel.length) parts.push(`cross B from reference mixture models: ${list(fromModel)}`);
  if (averaged.length) parts.push(`composition averages of reference mixture models: ${list(averaged)}`);
  if (byRule.length) parts.push(`by combining rule: ${list(byRule)}`);
  return parts.join('; ');
}

const SEVERITY_LABEL: Record<Severity, string> = { danger: 'DANGER ', warning: 'warning', note: 'note   ' };

/** the tank line: its volume and its rating with the working limit */
function tankLine(plan: Plan, P: (pa: number, sig?: number) => string): string {
  const t = plan.tank;
  return `Tank        ${tankName(t.id)}: ${fixedSig(t.volumeM3 * 1000, 4)} L, ${tankRating(plan, P)}`;
}

/** how many experiments the batch serves in the lab's reactor */
function servesLine(
  ex: NonNullable<PlanMeta['experiments']>,
  P: (pa: number, sig?: number) => string,
  dangers: number,
): string {
  const litres = fixedSig((ex.reactor.volumeM3 + ex.reactor.lineVolumeM3) * 1000, 4);
  const sized = ex.sizedFor !== undefined ? `; final pressure sized for ${ex.sizedFor}` : '';
  return (
    `Serves      ${ex.count} experiments in ${ex.reactor.id} (${litres} ` +
    `L with its line, filled to ${P(ex.reactor.fillPressurePa, 5)}; the tank ` +
    `is used down to ${P(ex.minTankPa, 5)})${sized}` +
    // a plan that cannot be filled safely serves nothing as it stands
    (dangers
      ? `; only once the ${dangers} DANGER ${dangers > 1 ? 'findings below are' : 'finding below is'} resolved`
      : '')
  );
}

const dangerCount = (plan: Plan) => plan.findings.filter((f) => f.severity === 'danger').length;

/** the barometric pressure that gauge-referenced readings assume, and how to correct for another */
function barometerLine(plan: Plan, meta: PlanMeta): string[] {
  const refSteps = plan.steps.filter((s) => s.gauge?.reference === 'gauge');
  if (!refSteps.length || !meta.barometer) return [];
  const b = pressure(meta.barometer.pressurePa, 'Torr', 5);
  const which = `reading${refSteps.length > 1 ? 's' : ''} of fill ${refSteps.map((s) => s.index).join(', ')}`;
  const given = meta.barometer.given ? '--barometer' : "lab profile value, not today's: give --barometer";
  return [
    `Barometer   ${b} assumed by the gauge-referenced ${which} (${given}); ` +
      `for another barometer B, stop at target + (${b} - B) in the gauge's unit`,
  ];
}

/**
 * The order line. A given order under a danger is not neutral: it says how many DANGER findings
 * the plan has as given, and the order the review advises where it advises one (safer-order).
 */
function orderLine(plan: Plan, meta: PlanMeta): string {
  const recommended = meta.orderRecommended ? 'recommended: ' : '';
  const dangers = dangerCount(plan);
  const safer = plan.findings.find(
    (f): f is Extract<Finding, { code: 'safer-order' }> => f.code === 'safer-order' && !f.of,
  );
  const given =
    !meta.orderRecommended && dangers
      ? `; the plan in this given order has ${dangers} DANGER finding${dangers > 1 ? 's' : ''} ` +
        `(see the findings)${safer ? `; the advised order: ${safer.order.join(' -> ')} (safer-order)` : ''}`
      : '';
  return (
    `Order       ${plan.steps.map((s) => chargeShort(s.species, s.charge)).join(' -> ')}  ` +
    `(${recommended}${plan.orderReason}${given})`
  );
}

/** the lines above the tables: design, tank, final state, real gas, order, serves, barometer, tolerance */
function headerLines(plan: Plan, meta: PlanMeta, unit: PressureUnit): string[] {
  const out: string[] = [];
  const P = (pa: number, sig = 6) => pressure(pa, unit, sig);
  const d = plan.design;
  out.push(`Fill plan  ${meta.recipeId}   (lab: ${meta.labName})`);
  out.push('');
  const phi = d.phi === undefined ? 'n/a' : d.phi.toFixed(4);
  out.push(
    `Design      phi ${phi}   fuel ${fixedSig(d.fuelFraction, 5)}   oxidizer ` +
      `${fixedSig(d.oxidizerFraction, 5)}   diluent ${fixedSig(d.diluentFraction, 5)}`,
  );
  out.push(`            ${formatFractions(d.composition)}`);
  out.push(tankLine(plan, P));
  out.push(
    `Final       ${P(plan.final.pressurePa)} absolute at ${plan.final.temperatureK.toFixed(2)} ` +
      `K (${(plan.final.temperatureK - 273.15).toFixed(2)} degC)`,
  );
  out.push(
    `            Z = ${plan.final.compressibility.toFixed(6)}, ${fixedSig(plan.final.amountMol, 6)} ` +
      `mol (an ideal gas would need ${fixedSig(plan.final.idealAmountMol, 6)} mol)`,
  );
  out.push(`Real gas    ${virialSummary(plan)}`);
  if (plan.initial)
    out.push(
      `In tank     ${P(plan.initial.pressurePa)} of ${formatFractions(plan.initial.composition)} ` +
        `(${fixedSig(plan.initial.amountMol, 5)} mol)`,
    );
  out.push(orderLine(plan, meta));
  if (meta.experiments) out.push(servesLine(meta.experiments, P, dangerCount(plan)));
  out.push(...barometerLine(plan, meta));
  const absolute = plan.tolerance.absolute > 0 ? ` or ${plan.tolerance.absolute} absolute` : '';
  out.push(
    `Tolerance   each mole fraction within ${(plan.tolerance.relative * 100).toFixed(2)} ` +
      `% relative${absolute}`,
  );
  out.push('');
  return out;
}

/** table 1: what the operator needs at the manifold, the reading in the gauge's own unit */
function manifoldTable(plan: Plan, unit: PressureUnit): string[] {
  const rows: string[][] = [['#', 'fill', 'from', 'gauge', 'read on gauge', 'band +-', `target ${unit} abs`]];
  for (const s of plan.steps) {
    let reading = 'NO GAUGE';
    let band = fixedSig(fromPa(s.bandPa, unit), 2);
    if (s.gauge) {
      const gu = isPressureUnit(s.gauge.unit) ? s.gauge.unit : unit;
      const dec = decimalsFor(fromPa(s.gauge.resolutionPa, gu));
      const ref = s.gauge.reference === 'gauge' ? ' (gauge)' : '';
      reading = `${fromPa(s.gauge.readingPa, gu).toFixed(dec)} ${gu}${ref}`;
      const bandValue = fromPa(s.bandPa, gu);
      const bandDec = Math.max(dec, decimalsFor(bandValue / 10));
      band = `${bandValue.toFixed(bandDec)} ${gu}`;
    }
    rows.push([
      String(s.index),
      chargeName(s.species, s.charge),
      s.source.id,
      s.gauge?.id ?? '-',
      reading,
      band,
      fixedSig(fromPa(s.targetPa, unit), 7),
    ]);
  }
  return padTable(rows, [true, false, false, false, true, true, true]);
}

/** table 2: the numbers behind each fill, real gas beside the ideal-gas plan */
function numbersTable(plan: Plan, unit: PressureUnit): string[] {
  const rows: string[][] = [
    ['#', `increment ${unit}`, 'amount mol', 'mass g', 'Z after', `ideal-gas plan ${unit}`, 'real - ideal'],
  ];
  for (const s of plan.steps) {
    const diff = s.targetPa - s.idealTargetPa;
    rows.push([
      String(s.index),
      fixedSig(fromPa(s.incrementPa, unit), 6),
      fixedSig(s.amountMol, 5),
      fixedSig(s.massKg * 1000, 4),
      s.compressibilityAfter.toFixed(6),
      fixedSig(fromPa(s.idealTargetPa, unit), 7),
      Math.abs(diff) < 1e-9 * s.targetPa ? '0' : signed(fixedSig(fromPa(diff, unit), 3)),
    ]);
  }
  return padTable(rows, [true, true, true, true, true, true, true]);
}

/**
 * a source filled in more than one charge: where each charge stops, and that every charge is its
 * own fill with its own reading (the earlier charge's stop reading is its target)
 */
export function splitChargeLines(plan: Plan, unit: PressureUnit): string[] {
  const out: string[] = [];
  const sources = [...new Set(plan.steps.filter((s) => isSplit(s.charge)).map((s) => s.source.id))];
  for (const id of sources) {
    const charges = plan.steps.filter((s) => s.source.id === id);
    const each = charges.map(
      (s) =>
        `${chargeWords(s.charge)} (fill ${s.index}) ` +
        `${s.charge.number < s.charge.of ? 'stops at' : 'ends at'} ${pressure(s.targetPa, unit, 6)} absolute`,
    );
    out.push(
      `Split       ${charges[0].species} from ${id} goes in ${charges.length} charges: ${each.join(', then ')}. ` +
        `Close the cylinder valve at each stop; each charge is read and logged as its own fill.`,
    );
  }
  return out;
}

/** "fill 2" or, for a split source, "fill 2, Ar charge 1 of 2" */
function fillRef(plan: Plan, step: number): string {
  const s = plan.steps.find((x) => x.index === step);
  return s && isSplit(s.charge) ? `fill ${step}, ${s.species} ${chargeWords(s.charge)}` : `fill ${step}`;
}

/** the findings, dangers first (gauge isolation is already said under the table) */
function findingLines(plan: Plan, unit: PressureUnit): string[] {
  if (!plan.findings.length) return [];
  const order: Severity[] = ['danger', 'warning', 'note'];
  const sorted = plan.findings
    .filter((f) => f.code !== 'isolate-gauge')
    .sort((a, b) => order.indexOf(a.severity) - order.indexOf(b.severity));
  const out = ['Findings'];
  for (const f of sorted) {
    out.push(
      `  ${SEVERITY_LABEL[f.severity]} ${f.code}${f.step ? ` (${fillRef(plan, f.step)})` : ''}: ` +
        `${describeFinding(f, (pa) => pressure(pa, unit, 5))}`,
    );
  }
  out.push('');
  return out;
}

export function planToText(plan: Plan, meta: PlanMeta, unit: PressureUnit): string {
  const out: string[] = [...twoStageHead(plan, meta, unit, planToText), ...headerLines(plan, meta, unit)];
  // the headlines: right under the first line (the two-stage line, or the plan's own), a danger first
  const danger = dangerHeadline(plan);
  out.splice(1, 0, ...(danger ? [danger] : []), ...toleranceHeadline(plan, unit));
  out.push(...manifoldTable(plan, unit));
  out.push('');
  out.push(...numbersTable(plan, unit));
  out.push('');
  for (const s of plan.steps) {
    for (const g of s.isolateBefore) {
      out.push(
        `Before fill ${s.index}: close off ${g.id} (${g.label}); it reads only up to ` +
          `${pressure(g.topPa, unit, 4)} absolute.`,
      );
    }
  }
  out.push(...splitChargeLines(plan, unit));
  out.push('');
  out.push(`Filled composition (with cylinder impurities):`);
  const unidentified =
    plan.unidentifiedFraction > 0
      ? `   + unidentified ${fixedSig(plan.unidentifiedFraction * 1e6, 3)} ppm`
      : '';
  out.push(`            ${formatFractions(plan.composition)}${unidentified}`);
  out.push('');
  out.push(...predictedLines(plan));
  out.push(...twoStageDeliveryLines(plan, unit));
  out.push(...premixLogLines(plan, unit));
  out.push(...findingLines(plan, unit));
  out.push(`Caution: ${STANDING_CAUTION}`);
  return out.join('\n') + '\n';
}
