/**
 * The guided fill as a pure state machine: one step at a time, the operator types the
 * actual reading (and the temperature when it changed); each accepted reading becomes
 * a log event (an effect the shell writes, with fsync, before the next screen), the
 * remaining targets are re-targeted, and the composition is judged with the same inverse
 * model and typed temperatures as `check`. A danger finding blocks the fill until it is
 * acknowledged in words, and is shown again on the screen of the fill that creates it. A
 * reading past the tank's working limit stops the fill on a danger screen; an implausible
 * reading asks first. No ink, no files here: the component executes the effects.
 */
import {
  bMix,
  cMix,
  densityFromPressure,
  virialModel,
  evaluateUncertainty,
  fail,
  gaugeReadingPa,
  inverseSetup,
  invertReadings,
  judge,
  premixMixingElapsed,
  ProblemError,
  describeProblem,
  retarget,
  ventBack,
  type Design,
  type GasSource,
  type Gauge,
  type RetargetInput,
  type UncertaintyResult,
} from '../core/index.js';
import { decimalsFor, fixedSig, inwardBand } from '../report/format.js';
import { gaugeUnit, shownPa } from './gauge-view.js';

export { shownPa } from './gauge-view.js';
import { duration } from '../report/ready-report.js';
import {
  gaugeConversionWords,
  isGaugeSpelling,
  parseQuantity,
  fromPa,
  isPressureUnit,
  paPerUnit,
  PRESSURE_UNITS,
  type PressureUnit,
} from '../io/quantity.js';
import { designFromHeader } from '../io/check.js';
import { settlingOf } from '../io/plan-predict.js';
import { acknowledges } from '../io/log-audit.js';
import { chargeName, chargeWords, isSplit, type ChargeOf } from '../report/charges.js';
import {
  chargesOfHeader,
  gaugeFromLog,
  sourceFromLog,
  OVER_RANGE_CODE,
  WENT_ON_BELOW_BAND,
  type NewLogEvent,
  type LogHeader,
  type LogReading,
  type ParsedLog,
} from '../io/batch-log.js';
import {
  belowBandWays,
  tankNowWords,
  NO_TANK_HAZARD_NOW,
  onReviewEnter,
  remindOnlyReached,
  reviewMemoryOf,
  withReview,
  type BelowWays,
  type PathReview,
  type ReviewHazard,
  type ReviewHooks,
  type ReviewMemory,
  type ReviewScreen,
  type ReviewTrigger,
} from './fill-review.js';

export interface FillStep {
  readonly index: number;
  readonly species: string;
  readonly source: GasSource;
  readonly gauge?: Gauge;
  readonly bandPa: number;
  /** charge `number` of the `of` charges of its source (1 of 1 unless the source is split) */
  readonly charge: ChargeOf;
}

/** "fill 2", or "fill 2 (Ar, charge 1 of 2)" for a charge of a split source */
export function fillName(step: FillStep): string {
  return isSplit(step.charge)
    ? `fill ${step.index} (${chargeName(step.species, step.charge)})`
    : `fill ${step.index}`;
}

/** the later charges of the current step's source, with the step index (for a split source only) */
function laterCharges(setup: FillSetup, k: number): number[] {
  const me = setup.steps[k];
  return setup.steps.map((_, j) => j).filter((j) => j > k && setup.steps[j].source.id === me.source.id);
}

export interface FillSetup {
  readonly header: LogHeader;
  readonly design: Design;
  readonly steps: readonly FillStep[];
  readonly dangers: readonly {
    readonly code: string;
    readonly step: number | null;
    readonly message: string;
  }[];
  /** the tank's working limit (rating x working fraction; the rating for logs that lack it), Pa absolute */
  readonly workingLimitPa?: number;
  /** a gauge-referenced sensor reads some step: today's barometric pressure is asked first */
  readonly needsBarometer: boolean;
  /** a top-up: the gas the plan assumed already in the tank */
  readonly inTank?: { readonly composition: Readonly<Record<string, number>>; readonly pressurePa: number };
  /** stage 2: the premix tank's check before the first fill from it (the stage-2 sheet's row) */
  readonly premixCheck?: PremixCheck;
}

/** the premix tank's check of a stage-2 fill (header stage.premix_check), its gauge as the core's */
export interface PremixCheck {
  readonly tank: string;
  readonly gauge?: Gauge;
  /** the lowest reading allowed on the gauge, with its unit ("621.7 Torr"), and as an absolute pressure */
  readonly minimum: string;
  readonly minimumPa: number;
  readonly plannedPa: number;
  readonly requiredPa: number;
  readonly targetPa: number;
  readonly deliveredMol: number;
  /** the batch's fills from the premix; the check comes before the first */
  readonly fills: readonly number[];
  /** the heads to close off before the line is filled from the premix tank (undefined: an older log) */
  readonly closeOff?: readonly { readonly id: string; readonly topPa: number; readonly reopen: boolean }[];
  readonly mixing?: { readonly stirred: boolean; readonly restS: number };
  /** the premix log the batch draws from, as the header names it */
  readonly premixLog?: string;
  /** when the premix log was closed (ISO), its last reading (absolute Pa) and the other batches' draws */
  readonly premixClosed?: string;
  readonly premixLastPa?: number;
  readonly premixDraws?: number;
}

/** what the log holds of the premix check: who confirmed the mixing, and the last premix-tank reading */
export interface PremixDone {
  readonly mixedBy?: string;
  /** confirmed `mixed early`: before the least mixing time since the premix log closed */
  readonly mixedEarly?: boolean;
  /** the last premix-tank reading logged: its text, absolute pressure, whether it is enough, its line */
  readonly reading?: {
    readonly text: string;
    readonly pressurePa: number;
    readonly enough: boolean;
    readonly by: string;
  };
  /** a premix-tank reading well below what the premix log predicts, asked about and not logged yet */
  readonly questioned?: { readonly text: string; readonly pressurePa: number };
}

/**
 * barometer: today's barometric pressure; start: a top-up's starting pressure, read and logged;
 * correct: a new value for an earlier reading; acknowledge: danger findings of the plan; reminder: the
 * accepted danger of this fill, again; reading: the step; confirm: an implausible reading, asked
 * first; over-limit: a reading past the working limit (already logged); vented: the operator vents
 * back (logged), the reading after venting is asked; below: the last fill's reading (logged) is below
 * its band, more gas may be added; ended: stopped before the last fill; done.
 */
export type Phase =
  /** who fills in this session: initials asked once at its start, then on every reading it logs */
  | 'operator'
  | 'barometer'
  | 'acknowledge'
  | 'start'
  | 'reminder'
  | 'reading'
  | 'correct'
  | 'confirm'
  /** a reading typed in another unit than the target's, far from it: asked before it is logged */
  | 'unit-check'
  | 'over-limit'
  | 'vented'
  /** the re-target is held below the working limit at the cost of the composition: an explicit choice */
  | 'capped'
  /** undo INITIALS typed: a short reason is asked (optional), then the reading is withdrawn */
  | 'undo-reason'
  | 'below'
  | 'ended'
  | 'done'
  /** the re-targeted remainder passes a hazard the plan did not (fill-review.ts) */
  | 'review'
  /** stage 2: before the first fill from the premix, its mixing confirmed and its tank read (logged) */
  | 'premix'
  /** a value typed past the range of the fill's gauge (logged as typed): read on a gauge that covers it, or a slip */
  | 'over-range';
export type Field = 'reading' | 'temperature';

export interface DoneReading {
  readonly step: number;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly text: string;
  /** the log line it is on (known once written) */
  readonly line?: number;
}

/** the gas in the tank before the first fill (top-up) */
export interface StartGas {
  readonly composition: Readonly<Record<string, number>>;
  readonly pressurePa: number;
  readonly temperatureK: number;
  /** read at the manifold and logged (else the plan's assumption) */
  readonly read: boolean;
}

export interface Correcting {
  readonly step: number;
  readonly by: string;
  /** the new reading, once typed; then the reason is asked */
  readonly pending?: Pending;
  /** begun on the screen of a fill read below its band: Esc and the correction come back to it */
  readonly back?: 'below';
}

export interface FractionDeviation {
  readonly species: string;
  readonly design: number;
  readonly actual: number;
  /** actual - design */
  readonly deviation: number;
  /** allowed |deviation|: max(relative x design, absolute) */
  readonly tolerance: number;
  readonly within: boolean;
  /** expanded uncertainty (k = 2), when the reading's gauges give an uncertainty model */
  readonly expandedU?: number;
}

/**
 * The verdict after a reading is on composition: after the last fill, the as-filled composition
 * from the inverse model against the design (with U, as `judge` in `check`); before it, the
 * composition the re-targeted remaining fills lead to, from the as-filled amounts.
 */
export interface CompositionJudgement {
  readonly kind: 'final' | 'predicted';
  readonly verdict: 'pass' | 'pass-uncertain' | 'fail' | 'on-course' | 'off-course';
  readonly deviations: readonly FractionDeviation[];
  readonly phi?: number;
}

export interface Pending {
  readonly event: LogReading;
  readonly done: DoneReading;
  /** the text as typed, given back when the operator edits it */
  readonly typed: string;
  /** why the reading is asked about (confirm) */
  readonly reason?: string;
  /** already written to the log (a reading past the working limit is logged before the operator chooses) */
  readonly logged?: boolean;
  /** the fill was resumed on it: the log holds the reading and no choice for it (a reading past the limit) */
  readonly resumed?: boolean;
}

export interface OverLimit {
  readonly limitPa: number;
  /**
   * vent or pump back to this absolute pressure (from where the remaining fills end at the design
   * pressure if they can; never above the limit), Pa
   */
  readonly ventToPa: number;
  /** what the remaining fills become from there (on the last fill: that none remains) */
  readonly after: string;
  /** why the tank is vented to ventToPa, in words */
  readonly why: string;
  /** the reading is the last fill's: no fill follows the vent */
  readonly last: boolean;
  /**
   * the composition the vented tank leads to (venting keeps it; the remaining fills re-targeted)
   * is within the tolerance
   */
  readonly within: boolean;
  /** the species outside the tolerance there */
  readonly outside: readonly string[];
}

/**
 * a value typed past the range of the gauge its fill is read on: logged as typed (acknowledge
 * "over-range"), not as a reading; the tank is read on a gauge that covers it, or the value is declared a slip
 */
export interface OverRange {
  /** as typed, and the gauge it was typed for */
  readonly typed: string;
  readonly gaugeId: string;
  /** the value on that gauge's basis (gauge-referenced: above ambient), and absolute, Pa */
  readonly shownPa: number;
  readonly absolutePa: number;
  /** the lab profile's gauges whose range covers the value (finest first) */
  readonly covering: readonly string[];
  /** what the screen says: the value, the range, the overpressure rating, the danger if past the limit */
  readonly words: string;
}

/** a vent chosen on the danger screen (logged): the reading after venting is asked next */
export interface Venting {
  /** the fill whose reading went past the limit */
  readonly step: number;
  /** the vent target shown (absolute, Pa) and the reading before venting */
  readonly targetPa: number;
  readonly beforePa: number;
  readonly limitPa: number;
  readonly by: string;
  /** no fill follows (the last fill's reading was vented) */
  readonly last: boolean;
  /** what the remaining fills become from the vent target (not the last fill) */
  readonly after: string;
}

/** a re-target held below the working limit: what it costs, for the stop screen (phase 'capped') */
export interface Capped {
  /** what brought the cap, in words ("after fill 1", "after the undo of fill 2", "at 35.0 degC"), and the next fill */
  readonly after: string;
  readonly step: number;
  /** the capped final pressure (the last capped target, absolute) and the limit (absolute, Pa) */
  readonly finalPa: number;
  /** the capped final pressure as every line of the stop screen says it (computed once) */
  readonly finalText: string;
  readonly limitPa: number;
  /** the design species left outside the tolerance */
  readonly outside: readonly string[];
  /** the cost in words (final pressure, each mole fraction against the design) */
  readonly cost: string;
  /** go (the capped fills ahead) and stop (the tank as it stands), each as its review found it */
  readonly ways?: BelowWays;
}

export interface FillState {
  readonly setup: FillSetup;
  readonly phase: Phase;
  /** 0-based index of the current step */
  readonly current: number;
  readonly done: readonly DoneReading[];
  /** absolute targets of every step, re-targeted after each reading and temperature change, Pa */
  readonly targetsPa: readonly number[];
  /** the temperature the targets are computed for, K */
  readonly targetTemperatureK: number;
  /** barometric pressure for gauge-referenced readings, Pa */
  readonly barometerPa: number;
  /** today's value was typed (or taken from the log) */
  readonly barometerToday: boolean;
  readonly field: Field;
  readonly input: string;
  readonly temperatureText: string;
  readonly message?: string;
  readonly error?: string;
  readonly effects: readonly NewLogEvent[];
  readonly summary?: UncertaintyResult;
  readonly judgement?: CompositionJudgement;
  readonly pending?: Pending;
  readonly overLimit?: OverLimit;
  /** in phase 'vented': the vent logged, the reading after it asked */
  readonly venting?: Venting;
  /** in phase 'capped': the re-target held by the working limit, and its cost */
  readonly capped?: Capped;
  /** in phase 'undo-reason': who undoes the last reading, and the screen to go back to on Esc */
  readonly undoing?: { readonly by: string; readonly back: Phase };
  /** a capped re-target the operator went on with (logged): who, and the species it left outside */
  readonly capAccepted?: { readonly by: string; readonly outside: readonly string[] };
  /** steps whose accepted danger has been shown again */
  readonly reminded: readonly number[];
  readonly start?: StartGas;
  readonly correcting?: Correcting;
  // the safety review of the re-targeted remainder (fill-review.ts)
  /** the review of the current remainder: the targets it reviewed and what it found (planDangerNow) */
  readonly pathReview?: PathReview;
  /** the review screen's content, in phase 'review' */
  readonly review?: ReviewScreen;
  /** earlier reviews: hazards accepted, stops changed to a safer one (from the log on resume) */
  readonly reviewed?: ReviewMemory;
  /**
   * the hazards of the remainder accepted at a review, with their numbers as the last review found
   * them: each fill's screen shows those at its step for as long as it is on screen
   */
  readonly acceptedHazards?: readonly ReviewHazard[];
  /**
   * in phase 'below': each way on (continue, and next or stop before the last fill; close on the last) as
   * its review found it
   */
  readonly belowWays?: BelowWays;
  /** a batch closed or stopped below a band: what the tank holds now, in words (tankNowWords), if anything */
  readonly tankNowText?: string;
  /** a reading above the working limit accepted (not vented since): the tank is above it, and what to do */
  readonly aboveLimitText?: string;
  /** the last fill vented back (a reading past the working limit): the reading after venting, which closed the batch */
  readonly ventedRead?: { readonly text: string; readonly pressurePa: number };
  /** stage 2: the premix check so far (from the log on resume) */
  readonly premix?: PremixDone;
  /** who fills in this session (initials): logged on every reading it takes */
  readonly operator?: string;
  /** in phase 'over-range': the value typed past the fill's gauge's range (logged as typed) */
  readonly overRange?: OverRange;
  /** in phase 'operator': the screen the session opens with once the initials are given */
  readonly operatorBack?: Phase;
}

/** how a session starts: the operator's initials given (`--by`), or asked first */
export interface SessionStart {
  readonly operator?: string;
  /** ask for the operator's initials before anything else when they are not given (the shell's sessions) */
  readonly askOperator?: boolean;
}

export type FillAction =
  | { readonly type: 'char'; readonly text: string }
  | { readonly type: 'backspace' }
  | { readonly type: 'tab' }
  | { readonly type: 'escape' }
  /** the shell wrote a reading or correction of this step on this log line */
  | { readonly type: 'logged'; readonly step: number; readonly line: number }
  | { readonly type: 'enter'; readonly now: string };

export function setupFromHeader(header: LogHeader): FillSetup {
  const gauges = new Map(header.gauges.map((g) => [g.id, gaugeFromLog(g)]));
  const sources = new Map(header.sources.map((s) => [s.id, sourceFromLog(s)]));
  const charges = chargesOfHeader(header);
  const steps = header.steps.map((s, i) => ({
    index: s.step,
    species: s.species,
    source: sources.get(s.source)!,
    gauge: s.gauge ? gauges.get(s.gauge) : undefined,
    bandPa: s.band_Pa,
    charge: charges[i],
  }));
  const dangers = (header.findings ?? [])
    .filter((f) => f.severity === 'danger')
    .map((f) => ({ code: f.code, step: f.step, message: f.message }));
  const workingLimitPa = header.tank.working_limit_Pa ?? header.tank.rated_pressure_Pa ?? undefined;
  const inTank = header.in_tank
    ? { composition: header.in_tank.composition, pressurePa: header.in_tank.pressure_Pa }
    : undefined;
  const pc = header.stage?.number === 2 ? header.stage.premix_check : undefined;
  const premixCheck: PremixCheck | undefined = pc && {
    tank: pc.tank,
    gauge: pc.gauge ? gaugeFromLog(pc.gauge) : undefined,
    minimum: pc.minimum,
    minimumPa: pc.minimum_Pa,
    plannedPa: pc.planned_Pa,
    requiredPa: pc.required_Pa,
    targetPa: pc.target_Pa,
    deliveredMol: pc.delivered_mol,
    fills: pc.fills,
    closeOff: pc.close_off?.map((g) => ({ id: g.gauge, topPa: g.top_Pa, reopen: g.reopen })),
    mixing: pc.mixing && { stirred: pc.mixing.stirred, restS: pc.mixing.rest_s },
    premixLog: header.stage?.premix_log?.file,
    premixClosed: pc.premix_log_closed,
    premixLastPa: pc.premix_log_last_Pa,
    premixDraws: pc.premix_log_draws,
  };
  return {
    header,
    design: designFromHeader(header),
    steps,
    dangers,
    workingLimitPa,
    // the premix tank's gauge may read above ambient too: today's barometer is asked for it as well
    needsBarometer:
      steps.some((s) => s.gauge?.reference === 'gauge') || premixCheck?.gauge?.reference === 'gauge',
    inTank,
    ...(premixCheck ? { premixCheck } : {}),
  };
}

