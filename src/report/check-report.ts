/** Renderers of a re-check: text for the terminal, JSON with SI keys, and the folder summary. */
import { fixedSig, padTable } from './format.js';
import { STDERR_STYLE, wrapWords } from './wrap.js';
import { fromPa, isPressureUnit, type PressureUnit } from './units.js';
import { checkOutcomes, COMPOSITION_ALONE_NOT_USABLE, overallVerdict } from './check-outcome.js';
import {
  dangerList,
  hazardList,
  premixCheckText,
  readByText,
  type AcceptedHazard,
  type AmendmentRecord,
  type CheckReport,
  type LoggedReading,
  type PlanDanger,
  type RecordedFill,
} from './check-types.js';
import {
  describeProblem,
  describeProblemAt,
  speciesRole,
  type OutputStat,
  type SpeciesDeviation,
  type PremixLogCause,
  type Problem,
  type Where,
} from '../core/index.js';
import { tankHazards } from './tank-hazards.js';

/** CSV readings without --recipe: what was computed, and why that is no pass */
const NO_DESIGN_TEXT =
  'NO DESIGN - not a pass: the composition above is computed from the readings, with its ' +
  'uncertainty, but there is no design and so no tolerance to compare it with: nothing is shown ' +
  'within tolerance. Give --recipe RECIPE (the design the tank was filled to) for a verdict';

const VERDICT_TEXT: Record<string, string> = {
  pass: 'PASS - every design fraction is within its tolerance, uncertainty included',
  'pass-uncertain':
    'NOT SHOWN WITHIN TOLERANCE - the readings put every design fraction inside its ' +
    'tolerance, but for some the 95 % uncertainty reaches past it: this is not a pass',
  fail: 'FAIL - out of tolerance',
  'no-design': NO_DESIGN_TEXT,
};

/**
 * The verdict in a few words, as the fill's end screen gives it: never "pass" where `check` says it
 * is not one (not shown within, a record changed after writing, an incomplete batch)
 */
export function verdictWord(r: CheckReport): string {
  if (r.incomplete.length) return 'INCOMPLETE - not a pass';
  if (r.record?.alteredLines.length && r.verdict.verdict !== 'fail') return 'RECORD ALTERED - not a pass';
  const unacked = r.planDangersNotAcknowledged?.length
    ? ' - PLAN DANGER NOT ACKNOWLEDGED: not a pass (see below)'
    : '';
  const recorded = r.recordedFillDangers?.length
    ? ' - DANGER IN THE RECORDED FILL: not a pass (see below)'
    : '';
  const accepted = r.record?.acceptedHazards?.length ? ' - ACCEPTED HAZARD (see below)' : '';
  // a premix drawn before its least mixing time: computed from the record's times (premixChecksOf)
  const early = r.premixChecks?.some((c) => c.kind === 'mixed' && c.early)
    ? ' - PREMIX DRAWN EARLY (see below)'
    : '';
  const words: Record<string, string> = {
    // a composition within tolerance is a pass only when nothing in the record stands against it
    pass: checkOutcomes(r).length ? 'NOT A PASS (the composition is within tolerance)' : 'PASS',
    'pass-uncertain': pastRangeSpecies(r).length
      ? 'NOT SHOWN WITHIN TOLERANCE (a reading past its gauge range) - not a pass'
      : 'NOT SHOWN WITHIN TOLERANCE - not a pass',
    fail: 'FAIL - out of tolerance',
    'no-design': 'NO DESIGN to compare with - not a pass',
  };
  return (words[r.verdict.verdict] ?? r.verdict.verdict) + unacked + recorded + accepted + early;
}

function mcNote(st: OutputStat): string {
  if (!st.mc) return '';
  if (st.mc.validated) return 'agrees';
  const inside = st.mc.low >= st.low && st.mc.high <= st.high;
  return inside ? 'narrower' : 'DIFFERS';
}

/**
 * the readings the re-check used, in the gauge's own unit, and who took each (a `by` column only
 * where some reading names someone: an older log, or CSV readings, without it read as before)
 */
function readingsTable(r: CheckReport): string[] {
  const by = r.readBy?.some((b) => b.by !== null || b.corrected) ? r.readBy : undefined;
  const readRows: string[][] = [['#', 'fill', 'gauge', 'absolute pressure', 'T degC', ...(by ? ['by'] : [])]];
  for (const [i, x] of r.readings.entries()) {
    const u = isPressureUnit(x.gauge.unit) ? x.gauge.unit : 'Pa';
    readRows.push([
      String(x.step),
      // a source filled in more than one charge: which charge this reading ends
      x.charge && x.charge.of > 1
        ? `${x.source.id} (charge ${x.charge.number} of ${x.charge.of})`
        : x.source.id,
      x.gauge.id,
      `${fixedSig(fromPa(x.pressurePa, u), 7)} ${u}`,
      (x.temperatureK - 273.15).toFixed(2),
      ...(by ? [by[i] ? readByText(by[i]) : '(not named)'] : []),
    ]);
  }
  return padTable(readRows, [true, false, false, true, true, false]);
}

/** a top-up's starting pressure and a barometer read at the fill, where the log has them */
function startLines(r: CheckReport): string[] {
  const out: string[] = [];
  if (r.start) {
    const u = unitOfReport(r);
    const p = `${fixedSig(fromPa(r.start.pressurePa, u), 7)} ${u}`;
    out.push(
      r.start.read
        ? `Top-up      started from ${p} ` +
            `at ${(r.start.temperatureK - 273.15).toFixed(2)} degC already in the tank, ` +
            `read by ${r.start.by} at ${r.start.time}`
        : `Top-up      started from the planned ${p} already in the tank (not read: see the findings)`,
    );
  }
  if (r.barometer?.from === 'log')
    out.push(
      `Barometer   ${r.barometer.text} logged by ${r.barometer.by} at ${r.barometer.time}; ` +
        `used for the gauge-referenced readings`,
    );
  out.push(...ventLines(r));
  if (out.length) out.push('');
  if (r.amendments.length) {
    out.push('Corrections and withdrawals (applied to the readings above; the originals stay in the log)');
    for (const a of r.amendments) out.push(`  ${amendmentText(a)}`);
    out.push('');
  }
  return out;
}

/** a premix check's pressure in its gauge's unit (Pa where the unit is not a pressure unit) */
export function premixPressure(pa: number, unit: string): string {
  const u = isPressureUnit(unit) ? unit : 'Pa';
  return `${fixedSig(fromPa(pa, u), 7)} ${u}`;
}

