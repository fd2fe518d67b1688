/**
 * The fill sheet of a two-stage preparation: one sheet per stage, stage 1 (the premix) first,
 * each built by the sheet's own model and renderer; the stage-2 sheet says which premix it
 * draws from (composition +- U from stage 1, one gas a line) and, as a row of its Fills table,
 * the premix tank's reading to tick before the premix fill. Stage 1 says how long the premix
 * takes to become uniform before stage 2 draws from it. A single-tank plan gives its one sheet
 * unchanged; a batch drawn from a premix log gets the same premix rows and check row.
 */
import {
  chooseGauge,
  gaugeReadingPa,
  gaugeTopAbsolutePa,
  mixingEstimate,
  predictionOf,
  premixStartForEndPa,
  type GasSource,
  type Gauge,
  type Plan,
  type PremixDeliveryCheck,
} from '../core/index.js';
import { decimalsFor, fixedSig, pressure, tankName } from './format.js';
import {
  recipeTitle,
  type SheetCheck,
  type SheetLab,
  type SheetMeta,
  type SheetModel,
} from './sheet-model.js';
import { premixLogFractions } from './premix-log-text.js';
import { duration } from './ready-report.js';
import { fromPa, isPressureUnit, paPerUnit, type PressureUnit } from './units.js';

type Build = (plan: Plan, meta: SheetMeta) => SheetModel;

/** the premix a batch draws from, whichever way it was planned */
interface Draw {
  readonly tankId: string;
  readonly source: GasSource;
  readonly volumeM3: number;
  readonly delivery: PremixDeliveryCheck;
  /** the highest the premix tank may read before the batch: its last fill's band top, or its log's last reading */
  readonly upperPa: number;
}

function drawOf(plan: Plan): Draw | undefined {
  const t = plan.twoStage;
  if (t) {
    const last = t.premix.steps[t.premix.steps.length - 1];
    return {
      tankId: t.premix.tank.id,
      source: t.source,
      volumeM3: t.premix.tank.volumeM3,
      delivery: t.delivery,
      upperPa: Math.max(t.delivery.startPa, last ? last.targetPa + last.bandPa : 0),
    };
  }
  const p = plan.premixLog;
  return (
    p && {
      tankId: p.tank.id,
      source: p.source,
      volumeM3: p.tank.volumeM3,
      delivery: p.delivery,
      upperPa: Math.max(p.delivery.startPa, p.lastReadingPa),
    }
  );
}

const fillList = (ns: readonly number[]) =>
  ns.length === 1 ? `fill ${ns[0]}` : `fills ${ns.slice(0, -1).join(', ')} and ${ns[ns.length - 1]}`;

/** the premix tank's reading before the batch's first premix fill, as numbers (the sheet's row and the fill's check) */
export interface PremixTankCheck {
  readonly tankId: string;
  /** the lowest absolute pressure from which the batch's premix delivery still ends at the required pressure, Pa */
  readonly minPa: number;
  /** the gauge to read it on (one that covers it from the minimum to its planned reading), if any */
  readonly gauge?: Gauge;
  readonly unit: PressureUnit;
  readonly decimals: number;
  /** the minimum as read on that gauge, rounded up to its display step ("621.7") */
  readonly minimum: string;
  /** that rounded minimum as an absolute pressure (a gauge-referenced gauge: + the assumed barometer), Pa */
  readonly minimumAbsPa: number;
  /** the planned reading ("1890.2") and the planned absolute pressure, Pa */
  readonly planned: string;
  readonly plannedPa: number;
  readonly delivery: PremixDeliveryCheck;
  /** the batch's fills from the premix, in fill order */
  readonly fills: readonly number[];
  /**
   * the heads still open at the first premix fill whose range ends below the premix tank's pressure:
   * closed off before the line is filled from it; `reopen` when a later reading of the plan needs it
   * (only once the line is back below its range)
   */
  readonly closeOff: readonly { readonly id: string; readonly topPa: number; readonly reopen: boolean }[];
}

/**
 * The premix tank's reading before the batch's first premix fill: at least the pressure from which
 * delivering the batch's premix still leaves it, settled, at the required pressure (the batch reading
 * its last premix charge must reach + PREMIX_DELIVERY_MARGIN; the plan's `premix-runs-low` limit),
 * rounded up to the gauge's display step. The sheet prints it; the guided fill asks for it.
 */