/** the premix check as the log holds it (resume) */
function premixDoneOf(log: ParsedLog | undefined): PremixDone | undefined {
  if (!log) return undefined;
  const mixed = log.premixMixed.at(-1);
  const r = log.premixReadings.at(-1);
  if (!mixed && !r) return undefined;
  const pc = log.header.stage?.premix_check;
  const early =
    mixed &&
    premixMixingElapsed(
      {
        premixClosed: pc?.premix_log_closed,
        mixing: pc?.mixing && { stirred: pc.mixing.stirred, restS: pc.mixing.rest_s },
      },
      mixed.time,
    )?.early;
  return {
    ...(mixed ? { mixedBy: mixed.by, ...(early ? { mixedEarly: true } : {}) } : {}),
    ...(r ? { reading: { text: r.reading, pressurePa: r.pressure_Pa, enough: r.enough, by: r.by } } : {}),
  };
}

const degC = (k: number) => `${(k - 273.15).toFixed(1)} degC`;
const BARO_RANGE_PA = [70e3, 110e3] as const;

/**
 * a new fill, or one resumed from its log; `session`: who fills (initials, logged on every reading of
 * this session), or ask first (a session is one run of the fill: a resume is a new one, maybe by another)
 */
export function initialState(
  setup: FillSetup,
  log?: ParsedLog,
  now = '',
  session: SessionStart = {},
): FillState {
  const opened = openedState(setup, log, now);
  if (session.operator) return { ...opened, operator: session.operator };
  if (!session.askOperator || opened.phase === 'done' || opened.phase === 'ended') return opened;
  return { ...opened, phase: 'operator', operatorBack: opened.phase, input: '' };
}

/** the state a fill opens with, from its log (resumed) or new */
function openedState(setup: FillSetup, log: ParsedLog | undefined, now: string): FillState {
  const h = setup.header;
  const targets = h.steps.map((s) => s.target_Pa);
  const acked = new Set((log?.acknowledgements ?? []).map((a) => a.code));
  const done: DoneReading[] = (log?.readings ?? []).map((r) => ({
    step: r.step,
    pressurePa: r.pressure_Pa,
    temperatureK: r.temperature_K,
    text: r.reading,
    line: r.line,
  }));
  const needsAck = setup.dangers.some((d) => !acked.has(d.code));
  const lastBaro =
    log?.barometer?.pressure_Pa ??
    [...(log?.readings ?? [])].reverse().find((r) => r.barometer_Pa !== undefined)?.barometer_Pa;
  const inTank = setup.inTank;
  const start: StartGas | undefined = inTank
    ? log?.start
      ? {
          composition: inTank.composition,
          pressurePa: log.start.pressure_Pa,
          temperatureK: log.start.temperature_K,
          read: true,
        }
      : {
          composition: inTank.composition,
          pressurePa: inTank.pressurePa,
          temperatureK: h.temperature_K,
          read: false,
        }
    : undefined;
  const T = done.length ? done[done.length - 1].temperatureK : h.temperature_K;
  let state: FillState = {
    setup,
    phase: 'reading',
    current: done.length,
    done,
    targetsPa: targets,
    targetTemperatureK: h.temperature_K,
    barometerPa: lastBaro ?? h.barometer.pressure_Pa,
    barometerToday: lastBaro !== undefined,
    field: 'reading',
    input: '',
    temperatureText: degC(T),
    effects: [],
    reminded: [],
    start,
    message: done.length ? resumedText(setup, done.length) : undefined,
    reviewed: reviewMemoryOf(log),
    capAccepted: capAcceptedOf(log),
    premix: premixDoneOf(log),
  };
  const r = done.length || start?.read ? retargetRun(state, done, T) : undefined;
  if (r) state = { ...state, targetsPa: r.targets, targetTemperatureK: T };
  const stopped = resumedAtStop(state, log);
  if (stopped) return stopped;
  const overRange = resumedOverRange(state, log);
  if (overRange) return overRange;
  const capped = resumedCapped(state, log, r?.result, needsAck);
  if (capped) return capped;
  if (done.length >= setup.steps.length) {
    // the last fill vented back and read after venting: that reading closed the batch
    const vent = log?.vents.at(-1);
    const after =
      vent && vent.step === setup.steps[setup.steps.length - 1].index ? vent.readings.at(-1) : undefined;
    const ventedRead = after ? { text: after.reading, pressurePa: after.pressure_Pa } : undefined;
    // the last reading above the working limit, not vented: the tank is still above it (said on the end screen)
    const lastPa = done[done.length - 1].pressurePa;
    const limit = setup.workingLimitPa;
    if (!ventedRead && limit !== undefined && lastPa > limit)
      state = { ...state, aboveLimitText: aboveLimitWords(state, lastPa, limit) };
    return finish(
      { ...state, effects: [], ...(ventedRead ? { ventedRead } : {}) },
      log?.closed || !now ? undefined : now,
    );
  }
  const entered = enterStep({ ...state, phase: needsAck ? 'acknowledge' : 'reading' });
  return done.length || start?.read ? reviewed(entered, 'resume') : entered;
}

/**
 * a log whose last line of the next fill is a value typed past its gauge's range, neither re-read nor said
 * to be a slip: the over-range screen again (the value as the log keeps it)
 */
function resumedOverRange(state: FillState, log: ParsedLog | undefined): FillState | undefined {
  const step = state.setup.steps[state.current];
  if (!log || log.closed || !step?.gauge) return undefined;
  const acks = log.acknowledgements.filter((a) => a.code === OVER_RANGE_CODE && a.step === step.index);
  const last = acks.at(-1);
  const o = last?.over_range;
  const lastReading = Math.max(0, ...log.allReadings.map((r) => r.line));
  if (!last || !o || o.outcome !== 'typed' || last.line < lastReading) return undefined;
  const covering = coveringGauges(state, o.pressure_Pa, o.gauge).map((g) => g.id);
  const overRange: OverRange = {
    typed: o.typed,
    gaugeId: o.gauge,
    shownPa: o.shown_Pa,
    absolutePa: o.pressure_Pa,
    covering,
    words: `RESUMED: ${last.note ?? `"${o.typed}" typed for ${o.gauge}, past its range`}`,
  };
  return { ...state, phase: 'over-range', overRange };
}

/** what a resumed fill says first: how many readings the log held, and which fill (and charge) is next */
function resumedText(setup: FillSetup, n: number): string {
  const next = setup.steps[n];
  const split = setup.steps.some((x) => isSplit(x.charge));
  return (
    `resumed: ${n} of ${setup.steps.length} readings were in the log` +
    (next && split ? `; next: ${fillName(next)} from ${next.source.id}` : '')
  );
}

/**
 * a fill resumed where it stopped on a screen whose choice is not in the log: a reading past the
 * working limit with no choice logged (asked again), or a last fill below its band, not closed
 */
function resumedAtStop(state: FillState, log: ParsedLog | undefined): FillState | undefined {
  const { setup, done } = state;
  const limit = setup.workingLimitPa;
  const lastRead = log?.readings[log.readings.length - 1];
  const vent = log?.vents[log.vents.length - 1];
  if (vent && lastRead && !log?.closed) return resumedVenting(state, vent, lastRead);
  if (
    lastRead &&
    !log?.closed &&
    limit !== undefined &&
    lastRead.pressure_Pa > limit &&
    // a choice logged for this very reading (its log line, as check matches it), not for an earlier one of the fill
    !(log?.acknowledgements ?? []).some(
      (a) => a.code === 'above-working-limit' && acknowledges(log!, a, lastRead),
    )
  ) {
    // stopped on the danger screen: the reading is in the log, the operator's choice is not; ask again
    const before: FillState = { ...state, done: done.slice(0, -1), current: done.length - 1 };
    const prior = before.done.length
      ? retargetRun(before, before.done, before.done[before.done.length - 1].temperatureK).targets
      : before.targetsPa;
    const reading = done[done.length - 1];
    const pending: Pending = {
      event: lastRead,
      done: reading,
      typed: lastRead.reading.replace(/\s+\S+$/, ''),
      logged: true,
      resumed: true,
    };
    // the vent target from the targets as they stood at the reading (the re-target of the readings before
    // it), as the session computed it: the same number before and after the resume
    const atReading: FillState = { ...before, targetsPa: prior };
    return {
      ...atReading,
      phase: 'over-limit',
      pending,
      overLimit: overLimitOf(atReading, reading, limit),
      message:
        `resumed: the reading of fill ${reading.step} (${reading.text}, logged) is ` +
        `above the working limit and no choice was logged`,
    };
  }
  if (done.length && !log?.closed) {
    // the last reading below its fill's band: the last fill stays open for more gas; a fill before it is
    // incomplete, and continuing it is offered again, unless the log says the operator went on from that
    // very reading (`next`, logged): then the fill goes on to the fill after it
    const m = done.length;
    // the choice of this very reading: by its log line, as check matches it
    const read = { step: setup.steps[m - 1].index, line: done[m - 1].line ?? -1 };
    const wentOn = log?.acknowledgements.some(
      (a) => a.code === WENT_ON_BELOW_BAND && acknowledges(log, a, read),
    );
    if (wentOn && m < setup.steps.length) return undefined;
    const before: FillState = { ...state, done: done.slice(0, -1), current: m - 1 };
    const prior = before.done.length
      ? retargetRun(before, before.done, before.done[before.done.length - 1].temperatureK).targets
      : before.targetsPa;
    const step = setup.steps[m - 1];
    const last = done[m - 1];
    const target = prior[m - 1];
    const text = `resumed: ${fillName(step)} logged at ${last.text}`;
    if (last.pressurePa - target < -step.bandPa) {
      if (m >= setup.steps.length) return belowBand({ ...state, targetsPa: prior }, step, target, text);
      const t = [...state.targetsPa];
      t[m - 1] = target;
      return belowBand(rejudge({ ...state, targetsPa: t }), step, target, text);
    }
  }
  return undefined;
}

/**
 * a fill resumed after a reading whose re-target the working limit holds, with no choice logged for
 * it (acknowledge "limit-cap" of the next fill): the stop screen comes back
 */
function resumedCapped(
  state: FillState,
  log: ParsedLog | undefined,
  r: ReturnType<typeof retarget> | undefined,
  needsAck: boolean,
): FillState | undefined {
  const next = state.setup.steps[state.done.length];
  if (!r?.limitBinds || !log || log.closed || needsAck || !next || !state.done.length) return undefined;
  if (r.nowPa >= (state.setup.workingLimitPa ?? Infinity)) return undefined;
  if (log.acknowledgements.some((a) => a.code === LIMIT_CAP_CODE && a.step === next.index)) return undefined;
  return capStop(state, r, `after fill ${state.setup.steps[state.done.length - 1].index}`);
}

/** a fill stopped after its vent was logged: the reading after venting is asked (again) */
function resumedVenting(
  state: FillState,
  vent: ParsedLog['vents'][number],
  lastRead: ParsedLog['readings'][number],
): FillState {
  const limit = state.setup.workingLimitPa ?? Infinity;
  const step =
    state.setup.steps.find((x) => x.index === vent.step) ?? state.setup.steps[state.done.length - 1];
  const unit = gaugeUnit(step);
  const read = vent.readings.at(-1);
  return {
    ...state,
    phase: 'vented',
    input: '',
    field: 'reading',
    venting: {
      step: vent.step,
      targetPa: vent.target_Pa,
      beforePa: lastRead.pressure_Pa,
      limitPa: limit,
      by: vent.by,
      last: state.done.length >= state.setup.steps.length,
      after: '',
    },
    message:
      `resumed: the vent after fill ${vent.step} is logged (line ${vent.line}, by ${vent.by})` +
      (read
        ? `; read after venting: ${read.reading} (${fmtIn(read.pressure_Pa, unit)} absolute, still above ` +
          `the working limit). Vent more, let it settle and read again`
        : `; the pressure after venting is not logged yet. Read the tank now`),
  };
}

/** the phase a step opens with: today's barometer first, then the acknowledgement, then this fill's own danger */
function enterStep(s: FillState): FillState {
  if (s.phase === 'acknowledge') return s;
  if (s.setup.needsBarometer && !s.barometerToday) return { ...s, phase: 'barometer', input: '' };
  if (s.start && !s.start.read && s.done.length === 0) return { ...s, phase: 'start', input: '' };
  const stepIndex = s.setup.steps[s.current]?.index;
  const pc = s.setup.premixCheck;
  if (pc && stepIndex === pc.fills[0] && !(s.premix?.mixedBy && s.premix.reading?.enough))
    return { ...s, phase: 'premix', input: '', field: 'reading' };
  if (
    stepIndex !== undefined &&
    !s.reminded.includes(stepIndex) &&
    (s.setup.dangers.some((d) => d.step === stepIndex) ||
      (s.acceptedHazards ?? []).some((h) => h.step === stepIndex && h.severity === 'danger'))
  )
    // only while the current targets reach a danger there (or it is not known avoided): planDangerNow
    return remindOnlyReached({ ...s, phase: 'reminder', input: '' });
  return { ...s, phase: 'reading' };
}

export function retargetInput(
  s: FillState,
  done: readonly DoneReading[],
  temperatureK: number,
): RetargetInput {
  const h = s.setup.header;
  return {
    design: s.setup.design,
    tolerance: h.tolerance,
    sources: s.setup.steps.map((x) => x.source),
    done: done.map((d) => ({ pressurePa: d.pressurePa, temperatureK: d.temperatureK })),
    temperatureK,
    finalPressurePa: h.final_pressure_Pa,
    volumeM3: h.tank.volume_m3,
    workingLimitPa: s.setup.workingLimitPa,
    // the last fill's band stays below the limit: a reading inside it never passes the limit
    finalBandPa: s.setup.steps[s.setup.steps.length - 1]?.bandPa,
    initial: s.start,
    formatPressure: (pa) => `${Number(fromPa(pa, 'Torr').toPrecision(6))} Torr`,
    // the final pressure a cap holds: as the stop screen says it (one number everywhere)
    formatFinalPressure: (pa) => cappedFinalText(s, pa),
    // each charge of a split source, and the stop reading (the plan's target) of each but its last
    charges: s.setup.steps.map((x, k) => ({
      number: x.charge.number,
      of: x.charge.of,
      stopPa: x.charge.number < x.charge.of ? (s.reviewed?.stopsPa[k] ?? h.steps[k].target_Pa) : undefined,
    })),
  };
}

/**
 * The remaining targets after the readings done, at the temperature of the next fills. A charge
 * of a split source that is not its source's last keeps its stop reading (the plan's target):
 * the core re-target holds it, gives the rest of the source's gas to its last charge, and says
 * so in its message when a stop cannot be kept.
 */
function retargetRun(s: FillState, done: readonly DoneReading[], temperatureK: number) {
  const result = retarget(retargetInput(s, done, temperatureK));
  const t = [...s.targetsPa];
  for (const x of result.remaining) t[x.step - 1] = x.targetPa;
  return { targets: t, message: result.message, result };
}

/** the safety review of the re-targeted remainder (fill-review.ts), from the readings in force */
function reviewed(s: FillState, trigger: ReviewTrigger): FillState {
  return withReview(s, trigger, retargetInput(s, s.done, s.targetTemperatureK));
}

const REVIEW_HOOKS: ReviewHooks = {
  enterStep: (s) => enterStep(s),
  rejudge: (s) => rejudge(s),
  retargetInput: (s) => retargetInput(s, s.done, s.targetTemperatureK),
  continueFill: (s, now) => continueFromReview(s, now),
};

/**
 * "VALUE INITIALS" on the review screen of an incomplete fill: the fill was continued; the reading is
 * taken as on that fill's below-band screen (a further reading, logged as a correction "more gas
 * added"); a refused one stays on the review with the reason
 */
function continueFromReview(s: FillState, now: string): FillState {
  const next = onBelowEnter({ ...s, phase: 'below', review: undefined, current: s.done.length }, now);
  if (next.error && !next.effects.length) return { ...s, input: '', error: next.error };
  return next;
}

/**
 * a vent target as the operator reads it on the step's gauge: rounded DOWN to the gauge's display
 * resolution (an upper bound shown rounded up would let the tank stay above it), with the unit
 */
export function atMostOnGauge(s: FillState, step: FillStep, absolutePa: number): string {
  const unit = gaugeUnit(step);
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const f = 10 ** dec;
  const v = fromPa(shownPa(s, step, absolutePa), unit);
  return `${(Math.floor(v * f * (1 + 1e-12)) / f).toFixed(dec)} ${unit}`;
}

function deviationsOf(
  composition: Readonly<Record<string, { value: number; u?: number } | number>>,
  s: FillState,
): FractionDeviation[] {
  const tol = s.setup.header.tolerance;
  return Object.entries(s.setup.design.composition)
    .filter(([, xd]) => xd > 0)
    .map(([k, xd]) => {
      const v = composition[k];
      const actual = typeof v === 'number' ? v : (v?.value ?? 0);
      const t = Math.max(tol.relative * xd, tol.absolute);
      return {
        species: k,
        design: xd,
        actual,
        deviation: actual - xd,
        tolerance: t,
        within: Math.abs(actual - xd) <= t,
      };
    });
}

const initialOf = (s: FillState) =>
  s.start
    ? {
        composition: { ...s.start.composition },
        pressurePa: s.start.pressurePa,
        temperatureK: s.start.temperatureK,
      }
    : undefined;

/**
 * check's GUM budget (linear) of these readings of the fill's steps, in order, judged against the design
 * as `check` judges it; every step read must have a gauge (a ProblemError where the model refuses them)
 */