/** stage 2: the premix tank's checks before the first fill from it, each as logged (refused ones too) */
function premixCheckLines(r: CheckReport): string[] {
  const checks = r.premixChecks ?? [];
  if (!checks.length) return [];
  return [
    'Premix tank checks (before the first fill from the premix, as logged)',
    ...checks.map((c) => `  ${premixCheckText(c, premixPressure)}`),
    '',
  ];
}

const molText = (n: number | undefined) =>
  n === undefined ? 'amount not computed' : `${fixedSig(n, 5)} mol`;

/**
 * a vent after the last reading: the tank before and as read after it (pressure, temperature,
 * amount); the composition below is the readings' (venting keeps it); a vent not read says so
 */
function ventLines(r: CheckReport): string[] {
  const v = r.vent;
  if (!v) return [];
  const last = r.readings[r.readings.length - 1];
  const u = last && isPressureUnit(last.gauge.unit) ? last.gauge.unit : unitOfReport(r);
  const p = (pa: number) => `${fixedSig(fromPa(pa, u), 7)} ${u}`;
  const t = (k: number) => `${(k - 273.15).toFixed(2)} degC`;
  const who =
    v.line === null ? '(an older log: its close note says so)' : `by ${v.by} at ${v.time} (line ${v.line})`;
  const out = [
    `Vented      after fill ${v.step} ${who}` +
      (v.targetPa !== undefined ? `, to at most ${p(v.targetPa)}` : '') +
      `; before venting ${p(v.before.pressurePa)} at ${t(v.before.temperatureK)}, ${molText(v.before.amountMol)}`,
  ];
  const a = v.after;
  out.push(
    a
      ? `            after venting: ${a.text} on ${a.gauge} = ${p(a.pressurePa)} at ${t(a.temperatureK)}, ` +
          `read by ${a.by} at ${a.time} (line ${a.line}): the tank's final pressure; it holds ` +
          `${molText(a.amountMol)}. The composition below is the readings' (venting keeps it)`
      : `            after venting: NOT READ - the final pressure and amount are NOT known; the composition ` +
          `below is the readings' (venting keeps it)`,
  );
  return out;
}

type Ordered = readonly (readonly [string, OutputStat])[];

/** the composition with its uncertainty against the design, largest fraction first */
function compositionTable(r: CheckReport, order: Ordered): string[] {
  const rows: string[][] = [
    [
      'species',
      'actual x',
      'u (GUM)',
      '95 % interval (GUM, k=2)',
      'u (MC)',
      'MC vs GUM',
      'design',
      'deviation',
      'tolerance',
      '',
    ],
  ];
  const dev = new Map(r.verdict.deviations.map((d) => [d.species, d]));
  // an incomplete batch: a row inside its tolerance is so on the readings given, never a pass
  const soFar = r.incomplete.length ? ' so far' : '';
  for (const [k, st] of order) {
    const d = dev.get(k);
    rows.push([
      k,
      fixedSig(st.value, 6),
      fixedSig(st.u, 2),
      `${fixedSig(st.low, 6)} - ${fixedSig(st.high, 6)}`,
      st.mc ? fixedSig(st.mc.u, 2) : '-',
      mcNote(st),
      d ? fixedSig(d.design, 6) : '-',
      d ? fixedSig(d.deviation, 2) : '-',
      d ? `+-${fixedSig(d.tolerance, 2)}` : '-',
      d
        ? d.pastRange?.length
          ? `NOT SHOWN (line ${d.pastRange.join(', ')}: past gauge range)`
          : d.provenWithin
            ? `ok${soFar}`
            : d.within
              ? `ok?${soFar}`
              : `OUT${soFar}`
        : '',
    ]);
  }
  const table = padTable(rows, [false, true, true, true, true, false, true, true, true, false]);
  if (!soFar || !r.verdict.deviations.some((d) => !d.pastRange?.length)) return table;
  return [...table, soFarLine(r)];
}

/** what "so far" in the table means: a fraction of an incomplete batch, judged on the readings given only */
function soFarLine(r: CheckReport): string {
  const judged = r.verdict.deviations.filter((d) => !d.pastRange?.length);
  const marks = [
    ...(judged.some((d) => d.within) ? ['"ok so far" is inside its tolerance, not passed'] : []),
    ...(judged.some((d) => !d.within)
      ? ['"OUT so far" is outside its tolerance, not a final judgement']
      : []),
  ];
  return (
    `"so far": the batch is incomplete - no reading for ${r.incomplete.join(', ')}; each fraction is ` +
    `judged on the ${r.kind === 'csv' ? 'rows given' : 'fills logged so far'} only: ${marks.join('; ')}: ` +
    `the missing fills change every fraction`
  );
}

/** phi, the diluent fraction and the unidentified impurity, each against the design */
function derivedLines(r: CheckReport): string[] {
  const out: string[] = [];
  const phi = r.result.phi;
  if (phi) {
    const design = r.design?.phi !== undefined ? `  (design ${r.design.phi.toFixed(4)})` : '';
    out.push(
      `phi         ${phi.value.toFixed(5)}  u ${fixedSig(phi.u, 2)} ` +
        ` 95 %: ${phi.low.toFixed(5)} - ${phi.high.toFixed(5)}${design}`,
    );
  }
  const dil = r.result.diluentFraction;
  if (dil) {
    const design = r.design ? `  (design ${fixedSig(r.design.diluentFraction, 6)})` : '';
    out.push(`diluent     ${fixedSig(dil.value, 6)}  u ${fixedSig(dil.u, 2)}${design}`);
  }
  if (r.result.unidentified > 0)
    out.push(
      `unidentified cylinder impurity: ${fixedSig(r.result.unidentified * 1e6, 3)} ` +
        `ppm (not included in the fractions above)`,
    );
  out.push(...premixLines(r));
  return out;
}

/** the premix logs the batch drew from: each re-checked, its budget part of this one */
function premixLines(r: CheckReport): string[] {
  return (r.premixLogs ?? []).map(
    (p) =>
      `Premix      ${p.log} (${p.id}, tank ${p.tank}): ` +
      Object.entries(p.composition)
        .filter(([, c]) => c.value >= 1e-4)
        .map(([k, c]) => `${k} ${fixedSig(c.value, 6)} +- ${fixedSig(2 * c.u, 2)}`)
        .join('  ') +
      ' (re-checked from its log, U with k = 2; its budget is part of this one)',
  );
}

/**
 * the fraction the verdict is about, with why: the one furthest outside its tolerance, else the one whose
 * 95 % uncertainty reaches furthest past it; none when every fraction is shown within
 */
