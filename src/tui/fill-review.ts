/**
 * The guided fill's safety review of its re-targeted remainder: after every accepted reading,
 * undo, correction, resume of a log, starting pressure of a top-up and change of temperature, the
 * fills still ahead start from the tank as read, not as planned, so the core reviews the tank now,
 * every remaining state and every remaining fill path with the plan's own code
 * (core reviewRemainder). A flammable, detonable or danger state or path that the plan's findings
 * do not hold stops the fill on the review screen (phase 'review'): it names each one and why, and
 * offers the safer stop of a diluent charge ahead that the core computed where one exists. The fill
 * goes on only by a logged choice with initials: `safer AB` (take the safer stop) or `accept AB`
 * (go on through the hazard); `undo AB` / `fix N AB` take back or correct a mistyped reading.
 * Pure: the reducer (fill-state.ts) calls these functions; the log events are effects.
 */
import {
  describeFinding,
  hazardKey,
  reviewBelowBand,
  reviewRemainder,
  type Finding,
  type PlannedFinding,
  type ReadingGrid,
  type RemainderReview,
  type RetargetInput,
  type SafetyContext,
} from '../core/index.js';
import { fromPa } from '../io/quantity.js';
import type { LogRemainderReview, NewLogEvent, ParsedLog } from '../io/batch-log.js';
import { chargeName, isSplit } from '../report/charges.js';
import type { FillSetup, FillState } from './fill-state.js';
import { noneInsideOnGauge } from './gauge-view.js';

export type ReviewTrigger = LogRemainderReview['trigger'];

/** a hazard of the remainder the plan did not have, in words */
export interface ReviewHazard {
  readonly key: string;
  readonly code: string;
  readonly step: number | null;
  readonly severity: Finding['severity'];
  /** the numbers behind it, short (the screen is 80 columns): where, and against which limit */
  readonly numbers: string;
  /** the finding in words (describeFinding), for the log */
  readonly text: string;
}

/** the safer stop the core found, as the screen offers it */
export interface ReviewAlternative {
  /** 0-based index of the charge among the fills, and its fill number */
  readonly fill: number;
  readonly step: number;
  readonly name: string;
  readonly fromPa: number;
  readonly toPa: number;
  /** the targets of the fills ahead with the safer stop (absolute, Pa) */
  readonly targetsPa: readonly { readonly step: number; readonly targetPa: number }[];
  /** the NFPA 69 margins are kept as well as the plan kept them (else: only flammable states avoided) */
  readonly marginKept: boolean;
}

/** the last fill read stopped below its band: the same fill continued to its target (core Continuation) */
export interface ReviewContinuation {
  /** 0-based index of the fill, its fill number and name */
  readonly fill: number;
  readonly step: number;
  readonly name: string;
  readonly sourceId: string;
  /** the reading it stopped at and its target (absolute, Pa) */
  readonly fromPa: number;
  readonly toPa: number;
  /** nothing ahead then passes a hazard the plan did not have */
  readonly clean: boolean;
  /** what it would still pass, short (code and fill) */
  readonly still: readonly string[];
  /**
   * no value the fill's gauge displays lies inside its band at that target (gauge-view noneInsideOnGauge):
   * those words; the target is then no stop a reading can show, and continuing is not offered as safer
   */
  readonly unreadable?: string;
}

/** continuing the fill is the safer way offered: it passes nothing new and its gauge can show its band */
export const continuationOffered = (c: ReviewContinuation | undefined): boolean =>
  !!c?.clean && !c.unreadable;

/** the review screen: what triggered it, what the remainder passes, and the safer stop */
export interface ReviewScreen {
  readonly trigger: ReviewTrigger;
  readonly hazards: readonly ReviewHazard[];
  /** continuing the fill just read, when it stopped below its band: the first safer way */
  readonly continuation?: ReviewContinuation;
  readonly alternative?: ReviewAlternative;
  /** why no safer stop is offered */
  readonly noAlternative?: string;
}

/** what the fill remembers of earlier reviews: hazards accepted (keys), stops changed (by 0-based fill) */
export interface ReviewMemory {
  readonly accepted: readonly string[];
  readonly stopsPa: Readonly<Record<number, number>>;
}

export const REVIEW_CODE = 'remainder-review';