export function budgetOf(
  s: FillState,
  done: readonly Pick<DoneReading, 'step' | 'pressurePa' | 'temperatureK'>[],
): { summary: UncertaintyResult; v: ReturnType<typeof judge> } {
  const h = s.setup.header;
  const readings = done.map((d, i) => ({
    step: d.step,
    source: s.setup.steps[i].source,
    pressurePa: d.pressurePa,
    temperatureK: d.temperatureK,
    gauge: s.setup.steps[i].gauge!,
  }));
  const summary = evaluateUncertainty(
    readings,
    {
      barometricPa: s.barometerPa,
      barometricUncertaintyPa: h.barometer.u_Pa,
      thermometerUncertaintyK: h.thermometer.u_K,
      thermometerResolutionK: h.thermometer.resolution_K,
      // the gas-thermometer settling per reading, as check takes it from the log (log-recheck.ts)
      temperatureSettlingK: h.thermometer.settling_K ?? settlingOf(undefined),
      trials: 0,
      seed: 1,
    },
    h.design.diluent,
    initialOf(s),
  );
  return { summary, v: judge(summary, s.setup.design, h.tolerance) };
}

/** the as-filled composition of all readings, with the GUM uncertainty where every step has a gauge */
function finalJudgement(s: FillState): { judgement: CompositionJudgement; summary?: UncertaintyResult } {
  const withGauges = s.done.every((_, i) => s.setup.steps[i].gauge);
  if (withGauges) {
    try {
      const { summary, v } = budgetOf(s, s.done);
      const deviations = v.deviations.map((d) => ({
        species: d.species,
        design: d.design,
        actual: d.actual,
        deviation: d.deviation,
        tolerance: d.tolerance,
        within: d.within,
        expandedU: d.expandedU,
      }));
      return {
        summary,
        judgement: {
          kind: 'final',
          verdict: v.verdict === 'no-design' ? 'fail' : v.verdict,
          deviations,
          phi: summary.phi?.value,
        },
      };
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
    }
  }
  // a step without a gauge has no uncertainty model: the nominal inverse only
  const setup = inverseSetup(
    s.done.map((d, i) => ({
      source: s.setup.steps[i].source,
      pressurePa: d.pressurePa,
      temperatureK: d.temperatureK,
    })),
    initialOf(s),
  );
  const res = invertReadings(
    setup,
    undefined,
    s.done.map((d) => d.pressurePa),
  );
  const comp: Record<string, number> = {};
  setup.species.forEach((k, i) => (comp[k] = res.x[i] * (1 - res.unidentified)));
  const deviations = deviationsOf(comp, s);
  return {
    judgement: {
      kind: 'final',
      verdict: deviations.every((d) => d.within) ? 'pass-uncertain' : 'fail',
      deviations,
    },
  };
}

/**
 * How a finished batch (phase 'done') ended, for the end screen's title: the last fill's reading (or the
 * reading after venting) against that fill's target and band, and the fills before it read below their
 * band. Computed from the readings, never assumed: "all fills logged" is said only of kind 'within' with
 * no fill before the last left short.
 */
export interface FillEnding {
  /**
   * within: inside its band; above: above its band (below the working limit); over-limit: above the
   * tank's working limit (kept); below: closed below its target; vented: read after venting
   */
  readonly kind: 'within' | 'above' | 'over-limit' | 'below' | 'vented';
  readonly step: number;
  /** the reading in force (after venting: the reading after venting), as typed */
  readonly reached: string;
  /** the last fill's target as shown on its gauge, with the unit */
  readonly target: string;
  /** the fills before the last whose reading in force is below their band (gone on from) */
  readonly short: readonly number[];
  /** the fills before the last whose reading in force is above their band (the fills after re-targeted) */
  readonly over: readonly number[];
}

/** the target of each fill as it stood when the fill was read: re-targeted from the readings before it */
function targetsAtReadings(s: FillState): number[] {
  return s.done.map((d, i) => {
    // the target the fill was read to: from the readings before it, at the tank temperature logged with
    // its own reading (the one its screen re-targeted for: typed there, or carried on from the last)
    const T = d.temperatureK;
    const planT = s.setup.header.temperature_K;
    if (i === 0 && !s.start?.read && Math.abs(T - planT) < 0.005) return s.setup.header.steps[0].target_Pa;
    const prior = s.done.slice(0, i);
    try {
      return retargetRun(s, prior, T).targets[i];
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
      return s.targetsPa[i];
    }
  });
}

/** how the batch ended (phase 'done'); undefined before every fill is read */
export function fillEnding(s: FillState): FillEnding | undefined {
  const K = s.setup.steps.length;
  if (s.done.length < K) return undefined;
  const targets = targetsAtReadings(s);
  const off = (i: number) => s.done[i].pressurePa - targets[i];
  const before = s.setup.steps.slice(0, K - 1);
  const short = before.filter((st, i) => off(i) < -st.bandPa).map((st) => st.index);
  const over = before.filter((st, i) => off(i) > st.bandPa).map((st) => st.index);
  const step = s.setup.steps[K - 1];
  const unit = gaugeUnit(step);
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const target = `${fromPa(shownPa(s, step, targets[K - 1]), unit).toFixed(dec)} ${unit}`;
  const last = s.done[K - 1];
  const kind: FillEnding['kind'] = s.ventedRead
    ? 'vented'
    : last.pressurePa > (s.setup.workingLimitPa ?? Infinity)
      ? 'over-limit'
      : off(K - 1) < -step.bandPa
        ? 'below'
        : off(K - 1) > step.bandPa
          ? 'above'
          : 'within';
  const reached = s.ventedRead?.text ?? last.text;
  return { kind, step: step.index, reached, target, short, over };
}

function finish(s: FillState, now?: string, note?: string): FillState {
  const { judgement, summary } = finalJudgement(s);
  const effects: NewLogEvent[] = now
    ? [...s.effects, { kind: 'close', time: now, ...(note ? { note } : {}) }]
    : [...s.effects];
  return { ...s, phase: 'done', effects, summary, judgement };
}

/** the pressure unit the operator typed (a bare number is in the gauge's unit) */
function typedUnitOf(text: string, fallback: PressureUnit): PressureUnit {
  const m = /([A-Za-z][A-Za-z0-9]*)\s*$/.exec(text.trim());
  return m && isPressureUnit(m[1]) ? m[1] : fallback;
}

const READING_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * the barometer a typed gauge pressure ("15 psig") is made absolute with: today's, logged, else the one
 * the plan took from the lab profile or --barometer; the default a profile without a barometer leaves
 * (or a log that does not say) is not assumed: refused, saying what to type instead
 */
function typedGaugeBarometer(s: FillState, text: string): { pa: number; from: string } | { error: string } {
  const from = s.setup.header.barometer.from;
  if (s.barometerToday) return { pa: s.barometerPa, from: "today's (logged)" };
  if (from === 'lab-profile') return { pa: s.barometerPa, from: "the lab profile's" };
  if (from === 'option') return { pa: s.barometerPa, from: "the plan's (--barometer)" };
  return {
    error:
      `"${text}" is a gauge pressure (above the ambient pressure), and making it absolute needs a ` +
      `measured barometric pressure, which this batch does not have (` +
      (from === 'default'
        ? `the lab profile gives no barometer; the plan assumed ${fmtIn(s.barometerPa, 'Torr', 5)}`
        : 'the log does not say where its barometer came from') +
      `). Nothing is logged. Type the absolute reading instead (e.g. in psia, Torr or kPa), as the ` +
      `gauge shows it if it reads absolute`,
  };
}

/** a log event's `note` saying how a typed gauge pressure was made absolute (nothing for any other) */
function withGaugeNote(s: FillState, typed: string, absolutePa: number): { note?: string } {
  const note = gaugeNoteOf(s, typed, absolutePa);
  return note ? { note } : {};
}

/**
 * what the record says of a reading typed as a gauge pressure: "gauge pressure 15 psig read as
 * 1535.7 Torr absolute with the lab profile's barometer 760.0 Torr" (undefined for any other reading)
 */
export function gaugeNoteOf(s: FillState, typed: string, absolutePa: number): string | undefined {
  const text = typed.trim();
  if (!isGaugeSpelling(text)) return undefined;
  const b = typedGaugeBarometer(s, text);
  if ('error' in b) return undefined;
  return `gauge pressure ${gaugeConversionWords({ text, absolutePa, barometricPa: b.pa, barometerFrom: b.from })}`;
}

function parseReading(
  s: FillState,
  step: FillStep,
): { shown: number; temperatureK: number } | { error: string; field: Field } {
  let shown: number;
  try {
    const text = s.input.trim();
    if (text === '') fail({ code: 'reading-missing', expected: 'pressure' });
    if (isGaugeSpelling(text)) {
      // a gauge pressure typed ("15 psig"): absolute with a measured barometer only, then on this
      // step's gauge basis (gauge-referenced: above ambient), so every caller adds back the same value
      const b = typedGaugeBarometer(s, text);
      if ('error' in b) return { error: `reading refused: ${b.error}`, field: 'reading' };
      const absolute = parseQuantity(text, 'pressure', {}, { barometricPa: b.pa });
      shown = step.gauge?.reference === 'gauge' ? absolute - s.barometerPa : absolute;
    } else
      shown = READING_NUMBER.test(text)
        ? parseQuantity(`${text} ${gaugeUnit(step)}`, 'pressure')
        : parseQuantity(text, 'pressure');
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    const p = e.problem;
    // a bare number is read in the gauge's unit: the hint says so (the message quotes what was typed)
    const why = describeProblem(
      p.code === 'bad-quantity' || p.code === 'reading-missing' ? { ...p, bareUnit: gaugeUnit(step) } : p,
    );
    return { error: `reading refused: ${why}`, field: 'reading' };
  }
  try {
    return { shown, temperatureK: parseTemperature(s.temperatureText) };
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    return {
      error:
        `tank temperature refused ("${s.temperatureText.trim()}"): ${describeProblem(e.problem)}. ` +
        `Nothing is logged; the reading typed is kept: type the tank temperature again (Tab moves ` +
        `between the two fields)`,
      field: 'temperature',
    };
  }
}

/**
 * a refused entry: only the field refused is cleared (the message quotes it or its value), so the
 * next entry does not run on from it, and the other field keeps what was typed; the refused
 * temperature field takes the focus
 */
function refusedEntry(s: FillState, r: { error: string; field: Field }): FillState {
  return r.field === 'temperature'
    ? { ...s, temperatureText: '', field: 'temperature', error: r.error }
    : { ...s, input: '', error: r.error };
}

function parseTemperature(text: string): number {
  const t = parseQuantity(text.trim(), 'temperature');
  if (!(t >= 200 && t <= 600))
    fail({ code: 'out-of-range', what: 'tank temperature', value: t, allowed: '200-600 K' });
  return t;
}

/** re-target the current and later steps for a changed temperature (the fills ahead are read at it) */
function withTemperature(s: FillState): FillState {
  let T: number;
  try {
    T = parseTemperature(s.temperatureText);
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    // only the temperature is refused (and cleared); the reading field keeps what was typed
    return refusedEntry(s, {
      error:
        `tank temperature refused ("${s.temperatureText.trim()}"): ${describeProblem(e.problem)}. ` +
        `The targets stay at ${degC(s.targetTemperatureK)}; type the tank temperature again`,
      field: 'temperature',
    });
  }
  if (Math.abs(T - s.targetTemperatureK) < 0.005) return s;
  const r = retargetRun(s, s.done, T);
  return {
    ...s,
    targetsPa: r.targets,
    targetTemperatureK: T,
    message: `targets re-computed for ${degC(T)}: the amount to fill is the same, its pressure is not`,
  };
}

const fmtIn = (pa: number, unit: PressureUnit, sig = 6) => `${fromPa(pa, unit).toPrecision(sig)} ${unit}`;

/** the ratios between two display units (far from 1): what a reading typed in the wrong unit is off by */
const UNIT_RATIOS = PRESSURE_UNITS.flatMap((a) =>
  PRESSURE_UNITS.map((b) => paPerUnit(a) / paPerUnit(b)).filter((r) => Math.abs(Math.log(r)) > Math.log(1.1)),
);
/** how near a ratio (or the number typed to the target's number) counts as a unit slip: 5 % */
const UNIT_SLIP_REL = 0.05;

/**
 * A unit slip: the reading carries a unit other than the target's (the gauge's), lies outside the
 * step's band, and either its number is within 5 % of the target's number in the target's unit
 * ("10.02 kPa" for 10.01 Torr) or its ratio to the target is within 5 % of the ratio of two pressure
 * units (kPa/Torr 7.50, psi/kPa 6.89, bar/Torr 750...). What to ask, in words; undefined when none.
 */
export function unitSlip(s: FillState, step: FillStep, shownPaTyped: number): string | undefined {
  const unit = gaugeUnit(step);
  const text = s.input.trim();
  if (READING_NUMBER.test(text)) return undefined; // a bare number is in the gauge's unit
  const m = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*)$/.exec(text);
  if (!m || m[2].trim() === unit) return undefined;
  const targetShown = shownPa(s, step, s.targetsPa[s.current]);
  if (Math.abs(shownPaTyped - targetShown) <= step.bandPa || !(targetShown > 0)) return undefined;
  const bare = Number(m[1]);
  const targetNumber = fromPa(targetShown, unit);
  const sameNumber = Math.abs(bare / targetNumber - 1) <= UNIT_SLIP_REL;
  const ratio = shownPaTyped / targetShown;
  const factor = UNIT_RATIOS.some((r) => Math.abs(ratio / r - 1) <= UNIT_SLIP_REL);
  if (!sameNumber && !factor) return undefined;
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const at = (pa: number) => `${fromPa(pa, unit).toFixed(dec)} ${unit}`;
  const gauge = step.gauge?.id ?? 'the gauge';
  const band = inwardBand(targetShown, step.bandPa, unit, dec);
  const times =
    ratio >= 1 ? `${fixedSig(ratio, 3)} x the target` : `1/${fixedSig(1 / ratio, 3)} of the target`;
  const why = sameNumber
    ? "The number typed is the target's number in another unit"
    : 'That is about the ratio of two pressure units';
  return (
    `typed "${text}" = ${at(shownPaTyped)} on ${gauge}; the target is ${at(targetShown)} ` +
    `(band ${band ? `${band.low} - ${band.high}` : `+-${fixedSig(fromPa(step.bandPa, unit), 2)}`} ${unit}): ` +
    `${times}. ${why}: likely the unit (${gauge} shows ${unit}).`
  );
}

/** plausibility: why a reading looks wrong, or undefined */
function doubt(s: FillState, step: FillStep, shown: number): string | undefined {
  const unit = gaugeUnit(step);
  const target = s.targetsPa[s.current];
  const targetShown = shownPa(s, step, target);
  if (
    step.gauge?.reference === 'gauge' &&
    Math.abs(Math.abs(shown - targetShown) - s.barometerPa) <= 0.1 * s.barometerPa
  ) {
    const sense =
      shown > targetShown
        ? 'an absolute pressure typed for a gauge-referenced sensor'
        : 'a gauge-referenced value where the target is absolute';
    return (
      `${fmtIn(shown, unit)} is about one barometric pressure (${fmtIn(s.barometerPa, unit, 5)}) ` +
      `from the target ${fmtIn(targetShown, unit)} on ${step.gauge.id}, which reads ` +
      `above ambient: likely ${sense}`
    );
  }
  const later = laterCharges(s.setup, s.current).find((j) => {
    const other = shownPa(s, s.setup.steps[j], s.targetsPa[j]);
    return (
      Math.abs(shown - targetShown) > step.bandPa && Math.abs(shown - other) < Math.abs(shown - targetShown)
    );
  });
  if (later !== undefined) {
    const other = s.setup.steps[later];
    return (
      `${fmtIn(shown, unit)} is nearer the target of ${fillName(other)}, ` +
      `${fmtIn(shownPa(s, other, s.targetsPa[later]), unit)}, than the stop of this one, ` +
      `${fmtIn(targetShown, unit)}: this is ${chargeWords(step.charge)} of ${step.species}, which stops ` +
      `at ${fmtIn(targetShown, unit)}. If the tank really reads this, log it as this charge's reading ` +
      `(y); a typing slip: n`
    );
  }
  if (step.gauge && shown < step.gauge.minimumPa)
    return (
      `${fmtIn(shown, unit)} is below the range of ${step.gauge.id} (from ${fmtIn(step.gauge.minimumPa, unit)}): ` +
      `likely the unit, a sign, or a gauge not zeroed`
    );
  return undefined;
}

function readingEvent(
  s: FillState,
  step: FillStep,
  absolute: number,
  temperatureK: number,
  now: string,
  note?: string,
): LogReading {
  const unit = gaugeUnit(step);
  const readingText = `${s.input.trim()}${/[A-Za-z]/.test(s.input) ? '' : ` ${unit}`}`;
  // a gauge pressure typed: the record says with which barometer it was made absolute
  const gaugeNote = gaugeNoteOf(s, s.input, absolute);
  note = [note, gaugeNote].filter(Boolean).join('; ') || undefined;
  return {
    kind: 'reading',
    step: step.index,
    source: step.source.id,
    // the charge of its source this reading belongs to: the log refuses it for any other
    charge: { number: step.charge.number, of: step.charge.of },
    gauge: step.gauge?.id ?? 'none',
    reading: readingText,
    pressure_Pa: absolute,
    ...(step.gauge?.reference === 'gauge' ? { barometer_Pa: s.barometerPa } : {}),
    temperature: s.temperatureText.trim(),
    temperature_K: temperatureK,
    time: now,
    // who read it: the session's operator (a log of an older fill, or a session without one, has none)
    ...(s.operator ? { by: s.operator } : {}),
    ...(note ? { note } : {}),
  };
}