function fractionAtStake(r: CheckReport): { species: string; why: string } | undefined {
  const open = r.verdict.deviations.filter((d) => !d.provenWithin && r.result.composition[d.species]);
  const out = open.filter((d) => !d.within);
  const reach = (d: SpeciesDeviation) => (Math.abs(d.deviation) + (d.within ? d.expandedU : 0)) / d.tolerance;
  const worst = (out.length ? out : open).sort((a, b) => reach(b) - reach(a))[0];
  if (!worst) return undefined;
  return {
    species: worst.species,
    why: out.length
      ? 'the fraction furthest outside its tolerance'
      : 'the fraction whose 95 % uncertainty reaches furthest past its tolerance',
  };
}

/** the uncertainty budget of the fraction the verdict is about, else of the largest fuel fraction */
function budgetLines(r: CheckReport, order: Ordered): string[] {
  const inDesign = ([k]: readonly [string, OutputStat]) => (r.design?.composition[k] ?? 0) > 0;
  const stake = fractionAtStake(r);
  // the largest fuel of the design (never the N2 of an air fill); else the largest non-O2, non-diluent gas
  const shown =
    (stake && order.find((e) => e[0] === stake.species)) ??
    order.find((e) => inDesign(e) && speciesRole(e[0]) === 'fuel') ??
    order.find((e) => inDesign(e) && e[0] !== 'O2' && !(r.design && e[0] in r.design.groups.diluent));
  if (!shown) return [];
  const why = stake?.species === shown[0] ? ` (${stake.why})` : '';
  const out = ['', `Largest contributions to u(${shown[0]})${why}:`];
  for (const b of shown[1].budget) out.push(`  ${b.name.padEnd(36)} ${fixedSig(b.contribution, 2)}`);
  return out;
}

/** 'line 3' or 'lines 3, 5' */
const linesText = (lines: readonly number[]) => `line${lines.length === 1 ? '' : 's'} ${lines.join(', ')}`;

/**
 * What the record itself says of a log's verdict, for the verdict line and the folder summary:
 * an altered record (a line that does not match its hash chain) and a fill never closed.
 */
export function recordMarks(r: CheckReport): string[] {
  const out: string[] = [];
  // an altered record that leads the verdict (alteredLeads) is said there, not again as a mark
  if (r.record?.alteredLines.length && !alteredLeads(r))
    out.push(`RECORD ALTERED (${linesText(r.record.alteredLines)})`);
  if (r.record && !r.record.closed && !r.incomplete.length) out.push('NOT CLOSED');
  if (r.planDangersNotAcknowledged?.length) out.push(unackedMark(r.planDangersNotAcknowledged));
  if (r.recordedFillDangers?.length) out.push(recordedMark(r.recordedFillDangers));
  if (r.record?.acceptedHazards?.length) out.push(acceptedMark(r.record.acceptedHazards));
  if (r.premixChecks?.some((c) => c.kind === 'mixed' && c.early)) out.push('PREMIX DRAWN EARLY');
  return out;
}

/** "DANGER IN THE RECORDED FILL (detonable-state (fill 2))": the fill as recorded went through a danger */
function recordedMark(dangers: readonly PlanDanger[]): string {
  return `DANGER IN THE RECORDED FILL (${dangerList(dangers)})`;
}

/** "PLAN DANGER NOT ACKNOWLEDGED (detonable-state (fill 3))": no acknowledgement of the plan's dangers */
function unackedMark(dangers: readonly PlanDanger[]): string {
  return `PLAN DANGER NOT ACKNOWLEDGED (${dangerList(dangers)})`;
}

/** the accepted review hazards of a log's record, as `check --json` gives them */
function acceptedJson(r: CheckReport) {
  const accepted = r.record?.acceptedHazards ?? [];
  return accepted.map((a) => ({
    found_by: a.found === 'plan' ? 'plan' : 'fill-review',
    before_step: a.step,
    by: a.by,
    time: a.time,
    hazards: a.hazards,
  }));
}

/**
 * "ACCEPTED HAZARD (before fill 3: flammable-state (fill 3))": the fill went on through a review's
 * hazards; "ACCEPTED HAZARD (plan danger: detonable-state (fill 3))": through the plan's own dangers
 */
function acceptedMark(accepted: readonly AcceptedHazard[]): string {
  return `ACCEPTED HAZARD (${accepted
    .map((a) => `${a.found === 'plan' ? 'plan danger' : `before fill ${a.step ?? '?'}`}: ${hazardList(a)}`)
    .join('; ')})`;
}

/**
 * A record changed after it was written leads the verdict (never a pass, whatever its numbers give),
 * unless the numbers fail: FAIL leads then, the altered record beside it. An incomplete batch leads
 * with INCOMPLETE.
 */
function alteredLeads(r: CheckReport): boolean {
  return Boolean(r.record?.alteredLines.length) && r.verdict.verdict !== 'fail' && !r.incomplete.length;
}

/** what the numbers as they stand would give, for a verdict led by an altered record */
const STANDING_TEXT: Record<string, string> = {
  pass:
    'every design fraction is within its tolerance, uncertainty included (the composition alone, ' +
    `${COMPOSITION_ALONE_NOT_USABLE})`,
  'pass-uncertain':
    'not every design fraction is shown within its tolerance (the 95 % uncertainty of some reaches ' +
    'past it)',
  'no-design': 'there is no design to compare them with',
};

/** the readings past their gauge's range the composition rests on: "line 5 (head-1kT)" */
function pastRangeList(r: CheckReport): string {
  return (r.verdict.pastRange ?? []).map((p) => `line ${p.line}, ${p.gauge}`).join('; ');
}

/** the design fractions that rest on a reading past its gauge's range (never shown within tolerance) */
function pastRangeSpecies(r: CheckReport): string[] {
  return r.verdict.deviations.filter((d) => d.pastRange?.length).map((d) => d.species);
}

/** beside words of the numbers alone: the readings past their gauge's range they rest on */
function pastRangeNote(r: CheckReport): string {
  return r.verdict.pastRange?.length
    ? ` (resting on ${pastRangeList(r)}, past its gauge's range: not trustworthy)`
    : '';
}

/**
 * the composition's words where it rests on a reading past its gauge's range: a fraction that depends
 * on it is not shown within tolerance whatever the numbers give; undefined where none does
 */