const torr = (pa: number) => `${fromPa(pa, 'Torr').toFixed(2)} Torr`;
const words = (f: Finding) => describeFinding(f, (pa) => `${Number(fromPa(pa, 'Torr').toPrecision(6))} Torr`);

/** the settings of the plan's review, from the log header (older logs: the fill temperature, 0.5) */
function safetyOf(setup: FillSetup): Omit<SafetyContext, 'temperatureK'> {
  const h = setup.header;
  return {
    workingLimitPa: setup.workingLimitPa,
    tankId: h.tank.id,
    coldestK: h.safety?.coldest_K,
    condensationFraction: h.safety?.condensation_fraction,
  };
}

const plannedMemo = new WeakMap<FillSetup, readonly PlannedFinding[]>();

/**
 * the plan's findings: as its log header keeps them; a log without them (older) has its planned
 * sequence reviewed here, from the re-target of an untouched tank at the plan's temperature
 */
function plannedOf(setup: FillSetup, base: RetargetInput): readonly PlannedFinding[] {
  const known = plannedMemo.get(setup);
  if (known) return known;
  const h = setup.header;
  const planned =
    h.findings ??
    reviewRemainder({
      retarget: { ...base, done: [], temperatureK: h.temperature_K },
      safety: safetyOf(setup),
      planned: [],
      searchAlternative: false,
    }).findings;
  plannedMemo.set(setup, planned);
  return planned;
}

const planPathMemo = new WeakMap<FillSetup, readonly string[]>();

/**
 * the hazard keys this review finds on the plan's own targets (the re-target of an untouched tank at the
 * plan's temperature): a plan danger it does not find there is never called avoided by a re-target
 */
function planPathKeys(setup: FillSetup, base: RetargetInput): readonly string[] {
  const known = planPathMemo.get(setup);
  if (known) return known;
  const keys = reviewRemainder({
    retarget: { ...base, done: [], temperatureK: setup.header.temperature_K },
    safety: safetyOf(setup),
    planned: [],
    searchAlternative: false,
  }).findings.map(hazardKey);
  planPathMemo.set(setup, keys);
  return keys;
}

/**
 * the review of the current remainder (withReview), kept with the fill: the targets it reviewed and what
 * it found; a fill's reminder of a plan danger comes from it (planDangerNow)
 */
export interface PathReview {
  /** the remaining targets it reviewed: fill number -> absolute Pa */
  readonly targetsPa: Readonly<Record<number, number>>;
  /** what it found, by hazard key (code@fill), in words */
  readonly found: Readonly<Record<string, string>>;
  /** the hazard keys the same review finds on the plan's own targets */
  readonly planKeys: readonly string[];
}

function pathReviewOf(s: FillState, input: RetargetInput, rv: RemainderReview): PathReview {
  const targetsPa: Record<number, number> = {};
  for (const x of rv.result.remaining) targetsPa[x.step] = x.targetPa;
  const found: Record<string, string> = {};
  for (const f of rv.findings) found[hazardKey(f)] = words(f);
  return { targetsPa, found, planKeys: planPathKeys(s.setup, input) };
}

/**
 * A danger of the plan at a fill, as the review of the current targets finds it: reached (with its words
 * now), avoided (the review finds it on the plan's targets and not on the current ones: computed), or
 * unknown (no review of the current targets, or a danger that review does not cover: the plan's stands)
 */
export type DangerNow =
  | { readonly kind: 'reached'; readonly text: string }
  | { readonly kind: 'avoided' }
  | { readonly kind: 'unknown' };

export function planDangerNow(s: FillState, d: { code: string; step?: number | null }): DangerNow {
  const r = s.pathReview;
  if (!r) return { kind: 'unknown' };
  // the review is of the current targets only if every target it reviewed is the fill's target now
  const steps = Object.keys(r.targetsPa).map(Number);
  const current = steps.every((k) => Math.abs(r.targetsPa[k] - s.targetsPa[k - 1]) <= 1e-9 * r.targetsPa[k]);
  if (!current || (d.step ?? 0) <= s.done.length || !steps.includes(d.step ?? 0)) return { kind: 'unknown' };
  const key = hazardKey({ ...d, severity: 'danger' });
  if (r.found[key] !== undefined) return { kind: 'reached', text: r.found[key] };
  return r.planKeys.includes(key) ? { kind: 'avoided' } : { kind: 'unknown' };
}

