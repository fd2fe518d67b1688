/**
 * The guided fill as a pure state machine: one step at a time, the operator types the
 * actual reading (and the temperature when it changed); each accepted reading becomes
 * a log event (an effect the shell writes, with fsync, before the next screen), the
 * remaining targets are re-targeted, and a danger finding blocks the fill until it is
 * acknowledged in words. No ink, no files here: the component executes the effects.
 */
import {
  evaluateUncertainty,
  fail,
  gaugeReadingPa,
  ProblemError,
  describeProblem,
  retarget,
  type Design,
  type GasSource,
  type Gauge,
  type UncertaintyResult,
} from '../core/index.js';
import { parseQuantity, fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import { designFromHeader } from '../io/check.js';
import { gaugeFromLog, sourceFromLog, type LogEvent, type LogHeader, type ParsedLog } from '../io/batch-log.js';

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
}

export type Phase = 'acknowledge' | 'reading' | 'done';
export type Field = 'reading' | 'temperature';

export interface DoneReading {
  readonly step: number;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly text: string;
}

export interface FillState {
  readonly setup: FillSetup;
  readonly phase: Phase;
  /** 0-based index of the current step */
  readonly current: number;
  readonly done: readonly DoneReading[];
  /** absolute targets of every step, re-targeted after each reading, Pa */
  readonly targetsPa: readonly number[];
  readonly field: Field;
  readonly input: string;
  readonly temperatureText: string;
  readonly message?: string;
  readonly error?: string;
  readonly effects: readonly LogEvent[];
  readonly summary?: UncertaintyResult;
}

export type FillAction =
  | { readonly type: 'char'; readonly text: string }
  | { readonly type: 'backspace' }
  | { readonly type: 'tab' }
  | { readonly type: 'enter'; readonly now: string };

export function setupFromHeader(header: LogHeader): FillSetup {
  const gauges = new Map(header.gauges.map((g) => [g.id, gaugeFromLog(g)]));
  const sources = new Map(header.sources.map((s) => [s.id, sourceFromLog(s)]));
  const steps = header.steps.map((s) => ({ index: s.step, species: s.species, source: sources.get(s.source)!, gauge: s.gauge ? gauges.get(s.gauge) : undefined, bandPa: s.band_Pa }));
  const dangers = (header.findings ?? []).filter((f) => f.severity === 'danger').map((f) => ({ code: f.code, step: f.step, message: f.message }));
  return { header, design: designFromHeader(header), steps, dangers };
}

const degC = (k: number) => `${(k - 273.15).toFixed(1)} degC`;

/** a new fill, or one resumed from its log */
export function initialState(setup: FillSetup, log?: ParsedLog, now = ''): FillState {
  const targets = setup.header.steps.map((s) => s.target_Pa);
  const acked = new Set((log?.acknowledgements ?? []).map((a) => a.code));
  const done: DoneReading[] = (log?.readings ?? []).map((r) => ({ step: r.step, pressurePa: r.pressure_Pa, temperatureK: r.temperature_K, text: r.reading }));
  const needsAck = setup.dangers.some((d) => !acked.has(d.code));
  let state: FillState = {
    setup,
    phase: needsAck ? 'acknowledge' : 'reading',
    current: done.length,
    done,
    targetsPa: targets,
    field: 'reading',
    input: '',
    temperatureText: degC(done.length ? done[done.length - 1].temperatureK : setup.header.temperature_K),
    effects: [],
    message: done.length ? `resumed: ${done.length} of ${setup.steps.length} readings were in the log` : undefined,
  };
  if (done.length) state = { ...state, targetsPa: retargeted(state, done) };
  if (done.length >= setup.steps.length) state = finish({ ...state, effects: [] }, log?.closed || !now ? undefined : now);
  return state;
}

/** the remaining targets after the readings done (and what had to give) */
function retargeted(s: FillState, done: readonly DoneReading[]): number[] {
  return retargetRun(s, done).targets;
}

function retargetRun(s: FillState, done: readonly DoneReading[]): { targets: number[]; message: string } {
  const h = s.setup.header;
  const r = retarget({
    design: s.setup.design,
    tolerance: h.tolerance,
    sources: s.setup.steps.map((x) => x.source),
    done: done.map((d) => ({ pressurePa: d.pressurePa, temperatureK: d.temperatureK })),
    temperatureK: done.length ? done[done.length - 1].temperatureK : h.temperature_K,
    finalPressurePa: h.final_pressure_Pa,
    volumeM3: h.tank.volume_m3,
    workingLimitPa: h.tank.rated_pressure_Pa ?? undefined,
  });
  const t = [...s.targetsPa];
  for (const x of r.remaining) t[x.step - 1] = x.targetPa;
  return { targets: t, message: r.message };
}

function gaugeUnit(step: FillStep): PressureUnit {
  return step.gauge && isPressureUnit(step.gauge.unit) ? step.gauge.unit : 'Torr';
}

/** what the operator should read on the gauge for an absolute tank pressure */
export function shownPa(s: FillState, step: FillStep, absolutePa: number): number {
  const ctx = { barometricPa: s.setup.header.barometer.pressure_Pa, barometricUncertaintyPa: s.setup.header.barometer.u_Pa };
  return step.gauge ? gaugeReadingPa(step.gauge, absolutePa, ctx) : absolutePa;
}

