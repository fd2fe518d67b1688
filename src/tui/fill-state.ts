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
  evaluateUncertainty,
  fail,
  gaugeReadingPa,
  inverseSetup,
  invertReadings,
  judge,
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
import { parseQuantity, fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import { designFromHeader } from '../io/check.js';
import { gaugeFromLog, sourceFromLog, type NewLogEvent, type LogHeader, type LogReading, type ParsedLog } from '../io/batch-log.js';

export interface FillStep {
  readonly index: number;
  readonly species: string;
  readonly source: GasSource;
  readonly gauge?: Gauge;
  readonly bandPa: number;
}

export interface FillSetup {
  readonly header: LogHeader;
  readonly design: Design;
  readonly steps: readonly FillStep[];
  readonly dangers: readonly { readonly code: string; readonly step: number | null; readonly message: string }[];
  /** the tank's working limit (rating x working fraction; the rating for logs that lack it), Pa absolute */
  readonly workingLimitPa?: number;
  /** a gauge-referenced sensor reads some step: today's barometric pressure is asked first */
  readonly needsBarometer: boolean;
}

/**
 * barometer: today's barometric pressure; acknowledge: danger findings of the plan; reminder: the
 * accepted danger of this fill, again; reading: the step; confirm: an implausible reading, asked
 * first; over-limit: a reading past the working limit; ended: stopped before the last fill; done.
 */
export type Phase = 'barometer' | 'acknowledge' | 'reminder' | 'reading' | 'confirm' | 'over-limit' | 'ended' | 'done';
export type Field = 'reading' | 'temperature';

export interface DoneReading {
  readonly step: number;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly text: string;
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
  /** why the reading is asked about (confirm) */
  readonly reason?: string;
}

export interface OverLimit {
  readonly limitPa: number;
  /** vent or pump back to this absolute pressure (from where the remaining fills end at the design pressure if they can; never above the limit), Pa */
  readonly ventToPa: number;
  /** what the remaining fills become from there */
  readonly after: string;
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
  /** steps whose accepted danger has been shown again */
  readonly reminded: readonly number[];
}

export type FillAction =
  | { readonly type: 'char'; readonly text: string }
  | { readonly type: 'backspace' }
  | { readonly type: 'tab' }
  | { readonly type: 'escape' }
  | { readonly type: 'enter'; readonly now: string };

export function setupFromHeader(header: LogHeader): FillSetup {
  const gauges = new Map(header.gauges.map((g) => [g.id, gaugeFromLog(g)]));
  const sources = new Map(header.sources.map((s) => [s.id, sourceFromLog(s)]));
  const steps = header.steps.map((s) => ({ index: s.step, species: s.species, source: sources.get(s.source)!, gauge: s.gauge ? gauges.get(s.gauge) : undefined, bandPa: s.band_Pa }));
  const dangers = (header.findings ?? []).filter((f) => f.severity === 'danger').map((f) => ({ code: f.code, step: f.step, message: f.message }));
  const workingLimitPa = header.tank.working_limit_Pa ?? header.tank.rated_pressure_Pa ?? undefined;
  return { header, design: designFromHeader(header), steps, dangers, workingLimitPa, needsBarometer: steps.some((s) => s.gauge?.reference === 'gauge') };
}

const degC = (k: number) => `${(k - 273.15).toFixed(1)} degC`;
const BARO_RANGE_PA = [70e3, 110e3] as const;

/** a new fill, or one resumed from its log */
export function initialState(setup: FillSetup, log?: ParsedLog, now = ''): FillState {
  const h = setup.header;
  const targets = h.steps.map((s) => s.target_Pa);
  const acked = new Set((log?.acknowledgements ?? []).map((a) => a.code));
  const done: DoneReading[] = (log?.readings ?? []).map((r) => ({ step: r.step, pressurePa: r.pressure_Pa, temperatureK: r.temperature_K, text: r.reading }));
  const needsAck = setup.dangers.some((d) => !acked.has(d.code));
  const lastBaro = [...(log?.readings ?? [])].reverse().find((r) => r.barometer_Pa !== undefined)?.barometer_Pa;
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
    message: done.length ? `resumed: ${done.length} of ${setup.steps.length} readings were in the log` : undefined,
  };
  if (done.length) {
    const r = retargetRun(state, done, T);
    state = { ...state, targetsPa: r.targets, targetTemperatureK: T };
  }
  if (done.length >= setup.steps.length) return finish({ ...state, effects: [] }, log?.closed || !now ? undefined : now);
  return enterStep({ ...state, phase: needsAck ? 'acknowledge' : 'reading' });
}