export function premixTankCheck(
  plan: Plan,
  lab: SheetLab | undefined,
  unit: PressureUnit,
): PremixTankCheck | undefined {
  const d = drawOf(plan);
  if (!d) return undefined;
  const fills = plan.steps.filter((s) => s.source.id === d.source.id).map((s) => s.index);
  if (!fills.length) return undefined;
  const del = d.delivery;
  const minPa = premixStartForEndPa({
    composition: d.source.composition,
    volumeM3: d.volumeM3,
    temperatureK: plan.temperatureK,
    endPa: del.requiredPa,
    deliveredMol: del.deliveredMol,
  });
  const g = lab && chooseGauge(lab.gauges, minPa, d.upperPa, lab.reading)?.gauge;
  const gu: PressureUnit = g && isPressureUnit(g.unit) ? g.unit : unit;
  const shown = (pa: number) => fromPa(g && lab ? gaugeReadingPa(g, pa, lab.reading) : pa, gu);
  // the gauge's display step, else about five significant digits; a minimum is rounded up
  const dec = g
    ? decimalsFor(fromPa(g.resolutionPa, gu))
    : Math.max(0, 4 - Math.floor(Math.log10(Math.abs(shown(minPa)))));
  const step = 10 ** -dec;
  const minShown = Math.ceil(shown(minPa) / step - 1e-9) * step;
  const offset = g && lab && g.reference === 'gauge' ? lab.reading.barometricPa : 0;
  return {
    tankId: d.tankId,
    minPa,
    gauge: g,
    unit: gu,
    decimals: dec,
    minimum: minShown.toFixed(dec),
    minimumAbsPa: Number(minShown.toFixed(dec)) * paPerUnit(gu) + offset,
    planned: shown(del.startPa).toFixed(dec),
    plannedPa: del.startPa,
    delivery: del,
    fills,
    closeOff: lab ? closeOffFor(plan, lab, fills[0], d.upperPa) : [],
  };
}

/** the heads open before fill `first` (the plan's own close-offs before it done) that read only below `upperPa` */
function closeOffFor(plan: Plan, lab: SheetLab, first: number, upperPa: number): PremixTankCheck['closeOff'] {
  const closedAt = new Map<string, number>();
  for (const s of plan.steps) for (const g of s.isolateBefore) closedAt.set(g.id, s.index);
  return lab.gauges
    .filter((g) => (closedAt.get(g.id) ?? Infinity) > first)
    .map((g) => ({ g, topPa: gaugeTopAbsolutePa(g, lab.reading) }))
    .filter(({ topPa }) => topPa < upperPa)
    .map(({ g, topPa }) => ({
      id: g.id,
      topPa,
      // a head the plan reads on at or after this fill, before its own close-off
      reopen: plan.steps.some(
        (s) => s.index >= first && s.gauge?.id === g.id && (closedAt.get(g.id) ?? Infinity) > s.index,
      ),
    }));
}

/**
 * "Close off head-1kT (...) before the line is filled from MT-2; open it again ..." or nothing: the
 * stage-2 sheet's words and the guided fill's premix-tank screen's (one function, so they agree)
 */
export function premixCloseOffWords(
  closeOff: PremixTankCheck['closeOff'],
  tank: string,
  batchTank: string,
  unit: PressureUnit,
): string {
  if (!closeOff.length) return '';
  const heads = closeOff.map((h) => `${h.id} (it reads only up to ${pressure(h.topPa, unit, 5)} absolute)`);
  const again = closeOff.filter((h) => h.reopen).map((h) => h.id);
  const reopen = again.length
    ? `; open ${again.join(' and ')} again for the fill only once the line is back below ` +
      `${again.length > 1 ? 'their ranges' : 'its range'} (${tank}'s valve closed, the ${batchTank} valve opened)`
    : '';
  return `Close off ${heads.join(' and ')} before the line is filled from ${tank}${reopen}. `;
}