function pastRangeText(r: CheckReport): string | undefined {
  if (!r.verdict.pastRange?.length) return undefined;
  const list = pastRangeList(r);
  const species = pastRangeSpecies(r);
  const one = r.verdict.pastRange.length === 1;
  const rests =
    `the composition rests on ${one ? 'a reading' : 'readings'} past ${one ? 'its gauge' : 'their gauges'}'s ` +
    `range (${list}), which ${one ? 'is' : 'are'} not trustworthy`;
  if (r.verdict.verdict === 'pass-uncertain' && species.length)
    return (
      `NOT SHOWN WITHIN TOLERANCE - ${rests}: ${species.join(', ')} ${species.length === 1 ? 'is' : 'are'} ` +
      `not shown within tolerance, whatever the numbers give; re-read the tank on a gauge whose range ` +
      `covers its pressure: this is not a pass`
    );
  return `${VERDICT_TEXT[r.verdict.verdict] ?? r.verdict.verdict} - ${rests}`;
}

/** the verdict in words, marked by what the record says of it */
function verdictText(r: CheckReport): string {
  if (r.incomplete.length && r.kind === 'csv') {
    const inFill = r.recordedFillDangers ?? [];
    // several planned fills missing (entries, or one entry naming "the plan's fills 2 and 4"): rows
    const rows = r.incomplete.length > 1 || r.incomplete.some((x) => x.includes("the plan's fills"));
    return (
      `INCOMPLETE - no reading for ${r.incomplete.join(', ')}: no row of the CSV fills ` +
      `${r.incomplete.length === 1 ? 'it' : 'them'} (a row is missing, or the batch is not finished), so it ` +
      `is not passed; the fractions and the review of the fill as recorded cover the rows given only: ` +
      (rows
        ? 'add the missing rows (their readings from the paper record) and check again'
        : 'add the missing row (its reading from the paper record) and check again') +
      (inFill.length
        ? ` - ${recordedMark(inFill)} as the rows stand: the record does not show ` +
          `${inFill.length === 1 ? 'it' : 'them'} accepted`
        : '')
    );
  }
  if (r.incomplete.length)
    return (
      `INCOMPLETE - no reading for ${r.incomplete.join(', ')}: the batch is not ` +
      `finished, so it is not passed; the fractions above cover the fills logged so far`
    );
  const altered = r.record?.alteredLines ?? [];
  const closed =
    r.record && !r.record.closed
      ? ' - NOT CLOSED: the fill never ended with a close entry (it was stopped or cut off, and gas ' +
        'may have gone in after the last reading); read the tank before it is used'
      : '';
  const dangers = r.planDangersNotAcknowledged ?? [];
  const unacked = dangers.length
    ? ` - ${unackedMark(dangers)}: nobody is recorded as having accepted the plan's ` +
      `${dangers.length === 1 ? 'danger' : 'dangers'}`
    : '';
  const inFill = r.recordedFillDangers ?? [];
  const recorded = inFill.length
    ? ` - ${recordedMark(inFill)}: the record does not show ${inFill.length === 1 ? 'it' : 'them'} accepted`
    : '';
  const acc = r.record?.acceptedHazards ?? [];
  const accepted = acc.length
    ? ` - ${acceptedMark(acc)}: the fill went on through ` +
      (acc.every((a) => a.found === 'plan')
        ? "dangers of the plan's review"
        : acc.some((a) => a.found === 'plan')
          ? "dangers of the plan's review and hazards the plan did not have"
          : 'hazards the plan did not have')
    : '';
  // a premix drawn before its least mixing time (premixChecksOf: the guided fill's own rule)
  const drawn = r.premixChecks?.find((c) => c.kind === 'mixed' && c.early);
  const early =
    drawn?.kind === 'mixed' && drawn.early
      ? ` - PREMIX DRAWN EARLY: the batch drew from the premix in ${drawn.tank} before its least mixing ` +
        `time (confirmed as mixed early by ${drawn.by}, line ${drawn.line}); the re-check takes the premix as ` +
        `uniform, which the record does not show: let it mix, or re-measure the tank before it is used`
      : '';
  if (alteredLeads(r))
    return (
      `RECORD ALTERED AFTER WRITING (${linesText(altered)}) - not a pass: the record was changed ` +
      `after it was written, so the log is no proof of what the tank holds; on the numbers as they stand ` +
      `${STANDING_TEXT[r.verdict.verdict] ?? r.verdict.verdict}${pastRangeNote(r)}. Restore the log as it ` +
      `was written (a backup), or re-measure the tank before it is used` +
      closed +
      unacked +
      recorded +
      accepted +
      early
    );
  // a composition within tolerance beside a danger, a plan danger or hazards, or a log never closed
  const composition =
    r.verdict.verdict === 'pass' && checkOutcomes(r).length
      ? 'NOT A PASS - the composition alone is within tolerance (every design fraction, uncertainty ' +
        `included), ${COMPOSITION_ALONE_NOT_USABLE}: what follows stands against it`
      : (pastRangeText(r) ?? VERDICT_TEXT[r.verdict.verdict]);
  return (
    composition +
    (altered.length
      ? ` - RECORD ALTERED (${linesText(altered)}): on numbers that are not as first logged`
      : '') +
    closed +
    unacked +
    recorded +
    accepted +
    early
  );
}

/** "CH4, O2, Ar" (a source filled in more than one charge is named at each) */
const orderText = (ids: readonly string[]) => ids.join(', ');

/** the sources in the order each is first filled (a later charge of one filled already adds no place) */
const firstFilled = (ids: readonly string[]) => [...new Set(ids)].join('\n');

/**
 * The record filled its sources in another order than the plan's (the order each is first filled:
 * the tank's states follow it); `charges`: the same order, but other charges (a diluent the plan splits
 * in two filled in one); `unfinished`: the plan's first fills, charge for charge in its order, and
 * none of the fills after them (a batch stopped, or a row left out at the end)
 */
export function orderDifference(
  f: { readonly order: readonly string[]; readonly plannedOrder?: readonly string[] },
  incomplete: boolean,
): 'order' | 'charges' | 'unfinished' | undefined {
  if (!f.plannedOrder) return undefined;
  const planned = f.plannedOrder;
  // a complete fill may be a prefix too (CH4, Ar, O2 where the plan splits the Ar): other charges
  if (incomplete && f.order.length < planned.length && f.order.every((id, i) => id === planned[i]))
    return 'unfinished';
  if (firstFilled(f.order) !== firstFilled(planned)) return 'order';
  return f.order.join('\n') === f.plannedOrder.join('\n') ? undefined : 'charges';
}