/** the plan's dangers at a fill that the re-targeted fills avoid (planDangerNow), by code */
export function avoidedDangers(s: FillState, step: number): string[] {
  return s.setup.dangers
    .filter((d) => d.step === step && planDangerNow(s, d).kind === 'avoided')
    .map((d) => d.code);
}

/** the plan's warnings at a fill that the re-targeted fills avoid (computed as for a danger), by code */
export function avoidedWarnings(s: FillState, step: number): string[] {
  return (s.setup.header.findings ?? [])
    .filter((f) => f.severity === 'warning' && f.step === step && planDangerNow(s, f).kind === 'avoided')
    .map((f) => f.code);
}

/** how each fill's stop is shown: its gauge's resolution (above ambient for a gauge-referenced sensor) */
function gridOf(s: FillState): (fill: number) => ReadingGrid | undefined {
  return (k) => {
    const g = s.setup.steps[k]?.gauge;
    const offsetPa = g?.reference === 'gauge' ? s.barometerPa : 0;
    return g ? { resolutionPa: g.resolutionPa, offsetPa, topPa: g.fullScalePa + offsetPa } : undefined;
  };
}

/** the earlier reviews' outcomes in a log being resumed */
export function reviewMemoryOf(log: ParsedLog | undefined): ReviewMemory {
  const accepted: string[] = [];
  const stopsPa: Record<number, number> = {};
  for (const a of log?.acknowledgements ?? []) {
    if (a.code !== REVIEW_CODE || !a.review) continue;
    if (a.review.outcome === 'accepted') accepted.push(...a.review.hazards.map(hazardKey));
    if (a.review.stop) stopsPa[a.review.stop.step - 1] = a.review.stop.to_Pa;
  }
  return { accepted, stopsPa };
}

const NO_ALTERNATIVE = {
  'no-diluent-stop':
    'no safer stop can be offered: no charge ahead holds a stop of a diluent before the oxidizer (or the ' +
    'hazard is in the tank already)',
  'none-clean':
    'no stop of the diluent charge ahead, up to the reading of its last charge, avoids it: the ' +
    'remaining sequence cannot be made as safe as the plan by a stop alone',
  'not-searched': 'no safer stop was searched',
  'past-gauge': 'no safer stop can be offered',
} as const;

/** why no safer stop is offered: a stop that avoids it would need a reading its fill's gauge cannot show */
function pastGaugeWords(s: FillState, rv: RemainderReview): string | undefined {
  const p = rv.pastGauge;
  const g = p && s.setup.steps[p.fill]?.gauge;
  if (!p || !g) return undefined;
  const top = g.fullScalePa + (g.reference === 'gauge' ? s.barometerPa : 0);
  const beyond = p.pressurePa > top * (1 + 1e-9);
  const range = `the range of ${g.id} it is read on (up to ${torr(top)} absolute)`;
  return beyond
    ? `no safer stop can be offered: the stop that avoids it puts ${stepName(s, p.fill)} at ` +
        `${torr(p.pressurePa)} absolute, past ${range}`
    : `no safer stop can be offered: no stop of ${stepName(s, p.fill)} that avoids it is within ${range}`;
}

/**
 * Review the remainder of a state whose targets have just been re-targeted; on a hazard the plan did
 * not have (and the operator has not accepted), the fill stops on the review screen. Only a state on
 * a fill step's screen is reviewed (a stopped or finished fill has no remainder).
 */
