/**
 * The as-filled tank label: what is in the tank by its own readings, never the design.
 * Built from a re-check report (the same computation `check` prints), so the label and
 * `check --json` of one log carry the same composition and expanded uncertainty. A
 * failed re-check makes a label that says FAIL first and names what is off; a pass the
 * measurement cannot prove says so in words. A log that records a reading past the tank's
 * working limit or a gauge's range makes a label that says DANGER before any verdict, with
 * the caveats of `check` beside it: such a label never reads as fit.
 *
 * Pure: the fill's end screen and `mixwright label` both call it.
 */
import type { OutputStat, VerdictKind } from '../core/index.js';
import { tankHazards } from './tank-hazards.js';
import type { CheckReport, LogView } from './check-types.js';
import { overallVerdict, type CheckOutcome } from './check-outcome.js';
import { fromPa, isPressureUnit, type PressureUnit } from './units.js';
import { decimalsFor, fixedSig, tankName } from './format.js';
import { LABEL_STYLE, wrapWords } from './wrap.js';

/** one mole fraction on the label, in mole percent, with its expanded uncertainty U (k = 2) */
export interface LabelFraction {
  readonly species: string;
  readonly value: number;
  readonly expandedU: number;
  /** e.g. "0.6669 % +- 0.0015 %", or ppm below 0.1 % (U to two significant digits, the value to the same place) */
  readonly text: string;
}

export type LabelStatus =
  'pass' | 'pass-uncertain' | 'fail' | 'incomplete' | 'no-design' | 'premix-not-checked' | 'record-altered';

/** the premix a batch was made from, as the logs say it: re-checked from its own log, or why not */
export interface LabelPremix {
  /** the premix tank */
  readonly tank: string;
  /** the premix log as the batch log names it */
  readonly log: string;
  /** the premix batch's id and the first 12 hex digits of its last entry's hash (re-checked only) */
  readonly id?: string;
  readonly lastEntry?: string;
  /** re-checked now from the premix log's readings by `check`'s model */
  readonly checked: boolean;
  /** the re-checked fractions, one gas a line: "O2 13.423 % +- 0.035 %" (empty when not checked) */
  readonly fractions: readonly string[];
  /** why it was not re-checked, in a few words (label) and as the refusal words it (certificate) */
  readonly short?: string;
  readonly problem?: string;
}

export interface LabelModel {
  readonly batchId: string;
  readonly tank: string;
  readonly lab: string;
  /** date of the last logged reading (YYYY-MM-DD), or "date not logged" */
  readonly filledOn: string;
  readonly status: LabelStatus;
  /** the composition's own judgement (check --json `composition_verdict`) */
  readonly verdict: VerdictKind;
  /** the re-check's overall verdict, as `check --json` `verdict` and the exit code give it */
  readonly outcome: CheckOutcome | 'pass';
  /** the first line of the label: the verdict in capitals where it is not a proven pass */
  readonly headline: string;
  /** one line per design species outside its tolerance (fail), or whose U reaches past it (pass-uncertain) */
  readonly offDesign: readonly string[];
  readonly composition: readonly LabelFraction[];
  readonly phi?: string;
  readonly dilution?: string;
  readonly finalPressure: string;
  readonly finalTemperature: string;
  /**
   * the hazard marks of the as-filled composition at the final state (tank-hazards.ts): flammable by
   * itself or in air, oxygen-enriched; at least one line
   */
  readonly hazards: readonly string[];
  /**
   * the log records a danger (a reading past the tank's working limit or a gauge's range):
   * whatever the composition, the tank is not fit to use
   */
  readonly danger: boolean;
  /**
   * the readings past their gauge's range the composition rests on ("line 5, head-1kT"), where a design
   * fraction depends on one: not shown within tolerance for that reason, not its uncertainty
   */
  readonly pastRange?: string;
  /** what stands beside the verdict, as `check` words it (report.caveats) */
  readonly caveats: readonly string[];
  /** the premixes the batch was made from (batch log header `premix_logs`); empty for a batch of cylinders */
  readonly premix: readonly LabelPremix[];
}

const PCT = 100;

/** value +- U with U to two significant digits and the value to the same decimal place (GUM 7.2.6) */
export function withU(value: number, U: number, unit = ''): string {
  const sfx = unit ? ` ${unit}` : '';
  if (!(U > 0) || !Number.isFinite(U)) return `${fixedSig(value, 6)}${sfx} (U not computed)`;
  const place = Math.floor(Math.log10(U)) - 1;
  const dec = Math.max(0, -place);
  return `${value.toFixed(dec)}${sfx} +- ${U.toFixed(dec)}${sfx}`;
}

