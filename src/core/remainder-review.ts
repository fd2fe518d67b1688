/**
 * The safety review of the re-targeted remainder of a guided fill. After every accepted reading,
 * undo, correction, resume and change of temperature the fills still ahead are re-targeted
 * (retarget.ts) from the tank as read, so they pass other states than the plan reviewed: a CH4
 * fill read high makes the O2 that follows larger, and the O2 meets the diluted fuel at the same
 * held stop. This module reviews the tank now, every remaining state and every remaining fill path
 * with the plan's own code (sequence-review.ts), names the hazards the plan did not have, and looks
 * for a safer stop of a diluent charge ahead of the oxidizer (below). Findings and numbers only:
 * the shell decides what the operator may do with them.
 *
 * What counts: a finding of severity danger, or a flammable or detonable state or path
 * (`flammable-state`, `flammable-mixture`, `flammable-fill-path`, `flammable-at-inlet`,
 * `detonable-state`), or a state or path inside the flammability data's uncertainty margin (a
 * `near-flammable` warning, `near-flammable-fill-path`: not shown non-flammable), whose code and fill
 * number the plan's own findings do not hold. A state near the flammable region (`near-flammable`, a
 * note inside the NFPA 69 margins) is said, not stopped on.
 *
 * Continuing the fill just read (our rule): a reading below its fill's band (the fill incomplete; the
 * caller gives the band, `lastBandPa`) is first met by going on with the same fill to its target, the
 * re-target of the readings before it; that sequence (the whole fill, from the state before it) is
 * reviewed as the plan's would be, and when it has no hazard the plan did not have it is the safer way
 * offered, before any stop is searched.
 *
 * The safer stop (our rule, the split-point rule of plan/split-point.ts applied to the remainder):
 * the first charge still ahead that holds a stop, fills an inert gas only and comes before a fill
 * that carries an oxidizer, with a hazard at or after it, is given the lowest stop, above the one
 * it holds and below the reading of its source's last charge, at which the re-targeted remainder
 * has no hazard the plan did not have and no state near the flammable region that the plan did not
 * have (the NFPA 69 margins, as the plan's split point keeps them; where no stop keeps them, only
 * the hazards): 8 even grid points, then bisections between the last rejected grid point and
 * the first accepted one down to the reading gauge's resolution (at most 24), rounded up to that
 * resolution and checked again there (more diluent before the oxidizer is the safe side).
 */
import type { Fractions } from './composition.js';
import type { Finding, Severity } from './findings.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { retarget, type RetargetInput, type RetargetResult } from './retarget.js';
import type { SafetyContext } from './safety.js';
import { reviewSequence, type SequenceStart } from './sequence-review.js';
import { roundUpToGrid, type ReadingGrid } from './reading-grid.js';

/** a finding of the plan, as a batch log keeps it */
export interface PlannedFinding {
  readonly severity: Severity;
  readonly code: string;
  readonly step?: number | null;
}

export interface RemainderReviewInput {
  /** the re-target of the remaining fills (the readings done, the charges and their stops) */
  readonly retarget: RetargetInput;
  /** its result, when the caller has it already */
  readonly result?: RetargetResult;
  /** the review settings; the temperature is the re-target's */
  readonly safety: Omit<SafetyContext, 'temperatureK'>;
  /** the plan's findings: a hazard among them is known, not new */
  readonly planned: readonly PlannedFinding[];
  /** how each fill's reading is shown (0-based fill index): a safer stop is rounded up to it */
  readonly readingGrid?: (fill: number) => ReadingGrid | undefined;
  /** look for a safer stop when there is a new hazard (default true) */
  readonly searchAlternative?: boolean;
  /**
   * the band of the last fill read (Pa): a reading below that fill's target by more than it left the
   * fill incomplete, and going on with the same fill to its target is the first safer way looked at
   */
  readonly lastBandPa?: number;
  /**
   * whether a value the fill's gauge displays lies inside its band at a target (0-based fill, absolute Pa):
   * a continuation to a target no reading can show inside its band does not spare the search for a stop
   */
  readonly readableTarget?: (fill: number, targetPa: number) => boolean;
}

/** the last fill read stopped below its band: continuing it to its target, and what that leaves ahead */
export interface Continuation {
  /** 0-based index of the fill among all fills */
  readonly fill: number;
  readonly sourceId: string;
  /** the reading it stopped at and its target (absolute, Pa) */
  readonly fromPa: number;
  readonly toPa: number;
  /** the re-target with the fill continued to its target, and its review */
  readonly result: RetargetResult;
  readonly findings: readonly Finding[];
  /** nothing ahead then passes a hazard the plan did not have */
  readonly clean: boolean;
  /** the hazards it would still pass (empty when clean) */
  readonly hazards: readonly Finding[];
}