/** take a reading the operator has confirmed: log it, judge the composition, re-target or finish */
function commit(s: FillState, p: Pending, extra: readonly NewLogEvent[] = [], now: string): FillState {
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  const target = s.targetsPa[s.current];
  const deviation = p.done.pressurePa - target;
  const within = Math.abs(deviation) <= step.bandPa;
  const done = [...s.done, p.done];
  const gaugeNote = p.event.note?.split('; ').find((x) => x.startsWith('gauge pressure '));
  const pressureText =
    `${fillName(step)} logged: ${signed(fromPa(deviation, unit))} ${unit} from ` +
    `the target (${bandWords(s, unit, p.done.pressurePa, within)})` +
    (gaugeNote ? ` (${gaugeNote})` : '');
  let next: FillState = {
    ...s,
    done,
    current: s.current + 1,
    input: '',
    field: 'reading',
    effects: [...extra, ...(p.logged ? [] : [p.event])],
    pending: undefined,
    overLimit: undefined,
  };
  if (next.current >= s.setup.steps.length) {
    if (deviation < -step.bandPa) return belowBand(next, step, target, pressureText);
    return finish({ ...next, message: pressureText }, now);
  }
  const r = retargetRun(s, done, p.done.temperatureK);
  const deviations = deviationsOf(r.result.predicted.composition, s);
  const judgement: CompositionJudgement = {
    kind: 'predicted',
    verdict: deviations.every((d) => d.within) ? 'on-course' : 'off-course',
    deviations,
    phi: r.result.predicted.phi,
  };
  next = {
    ...next,
    targetsPa: r.targets,
    targetTemperatureK: p.done.temperatureK,
    judgement,
    message: `${pressureText}; ${r.message}`,
  };
  if (r.result.limitBinds && r.result.nowPa >= (s.setup.workingLimitPa ?? Infinity)) {
    return {
      ...next,
      phase: 'ended',
      effects: [
        ...next.effects,
        {
          kind: 'close',
          time: now,
          note:
            `stopped after fill ${step.index}: the tank is at or above its working limit; ` +
            `no further fill can be made within it`,
        },
      ],
    };
  }
  // the fill stopped below its band: it is incomplete; continuing it is offered first (belowBand)
  if (deviation < -step.bandPa) return belowBand(next, step, target, pressureText);
  if (r.result.limitBinds) {
    const stop = capStop(next, r.result, `after fill ${step.index}`);
    if (stop) return stop;
    const cost = limitCost(cappedFinalText(next, r.result.predicted.pressurePa), deviations);
    next = {
      ...next,
      message: `${next.message}. ${cost} (the capped targets: ${next.capAccepted!.by} went on with them)`,
    };
  }
  return reviewed(enterStep(next), 'reading');
}

/**
 * the stop screen when the re-target is held below the working limit, unless the operator already
 * went on with a cap that leaves no further species outside the tolerance (or the tank is at the
 * limit: no fill remains to cap). The same after a reading, an undo, a correction or a temperature change.
 */
function capStop(s: FillState, r: ReturnType<typeof retarget>, after: string): FillState | undefined {
  if (!r.limitBinds || s.current >= s.setup.steps.length) return undefined;
  if (r.nowPa >= (s.setup.workingLimitPa ?? Infinity)) return undefined;
  const deviations = deviationsOf(r.predicted.composition, s);
  const acc = s.capAccepted;
  // asked again only when the cap leaves a species outside the tolerance that the choice did not
  if (acc && deviations.every((d) => d.within || acc.outside.includes(d.species))) return undefined;
  return cappedScreen(s, r.predicted.pressurePa, deviations, after);
}

/** after an undo, a correction or a temperature change: the capped stop screen if the re-target is held */
function capAfterChange(s: FillState, after: string): FillState | undefined {
  if (s.current >= s.setup.steps.length || (!s.done.length && !s.start?.read)) return undefined;
  return capStop(s, retargetRun(s, s.done, s.targetTemperatureK).result, after);
}

/**
 * the capped final pressure as the stop screen says it, once: the last capped target, absolute, to
 * the display step of the last fill's gauge (the reading that ends the batch)
 */
function cappedFinalText(s: FillState, finalPa: number): string {
  const last = s.setup.steps[s.setup.steps.length - 1];
  const unit = gaugeUnit(last);
  const dec = last.gauge ? decimalsFor(fromPa(last.gauge.resolutionPa, unit)) : 2;
  return `${fromPa(finalPa, unit).toFixed(dec)} ${unit}`;
}

/** the stop screen of a re-target held below the working limit: its cost, and go, undo or stop */
function cappedScreen(
  s: FillState,
  finalPa: number,
  deviations: readonly FractionDeviation[],
  after: string,
): FillState {
  const finalText = cappedFinalText(s, finalPa);
  return {
    ...s,
    phase: 'capped',
    input: '',
    capped: {
      after,
      step: s.setup.steps[s.current].index,
      finalPa,
      finalText,
      limitPa: s.setup.workingLimitPa!,
      outside: deviations.filter((d) => !d.within).map((d) => d.species),
      cost: limitCost(finalText, deviations),
      // both choices reviewed as the below-band screen's are: the capped fills ahead, and the tank now
      ways: belowBandWays(s, retargetInput(s, s.done, s.targetTemperatureK)),
    },
  };
}

/**
 * Enter on the capped screen: `go INITIALS` (fill to the capped targets) or `stop INITIALS` (the
 * batch stops here), each logged (acknowledge "limit-cap" with the cost); `undo INITIALS` takes back
 * the reading (the reducer's undo)
 */
function onCappedEnter(s: FillState, now: string): FillState {
  const c = s.capped!;
  const text = s.input.trim();
  const unit = gaugeUnit(s.setup.steps[s.current - 1]);
  const m = /^(go|stop)\s+([A-Za-z]{1,6})$/i.exec(text);
  if (!m)
    return {
      ...s,
      error: 'type one of: go INITIALS, stop INITIALS or undo INITIALS (the ways above); each is logged',
    };
  const go = m[1].toLowerCase() === 'go';
  const by = m[2];
  const what =
    `${c.after} the remaining fills are held below the working limit ${fmtIn(c.limitPa, unit)}: ` +
    `the tank ends at the capped final pressure ${c.finalText}` +
    (c.outside.length
      ? `, ${c.outside.join(', ')} OUTSIDE the tolerance`
      : ', the composition within the tolerance');
  const ack: NewLogEvent = {
    kind: 'acknowledge',
    code: LIMIT_CAP_CODE,
    step: c.step,
    by,
    time: now,
    note: `${what}; ${go ? `${by} went on to the capped targets` : `${by} stopped the batch here`}`,
    cap: { outcome: go ? 'continued' : 'stopped', final_Pa: c.finalPa, outside: [...c.outside] },
  };
  if (!go) {
    const tankNowText = tankNowWords(c.ways?.tankNow);
    const tank = tankNowText ? `; ${tankNowText}` : '';
    return {
      ...s,
      phase: 'ended',
      capped: undefined,
      input: '',
      ...(tankNowText ? { tankNowText } : {}),
      effects: [ack, { kind: 'close', time: now, note: `stopped by ${by} ${c.after}: ${what}${tank}` }],
      message: `stopped by ${by} ${c.after} (logged): ${what}${tank}`,
    };
  }
  const entered = enterStep({
    ...s,
    phase: 'reading',
    capped: undefined,
    capAccepted: { by, outside: c.outside },
    input: '',
    effects: [ack],
    message: `${by} goes on to the capped targets (logged): ${what}`,
  });
  return reviewed(entered, 'reading');
}

/** the acknowledgement code of a choice on the capped screen */
export const LIMIT_CAP_CODE = 'limit-cap';

/** the last capped re-target the log says the operator went on with */
function capAcceptedOf(log: ParsedLog | undefined): FillState['capAccepted'] {
  const a = (log?.acknowledgements ?? [])
    .filter((x) => x.code === LIMIT_CAP_CODE && x.cap?.outcome === 'continued')
    .at(-1);
  return a?.cap ? { by: a.by, outside: a.cap.outside } : undefined;
}

/** after the reading is plausible (or confirmed): the working limit */
function afterDoubt(s: FillState, p: Pending, now: string): FillState {
  const limit = s.setup.workingLimitPa;
  if (limit !== undefined && p.done.pressurePa > limit) {
    // a reading is a fact about the tank: it is logged now, before the operator chooses
    // (Ctrl-C or a crash on the danger screen keeps it)
    const unit = gaugeUnit(s.setup.steps[s.current]);
    const event: LogReading = {
      ...p.event,
      note:
        `above the working limit ${fmtIn(limit, unit)} of ${s.setup.header.tank.id}; ` +
        `logged as typed, before the operator's choice (vent, accept or withdraw ` +
        `as mistyped)` +
        (p.event.note ? `; ${p.event.note}` : ''),
    };
    return {
      ...s,
      phase: 'over-limit',
      pending: { ...p, event, logged: true },
      input: '',
      effects: [event],
      overLimit: overLimitOf(s, p.done, limit),
    };
  }
  return commit(s, p, [], now);
}

/** the vent-back advice for a reading past the limit, and whether the composition from there is within the tolerance */
function overLimitOf(s: FillState, reading: DoneReading, limit: number): OverLimit {
  const done = [...s.done, reading];
  let v: ReturnType<typeof ventBack>;
  try {
    v = ventBack({ ...retargetInput(s, done, reading.temperatureK), workingLimitPa: limit });
  } catch (e) {
    if (!(e instanceof ProblemError) || e.problem.code !== 'not-converged') throw e;
    // no vent lets the remaining fills go on within the limit: the hard stop stands, with a vent
    // to just below the limit and the reason why nothing can follow
    return {
      limitPa: limit,
      ventToPa: limit * (1 - 1e-3),
      after: `no further fill can be re-targeted within the limit (${describeProblem(e.problem)})`,
      why: 'just below the working limit: no vent lets the remaining fills go on within it',
      within: false,
      outside: [],
      last: false,
    };
  }
  const deviations = deviationsOf(v.after.predicted.composition, s);
  const outside = deviations.filter((d) => !d.within).map((d) => d.species);
  const unit = gaugeUnit(s.setup.steps[s.current]);
  const last = s.current + 1 >= s.setup.steps.length;
  if (last) {
    // no fill follows: vent to this fill's own target (the final pressure the re-target set), kept
    // below the limit by the fill's band; venting keeps the composition, so it is final as read
    const band = s.setup.steps[s.current].bandPa;
    const ventToPa = Math.min(s.targetsPa[s.current], limit - band);
    return {
      limitPa: limit,
      ventToPa,
      after:
        'no fill remains; venting keeps the composition, so the readings give it, and the reading after ' +
        'venting gives the final pressure',
      why:
        `the target of this last fill (the final pressure the re-target set), ` +
        `${ventToPa < s.targetsPa[s.current] ? 'held below the working limit by its band' : 'below the working limit'}`,
      within: outside.length === 0,
      outside,
      last,
    };
  }
  return {
    limitPa: limit,
    ventToPa: v.targetPa,
    after: v.after.message,
    why:
      `the pressure from which the remaining fills, re-targeted, end at ` +
      `${fmtIn(v.after.predicted.pressurePa, unit)} within the working limit`,
    within: outside.length === 0,
    outside,
    last,
  };
}

/**
 * where a logged reading lies: inside or outside its pressure band, or, past the tank's working
 * limit, that first (never "inside the band" for a tank over its limit)
 */
function bandWords(s: FillState, unit: PressureUnit, absolutePa: number, within: boolean): string {
  const limit = s.setup.workingLimitPa;
  if (limit !== undefined && absolutePa > limit)
    return (
      `ABOVE the working limit ${fmtIn(limit, unit)} of ${s.setup.header.tank.id} by ` +
      `${fmtIn(absolutePa - limit, unit, 3)}`
    );
  return `${within ? 'inside' : 'outside'} the pressure band`;
}

/**
 * what a remainder held by the working limit costs, in words: the final pressure it ends at, each
 * mole fraction off the design (by how much, inside or outside the tolerance), and the choices
 */
function limitCost(finalText: string, deviations: readonly FractionDeviation[]): string {
  const pct = (x: number) => `${fixedSig(x * 100, 3)} %`;
  const off = deviations
    .map(
      (d) =>
        `x(${d.species}) ${pct(d.actual)} (design ${pct(d.design)}: ${signed(d.deviation * 100)} points, ` +
        `${d.within ? 'inside' : 'OUTSIDE'} the tolerance +-${fixedSig(d.tolerance * 100, 3)} points)`,
    )
    .join(', ');
  const outside = deviations.filter((d) => !d.within).length;
  return (
    `The working limit costs: the tank ends at the capped final pressure ${finalText} (absolute); ${off}` +
    (outside
      ? ` - ${outside} mole fraction(s) OUTSIDE the tolerance`
      : ' - the composition stays within the tolerance')
  );
}

/**
 * A reading past the gauge head's range, in words. Past the tank's working limit too, that comes
 * first: if the value is real the tank is over its limit (what to do now), then the likely slip.
 */
/**
 * A typed reading past its gauge's range: no reading of that gauge can show it, so it is a typing
 * slip or the unit, and it is not logged (a real over-pressure shows as the gauge's over-range, not
 * as a number: the over-limit flow applies to a number read). Says what was typed, what it is on the
 * gauge, the range, what to do; and what an over-range display itself would mean for the tank.
 */
function pastRange(s: FillState, step: FillStep, shown: number, absolutePa: number): string {
  const unit = gaugeUnit(step);
  const gauge = step.gauge!;
  const limit = s.setup.workingLimitPa;
  const tank = s.setup.header.tank.id;
  const ambient = gauge.reference === 'gauge' ? s.barometerPa : 0;
  const topAbs = gauge.fullScalePa + ambient;
  const target = shownPa(s, step, s.targetsPa[s.current]);
  // the next gauge up: one this plan reads the tank on first, else any of the lab profile's
  const used = new Set(s.setup.steps.map((x) => x.gauge?.id));
  const higher = s.setup.header.gauges
    .filter((g) => g.full_scale_Pa + (g.reference === 'gauge' ? s.barometerPa : 0) > topAbs)
    .sort((a, b) => Number(used.has(b.id)) - Number(used.has(a.id)) || a.full_scale_Pa - b.full_scale_Pa)[0];
  const typed = s.input.trim();
  const overRange =
    limit !== undefined && topAbs >= limit
      ? `If ${gauge.id} itself shows over-range, ${tank} is above ${fmtIn(topAbs, unit)} absolute, past its ` +
        `working limit ${fmtIn(limit, unit)}: DANGER - stop adding gas, close the cylinder and tank valves, ` +
        `keep clear of the tank and follow the lab's over-pressure procedure.`
      : `If ${gauge.id} itself shows over-range, close its valve and read ${tank} on ` +
        (higher
          ? `${higher.id} (up to ${fmtIn(higher.full_scale_Pa, unit)}).`
          : 'a gauge with a higher range (the lab profile has none: stop adding gas and ask).');
  const absText = absolutePa !== shown ? ` (${fmtIn(absolutePa, unit)} absolute)` : '';
  return (
    pastLimitFirst(s, step, absolutePa) +
    `typed "${typed}" = ${fmtIn(shown, unit)} on ${gauge.id}${absText}, ` +
    `past its range (up to ${fmtIn(gauge.fullScalePa, unit)}): ${gauge.id} cannot show that, so it is NOT logged. ` +
    `Likely the unit or a typing slip (the target is ${fmtIn(target, unit)} on ${gauge.id}): type the number ` +
    `the gauge shows, in ${unit}. ${overRange}`
  );
}

/**
 * The danger a typed value past the gauge's range says first when it is past the tank's working limit
 * too, as typed or as its bare number in the gauge's unit (the reading it would be if only the unit was
 * a slip): if the tank really holds that, it is over its limit now. Empty when neither reading is.
 */
function pastLimitFirst(s: FillState, step: FillStep, absolutePa: number): string {
  const limit = s.setup.workingLimitPa;
  if (limit === undefined) return '';
  const unit = gaugeUnit(step);
  const tank = s.setup.header.tank;
  const text = s.input.trim();
  // a number with a unit (a bare number is in the gauge's unit already)
  const m = READING_NUMBER.test(text)
    ? null
    : /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*[A-Za-z]/.exec(text);
  // the bare number read in the gauge's unit, on its basis (gauge-referenced: above ambient)
  const bare = m
    ? Number(m[1]) * paPerUnit(unit) + (step.gauge?.reference === 'gauge' ? s.barometerPa : 0)
    : NaN;
  const readings = [
    { pa: absolutePa, as: 'as typed' },
    { pa: bare, as: `read as ${m?.[1]} ${unit}, the gauge's unit` },
  ].filter((r) => r.pa > limit);
  if (!readings.length) return '';
  const r = readings[0];
  const rated = tank.rated_pressure_Pa ? `, rated ${fmtIn(tank.rated_pressure_Pa, unit, 4)}` : '';
  return (
    `DANGER if the tank holds it: ${fmtIn(r.pa, unit)} absolute (${r.as}) is past the working limit ` +
    `${fmtIn(limit, unit)} of ${tank.id}${rated}: stop adding gas, close the cylinder and tank valves, keep ` +
    `clear of the tank and follow the lab's over-pressure procedure. Then: `
  );
}

/** the lab profile's gauges (the log header's) whose range covers an absolute pressure, the best first */
function coveringGauges(s: FillState, absolutePa: number, except: string): Gauge[] {
  return (
    s.setup.header.gauges
      .map(gaugeFromLog)
      .filter((g) => {
        if (g.id === except) return false;
        const shown = absolutePa - (g.reference === 'gauge' ? s.barometerPa : 0);
        return shown >= g.minimumPa && shown <= g.fullScalePa;
      })
      // absolute heads first (no barometer in the reading), then the finer display step
      .sort(
        (a, b) =>
          Number(a.reference === 'gauge') - Number(b.reference === 'gauge') ||
          a.resolutionPa - b.resolutionPa,
      )
  );
}