export function withReview(s0: FillState, trigger: ReviewTrigger, input: RetargetInput): FillState {
  if ((s0.phase !== 'reading' && s0.phase !== 'reminder') || s0.current >= s0.setup.steps.length)
    return s0.review ? { ...s0, review: undefined } : s0;
  const rv = reviewRemainder({
    retarget: input,
    safety: safetyOf(s0.setup),
    planned: plannedOf(s0.setup, input),
    readingGrid: gridOf(s0),
    // a last reading below its fill's band: continuing that fill is looked at first
    lastBandPa: s0.setup.steps[input.done.length - 1]?.bandPa,
    readableTarget: (k, pa) => !noneInsideOnGauge(s0, s0.setup.steps[k], pa),
  });
  const accepted = new Set(s0.reviewed?.accepted ?? []);
  const open = rv.hazards.filter((f) => !accepted.has(hazardKey(f)));
  // the accepted ones as this review finds them now: their fills' screens show them
  const acceptedHazards = rv.hazards.filter((f) => accepted.has(hazardKey(f))).map(reviewHazardOf);
  const s: FillState = remindOnlyReached({
    ...s0,
    acceptedHazards,
    pathReview: pathReviewOf(s0, input, rv),
  });
  if (!open.length) {
    // a state already in the tank (the fill just read, step <= current) is no longer "remaining"
    const ahead = rv.near.filter((f) => (f.step ?? 0) > s.current);
    const inTank = rv.near.filter((f) => (f.step ?? 0) <= s.current);
    // short (the reading screen is 24 rows): where, and the point against the limits; the full text is the
    // finding's (describeFinding) on the plan and in check
    const near = (f: Finding) => numbersOf(f) || words(f);
    const said = [
      inTank.length > 0
        ? `the tank now is near the flammable region where the plan was not (inside the NFPA 69 margins; ${inTank
            .map(near)
            .join('; ')})`
        : undefined,
      ahead.length > 0
        ? `the remaining fills come near the flammable region where the plan did not (inside the NFPA 69 ` +
          `margins; ${ahead.map((f) => `fill ${f.step ?? 0} ${near(f)}`).join('; ')})`
        : undefined,
    ]
      .filter(Boolean)
      .join('; ');
    return {
      ...s,
      review: undefined,
      message: said ? [s.message, said].filter(Boolean).join('; ') : s.message,
    };
  }
  const hazards = open.map(reviewHazardOf);
  const alt = rv.alternative;
  const alternative: ReviewAlternative | undefined = alt && {
    fill: alt.fill,
    step: alt.fill + 1,
    name: stepName(s, alt.fill),
    fromPa: alt.fromPa,
    toPa: alt.toPa,
    targetsPa: alt.result.remaining.map((x) => ({ step: x.step, targetPa: x.targetPa })),
    marginKept: alt.marginKept,
  };
  const c = rv.continuation;
  const continuation: ReviewContinuation | undefined = c && {
    fill: c.fill,
    step: c.fill + 1,
    name: stepName(s, c.fill),
    sourceId: c.sourceId,
    fromPa: c.fromPa,
    toPa: c.toPa,
    clean: c.clean,
    still: c.hazards.map((f) => `${f.code}${f.step ? ` (fill ${f.step})` : ''}`),
    unreadable: noneInsideOnGauge(s, s.setup.steps[c.fill], c.toPa),
  };
  return {
    ...s,
    phase: 'review',
    input: '',
    review: {
      trigger,
      hazards,
      continuation,
      alternative,
      noAlternative:
        alt || continuationOffered(continuation)
          ? undefined
          : (continuation && !continuation.clean
              ? `continuing ${continuation.name} to its target does not avoid it either; `
              : '') + (pastGaugeWords(s, rv) ?? NO_ALTERNATIVE[rv.noAlternative ?? 'not-searched']),
    },
  };
}

/**
 * the reminder before a fill that creates a danger: only while a danger there is reached (or not known
 * avoided) by the current targets; where the review of the re-targeted fills avoids every one, the fill's
 * screen opens and says so
 */
export function remindOnlyReached(s: FillState): FillState {
  if (s.phase !== 'reminder') return s;
  const step = s.setup.steps[s.current].index;
  const plan = s.setup.dangers.filter((d) => d.step === step);
  const review = (s.acceptedHazards ?? []).some((h) => h.step === step && h.severity === 'danger');
  const avoided = avoidedDangers(s, step);
  if (review || !plan.length || avoided.length < plan.length) return s;
  // the fill's screen says which the re-target avoids (StepDangers)
  return { ...s, phase: 'reading', reminded: [...s.reminded, step] };
}