/** the phase a step opens with: today's barometer first, then the acknowledgement, then this fill's own danger */
function enterStep(s: FillState): FillState {
  if (s.phase === 'acknowledge') return s;
  if (s.setup.needsBarometer && !s.barometerToday) return { ...s, phase: 'barometer', input: '' };
  const stepIndex = s.setup.steps[s.current]?.index;
  if (stepIndex !== undefined && !s.reminded.includes(stepIndex) && s.setup.dangers.some((d) => d.step === stepIndex)) return { ...s, phase: 'reminder', input: '' };
  return { ...s, phase: 'reading' };
}

export function retargetInput(s: FillState, done: readonly DoneReading[], temperatureK: number): RetargetInput {
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
    formatPressure: (pa) => `${fromPa(pa, 'Torr').toPrecision(6)} Torr`,
  };
}

/** the remaining targets after the readings done, at the temperature of the next fills */
function retargetRun(s: FillState, done: readonly DoneReading[], temperatureK: number) {
  const r = retarget(retargetInput(s, done, temperatureK));
  const t = [...s.targetsPa];
  for (const x of r.remaining) t[x.step - 1] = x.targetPa;
  return { targets: t, message: r.message, result: r };
}

function gaugeUnit(step: FillStep): PressureUnit {
  return step.gauge && isPressureUnit(step.gauge.unit) ? step.gauge.unit : 'Torr';
}

/** what the operator should read on the gauge for an absolute tank pressure */
export function shownPa(s: FillState, step: FillStep, absolutePa: number): number {
  const ctx = { barometricPa: s.barometerPa, barometricUncertaintyPa: s.setup.header.barometer.u_Pa };
  return step.gauge ? gaugeReadingPa(step.gauge, absolutePa, ctx) : absolutePa;
}

function deviationsOf(composition: Readonly<Record<string, { value: number; u?: number } | number>>, s: FillState): FractionDeviation[] {
  const tol = s.setup.header.tolerance;
  return Object.entries(s.setup.design.composition)
    .filter(([, xd]) => xd > 0)
    .map(([k, xd]) => {
      const v = composition[k];
      const actual = typeof v === 'number' ? v : (v?.value ?? 0);
      const t = Math.max(tol.relative * xd, tol.absolute);
      return { species: k, design: xd, actual, deviation: actual - xd, tolerance: t, within: Math.abs(actual - xd) <= t };
    });
}

/** the as-filled composition of all readings, with the GUM uncertainty where every step has a gauge */
function finalJudgement(s: FillState): { judgement: CompositionJudgement; summary?: UncertaintyResult } {
  const h = s.setup.header;
  const withGauges = s.done.every((_, i) => s.setup.steps[i].gauge);
  if (withGauges) {
    try {
      const readings = s.done.map((d, i) => ({ step: d.step, source: s.setup.steps[i].source, pressurePa: d.pressurePa, temperatureK: d.temperatureK, gauge: s.setup.steps[i].gauge! }));
      const summary = evaluateUncertainty(readings, { barometricPa: s.barometerPa, barometricUncertaintyPa: h.barometer.u_Pa, thermometerUncertaintyK: h.thermometer.u_K, thermometerResolutionK: h.thermometer.resolution_K, trials: 0, seed: 1 }, h.design.diluent);
      const v = judge(summary, s.setup.design, h.tolerance);
      const deviations = v.deviations.map((d) => ({ species: d.species, design: d.design, actual: d.actual, deviation: d.deviation, tolerance: d.tolerance, within: d.within, expandedU: d.expandedU }));
      return { summary, judgement: { kind: 'final', verdict: v.verdict === 'no-design' ? 'fail' : v.verdict, deviations, phi: summary.phi?.value } };
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
    }
  }
  // a step without a gauge has no uncertainty model: the nominal inverse only
  const setup = inverseSetup(s.done.map((d, i) => ({ source: s.setup.steps[i].source, pressurePa: d.pressurePa, temperatureK: d.temperatureK })));
  const res = invertReadings(setup, undefined, s.done.map((d) => d.pressurePa));
  const comp: Record<string, number> = {};
  setup.species.forEach((k, i) => (comp[k] = res.x[i] * (1 - res.unidentified)));
  const deviations = deviationsOf(comp, s);
  return { judgement: { kind: 'final', verdict: deviations.every((d) => d.within) ? 'pass-uncertain' : 'fail', deviations } };
}