/** a gauge's range in words, on its basis: "up to 10000.0 Torr absolute", "up to 100.00 psi above ambient" */
function rangeWords(g: Gauge): string {
  const unit: PressureUnit = isPressureUnit(g.unit) ? g.unit : 'Torr';
  const dec = decimalsFor(fromPa(g.resolutionPa, unit));
  const basis = g.reference === 'gauge' ? 'above ambient' : 'absolute';
  return `up to ${fromPa(g.fullScalePa, unit).toFixed(dec)} ${unit} ${basis}`;
}

/** a value past a head's range against its overpressure rating, in words (the lab profile may give none) */
function overpressureWords(gauge: Gauge, shown: number, unit: PressureUnit): string {
  const o = gauge.overpressurePa;
  if (o === undefined)
    return (
      `The lab profile gives no overpressure rating for ${gauge.id}: whether the head was harmed is not ` +
      `known; have it checked before it is used again.`
    );
  return shown > o
    ? `It is PAST ${gauge.id}'s overpressure rating (${fmtIn(o, unit)}): if the tank holds it, the head may ` +
        `be damaged - close its valve now and have it checked before it is used again.`
    : `It is within ${gauge.id}'s overpressure rating (${fmtIn(o, unit)}).`;
}

/**
 * A value typed past the range of the fill's gauge: the gauge cannot show it, so it is no reading; but the
 * tank may hold it (a real over-pressure shows as the gauge's over-range), so it is logged as typed at once
 * (acknowledge "over-range", outcome "typed": Ctrl-C keeps it, and `check` says the tank was not re-read)
 * and the screen asks: the tank read on a gauge that covers the value (named), or a typing slip.
 */
function overRangeOpened(
  s: FillState,
  step: FillStep,
  shown: number,
  absolutePa: number,
  now: string,
): FillState {
  const gauge = step.gauge!;
  const unit = gaugeUnit(step);
  const typed = s.input.trim();
  const covering = coveringGauges(s, absolutePa, gauge.id);
  const absText = absolutePa !== shown ? ` (${fmtIn(absolutePa, unit)} absolute)` : '';
  const target = shownPa(s, step, s.targetsPa[s.current]);
  const limit = s.setup.workingLimitPa;
  const topAbs = gauge.fullScalePa + (gauge.reference === 'gauge' ? s.barometerPa : 0);
  const tank = s.setup.header.tank.id;
  // the gauge's own over-range display, where its top is past the tank's working limit: the danger
  const display =
    limit !== undefined && topAbs >= limit
      ? ` If ${gauge.id} itself shows over-range, ${tank} is above ${fmtIn(topAbs, unit)} absolute, past its ` +
        `working limit ${fmtIn(limit, unit)}: DANGER - stop adding gas, close the cylinder and tank valves, ` +
        `keep clear of the tank and follow the lab's over-pressure procedure.`
      : '';
  const words =
    pastLimitFirst(s, step, absolutePa) +
    `typed "${typed}" = ${fmtIn(shown, unit)} on ${gauge.id}${absText}, past its range ` +
    `(up to ${fmtIn(gauge.fullScalePa, unit)}): ${gauge.id} cannot show that, so it is NOT logged as a ` +
    `reading. It is logged as typed: ${tank} counts as NOT read until it is read on a gauge that covers it, ` +
    `or the value is said to be a slip. Likely the unit or a typing slip (the target is ` +
    `${fmtIn(target, unit)} on ${gauge.id}). ${overpressureWords(gauge, shown, unit)}${display}`;
  const overRange: OverRange = {
    typed,
    gaugeId: gauge.id,
    shownPa: shown,
    absolutePa,
    covering: covering.map((g) => g.id),
    words,
  };
  return {
    ...s,
    phase: 'over-range',
    input: '',
    overRange,
    effects: [overRangeEvent(s, overRange, 'typed', s.operator ?? '-', now, words)],
  };
}

/** the log line of a value typed past its gauge's range, or of its resolution (slip, re-read) */
function overRangeEvent(
  s: FillState,
  o: OverRange,
  outcome: 'typed' | 'slip' | 're-read',
  by: string,
  now: string,
  note: string,
  readOn?: string,
): NewLogEvent {
  const gauge = s.setup.steps[s.current].gauge!;
  return {
    kind: 'acknowledge',
    code: OVER_RANGE_CODE,
    step: s.setup.steps[s.current].index,
    by,
    time: now,
    note,
    over_range: {
      outcome,
      typed: o.typed,
      gauge: o.gaugeId,
      shown_Pa: o.shownPa,
      pressure_Pa: o.absolutePa,
      full_scale_Pa: gauge.fullScalePa,
      ...(gauge.overpressurePa !== undefined ? { overpressure_Pa: gauge.overpressurePa } : {}),
      ...(readOn ? { read_on: readOn } : {}),
    },
  };
}

/** an example entry of the over-range screen: the first covering gauge, the value typed as it shows it */
export function overRangeExample(s: FillState, o: OverRange): string | undefined {
  const g = s.setup.header.gauges.find((x) => x.id === o.covering[0]);
  if (!g) return undefined;
  const gauge = gaugeFromLog(g);
  const unit: PressureUnit = isPressureUnit(gauge.unit) ? gauge.unit : 'Torr';
  const shown = o.absolutePa - (gauge.reference === 'gauge' ? s.barometerPa : 0);
  return `${gauge.id} ${fromPa(shown, unit).toFixed(decimalsFor(fromPa(gauge.resolutionPa, unit)))} AB`;
}

const OVER_RANGE_WAYS =
  'type GAUGE VALUE INITIALS (the tank read on a gauge that covers it) or slip INITIALS (a typing slip); ' +
  'each is logged';

/**
 * Enter on the over-range screen: `slip INITIALS` (the value was a typing slip: logged, the reading asked
 * again) or `GAUGE VALUE INITIALS`, the tank read on a gauge whose range covers it: logged as the fill's
 * reading on that gauge (check takes its uncertainty from it), then judged as any reading is (the working
 * limit, the band, the review of the fills ahead)
 */
function onOverRangeEnter(s: FillState, now: string): FillState {
  const o = s.overRange!;
  const text = s.input.trim();
  const slip = /^slip\s+([A-Za-z]{1,6})$/i.exec(text);
  if (slip) {
    const note = `"${o.typed}" typed for ${o.gaugeId} (past its range): a typing slip, said by ${slip[1]}`;
    return {
      ...s,
      phase: 'reading',
      overRange: undefined,
      input: '',
      effects: [overRangeEvent(s, o, 'slip', slip[1], now, note)],
      message: `${note} (logged); type the reading ${o.gaugeId} shows`,
    };
  }
  const m = /^(\S+)\s+(.+?)\s+([A-Za-z]{1,6})$/.exec(text);
  const g = m && s.setup.header.gauges.find((x) => x.id === m[1]);
  if (!m || !g)
    return {
      ...s,
      error: m
        ? `no gauge "${m[1]}" in the lab profile of this log; ${OVER_RANGE_WAYS}`
        : `${OVER_RANGE_WAYS}`,
    };
  if (g.id === o.gaugeId)
    return {
      ...s,
      error: `${g.id} cannot show it: read the tank on a gauge that covers it, or slip INITIALS`,
    };
  const step = s.setup.steps[s.current];
  const on: FillStep = { ...step, gauge: gaugeFromLog(g) };
  const parsed = parseReading({ ...s, input: m[2] }, on);
  if ('error' in parsed) return refusedEntry({ ...s, input: text }, parsed);
  const gauge = on.gauge!;
  const unit = gaugeUnit(on);
  const absolute = gauge.reference === 'gauge' ? parsed.shown + s.barometerPa : parsed.shown;
  if (parsed.shown > gauge.fullScalePa || parsed.shown < gauge.minimumPa)
    return {
      ...s,
      error:
        `${fmtIn(parsed.shown, unit)} is outside ${gauge.id}'s range (${rangeWords(gauge)}): it cannot show ` +
        `that either; read the tank on a gauge that covers it` +
        (o.covering.length ? ` (${o.covering.join(', ')})` : ''),
    };
  const prev = s.done.length ? s.done[s.done.length - 1].pressurePa : (s.start?.pressurePa ?? 0);
  if (!(absolute > prev))
    return {
      ...s,
      error:
        `${fmtIn(absolute, unit)} absolute on ${gauge.id} is not above the previous reading ` +
        `${fmtIn(prev, unit)} absolute, and a fill only adds gas: check the value and the gauge`,
    };
  // a gauge-referenced head: made absolute with the barometer in force, said when it was not read today
  const baro =
    gauge.reference === 'gauge' && !s.barometerToday
      ? `; made absolute with the plan's barometer ${fmtIn(s.barometerPa, 'Torr')} (not read today)`
      : '';
  const note = `read on ${gauge.id} by ${m[3]}: "${o.typed}" was typed for ${o.gaugeId}, past its range${baro}`;
  const event = readingEvent(
    { ...s, input: m[2], operator: m[3] },
    on,
    absolute,
    parsed.temperatureK,
    now,
    note,
  );
  const done: DoneReading = {
    step: step.index,
    pressurePa: absolute,
    temperatureK: parsed.temperatureK,
    text: event.reading,
  };
  const ack = overRangeEvent(
    s,
    o,
    're-read',
    m[3],
    now,
    `${note} (the tank re-read; the reading logged next)`,
    gauge.id,
  );
  const base: FillState = { ...s, phase: 'reading', overRange: undefined, input: '' };
  const next = afterDoubt(base, { event, done, typed: m[2] }, now);
  const said = `read on ${gauge.id} ("${o.typed}" was past ${o.gaugeId}'s range)`;
  return {
    ...next,
    effects: [ack, ...next.effects],
    message: [next.message, said].filter(Boolean).join('; '),
  };
}

/** a signed number in plain notation, 3 significant figures (never "1.32e+3") */
function signed(v: number): string {
  // a reading typed at the target differs from it by the floating point only
  if (Math.abs(v) < 1e-9) return '0';
  return `${v >= 0 ? '+' : '-'}${fixedSig(Math.abs(v), 3)}`;
}

/**
 * A fill read below its band: the reading is logged, the fill stays on its screen. A fill before the
 * last: continue it, go on from the reading (next) or stop the batch here, each way reviewed (belowWays).
 * The last fill: more gas can be added (the new reading corrects this step's reading, reason "more gas
 * added"), the reading undone, or the batch closed as it is.
 */
function belowBand(s: FillState, step: FillStep, targetPa: number, pressureText: string): FillState {
  const unit = gaugeUnit(step);
  const last = s.done[s.done.length - 1];
  const short =
    `${pressureText}: ${fmtIn(last.pressurePa, unit)} absolute is BELOW the target ` +
    `${fmtIn(targetPa, unit)} by more than its band (${fmtIn(step.bandPa, unit, 3)})`;
  if (s.current < s.setup.steps.length) {
    // a fill before the last: the fills ahead are re-targeted (s) but not entered; every way on the screen
    // offers is reviewed here, and the screen says what each review found
    const belowWays = belowBandWays(s, retargetInput(s, s.done, s.targetTemperatureK));
    return {
      ...s,
      phase: 'below',
      input: '',
      field: 'reading',
      review: undefined,
      belowWays,
      message: `${short}: the fill is incomplete`,
    };
  }
  const { judgement, summary } = finalJudgement(s);
  // the last fill: continuing it and closing the batch as it stands are reviewed as before the last
  const belowWays = belowBandWays(s, retargetInput(s, s.done, s.targetTemperatureK));
  return {
    ...s,
    phase: 'below',
    judgement,
    summary,
    input: '',
    field: 'reading',
    belowWays,
    message:
      `${pressureText}: ${fmtIn(last.pressurePa, unit)} absolute is BELOW the target ` +
      `${fmtIn(targetPa, unit)} of the last fill by more than its band (${fmtIn(step.bandPa, unit, 3)}); ` +
      `the batch is not closed`,
  };
}

function onReadingEnter(s: FillState, now: string): FillState {
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  const parsed = parseReading(s, step);
  // a refused entry clears the field refused, and only it
  if ('error' in parsed) return refusedEntry(s, parsed);
  const { shown, temperatureK } = parsed;
  const absolute = step.gauge?.reference === 'gauge' ? shown + s.barometerPa : shown;
  const prev = s.done.length ? s.done[s.done.length - 1].pressurePa : (s.start?.pressurePa ?? 0);
  if (!(absolute > prev)) {
    // both values in the unit typed and on the basis of this step's gauge (gauge-referenced: above ambient)
    const typedUnit = typedUnitOf(s.input, unit);
    const gaugeRef = step.gauge?.reference === 'gauge';
    const basis = gaugeRef
      ? `on ${step.gauge!.id} (above ambient; barometer ${fmtIn(s.barometerPa, typedUnit, 5)})`
      : 'absolute';
    const prevShown = gaugeRef ? prev - s.barometerPa : prev;
    return {
      ...s,
      input: '',
      error:
        `typed "${s.input.trim()}": ${fmtIn(shown, typedUnit)} ${basis} is not above ` +
        `the previous reading, ${fmtIn(prevShown, typedUnit)} ${basis}, and a fill ` +
        `only adds gas. Likely: a typing slip or the unit; gas that flowed back into ` +
        `the line (it was below the tank pressure when the valve opened; the tank's ` +
        `composition is unchanged: fill on to the target and log that reading); or ` +
        `the tank cooled (check the temperature). The reading is not logged.`,
    };
  }
  if (step.gauge && shown > step.gauge.fullScalePa) return overRangeOpened(s, step, shown, absolute, now);
  // the judgement uses the temperature typed with the reading: re-target first if it changed
  const s1 = Math.abs(temperatureK - s.targetTemperatureK) >= 0.005 ? withTemperature(s) : s;
  const event = readingEvent(s1, step, absolute, temperatureK, now);
  const p: Pending = {
    event,
    done: { step: step.index, pressurePa: absolute, temperatureK, text: event.reading },
    typed: s1.input.trim(),
  };
  const slip = unitSlip(s1, step, shown);
  if (slip) return { ...s1, phase: 'unit-check', input: '', pending: { ...p, reason: slip } };
  const why = doubt(s1, step, shown);
  if (why) return { ...s1, phase: 'confirm', pending: { ...p, reason: why } };
  return afterDoubt(s1, p, now);
}

/**
 * Enter on the unit check: `log INITIALS` logs the reading as typed (never converted), with the
 * initials and a note of what was asked; `n` (or Esc) goes back to re-type it, nothing logged
 */
function onUnitCheckEnter(s: FillState): FillState {
  const p = s.pending!;
  const text = s.input.trim();
  if (/^(n|no|retype|re-type)$/i.test(text)) return unitRetype(s);
  const m = /^log\s+([A-Za-z]{1,6})$/i.exec(text);
  if (!m)
    return {
      ...s,
      input: '',
      error: `type log and your initials (e.g. log AB) to log ${p.done.text} as typed, or n (or Esc) to re-type it`,
    };
  const step = s.setup.steps[s.current];
  const note = `unit checked at the manifold: ${p.reason} Logged as typed (${p.done.text}), confirmed by ${m[1]}`;
  const event: LogReading = {
    ...p.event,
    by: m[1],
    note: p.event.note ? `${p.event.note}; ${note}` : note,
  };
  const confirmed: Pending = { ...p, event, reason: undefined };
  const back: FillState = { ...s, phase: 'reading', input: '', pending: undefined };
  // the other doubts still ask (an absolute value on a gauge-referenced head, another charge's target)
  const shown = step.gauge?.reference === 'gauge' ? p.done.pressurePa - s.barometerPa : p.done.pressurePa;
  const why = doubt(back, step, shown);
  if (why) return { ...back, phase: 'confirm', pending: { ...confirmed, reason: why } };
  return afterDoubt(back, confirmed, event.time);
}

/** back from the unit check to the reading: nothing logged, the field cleared */
function unitRetype(s: FillState): FillState {
  return {
    ...s,
    phase: 'reading',
    pending: undefined,
    input: '',
    field: 'reading',
    message: `${s.pending!.done.text} is not logged; type the reading again (a bare number is in the gauge's unit)`,
  };
}

function onOverLimitEnter(s: FillState, now: string): FillState {
  const p = s.pending!;
  const o = s.overLimit!;
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  const text = s.input.trim();
  const edit = /^edit\s+([A-Za-z]{1,6})$/i.exec(text);
  if (/^edit\b/i.test(text) && !edit)
    return {
      ...s,
      error:
        'type "edit" and your initials (e.g. edit AB): the reading is withdrawn as ' +
        'mistyped (the log keeps it and the withdrawal), then type the right one',
    };
  if (edit) {
    if (p.done.line === undefined)
      return {
        ...s,
        error: 'the log line of this reading is not known; stop (Ctrl-C) and resume the fill to withdraw it',
      };
    const withdraw: NewLogEvent = {
      kind: 'withdraw',
      step: step.index,
      withdraws_line: p.done.line,
      by: edit[1],
      time: now,
      reason: `mistyped: ${p.done.text} (above the working limit) withdrawn at the manifold`,
    };
    return {
      ...s,
      phase: 'reading',
      pending: undefined,
      overLimit: undefined,
      // the field is cleared, as after a refusal: one Enter must never log the mistyped value again
      input: '',
      effects: [withdraw],
      message:
        `the reading ${p.done.text} of fill ${step.index} is withdrawn by ${edit[1]} ` +
        `as mistyped; the log keeps it, the withdrawal and the reason. Type the right reading ` +
        `(the field is empty: type it anew)`,
    };
  }
  const acc = /^accept\s+([A-Za-z]{1,6})$/.exec(text);
  if (acc) {
    const ack: NewLogEvent = {
      kind: 'acknowledge',
      code: 'above-working-limit',
      step: step.index,
      by: acc[1],
      time: now,
      note:
        `reading ${fmtIn(p.done.pressurePa, unit)} absolute after fill ${step.index} ` +
        `is above the working limit ${fmtIn(o.limitPa, unit)} of ${s.setup.header.tank.id}; accepted`,
    };
    return { ...commit(s, p, [ack], now), aboveLimitText: aboveLimitWords(s, p.done.pressurePa, o.limitPa) };
  }
  const vent = /^vent\s+([A-Za-z]{1,6})$/i.exec(text);
  if (/^vent\b/i.test(text) && !vent)
    return {
      ...s,
      error: 'type "vent" and your initials (e.g. vent AB): the vent is logged, then its reading',
    };
  if (vent) return ventChosen(s, p, o, vent[1], now);
  return {
    ...s,
    error:
      'the reading is logged. Type "vent" and your initials (you vent or pump back), "accept" and ' +
      'your initials (keep the tank as it is; logged), or "edit" and your initials ' +
      '(it was mistyped: the reading is withdrawn, with a trace), then Enter',
  };
}