/** the premix tank's check as the sheet's row: the gauge, the minimum, and why, in words */
function premixCheck(plan: Plan, d: Draw, lab: SheetLab | undefined, unit: PressureUnit) {
  const c = premixTankCheck(plan, lab, unit);
  if (!c) return undefined;
  const { gauge: g, minimum, planned, delivery: del, minPa, unit: gu } = c;
  const tank = tankName(d.tankId);
  const first = c.fills[0];
  const which = fillList(c.fills);
  const gaugeName = g ? g.id : lab ? 'NO GAUGE' : 'a gauge that reads it';
  const readOn = g
    ? `read ${tank} on ${g.id}` +
      (g.reference === 'gauge' && lab
        ? ` (gauge-referenced: the minimum assumes a barometric pressure of ` +
          `${pressure(lab.reading.barometricPa, 'Torr', 5)}; add the assumed minus today's barometer)`
        : '')
    : lab
      ? `no gauge of the lab profile reads ${tank} from ${pressure(minPa, unit, 5)} to ` +
        `${pressure(d.upperPa, unit, 5)}: read it on one that does`
      : `read ${tank}`;
  const check: SheetCheck = {
    what: `Premix tank ${tank}`,
    when: `before fill ${first}`,
    gauge: gaugeName,
    reference: g?.reference ?? 'absolute',
    minimum,
    unit: gu,
    planned,
    note:
      premixCloseOffWords(c.closeOff, tank, tankName(plan.tank.id), unit) +
      `Before fill ${first}, with the ${tankName(plan.tank.id)} valve closed and the line filled from ${tank}, ` +
      `${readOn}: at least ${minimum} ${gu} (planned ${planned} ${gu}). Below that, do not fill from it: ` +
      `delivering the ${fixedSig(del.deliveredMol, 3)} mol of ${which} would leave ${tank} below ` +
      `${pressure(del.requiredPa, unit, 5)} (the ${pressure(del.targetPa, unit, 5)} that ` +
      `${tankName(plan.tank.id)} must reach at fill ${c.fills[c.fills.length - 1]}, + 10 % for a ` +
      `controllable flow at the end); make a new premix or a smaller batch.`,
  };
  return { fill: first, check };
}

/** the premix tank's mixing estimate at its pressure before the batch, from the lab profile's height */
function premixMixing(plan: Plan, lab: SheetLab | undefined): string | undefined {
  const m = premixMixingTime(plan, lab);
  if (!m) return undefined;
  return m.stirred
    ? 'stirred ________ min since its last fill (common practice: 15-30 min), or rested at least ' +
        `${duration(m.restS)} (diffusion alone to 0.1 %)`
    : `rested at least ${duration(m.restS)} since its last fill (unstirred, diffusion alone to 0.1 %): ` +
        'since ______';
}

/**
 * the premix tank's mixing before the batch draws from it: stirred (lab profile), and the time diffusion
 * alone takes to 0.1 % residual non-uniformity at its pressure before the batch; undefined without a height
 */
export function premixMixingTime(
  plan: Plan,
  lab: SheetLab | undefined,
): { readonly stirred: boolean; readonly restS: number } | undefined {
  const d = drawOf(plan);
  const info = d && lab?.tanks.find((t) => t.id === d.tankId);
  if (!d || !info?.heightM) return undefined;
  const m = mixingEstimate(
    d.source.composition,
    plan.temperatureK,
    d.delivery.startPa,
    info.heightM,
    Boolean(info.stirred),
  );
  return m.to01PercentS === undefined ? undefined : { stirred: Boolean(info.stirred), restS: m.to01PercentS };
}

/** the batch's checks before filling that a premix adds: the premix tank mixed since its fill */
function premixPreCheck(plan: Plan, d: Draw, lab: SheetLab | undefined): string {
  const how = premixMixing(plan, lab);
  return (
    `Premix in ${tankName(d.tankId)} uniform before the batch draws from it: ` +
    (how ?? 'stirred ________ min or rested ________ h since its last fill (diffusion alone takes hours)')
  );
}

/** the rows the stage-2 sheet adds to its design block: the premix source and its tank's pressures */
function premixRows(plan: Plan, unit: SheetMeta['unit'], checkFill?: number): [string, string][] {
  const t = plan.twoStage!;
  const st = predictionOf(t.premix);
  const comp = Object.entries(t.source.composition)
    .filter(([, v]) => v >= 1e-4)
    .map(([k, v]) => {
      const u = st?.result.composition[k]?.u;
      return u !== undefined ? `${k} ${fixedSig(v, 6)} +- ${fixedSig(2 * u, 2)}` : `${k} ${fixedSig(v, 6)}`;
    });
  const d = t.delivery;
  return [
    ['Stage', `2 of 2: the batch, from the premix of stage 1 (${t.source.id})`],
    ['Premix', [...comp, '(stage-1 prediction, U with k = 2)'].join('\n')],
    [
      'Targets',
      'from that prediction: once stage 1 is filled, re-print this sheet with `sheet --premix-log` and ' +
        'the stage-1 log, whose re-checked premix gives the targets to fill to',
    ],
    [
      'Premix tank',
      `${tankName(t.premix.tank.id)} at ${pressure(d.startPa, unit, 5)} before; ` +
        `${pressure(d.endPa, unit, 5)} after (settled); it must stay above ${pressure(d.requiredPa, unit, 5)}` +
        (checkFill ? `: read it before fill ${checkFill} (Fills)` : ''),
    ],
  ];
}