/** below this mole fraction the label gives ppm (mol/mol) instead of % */
const PPM_BELOW = 1e-3;

function fraction(species: string, st: Pick<OutputStat, 'value' | 'u'>): LabelFraction {
  const text =
    st.value < PPM_BELOW
      ? withU(st.value * 1e6, 2 * st.u * 1e6, 'ppm')
      : withU(st.value * PCT, 2 * st.u * PCT, '%');
  return { species, value: st.value, expandedU: 2 * st.u, text };
}

function unitOf(u: string): PressureUnit {
  return isPressureUnit(u) ? u : 'Pa';
}

export function statusOf(r: CheckReport): LabelStatus {
  if (r.incomplete.length) return 'incomplete';
  // a premix that could not be re-checked leaves the composition unproven, whatever the numbers say
  if (r.premixNotChecked?.length) return 'premix-not-checked';
  // a log changed after it was written proves nothing, whatever its numbers say (check: exit 5, not a pass);
  // a failing composition is said as such first
  if (r.record?.alteredLines.length && r.verdict.verdict !== 'fail') return 'record-altered';
  return r.verdict.verdict;
}

const HEADLINE: Record<LabelStatus, string> = {
  pass: 'PASS - as filled, within tolerance (uncertainty included)',
  'pass-uncertain':
    'NOT SHOWN WITHIN TOLERANCE - inside on the readings, but the uncertainty reaches past it',
  fail: 'FAIL - OUT OF TOLERANCE: NOT THE DESIGN MIXTURE',
  incomplete: 'FAIL - INCOMPLETE BATCH: NOT THE DESIGN MIXTURE',
  'no-design': 'NO DESIGN TO COMPARE WITH - NOT A PASS: composition as measured',
  'premix-not-checked': 'PREMIX NOT RE-CHECKED: COMPOSITION NOT PROVEN',
  'record-altered': 'RECORD ALTERED AFTER WRITING: NOT A PASS - COMPOSITION NOT PROVEN',
};

/**
 * A composition within tolerance (or inside it on the readings) that the record makes no pass, the
 * record not saying so in the headline by itself: what leads the headline then, as `check` marks it
 */
const OUTCOME_LEAD: Partial<Record<CheckOutcome, string>> = {
  'plan-danger-not-acknowledged': 'PLAN DANGER NOT ACKNOWLEDGED - NOT A PASS',
  'recorded-fill-danger': 'DANGER IN THE RECORDED FILL - NOT A PASS',
  'accepted-hazard': 'ACCEPTED HAZARD - NOT A PASS',
  'premix-drawn-early': 'PREMIX DRAWN EARLY - NOT A PASS',
  'not-closed': 'NOT CLOSED - NOT A PASS',
};

/** the composition's judgement under an outcome that leads the headline (never the word PASS) */
const COMPOSITION_ONLY: Partial<Record<LabelStatus, string>> = {
  // within the label's 78 columns: U is the expanded uncertainty the label gives with each fraction
  pass: 'composition only, within tolerance with U: it does not make the tank usable',
  'pass-uncertain': 'composition only: not shown within tolerance, the uncertainty reaches past it',
};

/**
 * the first line of the label: beside a danger the verdict speaks of the composition only; a plan
 * danger nobody acknowledged, hazards accepted at the manifold or a log never closed lead it
 */
function headlineOf(status: LabelStatus, outcome: CheckOutcome | 'pass', danger: boolean): string {
  // never the word PASS beside a danger: a composition within tolerance is said as the composition alone
  if (danger) return status === 'pass' ? COMPOSITION_ONLY.pass! : `composition only: ${HEADLINE[status]}`;
  const lead = outcome === 'pass' ? undefined : OUTCOME_LEAD[outcome];
  return lead && COMPOSITION_ONLY[status] ? lead : HEADLINE[status];
}

/** whether the headline is led by an outcome of the record (the label boxes it as a warning) */
export function outcomeLeads(m: Pick<LabelModel, 'outcome' | 'status' | 'danger'>): boolean {
  return (
    !m.danger &&
    m.outcome !== 'pass' &&
    Boolean(OUTCOME_LEAD[m.outcome]) &&
    Boolean(COMPOSITION_ONLY[m.status])
  );
}

/** the label's statuses that must not be used as the design mixture */
export function notDesign(s: LabelStatus): boolean {
  return s === 'fail' || s === 'incomplete' || s === 'premix-not-checked' || s === 'record-altered';
}