/**
 * what a Ctrl-C leaves that the count of logged readings does not say: a reading past the working limit
 * logged on its danger screen with no choice made (vent, accept, edit), or one accepted and not vented
 */
export function interruptNote(s: FillState): string | undefined {
  const p = s.pending;
  const o = s.overLimit;
  if (s.phase === 'over-limit' && p && o) {
    const step = s.setup.steps[s.current];
    const unit = gaugeUnit(step);
    return (
      `the tank ${s.setup.header.tank.id} is LEFT LOGGED ABOVE ITS WORKING LIMIT with no choice made: fill ` +
      `${step.index} read ${fmtIn(p.done.pressurePa, unit)} absolute vs the limit ${fmtIn(o.limitPa, unit)}` +
      `${p.logged ? ' (logged)' : ' (not logged)'}. Close the cylinder and tank valves; do not use the tank; ` +
      `resume the fill to choose (vent, accept or edit if mistyped); vent or pump back by your lab's procedure, ` +
      `away from ignition sources; defer to local rules and the tank's rating`
    );
  }
  const r = s.overRange;
  if (s.phase === 'over-range' && r)
    return (
      `"${r.typed}" typed for ${r.gaugeId} (past its range) is logged, and ${s.setup.header.tank.id} was NOT ` +
      `read on a gauge that covers it: the tank may hold more than the readings say. Close the cylinder and ` +
      `tank valves; resume the fill to read it on ` +
      (r.covering.length ? r.covering.join(' or ') : 'a gauge that covers it') +
      ` (or to say it was a typing slip)`
    );
  return s.aboveLimitText;
}

/** the tank left above its working limit (a reading there accepted): where it is, and what to do */
export function aboveLimitWords(s: FillState, pressurePa: number, limitPa: number): string {
  const unit = gaugeUnit(s.setup.steps[Math.min(s.current, s.setup.steps.length - 1)]);
  return (
    `the tank ${s.setup.header.tank.id} is STILL ABOVE its working limit: ${fmtIn(pressurePa, unit)} ` +
    `absolute logged vs the limit ${fmtIn(limitPa, unit)}. Close the cylinder and tank valves and bring it ` +
    `below the limit by your lab's procedure (vent or pump back to a safe place, away from ignition ` +
    `sources); do not use it until then; defer to local rules and the tank's rating`
  );
}

/** vent chosen on the danger screen: the vent is logged, then the tank is read after venting */
function ventChosen(s: FillState, p: Pending, o: OverLimit, by: string, now: string): FillState {
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  if (p.done.line === undefined)
    return {
      ...s,
      error: 'the log line of this reading is not known; stop (Ctrl-C) and resume the fill to choose again',
    };
  const ev: NewLogEvent = {
    kind: 'vent',
    step: step.index,
    target_Pa: o.ventToPa,
    by,
    time: now,
    note:
      `fill ${step.index} read ${fmtIn(p.done.pressurePa, unit)} absolute (line ${p.done.line}), above the ` +
      `working limit ${fmtIn(o.limitPa, unit)}; ${by} has chosen to vent; target to vent to: at most ` +
      `${fmtIn(o.ventToPa, unit)} absolute (the pressure after venting is the vent-reading that follows, if any)`,
  };
  return {
    ...s,
    done: [...s.done, p.done],
    current: s.current + 1,
    pending: undefined,
    overLimit: undefined,
    aboveLimitText: undefined,
    phase: 'vented',
    input: '',
    field: 'reading',
    effects: [ev],
    venting: {
      step: step.index,
      targetPa: o.ventToPa,
      beforePa: p.done.pressurePa,
      limitPa: o.limitPa,
      by,
      last: o.last,
      after: o.after,
    },
    message:
      `vent logged by ${by}. Vent or pump the tank back to at most ${atMostOnGauge(s, step, o.ventToPa)} on ` +
      `${step.gauge?.id ?? 'the gauge'} (${fmtIn(o.ventToPa, unit)} absolute), let it settle, then read it`,
  };
}

/**
 * The reading after venting, "VALUE INITIALS": refused (not logged) unless it is below the reading
 * before venting; logged as a vent-reading; still above the working limit, the screen stays (vent
 * more, read again); else the batch closes (the last fill) or stops (finish as a top-up).
 */
function onVentedEnter(s: FillState, now: string): FillState {
  const v = s.venting!;
  const step = s.setup.steps.find((x) => x.index === v.step)!;
  const unit = gaugeUnit(step);
  const w = withInitials(s.input, 'reading after venting', '1490.2 AB');
  if ('error' in w) return { ...s, error: w.error };
  const parsed = parseReading({ ...s, input: w.value }, step);
  if ('error' in parsed) return refusedEntry(s, parsed);
  const absolute = step.gauge?.reference === 'gauge' ? parsed.shown + s.barometerPa : parsed.shown;
  if (step.gauge && parsed.shown > step.gauge.fullScalePa)
    return { ...s, input: '', error: pastRange(s, step, parsed.shown, absolute) };
  if (!(absolute < v.beforePa))
    return {
      ...s,
      input: '',
      error:
        `typed "${w.value}": ${fmtIn(absolute, unit)} absolute is not below the reading before venting, ` +
        `${fmtIn(v.beforePa, unit)} absolute, and venting only lets gas out. Likely a typing slip or the ` +
        `unit, or the tank warmed (check the temperature). The reading is not logged.`,
    };
  const text = `${w.value}${/[A-Za-z]/.test(w.value) ? '' : ` ${unit}`}`;
  const ev: NewLogEvent = {
    kind: 'vent-reading',
    step: v.step,
    gauge: step.gauge?.id ?? 'none',
    reading: text,
    pressure_Pa: absolute,
    ...(step.gauge?.reference === 'gauge' ? { barometer_Pa: s.barometerPa } : {}),
    temperature: s.temperatureText.trim(),
    temperature_K: parsed.temperatureK,
    by: w.by,
    time: now,
    ...withGaugeNote(s, w.value, absolute),
  };
  const base: FillState = { ...s, input: '', effects: [ev] };
  if (absolute > v.limitPa)
    return {
      ...base,
      message:
        `${text} after venting logged by ${w.by}: ${fmtIn(absolute, unit)} absolute is still ABOVE the working ` +
        `limit ${fmtIn(v.limitPa, unit)} by ${fmtIn(absolute - v.limitPa, unit, 3)}. Vent more, to ` +
        `${fmtIn(v.targetPa, unit)} absolute at most, let it settle and read again`,
    };
  const off = absolute - v.targetPa;
  const read =
    `the tank read ${text} (${fmtIn(absolute, unit)} absolute) after venting, logged by ${w.by}: ` +
    `${signed(fromPa(off, unit))} ${unit} from the vent target ${fmtIn(v.targetPa, unit)}` +
    (off < -step.bandPa ? ' (vented below it: the tank holds less gas than that target)' : '');
  if (v.last)
    return {
      ...finish(
        { ...base, ventedRead: { text, pressurePa: absolute } },
        now,
        `closed after venting: ${read}`,
      ),
      message:
        `${read}. Venting keeps the composition: the re-check and the label below are of the readings, ` +
        `with the final pressure and amount read after venting`,
    };
  const how = topUpHow(s, absolute, parsed.temperatureK, unit);
  return {
    ...base,
    phase: 'ended',
    effects: [
      ev,
      {
        kind: 'close',
        time: now,
        note: `stopped after fill ${v.step}: ${read}; the readings give its composition. ${how}`,
      },
    ],
    message: `${read}. Venting keeps the composition, so this log's readings still give it. ${how}`,
  };
}

/**
 * How to finish a batch stopped by a vent as a top-up, in words: the recipe lines of the top-up
 * batch (in_tank: the tank's composition from the readings, at the pressure read after venting; the
 * order of the fills left) and its command, and what its fills will be (each gas, to which reading, on
 * which gauge), re-targeted from the vented tank (the amounts of the readings scaled by the vent:
 * the virial density after venting over the density before, same composition)
 */
function topUpHow(s: FillState, ventedPa: number, temperatureK: number, unit: PressureUnit): string {
  const rest = s.setup.steps.slice(s.current);
  const order = `[${rest.map((x) => x.species).join(', ')}]`;
  const before = s.done[s.done.length - 1];
  let fills: string;
  let now: Readonly<Record<string, number>> | undefined;
  try {
    now = retarget(retargetInput(s, s.done, before.temperatureK)).nowComposition;
    const y = now;
    const keys = Object.keys(y).filter((k) => y[k] > 0);
    const rho = (p: number, t: number) => {
      const m = virialModel(keys, t);
      return densityFromPressure(p, t, bMix(m, y), cMix(m, y));
    };
    const f = Math.min(1, rho(ventedPa, temperatureK) / rho(before.pressurePa, before.temperatureK));
    const r = retarget({ ...retargetInput(s, s.done, temperatureK), ventFactor: f });
    fills =
      ' Its fills should come to (re-targeted here from the tank as read after venting): ' +
      r.remaining
        .map((x) => {
          const st = s.setup.steps[x.step - 1];
          const u = gaugeUnit(st);
          return (
            `${fillName(st)} ${st.species} from ${st.source.id} to ${fmtIn(shownPa(s, st, x.targetPa), u)} ` +
            `on ${st.gauge?.id ?? 'the gauge'}`
          );
        })
        .join(', ') +
      ` (${r.message}).`;
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    fills = ` Its fills could not be re-targeted here (${describeProblem(e.problem)}); plan it first.`;
  }
  const comp = now
    ? `{ ${Object.entries(now)
        .filter(([, x]) => x > 0)
        .map(([k, x]) => `${k}: ${Number(x.toPrecision(6))}`)
        .join(', ')} }`
    : '(the composition `mixwright check` gives for this log)';
  return (
    `Finish it as a top-up batch, in a new log: in a copy of this batch's recipe add ` +
    `\`in_tank: { composition: ${comp}, pressure: ${fmtIn(ventedPa, unit)} }\` (the fills left: ` +
    `${order}), check it with \`mixwright plan\` and fill it with \`mixwright fill\` (it reads the ` +
    `starting pressure first).${fills} If \`plan\` refuses the copy (the tank holds more of a gas than ` +
    `the design allows), the design cannot be reached from this tank: use it under a new design, or vent ` +
    `or evacuate it.`
  );
}

const INITIALS = /^(.*\S)\s+([A-Za-z]{1,6})$/;

/** "VALUE INITIALS": the value text and the initials, or an error naming what is missing */
function withInitials(
  text: string,
  what: string,
  example: string,
): { value: string; by: string } | { error: string } {
  const m = INITIALS.exec(text.trim());
  if (!m) return { error: `type the ${what} and then your initials, e.g. ${example}` };
  return { value: m[1], by: m[2] };
}

/**
 * Enter on the undo screen: the last reading is withdrawn with the reason typed (none when Enter alone),
 * and its fill is read again
 */
function onUndoReasonEnter(s: FillState, now: string): FillState {
  const by = s.undoing!.by;
  const reason = s.input.trim().replace(/\s+/g, ' ');
  if (reason.length > 200)
    return {
      ...s,
      error: `the reason is ${reason.length} characters; keep it under 200 (or Enter alone to skip it)`,
    };
  const last = s.done[s.done.length - 1];
  const done = s.done.slice(0, -1);
  const next = rejudge({
    ...s,
    capped: undefined,
    undoing: undefined,
    done,
    current: s.done.length - 1,
    input: '',
    effects: [
      {
        kind: 'withdraw',
        step: last.step,
        withdraws_line: last.line!,
        by,
        time: now,
        ...(reason ? { reason } : {}),
      },
    ],
  });
  const withdrawn =
    `the reading of ${fillName(s.setup.steps[last.step - 1])} (${last.text}) is withdrawn by ` +
    `${by}${reason ? ` (reason: ${reason})` : ' (no reason given)'}; the log keeps it and the withdrawal. ` +
    `Read fill ${last.step} again`;
  // the readings left may still hold the re-target below the working limit: the same stop screen
  const cap = capAfterChange({ ...next, review: undefined }, `after the undo of fill ${last.step}`);
  if (cap) return { ...cap, message: withdrawn };
  const entered = enterStep({ ...next, phase: 'reading', message: withdrawn });
  return reviewed({ ...entered, review: undefined }, 'undo');
}

/** after the reading set changed (undo, correction): re-target and judge from the readings in force */
function rejudge(s: FillState): FillState {
  if (s.current >= s.setup.steps.length) return s;
  const r = retargetRun(s, s.done, s.targetTemperatureK);
  if (!s.done.length) return { ...s, targetsPa: r.targets, judgement: undefined };
  const deviations = deviationsOf(r.result.predicted.composition, s);
  return {
    ...s,
    targetsPa: r.targets,
    judgement: {
      kind: 'predicted',
      verdict: deviations.every((d) => d.within) ? 'on-course' : 'off-course',
      deviations,
      phi: r.result.predicted.phi,
    },
  };
}

/** the commands of the reading screen: undo INITIALS (the last reading) and fix N INITIALS (any earlier one) */
function onCommand(s: FillState, text: string): FillState | undefined {
  const undo = /^undo\s+([A-Za-z]{1,6})$/i.exec(text);
  if (/^undo\b/i.test(text) && !undo) return { ...s, error: 'type "undo" and your initials, e.g. undo AB' };
  if (undo) {
    const last = s.done[s.done.length - 1];
    if (!last) return { ...s, error: 'no reading is logged yet; nothing to undo' };
    if (last.line === undefined)
      return {
        ...s,
        error: 'the log line of the last reading is not known; stop and resume the fill to undo it',
      };
    // a short reason first (optional): it is logged with the withdrawal and `check` shows it
    return {
      ...s,
      phase: 'undo-reason',
      undoing: { by: undo[1], back: s.phase },
      input: '',
      field: 'reading',
    };
  }
  const fix = /^fix\s+(\d+)\s+([A-Za-z]{1,6})$/i.exec(text);
  if (/^fix\b/i.test(text) && !fix)
    return { ...s, error: 'type "fix", the fill number and your initials, e.g. fix 2 AB' };
  if (fix) {
    const n = Number(fix[1]);
    const d = s.done.find((x) => x.step === n);
    if (!d)
      return {
        ...s,
        error:
          `fill ${n} has no reading logged; only a logged reading can be corrected ` +
          `(fills logged: ${s.done.map((x) => x.step).join(', ') || 'none'})`,
      };
    if (d.line === undefined)
      return {
        ...s,
        error: `the log line of fill ${n} is not known; stop and resume the fill to correct it`,
      };
    return {
      ...s,
      phase: 'correct',
      correcting: { step: n, by: fix[2], ...(s.phase === 'below' ? { back: 'below' as const } : {}) },
      input: '',
      field: 'reading',
      temperatureText: degC(d.temperatureK),
    };
  }
  return undefined;
}

function onCorrectEnter(s: FillState, now: string): FillState {
  const c = s.correcting!;
  const i = s.done.findIndex((x) => x.step === c.step);
  const old = s.done[i];
  const step = s.setup.steps[c.step - 1];
  const unit = gaugeUnit(step);
  if (!c.pending) {
    const parsed = parseReading(s, step);
    if ('error' in parsed) return refusedEntry(s, parsed);
    const absolute = step.gauge?.reference === 'gauge' ? parsed.shown + s.barometerPa : parsed.shown;
    const before = i > 0 ? s.done[i - 1].pressurePa : (s.start?.pressurePa ?? 0);
    const after = s.done[i + 1]?.pressurePa;
    if (!(absolute > before) || (after !== undefined && !(absolute < after))) {
      return {
        ...s,
        error:
          `${fmtIn(absolute, unit)} absolute does not lie between the readings before ` +
          `and after fill ${c.step} (${fmtIn(before, unit)}` +
          `${after !== undefined ? ` and ${fmtIn(after, unit)}` : ''}); ` +
          `correct those first, or check the value`,
      };
    }
    if (step.gauge && parsed.shown > step.gauge.fullScalePa)
      return { ...s, input: '', error: pastRange(s, step, parsed.shown, absolute) };
    const ev = readingEvent(s, step, absolute, parsed.temperatureK, now);
    return {
      ...s,
      input: '',
      correcting: {
        ...c,
        pending: {
          event: ev,
          done: { step: c.step, pressurePa: absolute, temperatureK: parsed.temperatureK, text: ev.reading },
          typed: s.input.trim(),
        },
      },
    };
  }
  const reason = s.input.trim();
  if (!reason)
    return {
      ...s,
      error:
        'type why the reading is corrected (e.g. "mistyped: 1480.0 not 1408.0"), then Enter; Esc cancels',
    };
  const p = c.pending;
  const event: NewLogEvent = { ...p.event, kind: 'correction', by: c.by, reason, replaces_line: old.line! };
  const done = s.done.map((x, j) => (j === i ? p.done : x));
  const limit = s.setup.workingLimitPa;
  const over =
    limit !== undefined && p.done.pressurePa > limit
      ? ` - ${fmtIn(p.done.pressurePa, unit)} is ABOVE the working limit ${fmtIn(limit, unit)}`
      : '';
  let next: FillState = {
    ...s,
    done,
    correcting: undefined,
    input: '',
    effects: [event],
    message:
      `fill ${c.step} corrected by ${c.by}: ${old.text} -> ${p.done.text} (the ` +
      `original stays in the log)${over}`,
  };
  if (next.current >= s.setup.steps.length) return afterBelowCorrection(next, now);
  if (c.back === 'below') {
    // corrected from the screen of an incomplete fill: its target follows the readings before it
    const m = next.done.length;
    const before: FillState = { ...next, done: next.done.slice(0, -1), current: m - 1 };
    const target = retargetRun(before, before.done, next.targetTemperatureK).targets[m - 1];
    const judged = rejudge(next);
    const ls = s.setup.steps[m - 1];
    if (next.done[m - 1].pressurePa - target < -ls.bandPa) {
      const t = [...judged.targetsPa];
      t[m - 1] = target;
      return belowBand({ ...judged, targetsPa: t }, ls, target, next.message ?? '');
    }
  }
  next = rejudge(next);
  const cap = capAfterChange({ ...next, review: undefined }, `after the correction of fill ${c.step}`);
  if (cap) return cap;
  return reviewed(enterStep({ ...next, phase: 'reading', review: undefined }), 'correction');
}