/** the ways on from a fill read below its band, each as its review found it (fill-state's below screen) */
export interface BelowWays {
  /**
   * continuing the fill to its target: what it would still pass that the plan did not have and was not
   * accepted (still), and the accepted ones it still passes (stillAccepted, short, dangers first)
   */
  readonly continuing?: {
    readonly toPa: number;
    readonly still: readonly string[];
    readonly stillAccepted: readonly string[];
  };
  /** going on from the reading (next): the hazards the plan did not have (and not accepted) */
  readonly goingOn: readonly ReviewHazard[];
  /**
   * going on from the reading: the hazards accepted at an earlier review that this review finds again (with
   * its numbers now): they stand, and a screen that says "nothing new" must name them
   */
  readonly goingOnAccepted: readonly ReviewHazard[];
  /** stopping here: the flammable, detonable or danger findings of the tank as it is now, short */
  readonly tankNow: readonly string[];
}

const rank = (f: Finding) => (f.severity === 'danger' ? 0 : f.severity === 'warning' ? 1 : 2);
const shortOf = (f: Finding) => `${f.severity.toUpperCase()} ${f.code}${f.step ? ` (fill ${f.step})` : ''}`;

/**
 * every way on that the screen of an incomplete fill offers, reviewed (core reviewBelowBand): continuing
 * it to its target, going on from the reading (`next`), stopping with the tank as it is (`stop`)
 */
export function belowBandWays(s: FillState, input: RetargetInput): BelowWays {
  const rv = reviewBelowBand({
    retarget: input,
    safety: safetyOf(s.setup),
    planned: plannedOf(s.setup, input),
    lastBandPa: s.setup.steps[input.done.length - 1]?.bandPa,
  });
  const accepted = new Set(s.reviewed?.accepted ?? []);
  const open = (fs: readonly Finding[]) => fs.filter((f) => !accepted.has(hazardKey(f)));
  // the accepted ones found again, dangers first: they stand, whatever was accepted
  const again = (fs: readonly Finding[]) =>
    fs.filter((f) => accepted.has(hazardKey(f))).sort((a, b) => rank(a) - rank(b));
  const c = rv.continuing;
  return {
    ...(c
      ? {
          continuing: {
            toPa: c.toPa,
            still: open(c.hazards).map(shortOf),
            stillAccepted: again(c.hazards).map(shortOf),
          },
        }
      : {}),
    goingOn: open(rv.goingOn).map(reviewHazardOf),
    goingOnAccepted: again(rv.goingOn).map(reviewHazardOf),
    // its dangers first
    tankNow: [...rv.tankNow].sort((a, b) => rank(a) - rank(b)).map(shortOf),
  };
}

/**
 * what a stop says when the review of the tank as it stands finds nothing: of the gas by itself, not
 * of it leaked or vented into air (a fuel-rich tank burns there: `check` and the label mark it)
 */
export const NO_TANK_HAZARD_NOW =
  'the review finds no flammable, detonable or danger state in the tank now (the gas by itself: whether ' +
  'it burns where it leaks or is vented into air, `check` and the label say)';

/**
 * what the tank holds now, as the review of the tank as it stands found it (BelowWays.tankNow), in the
 * present tense with the usual cautions; undefined when it found nothing flammable, detonable or dangerous
 */
export function tankNowWords(tankNow: readonly string[] | undefined): string | undefined {
  if (!tankNow?.length) return undefined;
  const all = tankNow.join(', ');
  const kind = /detonable/.test(all)
    ? 'a detonable, flammable mixture'
    : /flammable/.test(all)
      ? 'a flammable mixture'
      : 'a state the review rates as a danger';
  // the cautions before the list: a screen that cuts the message keeps them
  return (
    `the tank NOW holds ${kind}: keep its valves closed, do not use or vent it except under your lab's ` +
    `procedure, defer to local rules and the supplier's safety data (${all})`
  );
}

function reviewHazardOf(f: Finding): ReviewHazard {
  return {
    key: hazardKey(f),
    code: f.code,
    step: f.step ?? null,
    severity: f.severity,
    numbers: numbersOf(f),
    text: words(f),
  };
}

const pct = (x: number) => `${(100 * x).toPrecision(3)} %`;