function finish(s: FillState, now?: string): FillState {
  const { judgement, summary } = finalJudgement(s);
  const effects: NewLogEvent[] = now ? [...s.effects, { kind: 'close', time: now }] : [...s.effects];
  return { ...s, phase: 'done', effects, summary, judgement };
}

const READING_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

function parseReading(s: FillState, step: FillStep): { shown: number; temperatureK: number } | { error: string } {
  try {
    const text = s.input.trim();
    if (text === '') fail({ code: 'bad-quantity', text, expected: 'pressure', reason: 'type the reading first' });
    const shown = READING_NUMBER.test(text) ? parseQuantity(`${text} ${gaugeUnit(step)}`, 'pressure') : parseQuantity(text, 'pressure');
    const temperatureK = parseTemperature(s.temperatureText);
    return { shown, temperatureK };
  } catch (e) {
    if (e instanceof ProblemError) return { error: describeProblem(e.problem) };
    throw e;
  }
}

function parseTemperature(text: string): number {
  const t = parseQuantity(text.trim(), 'temperature');
  if (!(t >= 200 && t <= 600)) fail({ code: 'out-of-range', what: 'tank temperature', value: t, allowed: '200-600 K' });
  return t;
}

/** re-target the current and later steps for a changed temperature (the fills ahead are read at it) */
function withTemperature(s: FillState): FillState {
  let T: number;
  try {
    T = parseTemperature(s.temperatureText);
  } catch (e) {
    if (e instanceof ProblemError) return { ...s, error: describeProblem(e.problem) };
    throw e;
  }
  if (Math.abs(T - s.targetTemperatureK) < 0.005) return s;
  const r = retargetRun(s, s.done, T);
  return { ...s, targetsPa: r.targets, targetTemperatureK: T, message: `targets re-computed for ${degC(T)}: the amount to fill is the same, its pressure is not` };
}

const fmtIn = (pa: number, unit: PressureUnit, sig = 6) => `${fromPa(pa, unit).toPrecision(sig)} ${unit}`;

/** plausibility: why a reading looks wrong, or undefined */
function doubt(s: FillState, step: FillStep, shown: number): string | undefined {
  const unit = gaugeUnit(step);
  const target = s.targetsPa[s.current];
  const targetShown = shownPa(s, step, target);
  if (step.gauge?.reference === 'gauge' && Math.abs(Math.abs(shown - targetShown) - s.barometerPa) <= 0.1 * s.barometerPa) {
    const sense = shown > targetShown ? 'an absolute pressure typed for a gauge-referenced sensor' : 'a gauge-referenced value where the target is absolute';
    return `${fmtIn(shown, unit)} is about one barometric pressure (${fmtIn(s.barometerPa, unit, 5)}) from the target ${fmtIn(targetShown, unit)} on ${step.gauge.id}, which reads above ambient: likely ${sense}`;
  }
  if (step.gauge && shown < step.gauge.minimumPa) return `${fmtIn(shown, unit)} is below the range of ${step.gauge.id} (from ${fmtIn(step.gauge.minimumPa, unit)}): likely the unit, a sign, or a gauge not zeroed`;
  return undefined;
}