/**
 * a correction made from the below-target screen (every fill read, the batch open): the last fill's
 * target follows the corrected readings; still below its band, the screen stays; else the batch closes
 */
function afterBelowCorrection(next: FillState, now: string): FillState {
  const K = next.setup.steps.length;
  const before: FillState = { ...next, done: next.done.slice(0, -1), current: K - 1 };
  const prior = before.done.length
    ? retargetRun(before, before.done, before.done[before.done.length - 1].temperatureK).targets
    : before.targetsPa;
  const step = next.setup.steps[K - 1];
  const last = next.done[K - 1];
  const target = prior[K - 1];
  const text = next.message ?? '';
  if (last.pressurePa - target < -step.bandPa)
    return belowBand({ ...next, targetsPa: prior }, step, target, text);
  return { ...finish({ ...next, targetsPa: prior }, now), message: text };
}

export function fillReducer(s: FillState, a: FillAction): FillState {
  if (a.type === 'logged') return onLogged(s, a.step, a.line);
  const base = { ...s, effects: [] as NewLogEvent[], error: undefined };
  const textPhase =
    (base.phase === 'reading' ||
      base.phase === 'start' ||
      base.phase === 'below' ||
      base.phase === 'vented' ||
      (base.phase === 'correct' && !base.correcting?.pending)) &&
    base.field === 'temperature';
  switch (a.type) {
    case 'char':
      return onChar(base, a.text, textPhase);
    case 'backspace':
      if (textPhase) return { ...base, temperatureText: base.temperatureText.slice(0, -1) };
      return { ...base, input: base.input.slice(0, -1) };
    case 'escape':
      return onEscape(base);
    case 'tab':
      return onTab(base);
    case 'enter':
      return onEnter(base, a.now);
  }
}

/** the shell wrote a reading or correction of this step on this log line */
function onLogged(s: FillState, step: number, line: number): FillState {
  const pending =
    s.pending?.logged && s.pending.done.step === step
      ? { ...s.pending, done: { ...s.pending.done, line } }
      : s.pending;
  return {
    ...s,
    effects: [],
    pending,
    done: s.done.map((d) => (d.step === step ? { ...d, line } : d)),
  };
}

function onChar(base: FillState, text: string, textPhase: boolean): FillState {
  if (base.phase === 'confirm') {
    if (/^[yY]/.test(text))
      return afterDoubt({ ...base, phase: 'reading' }, base.pending!, base.pending!.event.time);
    if (/^[nNeE]/.test(text))
      return {
        ...base,
        phase: 'reading',
        pending: undefined,
        input: '',
        message: `${base.pending!.done.text} is not logged; type the reading again`,
      };
    return { ...base, error: 'y: log the reading as typed   n: back to the reading' };
  }
  if (textPhase) return { ...base, temperatureText: base.temperatureText + text };
  return { ...base, input: base.input + text.replace(/[\r\n]/g, '') };
}

function onEscape(base: FillState): FillState {
  // a correction begun on the review screen goes back to it: the review stands until a logged choice
  if (base.phase === 'correct' && base.review)
    return { ...base, phase: 'review', correcting: undefined, input: '', message: 'correction cancelled' };
  if (base.phase === 'review')
    return {
      ...base,
      error:
        'the review of the remaining fills stands: type safer INITIALS, accept INITIALS, stop INITIALS, ' +
        'undo INITIALS or fix N INITIALS (logged), or Ctrl-C to leave without a choice',
    };
  if (base.phase === 'correct')
    return {
      ...base,
      phase: base.current >= base.setup.steps.length || base.correcting?.back ? 'below' : 'reading',
      correcting: undefined,
      input: '',
      temperatureText: degC(base.targetTemperatureK),
      message: 'correction cancelled; nothing logged',
    };
  // the over-limit reading is already logged: only vent, accept or edit (a withdrawal with a trace) leave the screen
  if (base.phase === 'over-limit')
    return {
      ...base,
      error:
        'the reading is logged; Esc does not take it back. Type vent INITIALS, accept INITIALS, ' +
        'or edit INITIALS (mistyped: withdrawn with a trace)',
    };
  if (base.phase === 'undo-reason')
    return {
      ...base,
      phase: base.undoing!.back,
      undoing: undefined,
      input: '',
      message: 'undo cancelled; nothing logged',
    };
  if (base.phase === 'premix')
    return {
      ...base,
      error:
        'the premix check stands before the first fill from the premix: type what the screen asks ' +
        '(logged), undo INITIALS or fix N INITIALS, stop INITIALS, or Ctrl-C to stop',
    };
  if (base.phase === 'capped')
    return {
      ...base,
      error:
        'the re-target held by the working limit stands: type go INITIALS, undo INITIALS or stop INITIALS',
    };
  if (base.phase === 'vented')
    return {
      ...base,
      error:
        'the vent is logged; Esc does not take it back. Read the tank after venting and type the reading ' +
        'and your initials (Ctrl-C stops; resuming asks for it again)',
    };
  if (base.phase === 'unit-check') return unitRetype(base);
  // the value typed is logged: only a reading on a gauge that covers it, or slip INITIALS, leaves the screen
  if (base.phase === 'over-range')
    return { ...base, error: `the value typed is logged; Esc does not take it back: ${OVER_RANGE_WAYS}` };
  if (base.phase === 'confirm')
    return {
      ...base,
      phase: 'reading',
      input: base.pending?.typed ?? base.input,
      pending: undefined,
      overLimit: undefined,
    };
  return base;
}

function onTab(base: FillState): FillState {
  if (
    base.phase === 'start' ||
    base.phase === 'below' ||
    base.phase === 'vented' ||
    (base.phase === 'correct' && !base.correcting?.pending)
  )
    return { ...base, field: base.field === 'reading' ? 'temperature' : 'reading' };
  if (base.phase !== 'reading') return base;
  if (base.field === 'temperature') {
    const t = withTemperature({ ...base, field: 'reading' });
    if (t.targetTemperatureK === base.targetTemperatureK) return t;
    const cap = capAfterChange(t, `at ${degC(t.targetTemperatureK)}`);
    return cap ?? reviewed(t, 'temperature');
  }
  return { ...base, field: 'temperature' };
}

function onEnter(base: FillState, now: string): FillState {
  switch (base.phase) {
    case 'operator':
      return onOperatorEnter(base);
    case 'done':
    case 'ended':
    case 'confirm':
      return base;
    case 'unit-check':
      return onUnitCheckEnter(base);
    case 'barometer':
      return onBarometerEnter(base, now);
    case 'acknowledge':
      return onAcknowledgeEnter(base, now);
    case 'start':
      return onStartEnter(base, now);
    case 'correct':
      return onCorrectEnter(base, now);
    case 'reminder':
      return {
        ...base,
        phase: 'reading',
        input: '',
        reminded: [...base.reminded, base.setup.steps[base.current].index],
      };
    case 'over-limit':
      return onOverLimitEnter(base, now);
    case 'vented':
      return onVentedEnter(base, now);
    case 'undo-reason':
      return onUndoReasonEnter(base, now);
    case 'capped':
      return /^undo\b/i.test(base.input.trim())
        ? (onCommand(base, base.input.trim()) ?? base)
        : onCappedEnter(base, now);
    case 'reading':
      return onCommand(base, base.input.trim()) ?? onReadingEnter(base, now);
    case 'review':
      return onCommand(base, base.input.trim()) ?? onReviewEnter(base, now, REVIEW_HOOKS);
    case 'below':
      return onBelowEnter(base, now);
    case 'premix':
      return onCommand(base, base.input.trim()) ?? onPremixEnter(base, now);
    case 'over-range':
      return onOverRangeEnter(base, now);
  }
  return base;
}

/** the operator's initials, once a session: every reading of the session is logged with them */
function onOperatorEnter(base: FillState): FillState {
  const m = /^([A-Za-z]{1,6})$/.exec(base.input.trim());
  if (!m)
    return {
      ...base,
      input: '',
      error: 'type your initials (1-6 letters, e.g. AB): every reading of this session is logged with them',
    };
  const said = `${m[1]} fills: every reading of this session is logged with these initials`;
  return {
    ...base,
    operator: m[1],
    phase: base.operatorBack ?? 'reading',
    operatorBack: undefined,
    input: '',
    message: [base.message, said].filter(Boolean).join('; '),
  };
}

/** today's barometric pressure with the initials of who read it */
function onBarometerEnter(base: FillState, now: string): FillState {
  try {
    // a pressure alone: only the initials are missing
    let whole = false;
    try {
      parseQuantity(base.input.trim(), 'pressure');
      whole = true;
    } catch {
      whole = false;
    }
    if (whole) return { ...base, error: 'add your initials after the pressure, e.g. 752.3 Torr AB' };
    const w = withInitials(base.input, 'barometric pressure with its unit', '752.3 Torr AB');
    if ('error' in w) return { ...base, error: w.error };
    const p = parseQuantity(w.value, 'pressure', { field: 'barometric pressure' });
    if (!(p >= BARO_RANGE_PA[0] && p <= BARO_RANGE_PA[1]))
      fail({
        code: 'out-of-range',
        what: 'barometric pressure',
        value: p,
        allowed: '70-110 kPa (525-825 Torr)',
      });
    const ev: NewLogEvent = {
      kind: 'barometer',
      reading: w.value,
      pressure_Pa: p,
      u_Pa: base.setup.header.barometer.u_Pa,
      by: w.by,
      time: now,
    };
    return enterStep({
      ...base,
      barometerPa: p,
      barometerToday: true,
      input: '',
      effects: [ev],
      message: `barometric pressure today ${fmtIn(p, 'Torr', 5)} (logged): the gauge-referenced targets use it`,
    });
  } catch (e) {
    if (e instanceof ProblemError)
      return {
        ...base,
        error:
          `${describeProblem(e.problem)} - type today's barometric pressure with its ` +
          `unit, e.g. 752.3 Torr or 1003.1 hPa`,
      };
    throw e;
  }
}

/** the plan's danger findings, acknowledged with the operator's initials before the first fill */
function onAcknowledgeEnter(base: FillState, now: string): FillState {
  const m = /^\s*accept\s+([A-Za-z]{1,6})\s*$/.exec(base.input);
  if (!m)
    return {
      ...base,
      error:
        'to go on past a danger finding, type "accept" and your initials (e.g. accept ' +
        'AB), then Enter; Ctrl-C stops',
    };
  const effects: NewLogEvent[] = base.setup.dangers.map((d) => ({
    kind: 'acknowledge',
    code: d.code,
    step: d.step,
    by: m[1],
    time: now,
    note: d.message,
  }));
  const entered = enterStep({
    ...base,
    phase: 'reading',
    input: '',
    effects,
    message: `${effects.length} danger finding(s) acknowledged by ${m[1]} and logged`,
  });
  // a resumed fill's review of its remainder waits for the acknowledgement
  return base.done.length ? reviewed(entered, 'resume') : entered;
}

/** a top-up: the tank's pressure and temperature before the first fill, read on the first fill's gauge */
function onStartEnter(s: FillState, now: string): FillState {
  const step = s.setup.steps[0];
  const unit = gaugeUnit(step);
  const w = withInitials(s.input, 'reading', '120.4 AB');
  if ('error' in w) return { ...s, error: w.error };
  const parsed = parseReading({ ...s, input: w.value }, step);
  if ('error' in parsed) return refusedEntry(s, parsed);
  const absolute = step.gauge?.reference === 'gauge' ? parsed.shown + s.barometerPa : parsed.shown;
  if (step.gauge && parsed.shown > step.gauge.fullScalePa)
    return { ...s, input: '', error: pastRange(s, step, parsed.shown, absolute) };
  if (!(absolute > 0))
    return {
      ...s,
      error: 'the starting pressure must be above zero absolute; an empty tank is not a top-up',
    };
  const limit = s.setup.workingLimitPa;
  if (limit !== undefined && absolute >= limit)
    return {
      ...s,
      error:
        `${fmtIn(absolute, unit)} absolute is at or above the working limit ${fmtIn(limit, unit)} ` +
        `of ${s.setup.header.tank.id}: no fill can be made. Vent the tank first`,
    };
  const text = `${w.value}${/[A-Za-z]/.test(w.value) ? '' : ` ${unit}`}`;
  const ev: NewLogEvent = {
    kind: 'start-pressure',
    gauge: step.gauge?.id ?? 'none',
    reading: text,
    pressure_Pa: absolute,
    ...(step.gauge?.reference === 'gauge' ? { barometer_Pa: s.barometerPa } : {}),
    temperature: s.temperatureText.trim(),
    temperature_K: parsed.temperatureK,
    by: w.by,
    time: now,
    ...withGaugeNote(s, w.value, absolute),
  };
  const planned = s.start!.pressurePa;
  const next: FillState = {
    ...s,
    start: { ...s.start!, pressurePa: absolute, temperatureK: parsed.temperatureK, read: true },
    input: '',
    field: 'reading',
    effects: [ev],
  };
  const r = retargetRun(next, [], parsed.temperatureK);
  const entered = enterStep({
    ...next,
    targetsPa: r.targets,
    targetTemperatureK: parsed.temperatureK,
    message:
      `starting pressure ${text} logged by ${w.by} (the plan assumed ${fmtIn(planned, unit)} ` +
      `absolute); targets re-computed from it: ${r.message}`,
  });
  return reviewed(entered, 'start');
}

/**
 * A fill read below its band. "VALUE INITIALS": more gas was added, the new reading corrects this
 * step's reading (reason "more gas added"; the re-check uses it); "undo INITIALS": the reading is
 * withdrawn; on the last fill "close INITIALS": the batch is closed as it is (the re-check judges it);
 * on a fill before it "next": go on from the logged reading.
 */
function onBelowEnter(s: FillState, now: string): FillState {
  const text = s.input.trim();
  const lastFill = s.current >= s.setup.steps.length;
  const last = s.done[s.done.length - 1];
  const step = s.setup.steps[s.done.length - 1];
  const unit = gaugeUnit(step);
  if (!lastFill && /^next\b/i.test(text)) return goOnFromBelow(s, text, step, last, now);
  if (!lastFill && /^stop\b/i.test(text)) return stopBelow(s, text, step, last, now);
  if (/^close\b/i.test(text)) return closeBelow(s, text, step, lastFill, now);
  if (/^(undo|fix)\b/i.test(text)) return onCommand(s, text) ?? s;
  // the example is this fill's own target as its screen shows it (not a number of another batch)
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 2;
  const example = `${fromPa(shownPa(s, step, s.targetsPa[s.done.length - 1]), unit).toFixed(dec)} AB`;
  const w = withInitials(text, 'new reading after adding gas', example);
  if ('error' in w)
    return {
      ...s,
      // short: the ways are on the screen above, each with what it does (the screen keeps 24 rows)
      error: lastFill
        ? `${w.error}; or close, undo or fix N with your initials (the ways above)`
        : `${w.error}; or next, stop, undo or fix N with your initials (the ways above)`,
    };
  const parsed = parseReading({ ...s, input: w.value }, step);
  if ('error' in parsed) return refusedEntry(s, parsed);
  const absolute = step.gauge?.reference === 'gauge' ? parsed.shown + s.barometerPa : parsed.shown;
  if (!(absolute > last.pressurePa)) {
    return {
      ...s,
      error:
        `typed "${w.value}": ${fmtIn(absolute, unit)} absolute is not above the logged ` +
        `reading of fill ${step.index}, ${fmtIn(last.pressurePa, unit)} absolute; ` +
        `adding gas only raises it. Check the value, or undo INITIALS to withdraw ` +
        `the logged reading`,
    };
  }
  if (step.gauge && parsed.shown > step.gauge.fullScalePa)
    return { ...s, input: '', error: pastRange(s, step, parsed.shown, absolute) };
  if (last.line === undefined)
    return {
      ...s,
      error: 'the log line of the last reading is not known; stop (Ctrl-C) and resume the fill to go on',
    };
  const limit = s.setup.workingLimitPa;
  const over = limit !== undefined && absolute > limit;
  const ev = readingEvent(
    { ...s, input: w.value },
    step,
    absolute,
    parsed.temperatureK,
    now,
    over ? `above the working limit ${fmtIn(limit, unit)} of ${s.setup.header.tank.id}` : undefined,
  );
  const event: NewLogEvent = {
    ...ev,
    kind: 'correction',
    by: w.by,
    reason: 'more gas added after a reading below the target band',
    replaces_line: last.line,
  };
  const done = [
    ...s.done.slice(0, -1),
    { step: step.index, pressurePa: absolute, temperatureK: parsed.temperatureK, text: ev.reading },
  ];
  const target = s.targetsPa[s.done.length - 1];
  const deviation = absolute - target;
  const within = Math.abs(deviation) <= step.bandPa;
  const pressureText =
    `fill ${step.index}: more gas added, ${ev.reading} logged by ${w.by} (it ` +
    `replaces ${last.text}; the log keeps both): ${signed(fromPa(deviation, unit))} ` +
    `${unit} from the target (${bandWords(s, unit, absolute, within)})`;
  const next: FillState = { ...s, done, input: '', effects: [event] };
  if (over) {
    // the same hard stop as any reading past the limit: logged now, then vent, accept or edit
    const before: FillState = { ...s, done: s.done.slice(0, -1), current: s.done.length - 1, input: '' };
    const reading = done[done.length - 1];
    return {
      ...before,
      phase: 'over-limit',
      pending: { event, done: reading, typed: w.value, logged: true },
      effects: [event],
      overLimit: overLimitOf(before, reading, limit),
      message: pressureText,
    };
  }
  if (deviation < -step.bandPa) {
    const again = lastFill
      ? next
      : { ...next, targetsPa: retargetRun(next, done, parsed.temperatureK).targets };
    return belowBand(again, step, target, pressureText);
  }
  if (lastFill) return { ...finish(next, now), message: pressureText };
  // the fill is complete now: the fills ahead are re-targeted from it and reviewed, as after any reading
  const judged = rejudge({ ...next, targetTemperatureK: parsed.temperatureK, message: pressureText });
  const cap = capAfterChange({ ...judged, review: undefined }, `after fill ${step.index}`);
  if (cap) return cap;
  return reviewed(enterStep({ ...judged, phase: 'reading', review: undefined }), 'correction');
}