/** a safer stop of a diluent charge ahead of the oxidizer */
export interface SaferStop {
  /** 0-based index of the charge among all fills */
  readonly fill: number;
  readonly sourceId: string;
  /** the stop it holds now, and the safer one (absolute, Pa) */
  readonly fromPa: number;
  readonly toPa: number;
  /** the re-target with the safer stop, and its review */
  readonly result: RetargetResult;
  readonly findings: readonly Finding[];
  /**
   * true: no state or path comes nearer the flammable region than the plan's (the NFPA 69 margins
   * kept); false: only flammable ones are avoided (no stop below the source's last charge keeps them)
   */
  readonly marginKept: boolean;
}

export interface RemainderReview {
  readonly result: RetargetResult;
  /** every finding of the remainder: the tank now, each remaining state and fill path */
  readonly findings: readonly Finding[];
  /** flammable, detonable or danger findings the plan did not have */
  readonly hazards: readonly Finding[];
  /** states near the flammable region the plan did not have (said, not stopped on) */
  readonly near: readonly Finding[];
  readonly alternative?: SaferStop;
  /**
   * the last fill read is incomplete (below its band): continuing it to its target, the first safer way
   * (when it is clean and its target readable inside its band, no stop is searched)
   */
  readonly continuation?: Continuation;
  /** why no safer stop is offered (when there are hazards and none is) */
  readonly noAlternative?: 'no-diluent-stop' | 'none-clean' | 'not-searched' | 'past-gauge';
  /**
   * noAlternative 'past-gauge': the fill (0-based) whose reading the lowest clean stop would put past the
   * top of its gauge (readingGrid topPa), and that reading (absolute, Pa; the stop's own fill: its top)
   */
  readonly pastGauge?: PastGauge;
  /** re-targets and reviews the search made */
  readonly evaluations: number;
}

/** a reading no gauge of its fill shows: the fill (0-based) and the absolute pressure, Pa */
export interface PastGauge {
  readonly fill: number;
  readonly pressurePa: number;
}

const HAZARD_CODES: ReadonlySet<string> = new Set([
  'flammable-state',
  'flammable-mixture',
  'flammable-fill-path',
  'flammable-at-inlet',
  'near-flammable-fill-path',
  'detonable-state',
]);

/** a finding the remainder review stops on (module comment) */
export function isSequenceHazard(f: PlannedFinding): boolean {
  return (
    f.severity === 'danger' ||
    HAZARD_CODES.has(f.code) ||
    // inside the flammability data's uncertainty margin: not shown non-flammable (thresholds.ts)
    (f.code === 'near-flammable' && f.severity === 'warning')
  );
}

/** the key a hazard is matched by: its code and fill (0 for the gas before the first fill or the batch) */
export function hazardKey(f: PlannedFinding): string {
  return `${f.code}@${f.step ?? 0}`;
}

/** the tank now and the remaining fills, as a sequence to review */
function sequenceOf(input: RetargetInput, r: RetargetResult) {
  const m = input.done.length;
  const start: SequenceStart | undefined =
    m > 0 || input.initial ? { step: m, composition: r.nowComposition, pressurePa: r.nowPa } : undefined;
  const fills = r.remaining.map((x) => ({
    step: x.step,
    sourceId: x.source.id,
    sourceComposition: x.source.composition,
    compositionAfter: x.compositionAfter,
    pressurePa: x.targetPa,
  }));
  return { start, fills };
}

/** the review of a re-target's remainder, and what in it the plan did not have */
function judgeRemainder(
  input: RemainderReviewInput,
  r: RetargetResult,
  locate: boolean,
): { findings: Finding[]; hazards: Finding[]; near: Finding[] } {
  const known = new Set(input.planned.map(hazardKey));
  const { start, fills } = sequenceOf(input.retarget, r);
  const ctx: SafetyContext = { ...input.safety, temperatureK: input.retarget.temperatureK };
  // every fill made (the last one read below its band): the tank as it stands is the whole review
  const findings = fills.length || start ? reviewSequence(start, fills, ctx, locate) : [];
  const fresh = findings.filter((f) => !known.has(hazardKey(f)));
  return {
    findings,
    hazards: fresh.filter(isSequenceHazard),
    near: fresh.filter((f) => f.code === 'near-flammable' && !isSequenceHazard(f)),
  };
}

