/**
 * The wizard's preview lines: the fill steps and findings of a plan, and for a two-stage design
 * both stages (the premix's targets and predicted U, then the batch's, and the premix tank's
 * pressure before and after it delivers). Pure: the plan in, lines out.
 */
import { allStageFindings, fillLabel, type Finding, type Plan, type PredictedPlan } from '../core/index.js';
import { premixName } from '../io/two-stage-request.js';
import { fromPa, isPressureUnit } from '../io/quantity.js';
import { chargeShort } from '../report/charges.js';
import { decimalsFor, fixedSig } from '../report/format.js';
import { wrapWords } from '../report/wrap.js';
import type { Preview } from './wizard-state.js';

/** one line per fill: number, gas (and charge), gauge and the reading to stop at on it */
export function stepLines(plan: Plan): string[] {
  return plan.steps.map((s) => {
    const u = s.gauge && isPressureUnit(s.gauge.unit) ? s.gauge.unit : 'Torr';
    const dec = s.gauge ? decimalsFor(fromPa(s.gauge.resolutionPa, u)) : 3;
    return (
      `${s.index} ${chargeShort(fillLabel(s.source), s.charge).padEnd(7)} ${s.gauge?.id ?? 'NO GAUGE'} ` +
      `${s.gauge ? fromPa(s.gauge.readingPa, u).toFixed(dec) : '-'} ${u}`
    );
  });
}

/** the dangers, then the warnings, four at most (notes are for `mixwright plan`) */
export function findingLines(findings: readonly Finding[], stageOf?: (f: Finding) => string): string[] {
  const rank = { danger: 0, warning: 1, note: 2 } as const;
  const top = [...findings]
    .filter((f) => f.severity !== 'note')
    .sort((a, b) => rank[a.severity] - rank[b.severity]);
  const lines = top
    .slice(0, 4)
    .map(
      (f) =>
        `${f.severity === 'danger' ? 'DANGER' : 'warning'} ${stageOf ? stageOf(f) : ''}${f.code}` +
        `${f.step ? ` (fill ${f.step})` : ''}`,
    );
  if (top.length > 4) lines.push(`+${top.length - 4} more; see mixwright plan`);
  return lines;
}

/** a line of findingLines: its severity, stage, code and fill */
const FINDING_LINE = /^(DANGER|warning) ((?:stage \d+ )?)(\S+)((?: \(fill \d+\))?)$/;

/**
 * a preview line in rows of at most `width` columns, nothing cut: as it is where it fits; a finding
 * line (findingLines) too long for the width gives its severity and where on its first row and the
 * code whole on the next ("warning (fill 3)", "  predicted-u-over-tolerance"); any other line breaks
 * at its spaces, its rows after the first two columns in
 */
export function previewRows(line: string, width: number): string[] {
  if (line.length <= width) return [line];
  const m = FINDING_LINE.exec(line);
  if (m) {
    const [, severity, stage, code, fill] = m;
    const head = `${severity} ${stage}${fill.trim()}`.trimEnd();
    const rows = [head, `  ${code}`];
    if (rows.every((r) => r.length <= width)) return rows;
  }
  return wrapWords(line, width, { lead: /^\s*/, deeper: 2, keepSpacing: true });
}

const torr4 = (pa: number) => fixedSig(fromPa(pa, 'Torr'), 4);
const pct = (x: number) => `${Number((x * 100).toPrecision(2))} %`;

/** the worst predicted design fraction in the preview's width: "  U x(O2) 0.36 % (tol 0.5 %)" */
function uLine(plan: Plan): string[] {
  const rows = (plan as PredictedPlan).predicted?.rows.filter((r) => r.kind === 'fraction') ?? [];
  if (!rows.length) return ['  U: no prediction'];
  const w = rows.reduce((a, b) => (b.expandedU / b.tolerance > a.expandedU / a.tolerance ? b : a));
  return [
    `  U x(${w.name}) ${pct(w.expandedU / w.design)} (tol ${pct(w.tolerance / w.design)})${w.within ? '' : ' OVER'}`,
  ];
}

/** both stages of a two-stage plan: what the sheet and the fill will use (the full search, not a preview) */
export function twoStagePreview(plan: Plan): Preview {
  const two = plan.twoStage;
  if (!two) throw new Error('twoStagePreview needs a two-stage plan');
  const p = two.premix;
  const d = two.delivery;
  const premixFindings = new Set(p.findings);
  const lines = [
    `stage 1: ${premixName(p.design.composition, two.choice.species)} in ${p.tank.id}`,
    ...stepLines(p),
    ...uLine(p),
    `stage 2: the batch in ${plan.tank.id}`,
    ...stepLines(plan),
    ...uLine(plan),
    `${p.tank.id} ${torr4(d.startPa)}->${torr4(d.endPa)} Torr, need ${torr4(d.requiredPa)}`,
    ...findingLines(allStageFindings(plan), (f) => (premixFindings.has(f) ? 'stage 1 ' : 'stage 2 ')),
  ];
  return { lines, danger: allStageFindings(plan).some((f) => f.severity === 'danger') };
}