/**
 * the readings are the plan's first `n` fills in its order: which they are, and which planned fills
 * have no reading ("the plan's fill 4 (cyl-Ar) has no row")
 */
function unfinishedNote(n: number, planned: readonly string[], what: string): string {
  const rest = planned.slice(n);
  const nums = rest.map((_, j) => n + j + 1);
  const fills =
    nums.length === 1 ? `fill ${nums[0]}` : `fills ${nums.slice(0, -1).join(', ')} and ${nums.at(-1)}`;
  return (
    `note: the readings are the plan's first ${n === 1 ? 'fill' : `${n} fills`}, in its order ` +
    `(${orderText(planned.slice(0, n))}); the plan's ${fills} (${orderText(rest)}) ` +
    `${rest.length === 1 ? 'has' : 'have'} no ${what}: reviewed here as recorded, up to the last reading`
  );
}

/** whether the record has no limit of its tank to check the readings against (no DANGER means nothing then) */
function limitsUnchecked(r: CheckReport): boolean {
  return r.tank?.limitPa === undefined && r.tank?.ratedPa === undefined;
}

/** what was done with the readings against the tank's working limit, beside the review of the fill */
function limitWords(r: CheckReport): string {
  if (r.tank?.limitPa === undefined)
    return `the readings were NOT checked against a tank's working limit: ${
      r.tank ? `tank ${r.tank.id} has none on record` : 'the tank is not known'
    }`;
  return r.findings.some((x) => x.code === 'above-working-limit')
    ? "the readings against the tank's working limit are judged with the record above"
    : "no reading went past the tank's working limit";
}

/** the temperatures the recorded fill was reviewed at, in words */
function reviewedAt(f: RecordedFill): string {
  const { coldestK, warmestK } = f.temperatures;
  const c = (k: number) => (k - 273.15).toFixed(1);
  return c(coldestK) === c(warmestK)
    ? `at ${c(warmestK)} degC, the readings' temperature`
    : `each state at its reading's temperature (${c(coldestK)} to ${c(warmestK)} degC), each fill's ` +
        `path at the warmer of its two readings`;
}

/**
 * The safety review of the fill as recorded: the order filled (against the plan's), and its dangers
 * and warnings, each marked where the record shows it accepted
 */
function recordedFillLines(r: CheckReport): string[] {
  const f = r.recordedFill;
  if (!f) return [];
  const out = [
    '',
    `The fill as recorded (the planner's safety review of the tank after each reading, by this ` +
      `re-check's composition at the reading's pressure, and of each fill's path; ${reviewedAt(f)})`,
  ];
  const differs = orderDifference(f, r.incomplete.length > 0);
  if (differs && f.plannedOrder)
    out.push(
      differs === 'order'
        ? `  note: the readings fill ${orderText(f.order)} in that order; the plan fills ` +
            `${orderText(f.plannedOrder)}: the tank went through other states than the plan reviewed ` +
            `(reviewed here as recorded)`
        : differs === 'unfinished'
          ? `  ${unfinishedNote(f.order.length, f.plannedOrder, r.kind === 'csv' ? 'row' : 'logged reading')}`
          : `  note: the readings fill in the plan's order, in other charges (readings ${orderText(f.order)}; ` +
            `plan ${orderText(f.plannedOrder)}): reviewed here as recorded`,
    );
  if (!f.findings.length)
    out.push(
      '  the review finds no danger and no warning of the gas on the recorded states and fill paths' +
        (r.incomplete.length
          ? r.kind === 'csv'
            ? " as the rows stand (a fill has no row: the states around it are not the tank's)"
            : ' so far (the batch is incomplete: the fills not logged are not reviewed)'
          : '') +
        ` (of the hazards it checks; ${limitWords(r)})`,
    );
  if (f.notes.length) out.push(`  notes: ${f.notes.join(', ')}`);
  for (const x of f.findings)
    out.push(
      `  ${x.severity === 'danger' ? 'DANGER' : 'warning'}${x.accepted ? ' (accepted in the log)' : ''}: ` +
        `${x.code}${x.step ? ` (fill ${x.step})` : ''}: ${x.message}`,
    );
  return out;
}

/**
 * the gas as filled as it leaves the tank (tank-hazards.ts, the label's marks): flammable by itself or
 * in air, oxygen-enriched, with the findings behind them
 */
function gasAsFilledLines(r: CheckReport): string[] {
  const h = tankHazards(r);
  return [
    '',
    'The gas as filled (by the composition above, released into air as well as in the tank)',
    ...h.marks.map((m) => `  ${m}`),
    ...h.findings.map((f) => `  ${f.severity}: ${f.code}: ${f.text}`),
  ];
}

/** the method note, warnings, the record's findings and the verdict with its caveats */
function verdictLines(r: CheckReport): string[] {
  const out: string[] = [''];
  out.push(
    r.result.trials > 0
      ? `Monte Carlo: ${r.result.trials} trials, seed ${r.result.seed} (JCGM 101; ` +
          `"agrees": the GUM interval is validated to within its numerical tolerance; ` +
          `"narrower": the Monte Carlo interval lies inside the GUM one)`
      : 'GUM law of propagation only (no Monte Carlo run; give --trials 200000 for one)',
  );
  for (const w of r.warnings) out.push(`warning: ${w}`);
  if (r.findings.length) {
    out.push('');
    out.push(r.kind === 'log' ? 'The record (the log itself)' : 'The record (the readings as typed)');
    for (const f of r.findings) out.push(`  ${f.severity}: ${f.message}`);
  }
  out.push(...recordedFillLines(r));
  out.push(...gasAsFilledLines(r));
  out.push('');
  // no DANGER must not read as "within the tank's limits" where there were none to check against
  out.push(`Verdict     ${verdictText(r)}${limitsUnchecked(r) ? ' - tank limits NOT checked' : ''}`);
  for (const c of r.caveats) out.push(`            ${c}`);
  return out;
}

/**
 * a stage-1 log that stage 2 takes: a pass, by check's own overall outcome (io/premix-check.ts refuses a
 * premix log by the same function, `premix-log-refused`)
 */
function premixUsable(r: CheckReport): boolean {
  return checkOutcomes(r).length === 0;
}

/**
 * The stage a log records, in a few words for the folder summary (as `stageLines` says it for one
 * log): '-' for a single-tank batch
 */
export function stageCell(r: CheckReport): string {
  const st = r.stage;
  if (!st) return '-';
  if (st.number === 2) return `2 of 2: batch ${st.batch} from ${st.premixLog ?? '(premix log not named)'}`;
  return `1 of 2: premix of ${st.batch}${premixUsable(r) ? '' : ' (stage 2 will refuse it)'}`;
}