/** the review of the remainder (module comment); the safer stop when there is a new hazard */
export function reviewRemainder(input: RemainderReviewInput): RemainderReview {
  const result = input.result ?? retarget(input.retarget);
  const { findings, hazards, near } = judgeRemainder(input, result, true);
  if (!hazards.length) return { result, findings, hazards, near, evaluations: 0 };
  const continuation = continuationOf(input, result);
  const base = { result, findings, hazards, near, ...(continuation ? { continuation } : {}) };
  const readable = !continuation || (input.readableTarget?.(continuation.fill, continuation.toPa) ?? true);
  if (continuation?.clean && readable) return { ...base, evaluations: 1 };
  const done = continuation ? 1 : 0;
  if (input.searchAlternative === false) return { ...base, noAlternative: 'not-searched', evaluations: done };
  const k = diluentStopAhead(input.retarget, hazards);
  if (k === undefined) return { ...base, noAlternative: 'no-diluent-stop', evaluations: done };
  const found = saferStopOf(input, result, k);
  return {
    ...base,
    evaluations: done + found.evaluations,
    ...(found.stop
      ? { alternative: found.stop }
      : found.pastGauge
        ? { noAlternative: 'past-gauge' as const, pastGauge: found.pastGauge }
        : { noAlternative: 'none-clean' as const }),
  };
}

/** each way on from a fill read below its band, reviewed (our rule: none is offered unreviewed) */
export interface BelowBandReview {
  /** going on from the reading, the fills ahead re-targeted from it: the hazards the plan did not have */
  readonly goingOn: readonly Finding[];
  /** continuing the fill to its target (undefined: the reading is not below its band) */
  readonly continuing?: Continuation;
  /**
   * stopping the batch here: the flammable, detonable or danger findings of the tank as it is now (the
   * plan's own included: what stays in the tank is not excused by the plan having had it)
   */
  readonly tankNow: readonly Finding[];
}

/**
 * The review of the ways on from a fill read below its band (`lastBandPa` given): go on from the
 * reading, continue the fill to its target, or stop with the tank as it is
 */
export function reviewBelowBand(input: RemainderReviewInput): BelowBandReview {
  const result = input.result ?? retarget(input.retarget);
  const { findings, hazards } = judgeRemainder(input, result, true);
  const m = input.retarget.done.length;
  const continuing = continuationOf(input, result);
  return {
    goingOn: hazards,
    ...(continuing ? { continuing } : {}),
    tankNow: findings.filter((f) => f.step === m && isSequenceHazard(f)),
  };
}

/**
 * the last fill read stopped below its band (`lastBandPa`): the same fill continued to its target (the
 * re-target of the readings before it) and the review of what then lies ahead; undefined when that fill
 * is complete (or no band is given)
 */
function continuationOf(input: RemainderReviewInput, result: RetargetResult): Continuation | undefined {
  const base = input.retarget;
  const m = base.done.length;
  if (input.lastBandPa === undefined || m === 0) return undefined;
  const before: RetargetInput = { ...base, done: base.done.slice(0, -1) };
  const r = retarget(before);
  const toPa = r.remaining.find((x) => x.step === m)?.targetPa;
  if (toPa === undefined || !(result.nowPa < toPa - input.lastBandPa)) return undefined;
  const j = judgeRemainder({ ...input, retarget: before }, r, true);
  return {
    fill: m - 1,
    sourceId: base.sources[m - 1].id,
    fromPa: result.nowPa,
    toPa,
    result: r,
    findings: j.findings,
    clean: j.hazards.length === 0,
    hazards: j.hazards,
  };
}

const carriesOxidizer = (y: Fractions) =>
  Object.entries(y).some(([k, v]) => v > 0 && oxygenDemand(getSpecies(k).elements) < 0);
const inertOnly = (y: Fractions) =>
  Object.entries(y).every(([k, v]) => !(v > 0) || oxygenDemand(getSpecies(k).elements) === 0);

/**
 * the first remaining charge that holds a stop, fills an inert gas only and comes before an
 * oxidizer fill, with a hazard at or after it (0-based fill index)
 */
function diluentStopAhead(input: RetargetInput, hazards: readonly Finding[]): number | undefined {
  const { sources, charges } = input;
  if (!charges) return undefined;
  for (let k = input.done.length; k < sources.length; k++) {
    const c = charges[k];
    if (!(c.number < c.of) || c.stopPa === undefined || !inertOnly(sources[k].composition)) continue;
    if (!sources.slice(k + 1).some((s) => carriesOxidizer(s.composition))) continue;
    if (hazards.some((h) => (h.step ?? 0) >= k + 1)) return k;
  }
  return undefined;
}