/** close INITIALS on the below-band screen: the last fill's only (the batch closed as it is) */
function closeBelow(s: FillState, text: string, step: FillStep, lastFill: boolean, now: string): FillState {
  const close = /^close\s+([A-Za-z]{1,6})$/i.exec(text);
  if (!lastFill)
    return {
      ...s,
      error:
        `${fillName(step)} is not the last fill: continue it (the new reading and your initials), next ` +
        'INITIALS (go on from the logged reading) or stop INITIALS (stop the batch here, incomplete)',
    };
  if (!close) return { ...s, error: 'type "close" and your initials, e.g. close AB' };
  const tankNowText = tankNowWords(s.belowWays?.tankNow);
  const f = finish(
    { ...s, input: '' },
    now,
    `closed by ${close[1]} with the last fill (fill ${step.index}) below its target band` +
      (tankNowText ? `; ${tankNowText}` : ''),
  );
  return {
    ...f,
    ...(tankNowText ? { tankNowText } : {}),
    message:
      `the batch is closed by ${close[1]} with fill ${step.index} below its target; ` +
      (tankNowText
        ? `${tankNowText}; the re-check below judges the composition`
        : `${NO_TANK_HAZARD_NOW}; the re-check below judges the tank as it is`),
  };
}

/**
 * next INITIALS on the screen of an incomplete fill before the last: go on from its logged reading. The
 * choice changes what the record means (the fill left short, the fills ahead re-targeted from it), so it
 * is logged (acknowledge "went-on-below-band", with the reading, target and band) before the review
 */
function goOnFromBelow(
  s: FillState,
  text: string,
  step: FillStep,
  last: DoneReading,
  now: string,
): FillState {
  const m = /^next\s+([A-Za-z]{1,6})$/i.exec(text);
  if (!m)
    return {
      ...s,
      error:
        'type next and your initials (e.g. next AB): going on from the logged reading leaves ' +
        `${fillName(step)} short, and that choice is logged`,
    };
  const unit = gaugeUnit(step);
  const targetPa = s.targetsPa[s.done.length - 1];
  const event: NewLogEvent = {
    kind: 'acknowledge',
    code: WENT_ON_BELOW_BAND,
    step: step.index,
    by: m[1],
    time: now,
    note:
      `${fillName(step)} left at ${last.text} (${fmtIn(last.pressurePa, unit)} absolute), below its target ` +
      `${fmtIn(targetPa, unit)} by more than its band; the fills ahead re-targeted from it`,
    below: { reading: last.text, pressure_Pa: last.pressurePa, target_Pa: targetPa, band_Pa: step.bandPa },
  };
  const left: FillState = {
    ...s,
    input: '',
    effects: [event],
    message:
      `${fillName(step)} left at ${last.text}, below its band (logged by ${m[1]}): the fills ahead are ` +
      're-targeted from it',
  };
  const cap = capAfterChange({ ...left, review: undefined }, `after fill ${step.index}`);
  if (cap) return cap;
  return reviewed(enterStep({ ...left, phase: 'reading' }), 'reading');
}

/**
 * stop INITIALS on the screen of an incomplete fill before the last (the cylinder cannot give more, say):
 * the batch is closed here, incomplete (check: INCOMPLETE, never a pass); the screen says what the review
 * found of the tank as it is now
 */
function stopBelow(s: FillState, text: string, step: FillStep, last: DoneReading, now: string): FillState {
  const m = /^stop\s+([A-Za-z]{1,6})$/i.exec(text);
  if (!m)
    return { ...s, error: 'type stop and your initials (e.g. stop AB): stopping the batch here is logged' };
  const unit = gaugeUnit(step);
  const rest = s.setup.steps.slice(s.done.length).map((x) => x.index);
  const notMade = `fill${rest.length === 1 ? '' : 's'} ${rest.join(', ')} not made`;
  const tankNowText = tankNowWords(s.belowWays?.tankNow);
  const tank = tankNowText ?? NO_TANK_HAZARD_NOW;
  return {
    ...s,
    ...(tankNowText ? { tankNowText } : {}),
    phase: 'ended',
    input: '',
    effects: [
      {
        kind: 'close',
        time: now,
        note:
          `stopped by ${m[1]} with ${fillName(step)} below its band at ${last.text} (target ` +
          `${fmtIn(s.targetsPa[s.done.length - 1], unit)} absolute): ${notMade}` +
          (tankNowText ? `; ${tankNowText}` : ''),
      },
    ],
    message:
      `the batch is stopped by ${m[1]} (logged) with ${fillName(step)} at ${last.text}, below its band; ` +
      `${notMade}, so it is INCOMPLETE (not a pass); ${tank}`,
  };
}

/** the premix check's pressures as read on its gauge (gauge-referenced: today's barometer) */
function premixShown(s: FillState, pc: PremixCheck, absolutePa: number): string {
  const g = pc.gauge;
  const unit: PressureUnit = g && isPressureUnit(g.unit) ? g.unit : 'Torr';
  const dec = g ? decimalsFor(fromPa(g.resolutionPa, unit)) : 1;
  const ctx = { barometricPa: s.barometerPa, barometricUncertaintyPa: s.setup.header.barometer.u_Pa };
  return `${fromPa(g ? gaugeReadingPa(g, absolutePa, ctx) : absolutePa, unit).toFixed(dec)} ${unit}`;
}

/** why a premix-tank reading below the minimum is refused, and what to do */
export function premixTooLow(s: FillState, pc: PremixCheck, absolutePa: number): string {
  const fills = pc.fills.length === 1 ? `fill ${pc.fills[0]}` : `fills ${pc.fills.join(', ')}`;
  const tank = s.setup.header.tank.id;
  return (
    `${pc.tank} reads ${premixShown(s, pc, absolutePa)} on ${pc.gauge?.id ?? 'the gauge'}, below the ` +
    `minimum ${premixShown(s, pc, pc.minimumPa)}: delivering the ${fixedSig(pc.deliveredMol, 3)} mol of ` +
    `${fills} would leave ${pc.tank} below ${fmtIn(pc.requiredPa, 'Torr')} (the ` +
    `${fmtIn(pc.targetPa, 'Torr')} that ${tank} must reach at fill ${pc.fills[pc.fills.length - 1]}, + 10 % ` +
    `for a controllable flow at the end). Do not fill from it: stop INITIALS closes this batch as it is ` +
    `(or Ctrl-C leaves it open), and make a new premix or a smaller batch. If it was misread, read ` +
    `${pc.tank} again and type the reading`
  );
}

/** the mixing asked before the first fill from the premix, in words (stage-2 sheet's pre-check) */
export function premixMixingWords(pc: PremixCheck): string {
  const m = pc.mixing;
  if (!m)
    return (
      `stirred or rested since its last fill (the lab profile gives no height for ${pc.tank}: ` +
      '`mixwright ready` gives the time; diffusion alone takes hours)'
    );
  return m.stirred
    ? `stirred since its last fill (common practice: 15-30 min), or rested at least ${duration(m.restS)} ` +
        '(diffusion alone to 0.1 %)'
    : `rested at least ${duration(m.restS)} since its last fill (unstirred: diffusion alone to 0.1 %)`;
}

/**
 * Enter on the premix check (stage 2, before the first fill from the premix): `mixed INITIALS` (the
 * premix was mixed for the stated time; a `premix-mixed` event), then the premix tank's reading with
 * initials (a `premix-reading` event, logged even when below the minimum: then the fill does not go
 * on, and says why and what to do); `stop INITIALS` closes the batch here.
 */
function onPremixEnter(s: FillState, now: string): FillState {
  const pc = s.setup.premixCheck!;
  const text = s.input.trim();
  const stop = /^stop\s+([A-Za-z]{1,6})$/i.exec(text);
  if (stop) {
    const why =
      s.premix?.reading && !s.premix.reading.enough
        ? `the premix tank ${pc.tank} read ${s.premix.reading.text}, below the minimum ${pc.minimum}`
        : `before the first fill from the premix tank ${pc.tank}`;
    return {
      ...s,
      phase: 'ended',
      input: '',
      effects: [
        { kind: 'close', time: now, note: `stopped by ${stop[1]} before fill ${pc.fills[0]}: ${why}` },
      ],
      message: `stopped by ${stop[1]} before fill ${pc.fills[0]} (logged): ${why}`,
    };
  }
  if (!s.premix?.mixedBy) return onPremixMixed(s, text, now);
  return onPremixReading(s, text, now);
}

const elapsedWords = (t: number) => (t < 0 ? `${duration(-t)} before it (by this clock)` : duration(t));

/**
 * `mixed INITIALS`: the premix was mixed for the stated time (a `premix-mixed` event, with the time
 * since the premix log closed). Less than the least mixing time since then: said, and only
 * `mixed early INITIALS` confirms it (logged so, with the elapsed time).
 */
function onPremixMixed(s: FillState, text: string, now: string): FillState {
  const pc = s.setup.premixCheck!;
  const m = /^mixed\s+(early\s+)?([A-Za-z]{1,6})$/i.exec(text);
  if (!m)
    return {
      ...s,
      input: '',
      error:
        `type mixed and your initials (e.g. mixed AB) once the premix in ${pc.tank} was ` +
        `${premixMixingWords(pc)}; stop INITIALS stops the batch here`,
    };
  const by = m[2];
  const t = premixMixingElapsed(pc, now);
  const since = t && `${elapsedWords(t.elapsedS)} since the premix log was closed (${pc.premixClosed})`;
  const least = t && `${duration(t.neededS)} of ${pc.mixing?.stirred ? 'stirring' : 'rest'}`;
  if (t?.early && !m[1])
    return {
      ...s,
      input: '',
      error:
        `only ${since}, less than the least asked, ${least}: not logged. The premix is to be ` +
        `${premixMixingWords(pc)}. Wait, or if it was mixed all the same, type mixed early ${by} to ` +
        `confirm it (logged with the time); stop ${by} stops the batch here`,
    };
  // confirmed early: said once, with the time short of the least asked
  const note =
    `the premix in ${pc.tank} was ${premixMixingWords(pc)}` +
    (t
      ? t.early
        ? `; ${since}, less than the ${least} asked: confirmed as mixed early by ${by}`
        : `; confirmed by ${by}; ${since}`
      : `; confirmed by ${by}; the time since the premix log was closed is not known`);
  return {
    ...s,
    input: '',
    premix: { ...s.premix, mixedBy: by, ...(t?.early ? { mixedEarly: true } : {}) },
    effects: [{ kind: 'premix-mixed', tank: pc.tank, by, time: now, note }],
    message:
      `${by} confirms the premix in ${pc.tank} was mixed${t?.early ? ' EARLY' : ''} (logged). ` +
      `Now read ${pc.tank}`,
  };
}

/** how far below the premix log's prediction a premix-tank reading is questioned: 3 % (about 9 K cooler) + the gauge */
const PREMIX_LOW_REL = 0.03;

/**
 * A premix-tank reading well below what the premix log predicts (its last reading less the other
 * batches' draws, planned_Pa): more than 3 % (the tank ~9 K cooler than at that reading) plus the
 * gauge's accuracy below it. What to ask, in words; undefined when not below.
 */
export function premixReadingDoubt(
  pc: PremixCheck,
  absolutePa: number,
  unit: PressureUnit,
): string | undefined {
  const g = pc.gauge;
  const gaugeU = g ? g.accuracyOfReading * pc.plannedPa + g.accuracyOfFullScale * g.fullScalePa : 0;
  const short = pc.plannedPa - absolutePa;
  if (!(short > PREMIX_LOW_REL * pc.plannedPa + gaugeU)) return undefined;
  const basis =
    pc.premixLastPa !== undefined
      ? `the premix log's last reading ${fmtIn(pc.premixLastPa, unit)}` +
        (pc.premixDraws
          ? ` less what ${pc.premixDraws} other batch log(s) drew from it`
          : ', nothing drawn since')
      : 'the premix log and the batches drawn from it';
  return (
    `${fmtIn(absolutePa, unit)} absolute is ${fmtIn(short, unit)} (${((100 * short) / pc.plannedPa).toFixed(1)} %) ` +
    `below the ${fmtIn(pc.plannedPa, unit)} expected from ${basis}: a leak, the wrong tank or the wrong gauge ` +
    '(or a much colder tank)?'
  );
}

/** the premix tank's reading with initials (a `premix-reading` event, logged even below the minimum) */
function onPremixReading(s: FillState, text: string, now: string): FillState {
  const pc = s.setup.premixCheck!;
  const w = withInitials(text, `reading of ${pc.tank}`, `${fromPa(pc.plannedPa, 'Torr').toFixed(1)} AB`);
  if ('error' in w) return { ...s, input: '', error: `${w.error}; or stop INITIALS` };
  const g = pc.gauge;
  const unit: PressureUnit = g && isPressureUnit(g.unit) ? g.unit : 'Torr';
  let shown: number;
  try {
    shown = READING_NUMBER.test(w.value)
      ? parseQuantity(`${w.value} ${unit}`, 'pressure')
      : parseQuantity(w.value, 'pressure');
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    const p = e.problem;
    const hinted = p.code === 'bad-quantity' || p.code === 'reading-missing' ? { ...p, bareUnit: unit } : p;
    return { ...s, input: '', error: describeProblem(hinted) };
  }
  if (g && shown > g.fullScalePa)
    return {
      ...s,
      input: '',
      error:
        `${fmtIn(shown, unit)} is past the range of ${g.id} (up to ${fmtIn(g.fullScalePa, unit)}): likely the ` +
        'unit or a typing slip. The reading is not logged.',
    };
  const absolute = g?.reference === 'gauge' ? shown + s.barometerPa : shown;
  if (!(absolute > 0))
    return { ...s, input: '', error: `the premix tank's pressure must be above zero absolute; not logged` };
  const textLogged = `${w.value}${/[A-Za-z]/.test(w.value) ? '' : ` ${unit}`}`;
  // well below what the premix log predicts: asked first; the same reading typed again is logged with it
  const doubt = premixReadingDoubt(pc, absolute, unit);
  const asked = s.premix?.questioned;
  if (doubt && !(asked && Math.abs(asked.pressurePa - absolute) <= 1e-9 * absolute))
    return {
      ...s,
      input: '',
      premix: { ...s.premix, questioned: { text: textLogged, pressurePa: absolute } },
      error:
        `NOT logged yet: ${doubt} Check the tank valve, the line and the gauge, and read ${pc.tank} again; ` +
        `type the reading with your initials again to log it as read (the difference is logged with it), or ` +
        `stop ${w.by}`,
    };
  // the sheet's rule: the reading on the gauge at least the minimum printed (rounded up to its step)
  const enough = absolute >= pc.minimumPa * (1 - 1e-12);
  const ev: NewLogEvent = {
    kind: 'premix-reading',
    tank: pc.tank,
    gauge: g?.id ?? 'none',
    reading: textLogged,
    pressure_Pa: absolute,
    ...(g?.reference === 'gauge' ? { barometer_Pa: s.barometerPa } : {}),
    minimum_Pa: pc.minimumPa,
    enough,
    by: w.by,
    time: now,
    ...(enough && !doubt
      ? {}
      : {
          note: [
            doubt ? `${doubt} Read again and confirmed as read by ${w.by}` : undefined,
            enough ? undefined : `below the minimum ${pc.minimum}: the batch does not draw from it`,
          ]
            .filter(Boolean)
            .join('; '),
        }),
  };
  const premix: PremixDone = {
    ...s.premix,
    questioned: undefined,
    reading: { text: textLogged, pressurePa: absolute, enough, by: w.by },
  };
  if (!enough)
    return {
      ...s,
      input: '',
      premix,
      effects: [ev],
      message: `REFUSED (the reading is logged): ${premixTooLow(s, pc, absolute)}`,
    };
  return enterStep({
    ...s,
    phase: 'reading',
    input: '',
    premix,
    effects: [ev],
    message:
      `${pc.tank} reads ${textLogged} (logged by ${w.by}), at least the minimum ${pc.minimum}: ` +
      `fill ${pc.fills[0]} may draw from it` +
      (doubt ? `; it is below what the premix log predicts, logged with the reading: ${doubt}` : ''),
  });
}