/**
 * A log of a two-stage preparation says which stage it is: stage 1, the premix of its batch, with
 * the command of stage 2 (or, when the premix is not usable, that stage 2 will refuse it); stage 2,
 * the batch and the premix log it was filled from. [] for a single-tank batch.
 */
export function stageLines(r: CheckReport): string[] {
  const st = r.stage;
  if (!st) return [];
  if (st.number === 2)
    return [
      `Stage 2 of 2: batch ${st.batch}, filled from the premix log ${st.premixLog ?? '(not named)'}`,
      '',
    ];
  const usable = premixUsable(r);
  return [
    `Stage 1 of 2: the premix of batch ${st.batch}; stage 2 fills batch ${st.batch} from it.`,
    ...(usable
      ? [
          'Stage 2, once the premix is mixed (the mixing time: its sheet, or the end screen of its fill):',
          `  ${st.nextCommand ?? '(no stage-2 command recorded in this log)'}`,
        ]
      : [
          `Stage 2 will refuse this premix log: its re-check is not a pass (${overallVerdict(r)}, see ` +
            'below); stage 2 takes only a premix whose re-check is a pass (closed, within tolerance, no ' +
            'danger in its record, no hazard gone through). Make a new premix (another --batch).',
        ]),
    '',
  ];
}

export function checkToText(r: CheckReport): string {
  const out: string[] = [];
  out.push(`Re-check  ${r.id}   (${r.kind === 'log' ? 'batch log' : 'CSV readings'} ${r.file})`);
  out.push('');
  out.push(...stageLines(r));
  out.push(...readingsTable(r));
  out.push('');
  out.push(...startLines(r));
  out.push(...premixCheckLines(r));
  const order = Object.entries(r.result.composition).sort((a, b) => b[1].value - a[1].value);
  out.push(...compositionTable(r, order));
  out.push('');
  out.push(...derivedLines(r));
  out.push(...budgetLines(r, order));
  out.push(...verdictLines(r));
  return out.join('\n') + '\n';
}

function unitOfReport(r: CheckReport): PressureUnit {
  const u = r.readings[0]?.gauge.unit;
  return u && isPressureUnit(u) ? u : 'Pa';
}

function readingText(x: LoggedReading): string {
  return `${x.reading} at ${x.temperature} (line ${x.line})`;
}

/**
 * "line 7  fill 1  corrected by QX at T: 10.0128 Torr at 25 degC (line 2) -> 10.0140 Torr
 * at 25 degC; reason: misread"
 */
export function amendmentText(a: AmendmentRecord): string {
  const who = `${a.by ?? '(not named)'} at ${a.time}`;
  const why = a.reason ? `; reason: ${a.reason}` : '; no reason given';
  const old = a.old ? readingText(a.old) : 'nothing in force';
  if (a.kind === 'withdraw') return `line ${a.line}  fill ${a.step}  withdrawn by ${who}: ${old}${why}`;
  const now = a.new ? `${a.new.reading} at ${a.new.temperature}` : '-';
  return `line ${a.line}  fill ${a.step}  corrected by ${who}: ${old} -> ${now}${why}`;
}

function readingJson(x: LoggedReading | null) {
  return x
    ? {
        line: x.line,
        reading: x.reading,
        pressure_Pa: x.pressure_Pa,
        temperature: x.temperature,
        temperature_K: x.temperature_K,
        time: x.time,
      }
    : null;
}

function statJson(st: OutputStat) {
  return {
    value: st.value,
    u: st.u,
    interval95: [st.low, st.high],
    mc: st.mc
      ? {
          mean: st.mc.mean,
          u: st.mc.u,
          interval95: [st.mc.low, st.mc.high],
          validated: st.mc.validated,
          tolerance: st.mc.tolerance,
        }
      : null,
    budget: st.budget,
  };
}

/** the vent after the last reading, with the tank before and after it (after: null when it was not read) */
function ventJson(r: CheckReport) {
  return r.vent
    ? {
        step: r.vent.step,
        line: r.vent.line,
        by: r.vent.by ?? null,
        time: r.vent.time ?? null,
        target_Pa: r.vent.targetPa ?? null,
        before: {
          pressure_Pa: r.vent.before.pressurePa,
          temperature_K: r.vent.before.temperatureK,
          amount_mol: r.vent.before.amountMol ?? null,
        },
        // null: the pressure after venting was not read, so the final pressure and amount are not known
        after: r.vent.after
          ? {
              reading: r.vent.after.text,
              gauge: r.vent.after.gauge,
              pressure_Pa: r.vent.after.pressurePa,
              temperature_K: r.vent.after.temperatureK,
              amount_mol: r.vent.after.amountMol ?? null,
              by: r.vent.after.by,
              time: r.vent.after.time,
              line: r.vent.after.line,
            }
          : null,
      }
    : null;
}

/** `stage` of check --json: the stage a two-stage log records, null for a single-tank batch */
export function stageJson(r: CheckReport) {
  const st = r.stage;
  return st
    ? {
        number: st.number,
        of: st.of,
        batch: st.batch,
        next_command: st.nextCommand ?? null,
        premix_log: st.premixLog ?? null,
      }
    : null;
}

/** stage 2: the premix tank's checks as `check --json` gives them, in log order */
function premixChecksJson(r: CheckReport) {
  return (r.premixChecks ?? []).map((c) =>
    c.kind === 'mixed'
      ? { kind: c.kind, line: c.line, tank: c.tank, by: c.by, time: c.time, note: c.note ?? null }
      : {
          kind: c.kind,
          line: c.line,
          tank: c.tank,
          gauge: c.gauge,
          reading: c.reading,
          pressure_Pa: c.pressurePa,
          minimum_Pa: c.minimumPa,
          enough: c.enough,
          by: c.by,
          time: c.time,
          note: c.note ?? null,
        },
  );
}

/**
 * the deviations and the verdicts of check --json: `verdict` the re-check's outcome as the exit code
 * gives it (`pass` only when nothing stands against a pass), `composition_verdict` the composition's own
 * judgement, `outcomes` every outcome that stands against a pass, in exit precedence
 */
