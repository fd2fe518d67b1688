/**
 * The fill sheet of a two-stage preparation: one sheet per stage, stage 1 (the premix) first,
 * each built by the sheet's own model and renderer; the stage-2 sheet says which premix it
 * draws from (composition +- U from stage 1) and how low the premix tank may fall. A single-tank
 * plan gives its one sheet unchanged.
 */
import { predictionOf, type Plan } from '../core/index.js';
import { fixedSig, pressure, tankName } from './format.js';
import type { SheetMeta, SheetModel } from './sheet-model.js';
import { premixLogComposition } from './premix-log-text.js';

type Build = (plan: Plan, meta: SheetMeta) => SheetModel;

/** the rows the stage-2 sheet adds to its design block: the premix source and its tank's pressures */
function premixRows(plan: Plan, unit: SheetMeta['unit']): [string, string][] {
  const t = plan.twoStage!;
  const st = predictionOf(t.premix);
  const comp = Object.entries(t.source.composition)
    .filter(([, v]) => v >= 1e-4)
    .map(([k, v]) => {
      const u = st?.result.composition[k]?.u;
      return u !== undefined ? `${k} ${fixedSig(v, 6)} ± ${fixedSig(2 * u, 2)}` : `${k} ${fixedSig(v, 6)}`;
    })
    .join(', ');
  const d = t.delivery;
  return [
    ['Stage', `2 of 2: the batch, from the premix of stage 1 (${t.source.id})`],
    [
      'Premix',
      `${comp} (stage-1 prediction, U with k = 2). The targets of this sheet are from that prediction: ` +
        'once stage 1 is filled, re-print this sheet with `sheet --premix-log` and the stage-1 log, whose ' +
        're-checked premix gives the targets to fill to',
    ],
    [
      'Premix tank',
      `${tankName(t.premix.tank.id)} at ${pressure(d.startPa, unit, 5)} before; ` +
        `${pressure(d.endPa, unit, 5)} after (settled); it must stay above ${pressure(d.requiredPa, unit, 5)}`,
    ],
  ];
}

/** the rows a batch drawn from an existing premix tank adds: the premix log, its composition, its tank */
function premixLogRows(plan: Plan, unit: SheetMeta['unit']): [string, string][] {
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
    ['Premix', `${premixLogComposition(p)} (re-checked from its log, U with k = 2)`],
    [
      'Premix tank',
      `${tankName(p.tank.id)} at ${pressure(d.startPa, unit, 5)} before (last reading ` +
        `${pressure(p.lastReadingPa, unit, 5)}${drawn}); ${pressure(d.endPa, unit, 5)} after (settled); ` +
        `it must stay above ${pressure(d.requiredPa, unit, 5)}: read it before the premix fill`,
    ],
  ];
}

/**
 * The sheets to print, stage 1 first. `build` is the sheet's own model builder; the stage-1
 * sheet carries the batch id with "-premix" and its own title.
 */
export function stageSheets(plan: Plan, meta: SheetMeta, build: Build): SheetModel[] {
  const t = plan.twoStage;
  if (!t) {
    const sheet = build(plan, meta);
    const rows = premixLogRows(plan, meta.unit);
    return [rows.length ? { ...sheet, design: [...rows, ...sheet.design] } : sheet];
  }
  const title = meta.recipe.title ?? meta.recipe.id;
  const premixMeta: SheetMeta = {
    ...meta,
    recipe: {
      id: `${meta.recipe.id}-premix`,
      title: `Stage 1 of 2: premix in ${tankName(t.premix.tank.id)} for ${title}`,
    },
    batchId: meta.batchId ? `${meta.batchId}-premix` : undefined,
    orderRecommended: true,
    mixing: undefined,
  };
  const stage1 = build(t.premix, premixMeta);
  const stage2 = build(plan, { ...meta, recipe: { ...meta.recipe, title: `Stage 2 of 2: ${title}` } });
  const one: SheetModel = {
    ...stage1,
    design: [['Stage', `1 of 2: the premix that stage 2 (${stage2.batchId}) draws from`], ...stage1.design],
  };
  const two: SheetModel = { ...stage2, design: [...premixRows(plan, meta.unit), ...stage2.design] };
  return [one, two];
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