/** the rows a batch drawn from an existing premix tank adds: the premix log, its composition, its tank */
function premixLogRows(plan: Plan, unit: SheetMeta['unit'], checkFill?: number): [string, string][] {
  const p = plan.premixLog;
  if (!p) return [];
  const d = p.delivery;
  const drawn = p.draws.length
    ? `; ${fixedSig(
        p.draws.reduce((a, x) => a + x.mol, 0),
        3,
      )} mol already drawn by ${p.draws.map((x) => x.log).join(', ')}`
    : '';
  return [
    [
      'Premix log',
      `${p.log} (${p.source.id}; last entry ${p.lastEntrySha256.slice(0, 12)}): check that it is this tank's log`,
    ],
    ['Premix', [...premixLogFractions(p), '(re-checked from its log, U with k = 2)'].join('\n')],
    [
      'Premix tank',
      `${tankName(p.tank.id)} at ${pressure(d.startPa, unit, 5)} before (last reading ` +
        `${pressure(p.lastReadingPa, unit, 5)}${drawn}); ${pressure(d.endPa, unit, 5)} after (settled); ` +
        `it must stay above ${pressure(d.requiredPa, unit, 5)}` +
        (checkFill ? `: read it before fill ${checkFill} (Fills)` : ''),
    ],
  ];
}

/** the batch's sheet with its premix: the design rows, the premix tank's check row and its mixing pre-check */
function withPremix(plan: Plan, sheet: SheetModel, meta: SheetMeta): SheetModel {
  const d = drawOf(plan);
  if (!d) return sheet;
  const c = premixCheck(plan, d, meta.lab, meta.unit);
  const rows = plan.twoStage ? premixRows(plan, meta.unit, c?.fill) : premixLogRows(plan, meta.unit, c?.fill);
  // the pre-checks end with the cylinders' line; the premix's mixing goes before it
  const pre = [...sheet.preChecks];
  pre.splice(Math.max(0, pre.length - 1), 0, premixPreCheck(plan, d, meta.lab));
  return {
    ...sheet,
    design: [...rows, ...sheet.design],
    preChecks: pre,
    rows: sheet.rows.map((r) => (c && r.n === c.fill ? { ...r, check: c.check } : r)),
  };
}

/**
 * The sheets to print, stage 1 first. `build` is the sheet's own model builder; the stage-1
 * sheet carries the batch id with "-premix" and its own title.
 */
export function stageSheets(plan: Plan, meta: SheetMeta, build: Build): SheetModel[] {
  const t = plan.twoStage;
  if (!t) return [withPremix(plan, build(plan, meta), meta)];
  // the batch's title, marked where an option overrode what it states; the stage titles carry it as it is
  const title = recipeTitle(plan, meta) ?? meta.recipe.id;
  const stage2 = withPremix(
    plan,
    build(plan, {
      ...meta,
      overrides: undefined,
      recipe: { ...meta.recipe, title: `Stage 2 of 2: ${title}` },
    }),
    meta,
  );
  const premixMeta: SheetMeta = {
    ...meta,
    overrides: undefined,
    recipe: {
      id: `${meta.recipe.id}-premix`,
      title: `Stage 1 of 2: premix in ${tankName(t.premix.tank.id)} for ${title}`,
    },
    batchId: meta.batchId ? `${meta.batchId}-premix` : undefined,
    orderRecommended: t.premix.orderRecommended,
    // the premix tank's own mixing time (from the lab profile), said as what stage 2 waits for
    mixing: undefined,
    premixFor: stage2.batchId,
  };
  const stage1 = build(t.premix, premixMeta);
  const one: SheetModel = {
    ...stage1,
    design: [['Stage', `1 of 2: the premix that stage 2 (${stage2.batchId}) draws from`], ...stage1.design],
  };
  return [one, stage2];
}

/** the rendered sheets as one document: text and Markdown one after the other, HTML bodies joined with a page break */
export function joinSheets(docs: readonly string[], format: 'html' | 'md' | 'txt'): string {
  if (docs.length === 1 || format !== 'html') return docs.join('\n\n');
  const bodyOf = (html: string) =>
    html.slice(html.indexOf('<body>') + '<body>'.length, html.lastIndexOf('</body>'));
  const first = docs[0];
  const end = first.lastIndexOf('</body>');
  const rest = docs
    .slice(1)
    .map((d) => `<div style="break-before: page; page-break-before: always"></div>${bodyOf(d)}`)
    .join('');
  return first.slice(0, end) + rest + first.slice(end);
}