/** the numbers of a hazard in a few words: the tank pressure, the diagram point against the limits, the peak */
function numbersOf(f: Finding): string {
  switch (f.code) {
    case 'flammable-state':
    case 'flammable-mixture':
    case 'near-flammable':
    case 'flammable-at-inlet':
      return (
        `at ${torr(f.pressurePa)}: fuel ${pct(f.fuelFraction)}, O2 ${pct(f.oxygenFraction)} (N2-equivalent; ` +
        `LFL ${f.lfl !== undefined ? pct(f.lfl) : 'n/a'}, LOC ${f.loc !== undefined ? pct(f.loc) : 'n/a'})`
      );
    case 'flammable-fill-path':
      return `from ${torr(f.fromPa)} to ${torr(f.toPa)}${f.detonable ? ', detonable on part of it' : ''}`;
    case 'closed-vessel-pressure':
      return (
        `ignited at ${torr(f.fromPa)} it reaches ${torr(f.peakPa)}` +
        (f.limitPa !== undefined ? ` (working limit ${torr(f.limitPa)})` : '')
      );
    case 'closed-vessel-fill-path':
      return (
        `flammable from ${torr(f.flammableFromPa)} to ${torr(f.flammableToPa)}; ignited at ` +
        `${torr(f.fromPa)} it reaches ${torr(f.peakPa)}` +
        (f.limitPa !== undefined ? ` (working limit ${torr(f.limitPa)})` : '')
      );
    case 'detonable-state':
      return `at ${torr(f.pressurePa)}`;
    default:
      return '';
  }
}

function stepName(s: FillState, k: number): string {
  const st = s.setup.steps[k];
  return isSplit(st.charge) ? `fill ${st.index} (${chargeName(st.species, st.charge)})` : `fill ${st.index}`;
}

/** what the reducer lends the review screen: its own step entry and re-target */
export interface ReviewHooks {
  /** the phase a step opens with (barometer, reminder, reading) */
  readonly enterStep: (s: FillState) => FillState;
  /** re-target and judge from the readings in force */
  readonly rejudge: (s: FillState) => FillState;
  /** the re-target input of a state */
  readonly retargetInput: (s: FillState) => RetargetInput;
  /** a further reading of the fill just read (it stopped below its band): "VALUE INITIALS" typed */
  readonly continueFill: (s: FillState, now: string) => FillState;
}

const NUMBER_FIRST = /^[-+]?(\d|\.\d)/;

const INITIALS = /^(safer|accept|stop)\s+([A-Za-z]{1,6})$/i;

/**
 * Enter on the review screen: `safer INITIALS`, `accept INITIALS` or `stop INITIALS` (undo and fix are the
 * reducer's)
 */