/** the premixes of the report: each re-checked one with its fractions, each one that was not with why */
function premixOf(r: CheckReport): LabelPremix[] {
  const checked = (r.premixLogs ?? []).map((p): LabelPremix => ({
    tank: tankName(p.tank),
    log: p.log,
    id: p.id,
    lastEntry: p.lastEntrySha256.slice(0, 12),
    checked: true,
    fractions: Object.entries(p.composition)
      // the premix's own gases, as check's Premix line gives them (its trace impurities are in the batch's)
      .filter(([, c]) => c.value >= 1e-4)
      .sort((a, b) => b[1].value - a[1].value)
      .map(([k, c]) => `${k} ${fraction(k, c).text}`),
  }));
  const not = (r.premixNotChecked ?? []).map((p): LabelPremix => ({
    tank: tankName(p.tank),
    log: p.log,
    checked: false,
    fractions: [],
    short: p.short,
    problem: p.why,
  }));
  return [...checked, ...not];
}

/** the label's lines on its premixes: what each was re-checked to, or that it was not and why */
function premixLines(m: LabelModel): string[] {
  const out: string[] = [];
  for (const p of m.premix) {
    if (p.checked) {
      out.push(`Made from premix ${p.id} in ${p.tank}, re-checked from its log:`);
      out.push(`  ${p.log} (last entry ${p.lastEntry})`);
      for (const f of p.fractions) out.push(`  ${f}`);
    } else {
      out.push(`*** PREMIX IN ${p.tank} NOT RE-CHECKED: ${p.short} ***`);
      out.push(`  ${p.log}`);
      out.push('  the fractions above use the premix as this log recorded it,', '  without its uncertainty');
    }
  }
  return out;
}

/** the first line of a label whose log records a danger: it comes before any composition verdict */
export const DANGER_HEADLINE = 'DANGER - NOT FIT FOR USE: A READING WENT PAST A TANK OR GAUGE LIMIT';
const DANGER_FOOTER = '*** DO NOT USE THIS TANK UNTIL IT AND ITS GAUGES HAVE BEEN INSPECTED ***';

/** a standing danger in the log's record (the same test as the exit code 3 of `check`) */
export function recordsDanger(r: CheckReport): boolean {
  return r.findings.some((f) => f.severity === 'danger');
}

/**
 * a line broken into lines of at most `width` characters at spaces, each continuation in a hanging indent
 * (four columns, or two deeper than the line's own text): no orphan, where the line before can give
 * it words (a last row of one word or under 12 characters: a label reads as text, not a stranded word)
 */
export function wrapLine(text: string, width: number): string[] {
  return wrapWords(text, width, LABEL_STYLE);
}

function offDesign(r: CheckReport): string[] {
  const out: string[] = [];
  for (const d of r.verdict.deviations) {
    const rel = d.deviation / d.design;
    const dir = d.deviation < 0 ? 'below' : 'above';
    const tolPct = (d.tolerance / d.design) * PCT;
    if (!d.within)
      out.push(
        `${d.species} ${fixedSig(Math.abs(rel) * PCT, 2)} % (relative) ${dir} design; ` +
          `tolerance ${fixedSig(tolPct, 2)} %`,
      );
    else if (d.pastRange?.length)
      out.push(`${d.species}: not shown (rests on line ${d.pastRange.join(', ')}, past its gauge range)`);
    else if (!d.provenWithin)
      out.push(
        `${d.species} ${fixedSig(Math.abs(rel) * PCT, 2)} % (relative) ${dir} design, ` +
          `but U ${fixedSig((d.expandedU / d.design) * PCT, 2)} % reaches past the ` +
          `tolerance ${fixedSig(tolPct, 2)} %`,
      );
  }
  if (r.incomplete.length) out.push(`no reading for ${r.incomplete.join(', ')}`);
  // as check's verdict marks it: gas may have gone in after the last reading
  else if (r.record && !r.record.closed)
    out.push('NOT CLOSED: the fill never ended with a close entry; read the tank before it is used');
  return out;
}

/**
 * the tank's final pressure and temperature: its last reading, or after a vent the reading after
 * venting; a vent not read after says so (never the pressure before venting as the final one)
 */
function finalState(r: CheckReport, unit: PressureUnit, dec: number) {
  const last = r.readings[r.readings.length - 1];
  const p = (pa: number) => `${fromPa(pa, unit).toFixed(dec)} ${unit}`;
  const v = r.vent;
  const at = v?.after ?? last;
  return {
    finalPressure: !v
      ? `${p(last.pressurePa)} absolute`
      : v.after
        ? `${p(v.after.pressurePa)} absolute after venting`
        : `PRESSURE NOT READ after venting (${p(last.pressurePa)} absolute before venting)`,
    finalTemperature: `${(at.temperatureK - 273.15).toFixed(1)} degC`,
  };
}