function finish(s: FillState, now?: string): FillState {
  const h = s.setup.header;
  // a step without a gauge (a danger finding the operator accepted) has no uncertainty model: no summary then
  const withGauges = s.done.every((_, i) => s.setup.steps[i].gauge);
  const readings = withGauges ? s.done.map((d, i) => ({ step: d.step, source: s.setup.steps[i].source, pressurePa: d.pressurePa, temperatureK: d.temperatureK, gauge: s.setup.steps[i].gauge! })) : [];
  let summary: UncertaintyResult | undefined;
  if (withGauges) try {
    summary = evaluateUncertainty(readings, { barometricPa: h.barometer.pressure_Pa, barometricUncertaintyPa: h.barometer.u_Pa, thermometerUncertaintyK: h.thermometer.u_K, thermometerResolutionK: h.thermometer.resolution_K, trials: 0, seed: 1 }, h.design.diluent);
  } catch {
    summary = undefined;
  }
  const effects: LogEvent[] = now ? [...s.effects, { kind: 'close', time: now }] : [...s.effects];
  return { ...s, phase: 'done', effects, summary };
}

export function fillReducer(s: FillState, a: FillAction): FillState {
  const base = { ...s, effects: [] as LogEvent[], error: undefined };
  if (a.type === 'char') {
    if (base.field === 'temperature' && base.phase === 'reading') return { ...base, temperatureText: base.temperatureText + a.text };
    return { ...base, input: base.input + a.text.replace(/[\r\n]/g, '') };
  }
  if (a.type === 'backspace') {
    if (base.field === 'temperature' && base.phase === 'reading') return { ...base, temperatureText: base.temperatureText.slice(0, -1) };
    return { ...base, input: base.input.slice(0, -1) };
  }
  if (a.type === 'tab') return base.phase === 'reading' ? { ...base, field: base.field === 'reading' ? 'temperature' : 'reading' } : base;
  // enter
  if (base.phase === 'done') return base;
  if (base.phase === 'acknowledge') {
    const m = /^\s*accept\s+([A-Za-z]{1,6})\s*$/.exec(base.input);
    if (!m) return { ...base, error: 'to go on past a danger finding, type "accept" and your initials (e.g. accept AB), then Enter; Ctrl-C stops' };
    const effects: LogEvent[] = base.setup.dangers.map((d) => ({ kind: 'acknowledge', code: d.code, step: d.step, by: m[1], time: a.now, note: d.message }));
    return { ...base, phase: 'reading', input: '', effects, message: `${effects.length} danger finding(s) acknowledged by ${m[1]} and logged` };
  }
  const step = base.setup.steps[base.current];
  const unit = gaugeUnit(step);
  let shown: number;
  let temperatureK: number;
  try {
    const text = base.input.trim();
    if (text === '') fail({ code: 'bad-quantity', text, expected: 'pressure', reason: 'type the reading first' });
    shown = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(text) ? parseQuantity(`${text} ${unit}`, 'pressure') : parseQuantity(text, 'pressure');
    temperatureK = parseQuantity(base.temperatureText.trim(), 'temperature');
    if (!(temperatureK >= 200 && temperatureK <= 600)) fail({ code: 'out-of-range', what: 'tank temperature', value: temperatureK, allowed: '200-600 K' });
  } catch (e) {
    if (e instanceof ProblemError) return { ...base, error: describeProblem(e.problem) };
    throw e;
  }
  const baro = base.setup.header.barometer.pressure_Pa;
  const absolute = step.gauge?.reference === 'gauge' ? shown + baro : shown;
  const prev = base.done.length ? base.done[base.done.length - 1].pressurePa : 0;
  if (!(absolute > prev)) return { ...base, error: `the reading must be above the previous one (${fromPa(prev, unit).toFixed(4)} ${unit} absolute); each fill raises the tank pressure` };
  if (step.gauge && shown > step.gauge.fullScalePa) return { ...base, error: `${step.gauge.id} reads only up to ${fromPa(step.gauge.fullScalePa, unit)} ${unit}; check the gauge and the unit` };
  const target = base.targetsPa[base.current];
  const deviation = absolute - target;
  const within = Math.abs(deviation) <= step.bandPa;
  const readingText = `${base.input.trim()}${/[A-Za-z]/.test(base.input) ? '' : ` ${unit}`}`;
  const event: LogEvent = {
    kind: 'reading',
    step: step.index,
    source: step.source.id,
    gauge: step.gauge?.id ?? 'none',
    reading: readingText,
    pressure_Pa: absolute,
    ...(step.gauge?.reference === 'gauge' ? { barometer_Pa: baro } : {}),
    temperature: base.temperatureText.trim(),
    temperature_K: temperatureK,
    time: a.now,
  };
  const done = [...base.done, { step: step.index, pressurePa: absolute, temperatureK, text: readingText }];
  const devText = `fill ${step.index} logged: ${fromPa(deviation, unit) >= 0 ? '+' : ''}${fromPa(deviation, unit).toPrecision(3)} ${unit} from the target (${within ? 'inside' : 'OUTSIDE'} the band)`;
  let next: FillState = { ...base, done, current: base.current + 1, input: '', field: 'reading', effects: [event] };
  if (next.current >= base.setup.steps.length) return finish({ ...next, message: devText }, a.now);
  const r = retargetRun(base, done);
  next = { ...next, targetsPa: r.targets, message: `${devText}; re-targeted: ${r.message}` };
  return next;
}