const GRID_POINTS = 8;
const MAX_BISECTIONS = 24;

/** the lowest clean stop of charge k above the one it holds (module comment) */
function saferStopOf(
  input: RemainderReviewInput,
  result: RetargetResult,
  k: number,
): { stop?: SaferStop; pastGauge?: PastGauge; evaluations: number } {
  const base = input.retarget;
  const charges = base.charges!;
  const sourceId = base.sources[k].id;
  const fromPa = charges[k].stopPa!;
  // the reading of the source's last charge: a stop must stay below it
  const lastOfSource = base.sources.map((s) => s.id).lastIndexOf(sourceId);
  const lastTarget = result.remaining.find((x) => x.step === lastOfSource + 1)?.targetPa;
  let hiPa = Math.min(lastTarget ?? Infinity, base.workingLimitPa ?? Infinity);
  if (!Number.isFinite(hiPa) || hiPa <= fromPa) return { evaluations: 0 };
  // the stop is read on its fill's gauge: no higher than it shows (a stop past it could not be logged)
  const shown = input.readingGrid?.(k);
  const capped = shown?.topPa !== undefined && shown.topPa < hiPa;
  if (capped) hiPa = shown.topPa!;
  const pastTop = capped ? { fill: k, pressurePa: shown.topPa! } : undefined;
  if (hiPa <= fromPa) return { evaluations: 0, pastGauge: pastTop };
  hiPa = fromPa + (hiPa - fromPa) * (1 - 1e-3);
  let evaluations = 0;
  // strict: no new hazard and no new near-flammable state (the plan's split-point rule); else no new hazard
  const at = (stopPa: number) => {
    evaluations++;
    const input2: RetargetInput = {
      ...base,
      charges: charges.map((c, j) => (j === k ? { ...c, stopPa } : c)),
    };
    const r = retarget(input2);
    const kept = r.stops.find((s) => s.step === k + 1)?.kept === true;
    const j = judgeRemainder(input, r, false);
    const clean = kept && j.hazards.length === 0;
    return { r, clean, strict: clean && j.near.length === 0 };
  };
  const grid = Array.from(
    { length: GRID_POINTS },
    (_, i) => fromPa + ((hiPa - fromPa) * (i + 1)) / GRID_POINTS,
  );
  const judged = grid.map((p) => ({ p, ...at(p) }));
  const strict = judged.some((g) => g.strict);
  const ok = (e: { clean: boolean; strict: boolean }) => (strict ? e.strict : e.clean);
  const first = judged.findIndex(ok);
  if (first < 0) return { evaluations, pastGauge: pastTop };
  let lo = first > 0 ? judged[first - 1].p : fromPa;
  let hi = judged[first].p;
  // to the gauge's resolution (else 1e-5 of the stop), at most MAX_BISECTIONS
  const fine = shown && shown.resolutionPa > 0 ? shown.resolutionPa : 1e-5 * hi;
  for (let i = 0; i < MAX_BISECTIONS && hi - lo > fine; i++) {
    const mid = (lo + hi) / 2;
    if (ok(at(mid))) hi = mid;
    else lo = mid;
  }
  // shown on the gauge: the bracket is one resolution wide, so the lowest accepted grid reading is the one
  // just below the rounded-up end or that end; checked there (a step up at most 3 times)
  let toPa = shown ? roundUpToGrid(hi, shown) : hi;
  if (shown && toPa - shown.resolutionPa > fromPa && ok(at(toPa - shown.resolutionPa)))
    toPa -= shown.resolutionPa;
  for (let tries = 0; tries < 4; tries++) {
    const e = at(toPa);
    if (ok(e)) {
      // every fill ahead must be read on its gauge too: a target past its top is no way on
      const past = unreadable(input, e.r);
      if (past) return { evaluations, pastGauge: past };
      const findings = judgeRemainder(input, e.r, true).findings;
      return {
        stop: { fill: k, sourceId, fromPa, toPa, result: e.r, findings, marginKept: strict },
        evaluations,
      };
    }
    if (!shown) break;
    toPa = roundUpToGrid(toPa + shown.resolutionPa, shown);
  }
  return { evaluations, pastGauge: pastTop };
}

/** the first remaining target past the top of its fill's gauge (readingGrid topPa), if any */
function unreadable(input: RemainderReviewInput, r: RetargetResult): PastGauge | undefined {
  for (const x of r.remaining) {
    const top = input.readingGrid?.(x.step - 1)?.topPa;
    if (top !== undefined && x.targetPa > top * (1 + 1e-9))
      return { fill: x.step - 1, pressurePa: x.targetPa };
  }
  return undefined;
}