function readingEvent(s: FillState, step: FillStep, absolute: number, temperatureK: number, now: string, note?: string): LogReading {
  const unit = gaugeUnit(step);
  const readingText = `${s.input.trim()}${/[A-Za-z]/.test(s.input) ? '' : ` ${unit}`}`;
  return {
    kind: 'reading',
    step: step.index,
    source: step.source.id,
    gauge: step.gauge?.id ?? 'none',
    reading: readingText,
    pressure_Pa: absolute,
    ...(step.gauge?.reference === 'gauge' ? { barometer_Pa: s.barometerPa } : {}),
    temperature: s.temperatureText.trim(),
    temperature_K: temperatureK,
    time: now,
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
  const pressureText = `fill ${step.index} logged: ${fromPa(deviation, unit) >= 0 ? '+' : ''}${fromPa(deviation, unit).toPrecision(3)} ${unit} from the target (${within ? 'inside' : 'outside'} the pressure band)`;
  let next: FillState = { ...s, done, current: s.current + 1, input: '', field: 'reading', effects: [...extra, p.event], pending: undefined, overLimit: undefined };
  if (next.current >= s.setup.steps.length) return finish({ ...next, message: pressureText }, now);
  const r = retargetRun(s, done, p.done.temperatureK);
  const deviations = deviationsOf(r.result.predicted.composition, s);
  const judgement: CompositionJudgement = { kind: 'predicted', verdict: deviations.every((d) => d.within) ? 'on-course' : 'off-course', deviations, phi: r.result.predicted.phi };
  next = { ...next, targetsPa: r.targets, targetTemperatureK: p.done.temperatureK, judgement, message: `${pressureText}; ${r.message}` };
  if (r.result.limitBinds && r.result.nowPa >= (s.setup.workingLimitPa ?? Infinity)) {
    return { ...next, phase: 'ended', effects: [...next.effects, { kind: 'close', time: now, note: `stopped after fill ${step.index}: the tank is at or above its working limit; no further fill can be made within it` }] };
  }
  return enterStep(next);
}

/** after the reading is plausible (or confirmed): the working limit */
function afterDoubt(s: FillState, p: Pending, now: string): FillState {
  const limit = s.setup.workingLimitPa;
  if (limit !== undefined && p.done.pressurePa > limit) {
    const done = [...s.done, p.done];
    const v = ventBack({ ...retargetInput(s, done, p.done.temperatureK), workingLimitPa: limit });
    return { ...s, phase: 'over-limit', pending: p, input: '', overLimit: { limitPa: limit, ventToPa: v.targetPa, after: v.after.message } };
  }
  return commit(s, p, [], now);
}

function onReadingEnter(s: FillState, now: string): FillState {
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  const parsed = parseReading(s, step);
  if ('error' in parsed) return { ...s, error: parsed.error };
  const { shown, temperatureK } = parsed;
  const absolute = step.gauge?.reference === 'gauge' ? shown + s.barometerPa : shown;
  const prev = s.done.length ? s.done[s.done.length - 1].pressurePa : 0;
  if (!(absolute > prev)) {
    return {
      ...s,
      error: `${fmtIn(absolute, unit)} absolute is not above the previous reading ${fmtIn(prev, unit)}, and a fill only adds gas. Likely: a typing slip or the unit; gas that flowed back into the line (it was below the tank pressure when the valve opened; the tank's composition is unchanged: fill on to the target and log that reading); or the tank cooled (check the temperature). The reading is not logged.`,
    };
  }
  if (step.gauge && shown > step.gauge.fullScalePa) {
    return { ...s, error: `${fmtIn(shown, unit)} is past the range of ${step.gauge.id} (up to ${fmtIn(step.gauge.fullScalePa, unit)}): a head past its range shows no measurement. Likely the unit or a typing slip; if the tank really is above it, close the head's valve and read the tank on a gauge with a higher range. The reading is not logged.` };
  }
  // the judgement uses the temperature typed with the reading: re-target first if it changed
  const s1 = Math.abs(temperatureK - s.targetTemperatureK) >= 0.005 ? withTemperature(s) : s;
  const p: Pending = { event: readingEvent(s1, step, absolute, temperatureK, now), done: { step: step.index, pressurePa: absolute, temperatureK, text: s1.input.trim() } };
  const why = doubt(s1, step, shown);
  if (why) return { ...s1, phase: 'confirm', pending: { ...p, reason: why } };
  return afterDoubt(s1, p, now);
}

function onOverLimitEnter(s: FillState, now: string): FillState {
  const p = s.pending!;
  const o = s.overLimit!;
  const step = s.setup.steps[s.current];
  const unit = gaugeUnit(step);
  const text = s.input.trim();
  if (/^edit$/i.test(text)) return { ...s, phase: 'reading', pending: undefined, overLimit: undefined, input: p.done.text };
  const acc = /^accept\s+([A-Za-z]{1,6})$/.exec(text);
  const last = s.current + 1 >= s.setup.steps.length;
  if (acc) {
    const ack: NewLogEvent = { kind: 'acknowledge', code: 'over-working-limit', step: step.index, by: acc[1], time: now, note: `reading ${fmtIn(p.done.pressurePa, unit)} absolute after fill ${step.index} is above the working limit ${fmtIn(o.limitPa, unit)} of ${s.setup.header.tank.id}; accepted` };
    return commit(s, { ...p, event: { ...p.event, note: `above the working limit; accepted by ${acc[1]}` } }, [ack], now);
  }
  if (/^vent$/i.test(text)) {
    const note = `above the working limit ${fmtIn(o.limitPa, unit)}; the operator vents the tank back to ${fmtIn(o.ventToPa, unit)} absolute`;
    const event: LogReading = { ...p.event, note };
    const done = [...s.done, p.done];
    const base: FillState = { ...s, done, current: s.current + 1, pending: undefined, input: '' };
    if (last) {
      const f = finish({ ...base, effects: [event] }, now);
      return { ...f, message: `fill ${step.index} logged above the working limit; vent the tank back to ${fmtIn(o.ventToPa, unit)} absolute. Venting keeps the composition, so the re-check below holds for the vented tank.` };
    }
    return {
      ...base,
      phase: 'ended',
      effects: [event, { kind: 'close', time: now, note: `stopped after fill ${step.index}: the tank is vented back to ${fmtIn(o.ventToPa, unit)} absolute; the readings give its composition; finish the design as a top-up batch` }],
      message: `fill ${step.index} logged. Vent or pump the tank back to ${fmtIn(o.ventToPa, unit)} absolute. Venting keeps the composition, so this log's readings still give it; finish the design as a top-up batch (in_tank: the composition of \`mixwright check\` of this log, at the pressure you read after venting). From there: ${o.after}.`,
    };
  }
  return { ...s, error: 'type "vent" (you vent or pump back), "accept" and your initials (keep the tank as it is; logged), or "edit" (the reading was mistyped), then Enter' };
}

export function fillReducer(s: FillState, a: FillAction): FillState {
  const base = { ...s, effects: [] as NewLogEvent[], error: undefined };
  const textPhase = base.phase === 'reading' && base.field === 'temperature';
  if (a.type === 'char') {
    if (base.phase === 'confirm') {
      if (/^[yY]/.test(a.text)) return afterDoubt({ ...base, phase: 'reading' }, base.pending!, base.pending!.event.time);
      if (/^[nNeE]/.test(a.text)) return { ...base, phase: 'reading', pending: undefined };
      return { ...base, error: 'y: log the reading as typed   n: back to the reading' };
    }
    if (textPhase) return { ...base, temperatureText: base.temperatureText + a.text };
    return { ...base, input: base.input + a.text.replace(/[\r\n]/g, '') };
  }
  if (a.type === 'backspace') {
    if (textPhase) return { ...base, temperatureText: base.temperatureText.slice(0, -1) };
    return { ...base, input: base.input.slice(0, -1) };
  }
  if (a.type === 'escape') {
    if (base.phase === 'confirm' || base.phase === 'over-limit') return { ...base, phase: 'reading', input: base.pending?.done.text ?? base.input, pending: undefined, overLimit: undefined };
    return base;
  }
  if (a.type === 'tab') {
    if (base.phase !== 'reading') return base;
    if (base.field === 'temperature') return withTemperature({ ...base, field: 'reading' });
    return { ...base, field: 'temperature' };
  }
  // enter
  switch (base.phase) {
    case 'done':
    case 'ended':
    case 'confirm':
      return base;
    case 'barometer': {
      try {
        const p = parseQuantity(base.input.trim(), 'pressure', { field: 'barometric pressure' });
        if (!(p >= BARO_RANGE_PA[0] && p <= BARO_RANGE_PA[1])) fail({ code: 'out-of-range', what: 'barometric pressure', value: p, allowed: '70-110 kPa (525-825 Torr)' });
        return enterStep({ ...base, barometerPa: p, barometerToday: true, input: '', message: `barometric pressure today ${fmtIn(p, 'Torr', 5)}: the gauge-referenced targets use it, and each such reading logs it` });
      } catch (e) {
        if (e instanceof ProblemError) return { ...base, error: `${describeProblem(e.problem)} - type today's barometric pressure with its unit, e.g. 752.3 Torr or 1003.1 hPa` };
        throw e;
      }
    }
    case 'acknowledge': {
      const m = /^\s*accept\s+([A-Za-z]{1,6})\s*$/.exec(base.input);
      if (!m) return { ...base, error: 'to go on past a danger finding, type "accept" and your initials (e.g. accept AB), then Enter; Ctrl-C stops' };
      const effects: NewLogEvent[] = base.setup.dangers.map((d) => ({ kind: 'acknowledge', code: d.code, step: d.step, by: m[1], time: a.now, note: d.message }));
      return enterStep({ ...base, phase: 'reading', input: '', effects, message: `${effects.length} danger finding(s) acknowledged by ${m[1]} and logged` });
    }
    case 'reminder':
      return { ...base, phase: 'reading', input: '', reminded: [...base.reminded, base.setup.steps[base.current].index] };
    case 'over-limit':
      return onOverLimitEnter(base, a.now);
    case 'reading':
      return onReadingEnter(base, a.now);
  }
}