export function labelModel(r: CheckReport, log?: LogView): LabelModel {
  const status = statusOf(r);
  const danger = recordsDanger(r);
  // a design fraction resting on a reading past its gauge's range (a danger of the record, so `danger`)
  const past =
    status === 'pass-uncertain' && r.verdict.deviations.some((d) => d.pastRange?.length)
      ? (r.verdict.pastRange ?? []).map((p) => `line ${p.line}, ${p.gauge}`).join('; ')
      : undefined;
  const composition = Object.entries(r.result.composition)
    .filter(([, st]) => st.value > 0)
    .sort((a, b) => b[1].value - a[1].value)
    .map(([k, st]) => fraction(k, st));
  const last = r.readings[r.readings.length - 1];
  const unit = unitOf(last.gauge.unit);
  const dec = Math.max(0, decimalsFor(fromPa(last.gauge.resolutionPa, unit)));
  const times = (log?.readings ?? [])
    .map((x) => x.time)
    .filter(Boolean)
    .sort();
  const lastTime = times[times.length - 1];
  const phi = r.result.phi;
  const dil = r.result.diluentFraction;
  return {
    batchId: r.id,
    tank: log ? tankName(log.header.tank.id) : 'tank not logged',
    lab: log?.header.lab ?? '',
    filledOn: lastTime ? lastTime.slice(0, 10) : 'date not logged',
    status,
    verdict: r.verdict.verdict,
    outcome: overallVerdict(r),
    headline: past
      ? 'composition only: NOT SHOWN WITHIN TOLERANCE (a reading past its gauge range)'
      : headlineOf(status, overallVerdict(r), danger),
    ...(past ? { pastRange: past } : {}),
    // under a headline led by the record, the composition's own judgement first
    offDesign: [
      ...(outcomeLeads({ outcome: overallVerdict(r), status, danger })
        ? [COMPOSITION_ONLY[status] ?? '']
        : []),
      ...offDesign(r),
    ],
    composition,
    phi: phi ? withU(phi.value, 2 * phi.u) : undefined,
    dilution: dil ? withU(dil.value * PCT, 2 * dil.u * PCT, '%') : undefined,
    ...finalState(r, unit, dec),
    hazards: tankHazards(r, log).marks,
    danger,
    caveats: r.caveats,
    premix: premixOf(r),
  };
}

/** the label as lines of plain text, the verdict first; what the fill's end screen and `label` print */
/**
 * the label's lines, each at most `width` characters (76: inside an 80-column box, as the `label` text
 * and the fill's end screen draw it); a longer line wraps at words (wrapLine)
 */
export function labelLines(m: LabelModel, width = LABEL_WIDTH): string[] {
  return labelRows(m).flatMap((l) => wrapLine(l, width));
}

/** the width of a label's text: an 80-column box with its edge and a space each side */
export const LABEL_WIDTH = 76;

function labelRows(m: LabelModel): string[] {
  const bad = notDesign(m.status);
  const out: string[] = [];
  // a danger in the record comes first: a composition within tolerance never reads as fit beside it
  if (m.danger) out.push(`*** ${DANGER_HEADLINE} ***`);
  out.push(bad || outcomeLeads(m) ? `*** ${m.headline} ***` : m.headline);
  for (const o of m.offDesign) out.push(`  ${o}`);
  for (const c of m.caveats) out.push(`! ${c}`);
  out.push(`Batch ${m.batchId}   tank ${m.tank}   filled ${m.filledOn}`);
  out.push('As filled, mole fraction +- U (k = 2):');
  for (const c of m.composition) out.push(`  ${c.species.padEnd(8)} ${c.text}`);
  const extra = [m.phi ? `phi ${m.phi}` : '', m.dilution ? `dilution ${m.dilution}` : ''].filter(Boolean);
  if (extra.length) out.push(extra.join('   '));
  out.push(`${m.finalPressure} at ${m.finalTemperature}`);
  out.push(...premixLines(m));
  out.push(...m.hazards);
  if (bad) out.push('*** DO NOT USE AS THE DESIGN MIXTURE ***');
  if (m.danger) out.push(DANGER_FOOTER);
  return out;
}

export function renderLabelText(m: LabelModel): string {
  return labelLines(m).join('\n') + '\n';
}