function verdictJson(r: CheckReport) {
  return {
    deviations: r.verdict.deviations.map((d) => ({
      species: d.species,
      design: d.design,
      actual: d.actual,
      deviation: d.deviation,
      tolerance: d.tolerance,
      expanded_u: d.expandedU,
      within: d.within,
      proven_within: d.provenWithin,
      // within or not, on an incomplete batch a fraction is the readings' so far, never a pass
      batch_incomplete: r.incomplete.length > 0,
      // the lines of the readings past their gauge's range this fraction rests on: never proven within then
      past_gauge_range_lines: d.pastRange ?? [],
    })),
    readings_past_gauge_range: (r.verdict.pastRange ?? []).map((p) => ({
      line: p.line,
      step: p.step,
      gauge: p.gauge,
    })),
    verdict: overallVerdict(r),
    composition_verdict: r.verdict.verdict,
    outcomes: checkOutcomes(r),
  };
}

/** the review of the fill as recorded, as `check --json` gives it (null where there is none) */
function recordedFillJson(r: CheckReport) {
  const f = r.recordedFill;
  if (!f) return null;
  return {
    order: f.order,
    planned_order: f.plannedOrder ?? null,
    // "order": the sources first filled in another order than the plan's; "charges": in its order,
    // in other charges; "unfinished": an incomplete batch, the plan's first fills in its order; false: as
    // planned; null: no plan to compare with
    order_differs:
      f.plannedOrder === undefined ? null : (orderDifference(f, r.incomplete.length > 0) ?? false),
    temperatures_K: { coldest: f.temperatures.coldestK, warmest: f.temperatures.warmestK },
    findings: f.findings,
    notes: f.notes,
  };
}

/** the fill as recorded, and the gas as filled: the label's hazard marks and the findings behind them */
function asFilledJson(r: CheckReport) {
  return { recorded_fill: recordedFillJson(r), as_filled_hazards: tankHazards(r) };
}

export function checkToJson(r: CheckReport, version: string): object {
  const composition: Record<string, object> = {};
  for (const [k, st] of Object.entries(r.result.composition)) composition[k] = statJson(st);
  return {
    tool: 'mixwright',
    version,
    kind: 'check',
    id: r.id,
    file: r.file,
    source: r.kind,
    composition,
    phi: r.result.phi ? statJson(r.result.phi) : null,
    dilution: r.result.diluentFraction ? statJson(r.result.diluentFraction) : null,
    unidentified_fraction: r.result.unidentified,
    readings: r.readings.map((x, i) => ({
      step: x.step,
      source: x.source.id,
      charge: x.charge ? { number: x.charge.number, of: x.charge.of } : { number: 1, of: 1 },
      gauge: x.gauge.id,
      pressure_Pa: x.pressurePa,
      temperature_K: x.temperatureK,
      // who took it (the initials of the line that first logged it); null: the line names nobody (an
      // older log, a CSV row without a by); who corrected it, null where it was not corrected (or the
      // correction names nobody: the corrections below list every one)
      by: r.readBy?.[i]?.by ?? null,
      corrected_by: r.readBy?.[i]?.corrected?.by ?? null,
    })),
    design: r.design ? { composition: r.design.composition, phi: r.design.phi ?? null } : null,
    tolerance: r.tolerance,
    ...verdictJson(r),
    incomplete: r.incomplete,
    warnings: r.warnings,
    corrections: r.amendments.map((a) => ({
      kind: a.kind,
      step: a.step,
      line: a.line,
      by: a.by,
      time: a.time,
      reason: a.reason,
      old: readingJson(a.old),
      new: readingJson(a.new),
    })),
    record_findings: r.findings.map((f) => ({
      severity: f.severity,
      code: f.code === 'record' && f.issue ? f.issue.code : f.code,
      step: f.step,
      line: f.line,
      message: f.message,
      // a CSV row whose number, read in the unit of the other rows or its gauge, would fit the fill
      ...('unitSlip' in f && f.unitSlip ? { likely_unit_slip: f.unitSlip } : {}),
    })),
    verdict_caveats: r.caveats,
    record_altered_lines: r.record ? r.record.alteredLines : null,
    record_closed: r.record ? r.record.closed : null,
    accepted_hazards: acceptedJson(r),
    plan_dangers_not_acknowledged: r.planDangersNotAcknowledged ?? [],
    ...asFilledJson(r),
    recorded_fill_dangers_not_accepted: r.recordedFillDangers ?? [],
    premix_checks: premixChecksJson(r),
    stage: stageJson(r),
    premix_logs: (r.premixLogs ?? []).map((p) => ({
      log: p.log,
      id: p.id,
      tank: p.tank,
      last_entry_sha256: p.lastEntrySha256,
      composition: p.composition,
    })),
    tank: r.tank
      ? {
          id: r.tank.id,
          rated_pressure_Pa: r.tank.ratedPa ?? null,
          working_limit_Pa: r.tank.limitPa ?? null,
          from: r.tank.from,
        }
      : null,
    // any danger that stands: of the finished tank or of the fill as recorded (not accepted)
    danger: r.findings.some((f) => f.severity === 'danger') || (r.recordedFillDangers?.length ?? 0) > 0,
    barometer: r.barometer
      ? {
          pressure_Pa: r.barometer.pressurePa,
          u_Pa: r.barometer.uPa,
          from: r.barometer.from,
          text: r.barometer.text ?? null,
          by: r.barometer.by ?? null,
          time: r.barometer.time ?? null,
        }
      : null,
    start: r.start
      ? {
          pressure_Pa: r.start.pressurePa,
          temperature_K: r.start.temperatureK,
          composition: r.start.composition,
          read: r.start.read,
          by: r.start.by ?? null,
          time: r.start.time ?? null,
        }
      : null,
    vent: ventJson(r),
    trials: r.result.trials,
    seed: r.result.seed,
  };
}

/**
 * what the numbers of a row led by an altered record give, in words that are no judgement of the
 * batch: never the bare "pass" or "pass-uncertain" in a row that is not a pass
 */
const NUMBERS_ALONE: Readonly<Record<string, string>> = {
  pass:
    'every design fraction within tolerance, uncertainty included: the composition alone, ' +
    COMPOSITION_ALONE_NOT_USABLE,
  'pass-uncertain': 'not shown within tolerance, the 95 % uncertainty of some fraction reaching past it',
  'no-design': 'no design to compare with',
};

/**
 * the composition's judgement in the folder summary: a pass only when nothing beside it stands
 * against one (the marks after it say what does)
 */
function compositionCell(r: CheckReport): string {
  if (r.verdict.verdict === 'no-design') return 'no design - not a pass';
  if (r.verdict.verdict === 'pass-uncertain')
    return pastRangeSpecies(r).length
      ? 'not shown within tolerance (a reading past its gauge range) - not a pass'
      : 'not shown within tolerance - not a pass';
  if (r.verdict.verdict === 'pass' && checkOutcomes(r).length)
    return `NOT A PASS (composition alone within tolerance, ${COMPOSITION_ALONE_NOT_USABLE})`;
  return r.verdict.verdict;
}