export function onReviewEnter(s: FillState, now: string, hooks: ReviewHooks): FillState {
  const r = s.review!;
  const text = s.input.trim();
  // a further reading of the incomplete fill: the fill was continued (logged as such by the reducer)
  if (r.continuation && NUMBER_FIRST.test(text)) return hooks.continueFill(s, now);
  const m = INITIALS.exec(text);
  const cont = r.continuation;
  // short: the choices stand in full on the screen above the field, one row each (its 24 rows)
  const example = cont
    ? `: the new reading of ${cont.name} and your initials, e.g. ${fromPa(cont.toPa, 'Torr').toFixed(2)} AB, or `
    : ', e.g. ';
  if (!m) return { ...s, error: `type one of the ways above${example}accept INITIALS (each is logged)` };
  const choice = m[1].toLowerCase();
  const by = m[2];
  const step = s.setup.steps[s.current].index;
  const hazards = r.hazards.map((h) => ({ code: h.code, step: h.step, severity: h.severity }));
  const what = r.hazards.map((h) => `${h.code}${h.step ? ` (fill ${h.step})` : ''}`).join(', ');
  const why = r.hazards.map((h) => `${h.code}${h.step ? ` (fill ${h.step})` : ''}: ${h.text}`).join(' | ');
  const mem: ReviewMemory = s.reviewed ?? { accepted: [], stopsPa: {} };
  /** the acknowledge line of the review's outcome (the one shape both choices log) */
  const logged = (note: string, review: LogRemainderReview): NewLogEvent => ({
    kind: 'acknowledge',
    code: REVIEW_CODE,
    step,
    by,
    time: now,
    note: `${note}. ${why}`,
    review,
  });
  if (choice === 'stop') return stopAtReview(s, by, now, what, hooks.retargetInput(s), logged);
  if (choice === 'safer') {
    const alt = r.alternative;
    if (!alt && cont && continuationOffered(cont))
      return {
        ...s,
        error:
          `the safer way is to continue ${cont.name}: fill on from ${cont.sourceId} to ` +
          `${torr(cont.toPa)} and type the new reading and your initials (e.g. ` +
          `${fromPa(cont.toPa, 'Torr').toFixed(2)} AB)`,
      };
    if (!alt)
      return {
        ...s,
        error:
          `${r.noAlternative ?? NO_ALTERNATIVE['not-searched']}; ` +
          'type accept INITIALS, undo INITIALS or fix N INITIALS',
      };
    const note =
      `review of the remaining fills after the ${r.trigger}: ${what}, which the plan did not have; ` +
      `${by} took the safer stop of ${alt.name}: ${torr(alt.toPa)} instead of ${torr(alt.fromPa)} absolute`;
    const ev = logged(note, {
      trigger: r.trigger,
      outcome: 'safer-stop',
      hazards,
      stop: { step: alt.step, from_Pa: alt.fromPa, to_Pa: alt.toPa },
    });
    const next = hooks.rejudge({
      ...s,
      reviewed: { ...mem, stopsPa: { ...mem.stopsPa, [alt.fill]: alt.toPa } },
      review: undefined,
      phase: 'reading',
      input: '',
      effects: [ev],
    });
    const entered = hooks.enterStep({ ...next, message: `${note} (logged); the targets ahead follow it` });
    return withReview(entered, r.trigger, hooks.retargetInput(entered));
  }
  const note =
    `review of the remaining fills after the ${r.trigger}: ${what}, which the plan did not have; ` +
    `accepted by ${by} (going on through it)`;
  const ev = logged(note, { trigger: r.trigger, outcome: 'accepted', hazards });
  return hooks.enterStep({
    ...s,
    reviewed: { ...mem, accepted: [...mem.accepted, ...r.hazards.map((h) => h.key)] },
    acceptedHazards: [
      ...(s.acceptedHazards ?? []).filter((h) => !r.hazards.some((x) => x.key === h.key)),
      ...r.hazards,
    ],
    review: undefined,
    phase: 'reading',
    input: '',
    effects: [ev],
    message: `${note} (logged)`,
  });
}

/**
 * `stop INITIALS` on the review screen: the fill goes no further. The choice is logged (outcome "stopped",
 * with the hazards), then the batch is closed there, not finished (check: INCOMPLETE, never a pass), the
 * close note saying what the review finds in the tank as it stands (belowBandWays' tankNow), as a stop on
 * the below-band or capped screen does.
 */
function stopAtReview(
  s: FillState,
  by: string,
  now: string,
  what: string,
  input: RetargetInput,
  logged: (note: string, review: LogRemainderReview) => NewLogEvent,
): FillState {
  const r = s.review!;
  const rest = s.setup.steps.slice(s.current).map((x) => x.index);
  const notMade = `fill${rest.length === 1 ? '' : 's'} ${rest.join(', ')} not made`;
  const tankNowText = tankNowWords(belowBandWays(s, input).tankNow);
  const tank = tankNowText ?? NO_TANK_HAZARD_NOW;
  const note =
    `review of the remaining fills after the ${r.trigger}: ${what}, which the plan did not have; ` +
    `${by} stopped the batch here (${notMade})`;
  const hazards = r.hazards.map((h) => ({ code: h.code, step: h.step, severity: h.severity }));
  return {
    ...s,
    ...(tankNowText ? { tankNowText } : {}),
    phase: 'ended',
    review: undefined,
    input: '',
    effects: [
      logged(note, { trigger: r.trigger, outcome: 'stopped', hazards }),
      { kind: 'close', time: now, note: `stopped by ${by} at the safety review: ${notMade}; ${tank}` },
    ],
    message:
      `the batch is stopped by ${by} at the safety review (logged): ${notMade}, so it is INCOMPLETE (not a ` +
      `pass); ${tank}`,
  };
}

/** the remaining targets with the safer stop, for the screen */
export function alternativeTargets(a: ReviewAlternative): string {
  return a.targetsPa.map((t) => `fill ${t.step} ${torr(t.targetPa)}`).join(', ');
}
