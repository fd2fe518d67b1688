/**
 * The lines that head a plan (plan text, and the fill sheet in every format): a danger found by the
 * review (how many, which codes at which fills, not to be filled as it stands), then a batch that
 * cannot be shown within tolerance even when filled exactly at the targets. A danger comes first.
 */
import { describeFinding, type Finding, type Plan } from '../core/index.js';
import { pressure } from './format.js';
import { passedOverFor } from './two-stage-text.js';
import type { PressureUnit } from './units.js';

const dangersOf = (fs: readonly Finding[]): Finding[] => fs.filter((f) => f.severity === 'danger');

/** "tank-over-rating (fills 2, 3)", "detonable-state (the batch)", "flammable-state (stage 1 fill 2)" */
function codeWhere(code: string, fs: readonly Finding[], stage: string): string {
  const steps = [...new Set(fs.map((f) => f.step).filter((s): s is number => s !== undefined))].sort(
    (a, b) => a - b,
  );
  const batch = fs.some((f) => f.step === undefined);
  const parts = [
    ...(steps.length ? [`${stage}${steps.length > 1 ? 'fills' : 'fill'} ${steps.join(', ')}`] : []),
    ...(batch ? [stage ? 'the premix' : 'the batch'] : []),
  ];
  return `${code} (${parts.join('; ')})`;
}

/** the codes of these dangers with their fills, in the order of their first fill, a batch-wide one last */
function codesWhere(dangers: readonly Finding[], stage: string): string[] {
  const first = (c: string) =>
    Math.min(...dangers.filter((f) => f.code === c).map((f) => f.step ?? Infinity));
  return [...new Set(dangers.map((f) => f.code))]
    .sort((a, b) => first(a) - first(b))
    .map((c) =>
      codeWhere(
        c,
        dangers.filter((f) => f.code === c),
        stage,
      ),
    );
}

/**
 * the count and the codes with their fills, e.g. "(3): tank-over-rating (fills 2, 3), supply-pressure-low
 * (fill 3)"; a two-stage plan counts its premix's (stage 1's) dangers too, as `plan` exits 3 on them
 */
export function dangerSummary(plan: Plan): string | undefined {
  const premix = dangersOf(plan.twoStage?.premix.findings ?? []);
  const own = dangersOf(plan.findings);
  if (!premix.length && !own.length) return undefined;
  const listed = [...codesWhere(premix, 'stage 1 '), ...codesWhere(own, '')].join(', ');
  return `(${premix.length + own.length}): ${listed}`;
}

/**
 * "DANGER findings stand (3): ... Do not fill as planned: ..." or nothing for a plan without a
 * danger; `where` says where the findings are printed ("below").
 */
export function dangerHeadline(plan: Plan, where = 'below'): string | undefined {
  const summary = dangerSummary(plan);
  return (
    summary &&
    `DANGER findings stand ${summary}. Do not fill as planned: see the findings (${where}); fill only ` +
      'once each is resolved or formally accepted.'
  );
}

/**
 * A plan whose predicted U exceeds the tolerance of a design fraction says so under its first line:
 * which fractions, the worst one's U and its largest cause and what would reduce it (the warning's own
 * words), and for a two-stage plan whether a premix choice that meets it was passed over. The exit code
 * stays 0 (a plan produced, README "Exit codes"); `check` of such a batch can at best say NOT SHOWN
 * WITHIN TOLERANCE.
 */
export function toleranceHeadline(plan: Plan, unit: PressureUnit, brief = false): string[] {
  const over = plan.findings.filter(
    (f): f is Extract<Finding, { code: 'predicted-u-over-tolerance' }> =>
      f.code === 'predicted-u-over-tolerance',
  );
  if (!over.length) return bandEdgesHeadline(plan, brief);
  const worst = over.reduce((a, f) => (f.expandedU / f.tolerance > a.expandedU / a.tolerance ? f : a));
  const t = plan.twoStage;
  const m = t?.mostPrecise;
  const search = !t
    ? ''
    : m && m.worstRatio <= 1
      ? ` A premix choice that meets it was passed over for its ${passedOverFor(m)} (below).`
      : ` None of the ${t.candidates} premix choices planned without a danger meets it.`;
  const head =
    `CANNOT MEET ITS TOLERANCE (${over.map((f) => `x(${f.species})`).join(', ')}): even readings ` +
    'exactly at the targets leave the batch NOT SHOWN WITHIN TOLERANCE by `check` (not a pass).';
  // brief (the fill sheet, where space is short): the cause and the fix are in the finding it names
  if (brief) {
    // a premix in another tank proposed (`plan`, `sheet`): the other remedy, in the finding it names
    const premix = plan.findings.some((f) => f.code === 'two-stage-proposed')
      ? ' A premix in another tank first would give a smaller U: two-stage-proposed (findings).'
      : '';
    return [`${head} The cause and what would reduce it: predicted-u-over-tolerance (findings).${premix}`];
  }
  return [`${head} Worst: ${describeFinding(worst, (pa) => pressure(pa, unit))}.${search}`];
}

/**
 * Readings inside every band can fail together (band-edges-past-tolerance): said under the plan's first
 * line too, as a paper fill reads its bands from the table: the share of every band that holds, and
 * that the guided fill re-targets instead
 */
function bandEdgesHeadline(plan: Plan, brief: boolean): string[] {
  const f = plan.findings.find(
    (x): x is Extract<Finding, { code: 'band-edges-past-tolerance' }> =>
      x.code === 'band-edges-past-tolerance',
  );
  if (!f) return [];
  const share = `${Number((f.share * 100).toPrecision(2))} %`;
  // a two-stage plan says it under its first line, above both stages: this is the batch's (stage 2)
  const which = plan.twoStage ? ' OF STAGE 2 (THE BATCH)' : '';
  // the sheet (brief) prints that share of every band as a column of its Fills table
  const where = brief ? 'this sheet' : 'the table';
  const column = brief ? ' (its shared band, a column of the Fills table)' : '';
  // a share finer than a gauge displays cannot be kept to from the table: said, not left to be found out
  const finer = f.bands.filter((b) => b.finerThanDisplay).map((b) => b.step);
  const table = finer.length
    ? `Filling from ${where}, each fill must be read within ${share} of its band${column}, finer than the ` +
      `gauge displays for fill${finer.length > 1 ? 's' : ''} ${finer.join(', ')}: fill with the guided fill ` +
      `(\`mixwright fill\`), which re-targets from each reading`
    : `Filling from ${where}, read each fill within ${share} of its band${column}; the guided fill ` +
      `(\`mixwright fill\`) re-targets from each reading instead`;
  return [
    `READINGS INSIDE EVERY BAND${which} CAN STILL FAIL TOGETHER: each band assumes the fills before it read on ` +
      `target. ${table} (band-edges-past-tolerance: ${brief ? 'findings' : 'below'}).`,
  ];
}