/**
 * A refused file's row of the folder summary says REFUSED; why, under it, in rows of 80 columns at four
 * columns in (the file's own name, said by the row, left off the front of the message).
 */
function refusalUnder(file: string, error: string): string[] {
  const why = error.startsWith(`${file}:`)
    ? error.slice(file.length + 1).replace(/^(\d+):/, 'line $1:')
    : error;
  return wrapWords(`    ${why.trim()}`, 80, STDERR_STYLE);
}

export function folderSummary(
  rows: readonly ({ file: string } & ({ report: CheckReport } | { error: string }))[],
): string {
  const table: string[][] = [['file', 'batch', 'stage', 'verdict', 'phi', 'worst |dev|/tol']];
  // the rows that say why a file was refused, under its table row (by its index in `table`)
  const under = new Map<number, string[]>();
  for (const r of rows) {
    if ('error' in r) {
      under.set(table.length, refusalUnder(r.file, r.error));
      table.push([r.file, '-', '-', 'REFUSED (why: below)', '-', '-']);
      continue;
    }
    const rep = r.report;
    const worst = rep.verdict.deviations.reduce(
      (m, d) => Math.max(m, Math.abs(d.deviation) / d.tolerance),
      0,
    );
    const danger = rep.findings.some((f) => f.severity === 'danger');
    // no DANGER must not read as "within the tank's limits" where the record has no limits to check against
    const unchecked = limitsUnchecked(rep);
    table.push([
      r.file,
      rep.id,
      stageCell(rep),
      (alteredLeads(rep)
        ? `RECORD ALTERED AFTER WRITING (${linesText(rep.record?.alteredLines ?? [])}) - not a pass; ` +
          `the numbers alone: ${NUMBERS_ALONE[rep.verdict.verdict] ?? rep.verdict.verdict}${pastRangeNote(rep)}`
        : rep.incomplete.length
          ? 'incomplete'
          : compositionCell(rep)) +
        (danger ? ', DANGER' : '') +
        recordMarks(rep)
          .map((m) => `, ${m}`)
          .join('') +
        (unchecked ? ', tank limits NOT checked' : ''),
      rep.result.phi ? rep.result.phi.value.toFixed(4) : '-',
      // an incomplete batch is not judged on a number: its missing fills make any ratio meaningless
      rep.incomplete.length ? 'incomplete' : rep.verdict.deviations.length ? worst.toFixed(2) : '-',
    ]);
  }
  const lines = padTable(table, [false, false, false, false, true, true]);
  return lines.flatMap((l, i) => [l, ...(under.get(i) ?? [])]).join('\n') + '\n';
}

/** why a premix log was refused, as `check --json` gives it (SI keys, as the rest of the JSON) */
function premixCauseJson(c: PremixLogCause): object {
  switch (c.kind) {
    case 'unreadable':
      return { kind: c.kind, code: c.problem.code, message: describeProblem(c.problem) };
    case 'not-finished':
      return { kind: c.kind, missing_steps: c.missingSteps, closed: c.closed };
    case 'recheck-not-passed':
      return { kind: c.kind, verdict: c.verdict, off: c.off };
    case 'danger':
      return { kind: c.kind, codes: c.codes };
    case 'too-little-gas':
      return {
        kind: c.kind,
        tank: c.tank,
        start_Pa: c.startPa,
        end_Pa: c.endPa,
        target_Pa: c.targetPa,
        required_Pa: c.requiredPa,
        delivered_mol: c.deliveredMol,
      };
    case 'foreign-gas':
      return { kind: c.kind, species: c.species, design: c.design };
    case 'same-tank':
      return { kind: c.kind, tank: c.tank };
    case 'not-in-order':
      return { kind: c.kind, source: c.source };
    case 'changed':
      return { kind: c.kind, recorded_last_entry_sha256: c.recorded, now_last_entry_sha256: c.now };
    case 'loop':
    case 'drawn-early':
      return { kind: c.kind };
    case 'with-premix-tank':
      return { kind: c.kind, places: c.places };
    case 'record-altered':
      return { kind: c.kind, lines: c.lines };
    case 'not-a-pass':
      return { kind: c.kind, outcome: c.outcome, hazards: c.hazards, by: c.by ?? [] };
    case 'not-drawn':
      return { kind: c.kind, file: c.file, names: c.names, rows: c.rows };
    case 'not-the-premix':
      return {
        kind: c.kind,
        row: {
          name: c.row.name,
          file: c.row.file,
          line: c.row.line,
          tank: c.row.tank,
          tank_known: c.row.tankKnown,
        },
        given: {
          id: c.given.id,
          tank: c.given.tank,
          is: c.given.is,
          batch: c.given.batch ?? null,
          premix_log: c.given.premixLog ?? null,
        },
      };
  }
}

/** what was refused and why, for `check --json` (the whole run, or one file of a folder) */
export function refusalJson(problem: Problem, where: Where) {
  return {
    code: problem.code,
    message: describeProblemAt(problem, where),
    file: where.file ?? null,
    line: where.line ?? null,
    field: where.field ?? null,
    premix_log:
      problem.code === 'premix-log-refused'
        ? { log: problem.log, cause: premixCauseJson(problem.cause) }
        : null,
  };
}

/**
 * `check --json` of a log, CSV or folder it refused (exit 2, a usage error too): a document in place of
 * the re-check, `verdict: "refused"` with no composition, so a tool that reads the JSON is never left
 * with empty input nor reads a refusal as a result. `target`: the log, CSV or folder (null where the
 * command line was refused before naming one)
 */
export function checkRefusedJson(
  target: string | null,
  problem: Problem,
  where: Where,
  version: string,
): object {
  return {
    ...commandRefusedJson('check', target, problem, where, version),
    composition_verdict: null,
    composition: null,
    phi: null,
  };
}

/**
 * the same refusal document for the other commands with --json (`plan`, `ready`): `kind` the command,
 * `file` the recipe (null: the design from options, or not given), `verdict: "refused"` and `refused`
 */
export function commandRefusedJson(
  kind: string,
  file: string | null,
  problem: Problem,
  where: Where,
  version: string,
) {
  return { tool: 'mixwright', version, kind, file, verdict: 'refused', refused: refusalJson(problem, where) };
}
