/**
 * The guided fill screen (ink). Thin: the state machine is fill-state.ts; effects are written here,
 * fsync'd, before the screen moves on. One component per phase's screen.
 */
import { useEffect, useRef, useState, type ReactNode } from 'react';
import { Box, Text, measureElement, useApp, useInput, useStdout, type DOMElement } from 'ink';
import { useLatestState } from './latest-state.js';
import {
  atMostOnGauge,
  fillEnding,
  fillReducer,
  interruptNote,
  overRangeExample,
  premixMixingWords,
  shownPa,
  type CompositionJudgement,
  type FillAction,
  type FillState,
  type FillStep,
  type PremixCheck,
} from './fill-state.js';
import { fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import type { NewLogEvent } from '../io/batch-log.js';
import type { CheckReport } from '../io/check.js';
import { splitChunk } from './keys.js';
import { bandWords, decimalsFor, fixedSig, inwardBand, tankName } from '../report/format.js';
import { noneInsideOnGauge } from './gauge-view.js';
import { premixCloseOffWords } from '../report/two-stage-sheet.js';
import { labelLines, labelModel, wrapLine } from '../report/label-model.js';
import { premixPressure, verdictWord } from '../report/check-report.js';
import { premixCheckText } from '../report/check-types.js';
import { overallVerdict } from '../report/check-outcome.js';
import type { ParsedLog } from '../io/batch-log.js';
import { describeProblem, type Problem } from '../core/index.js';
import { gasCaution } from '../report/gas-caution.js';
import { chargeWords, isSplit } from '../report/charges.js';
import { StageEnd } from './stage-view.js';
import { lastFillRange } from './last-fill.js';
import { fillTitle, intoTank, stageEndLines } from './stage-state.js';
import { RemainderReviewScreen } from './fill-review-view.js';
import { avoidedDangers, avoidedWarnings, planDangerNow, type BelowWays } from './fill-review.js';
import { Options, Para, ScreenTitle } from './para.js';

export interface FillAppProps {
  readonly initial: FillState;
  /** append one event to the batch log (with fsync); returns its line; throws on failure */
  readonly write: (e: NewLogEvent) => { line: number } | void;
  readonly logFile: string;
  readonly now?: () => string;
  /** `check`'s own re-check of the log, for the end screen */
  readonly recheck?: () => Promise<{ report: CheckReport; log: ParsedLog }>;
  /** Ctrl-C: the fill stops (the shell exits 130) */
  /** Ctrl-C: with what the tank is left in that the count of readings does not say (interruptNote) */
  readonly onInterrupt?: (note?: string) => void;
  /** the end screen's re-check, once it is there (the shell's exit code follows it) */
  readonly onReport?: (report: CheckReport) => void;
  /**
   * the fill ended with the tank in a hazard (a batch closed or stopped below a band) or above its working
   * limit: what it is now, one line each (the shell repeats them)
   */
  readonly onTankNow?: (text: string) => void;
}

export function toActions(
  input: string,
  key: { return?: boolean; tab?: boolean; backspace?: boolean; delete?: boolean; escape?: boolean },
  now: string,
): FillAction[] {
  if (key.return) return [{ type: 'enter', now }];
  if (key.tab) return [{ type: 'tab' }];
  if (key.escape) return [{ type: 'escape' }];
  if (key.backspace || key.delete) return [{ type: 'backspace' }];
  return splitChunk(input).map((t): FillAction =>
    t.kind === 'text'
      ? { type: 'char', text: t.text }
      : t.kind === 'enter'
        ? { type: 'enter', now }
        : { type: t.kind },
  );
}

const unitOf = (step: FillStep): PressureUnit =>
  step.gauge && isPressureUnit(step.gauge.unit) ? step.gauge.unit : 'Torr';

/** the two input fields of a reading screen, the focused one marked and with a cursor */
function ReadingFields({
  state,
  reading,
  temperature,
}: {
  state: FillState;
  reading: string;
  temperature: string;
}) {
  return (
    <>
      <Text>
        {state.field === 'reading' ? '> ' : '  '}
        {reading}: {state.input}
        {state.field === 'reading' ? <Text inverse> </Text> : null}
      </Text>
      <Text>
        {state.field === 'temperature' ? '> ' : '  '}
        {temperature}: {state.temperatureText}
        {state.field === 'temperature' ? <Text inverse> </Text> : null}
      </Text>
    </>
  );
}

/** a relative deviation in %, 2 significant digits; below 0.001 % as "<0.001" (one screen row per species) */
function relText(pct: number): string {
  return Math.abs(pct) < 0.001 ? ' <0.001' : `${pct >= 0 ? '+' : '-'}${fixedSig(Math.abs(pct), 2)}`;
}

function JudgementView({ j, compact }: { j: CompositionJudgement; compact?: boolean }) {
  const head =
    j.kind === 'final'
      ? 'Composition as filled (inverse model, typed temperatures): ' +
        (j.verdict === 'fail'
          ? 'FAIL - outside the tolerance'
          : j.verdict === 'pass'
            ? 'within the tolerance'
            : 'NOT SHOWN within the tolerance (inside on the readings, U reaches past it)')
      : // values only (one screen line): whether the batch is shown within, with its U, is the re-check's at the end
        'Composition (values, not U): ' +
        (j.verdict === 'on-course'
          ? 'the remaining fills bring each within tolerance'
          : "OFF COURSE - the remaining fills cannot bring every fraction's value within the tolerance");
  // before the last fill: the fractions within tolerance on one line (the screen keeps 24 rows), each one
  // outside on its own
  const ok = j.kind === 'final' ? [] : j.deviations.filter((d) => d.within);
  const tolOf = (d: CompositionJudgement['deviations'][number]) =>
    fixedSig((d.tolerance / d.design) * 100, 2);
  const tol = [...new Set(ok.map(tolOf))];
  const row = (d: CompositionJudgement['deviations'][number]) =>
    `${d.species} ${relText((d.deviation / d.design) * 100).trim()} %` +
    (tol.length > 1 ? ` (tol ${tolOf(d)} %)` : '');
  if (compact) {
    // the species outside on one wrapped row (a screen that has the ways on, or a crowded fill screen)
    const out = j.deviations.filter((d) => !d.within);
    const outText =
      `${out.map((d) => `${d.species} ${relText((d.deviation / d.design) * 100).trim()} %`).join(', ')}` +
      ` rel: OUT (tol ${[...new Set(out.map(tolOf))].join(' / ')} %)`;
    if (j.kind !== 'final')
      return (
        <Para bold={j.verdict === 'off-course'}>
          {j.verdict === 'on-course'
            ? 'Composition (values, not U): the remaining fills bring each within tolerance'
            : `Values (not U): OFF COURSE - ${outText}`}
        </Para>
      );
    return (
      <Box flexDirection="column">
        <Text bold={j.verdict === 'fail'}>{head}</Text>
        {out.length ? <Para>{`  ${outText}`}</Para> : null}
      </Box>
    );
  }
  return (
    <Box flexDirection="column">
      <Para bold={j.verdict === 'fail' || j.verdict === 'off-course'}>{head}</Para>
      {ok.length ? (
        <Para>
          {`  ${ok.map(row).join(', ')} rel: ${ok.length > 1 ? 'each ' : ''}within ` +
            (tol.length === 1 ? `tol ${tol[0]} %` : 'its tol')}
        </Para>
      ) : null}
      {j.deviations
        .filter((d) => !ok.includes(d))
        .map((d) => (
          <Text key={d.species}>
            {`  ${d.species.padEnd(8)} ${fixedSig(d.actual, 5).padStart(10)}  ` +
              `design ${fixedSig(d.design, 5).padStart(10)} ` +
              ` ${relText((d.deviation / d.design) * 100)} ` +
              `% rel (tol ${fixedSig((d.tolerance / d.design) * 100, 2)} %) ${d.within ? 'value ok' : 'OUT'}`}
          </Text>
        ))}
    </Box>
  );
}

/** what the tank is now at the end of a fill, where it is not what the plan made: one line each */
function endNotesOf(s: FillState): string[] {
  return [s.tankNowText, s.aboveLimitText].filter((x): x is string => Boolean(x));
}

type Recheck = { report: CheckReport; log: ParsedLog } | { error: string } | undefined;

export function FillApp({
  initial,
  write,
  logFile,
  now = () => new Date().toISOString(),
  recheck,
  onInterrupt,
  onReport,
  onTankNow,
}: FillAppProps) {
  const [state, current, setState] = useLatestState(initial);
  const check = useRecheckAtEnd(state.phase, recheck, onReport);
  const ended = state.phase === 'done' || state.phase === 'ended';
  const tankNow = ended ? endNotesOf(state).join('\n') : '';
  useEffect(() => {
    if (tankNow) onTankNow?.(tankNow);
  }, [tankNow, onTankNow]);
  const app = useApp();
  // the ? page of a fill screen (its findings and message whole): the part shown, or undefined
  // (a ref beside the state: a key may come before the handler of the latest render is attached)
  const [whole, setWholeState] = useState<number>();
  const wholeRef = useRef<number | undefined>(undefined);
  const { stdout } = useStdout();
  const rows = stdout?.rows || 24;
  const columns = stdout?.columns || 80;
  const fitted = useFitted(state, rows, columns);
  // whether the screen shown cut its message (? shows it whole), for a key read before the next render
  const cutRef = useRef(false);
  cutRef.current = fitted.cut;
  const setWhole = (k: number | undefined) => {
    wholeRef.current = k;
    setWholeState(k);
  };
  useInput((input, key) => {
    if (key.ctrl && input === 'c') {
      onInterrupt?.(interruptNote(current()));
      app.exit();
      return;
    }
    // another Ctrl key (Ctrl-U, Ctrl-A...) is no text: ink hands over its letter, which must not be typed
    if (key.ctrl) return;
    const part = wholeRef.current;
    if (part !== undefined) {
      if (input === 'n') setWhole(part + 1);
      else if (input === 'p') setWhole(Math.max(0, part - 1));
      else if (input === 'b' || input === '?' || key.escape || key.return) setWhole(undefined);
      return;
    }
    const cur = current();
    // ? on a fill screen with nothing typed: no reading starts with it
    if (
      input === '?' &&
      (cur.phase === 'reminder' || (cur.phase === 'reading' && cur.field === 'reading' && cur.input === ''))
    ) {
      setWhole(0);
      return;
    }
    // ? on a review or below-band screen whose message is cut, nothing typed: no choice starts with it
    if (input === '?' && FITTED.has(cur.phase) && cur.input === '' && cutRef.current) {
      setWhole(0);
      return;
    }
    const ph = current().phase;
    if ((ph === 'done' || ph === 'ended') && (input === 'q' || key.return || key.escape)) {
      app.exit();
      return;
    }
    setState(applyActions(current(), toActions(input, key, now()), write, logFile));
  });
  if (whole !== undefined && (state.phase === 'reading' || state.phase === 'reminder'))
    return <WholeTextPage state={state} part={whole} />;
  if (whole !== undefined && FITTED.has(state.phase))
    return <MessageWholePage state={state} part={whole} rows={rows} columns={columns} />;
  return (
    <Box ref={fitted.ref} flexDirection="column">
      <FillScreen state={fitted.state} check={check} recheck={recheck !== undefined} logFile={logFile} />
    </Box>
  );
}

/** texts as the rows a whole-text page shows (a page part holds whole lines: a long text spans parts) */
const rowLines = (texts: readonly string[], columns: number) =>
  texts.flatMap((t) => wrapLine(t, columns - 2));

/** the screens that show the message among their other text: measured, the message cut to fit (useFitted) */
const FITTED: ReadonlySet<FillState['phase']> = new Set(['review', 'below']);

/**
 * a review or below-band screen as it fits `rows` rows: whole where it fits; else (its height measured once
 * drawn) its message cut to the rows left, at least one, saying "(?: whole text)" (`cut`: ? shows it whole)
 */
function useFitted(state: FillState, rows: number, columns: number) {
  const ref = useRef<DOMElement>(null);
  // the rows the message is cut to, for that message (a new message starts whole)
  const [keep, setKeep] = useState<{ readonly message: string; readonly rows: number }>();
  const message = state.message;
  const fitting = FITTED.has(state.phase) && message !== undefined;
  const kept = fitting && keep?.message === message ? keep.rows : undefined;
  const shown =
    kept !== undefined ? { ...state, message: cutToRows(message!, kept, columns, '(?: whole text)') } : state;
  useEffect(() => {
    if (!fitting || !ref.current) return;
    const over = measureElement(ref.current).height - rows;
    const now = kept ?? wrapRows(message!, columns);
    if (over > 0 && now > 1) setKeep({ message: message!, rows: Math.max(1, now - over) });
  });
  return { ref, state: shown, cut: shown !== state };
}

/** the ? page of a review or below-band screen: its message whole, and a review's hazards in full words */
function MessageWholePage({
  state,
  part,
  rows,
  columns,
}: ScreenProps & { readonly part: number; readonly rows: number; readonly columns: number }) {
  const hazards = (state.phase === 'review' ? state.review?.hazards : undefined) ?? [];
  const lines = [
    ...(state.message ? [state.message] : []),
    ...hazards.map(
      (h) =>
        `- ${h.severity.toUpperCase()} ${h.code}${h.step ? ` (fill ${h.step})` : ''}: ` +
        `${h.numbers ? `${h.numbers}. ` : ''}${h.text}`,
    ),
  ];
  const what = state.phase === 'review' ? 'SAFETY REVIEW: THE WHOLE TEXT' : 'BELOW ITS BAND: THE WHOLE TEXT';
  return (
    <PartsPage
      title={`${fillTitle(state.setup.header)} - ${what}`}
      lines={rowLines(lines, columns)}
      part={part}
      rows={rows}
      columns={columns}
      back="b or ?: back   Ctrl-C: stop"
    />
  );
}

/** once the fill is done or ended: `check`'s own re-check of the log, for the end screen */
function useRecheckAtEnd(
  phase: FillState['phase'],
  recheck: FillAppProps['recheck'],
  onReport: FillAppProps['onReport'],
): Recheck {
  const [check, setCheck] = useState<Recheck>();
  useEffect(() => {
    if ((phase !== 'done' && phase !== 'ended') || !recheck) return;
    let live = true;
    recheck().then(
      (r) => {
        if (!live) return;
        onReport?.(r.report);
        setCheck(r);
      },
      (e: unknown) => live && setCheck({ error: (e as Error).message }),
    );
    return () => {
      live = false;
    };
  }, [phase, recheck, onReport]);
  return check;
}

/**
 * the actions of one input chunk, each through the reducer, its log events written (fsync'd) before
 * the next: a write that fails leaves the state before the action, with the error and "NOT recorded"
 * (a failed closing line keeps the logged readings and says so); the rest of the chunk is dropped
 */
export function applyActions(
  start: FillState,
  actions: readonly FillAction[],
  write: FillAppProps['write'],
  logFile: string,
): FillState {
  let s = start;
  for (const a of actions) {
    let next = fillReducer(s, a);
    const lines: { step: number; line: number }[] = [];
    let failed: string | undefined;
    let failedKind: string | undefined;
    for (const e of next.effects) {
      try {
        const w = write(e);
        if (w && (e.kind === 'reading' || e.kind === 'correction'))
          lines.push({ step: e.step, line: w.line });
      } catch (err) {
        failed = failureText(err);
        failedKind = e.kind;
        break;
      }
    }
    if (failed !== undefined && failedKind !== 'close')
      return {
        ...s,
        error: `could not write the log ${logFile}: ${failed}; the ${failedKind} was NOT recorded`,
      };
    for (const l of lines) next = fillReducer(next, { type: 'logged', ...l });
    s =
      failed !== undefined
        ? {
            ...next,
            error:
              `the readings are logged, but the closing line could not be written to ` +
              `${logFile}: ${failed}`,
          }
        : next;
  }
  return s;
}

/**
 * why a write failed, in words: a problem (recognised by shape: the log writer may come from
 * another bundle's copy of the core) is worded by describeProblem, not shown as its bare code
 */
function failureText(err: unknown): string {
  const p = (err as { problem?: Problem })?.problem;
  if (p && typeof p === 'object' && typeof p.code === 'string') return describeProblem(p);
  return (err as Error)?.message ?? String(err);
}

interface ScreenProps {
  readonly state: FillState;
}

/** the screen of the fill's phase */
function FillScreen({
  state,
  check,
  recheck,
  logFile,
}: ScreenProps & { check: Recheck; recheck: boolean; logFile: string }) {
  switch (state.phase) {
    case 'operator':
      return <OperatorScreen state={state} />;
    case 'barometer':
      return <BarometerScreen state={state} />;
    case 'acknowledge':
      return <AcknowledgeScreen state={state} />;
    case 'done':
    case 'ended':
      return <EndScreen state={state} check={check} recheck={recheck} logFile={logFile} />;
    case 'below':
      return <BelowScreen state={state} />;
  }
  if (state.phase === 'start' && state.start) return <StartScreen state={state} />;
  if (state.phase === 'correct' && state.correcting) return <CorrectScreen state={state} />;
  if (state.phase === 'reminder') return <ReminderScreen state={state} />;
  if (state.phase === 'review' && state.review) return <RemainderReviewScreen state={state} />;
  if (state.phase === 'confirm' && state.pending) return <ConfirmScreen state={state} />;
  if (state.phase === 'unit-check' && state.pending) return <UnitCheckScreen state={state} />;
  if (state.phase === 'over-limit' && state.pending && state.overLimit)
    return <OverLimitScreen state={state} />;
  if (state.phase === 'vented' && state.venting) return <VentedScreen state={state} />;
  if (state.phase === 'capped' && state.capped) return <CappedScreen state={state} />;
  if (state.phase === 'undo-reason' && state.undoing) return <UndoReasonScreen state={state} />;
  if (state.phase === 'over-range' && state.overRange) return <OverRangeScreen state={state} />;
  if (state.phase === 'premix' && state.setup.premixCheck) return <PremixScreen state={state} />;
  return <ReadingScreen state={state} />;
}

function Prompt({ state }: ScreenProps) {
  return (
    <Text>
      &gt; {state.input}
      <Text inverse> </Text>
    </Text>
  );
}

/**
 * a fill's band as shown on its gauge, rounded inward, with the unit; where no two display steps fit in
 * it, its half-width finer than the display step and the one reading inside it, as the sheet says it
 */
function bandText(step: FillStep, centerPa: number, unit: PressureUnit, dec: number): string {
  const inward = inwardBand(centerPa, step.bandPa, unit, dec);
  return bandWords(inward, step.bandPa, step.gauge?.resolutionPa ?? 0, unit, dec, ` ${unit}`);
}

/**
 * where no value the gauge displays lies inside a fill's band: said before the reading, with the nearest
 * displayed value and on which side of the band it reads (never a stop the gauge cannot show as inside)
 */
function noneInsideText(state: FillState, step: FillStep, targetPa: number) {
  const words = noneInsideOnGauge(state, step, targetPa);
  return words ? `! ${words}` : undefined;
}

function ErrorLine({ state }: ScreenProps) {
  return state.error ? <Para>! {state.error}</Para> : null;
}

/** the current step's unit, decimals and how a pressure is shown on its gauge */
function stepView(state: FillState) {
  const step = state.setup.steps[state.current];
  const unit = unitOf(step);
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const onGauge = (absPa: number) => `${fromPa(shownPa(state, step, absPa), unit).toFixed(dec)} ${unit}`;
  const absText = (pa: number) => `${fromPa(pa, unit).toFixed(dec)} ${unit} absolute`;
  return { step, unit, dec, onGauge, absText };
}

/**
 * a screen that asks for a typed entry: its title (the batch, then what the screen is), its body, then the
 * prompt and the refusal of the last entry, if any (the frame of every such screen)
 */
function AskScreen({
  state,
  what,
  children,
}: ScreenProps & { readonly what: string; readonly children: ReactNode }) {
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(state.setup.header)} what={what} />
      {children}
      <Prompt state={state} />
      <ErrorLine state={state} />
    </Box>
  );
}

function BarometerScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const gauges = [
    ...new Set(state.setup.steps.filter((s) => s.gauge?.reference === 'gauge').map((s) => s.gauge!.id)),
  ];
  return (
    <AskScreen state={state} what="barometric pressure today">
      <Para>
        {gauges.join(', ')} read{gauges.length === 1 ? 's' : ''} above ambient (gauge-referenced): the tank
        pressure is that reading plus today&apos;s barometric pressure. The plan assumed{' '}
        {fromPa(h.barometer.pressure_Pa, 'Torr').toFixed(1)} Torr.
      </Para>
      <Para>
        Type today&apos;s barometric pressure with its unit, then your initials (e.g. 752.3 Torr AB or 1003.1
        hPa AB), then Enter. It is logged.
      </Para>
    </AskScreen>
  );
}

function AcknowledgeScreen({ state }: ScreenProps) {
  return (
    <AskScreen state={state} what="DANGER findings stand">
      {state.setup.dangers.map((d, i) => (
        <Para key={i}>
          - {d.code}
          {d.step ? ` (fill ${d.step})` : ''}: {d.message}
        </Para>
      ))}
      <Text> </Text>
      <Para>
        The fill goes on only after you acknowledge these in words; the acknowledgement is logged. Type:
        accept INITIALS, then Enter. Ctrl-C stops.
      </Para>
    </AskScreen>
  );
}

/** a text cut at a word to what fits `rows` rows wrapped at `columns` (wrapRows), `more` saying where the rest is */
function cutToRows(text: string, rows: number, columns: number, more: string): string {
  if (wrapRows(text, columns) <= rows) return text;
  let keep = text.length;
  let out = text;
  while (keep > 10) {
    const at = text.lastIndexOf(' ', keep - 1);
    keep = at > 10 ? at : 10;
    out = `${text.slice(0, keep)} ... ${more}`;
    if (wrapRows(out, columns) <= rows) return out;
  }
  return out;
}

/** rows a text takes on a screen this wide (ink wraps at words: a margin for the ragged right edge) */
export function rowsOf(text: string, columns: number): number {
  const w = Math.max(20, columns - 8);
  return text.split('\n').reduce((n, l) => n + Math.max(1, Math.ceil(l.length / w)), 0);
}

/**
 * rows a text takes wrapped at words to `width` columns, as ink wraps it (a word longer than the row is
 * broken): exact where rowsOf keeps a margin, for a screen that measures its rows to fill them
 */
export function wrapRows(text: string, width: number): number {
  const w = Math.max(10, width);
  return text.split('\n').reduce((n, line) => {
    let rows = 1;
    let used = 0;
    for (const word of line.split(' ')) {
      const len = word.length;
      if (used === 0) used = len;
      else if (used + 1 + len <= w) used += 1 + len;
      else {
        rows++;
        used = len;
      }
      while (used > w) {
        rows++;
        used -= w;
      }
    }
    return n + rows;
  }, 0);
}

/** the first rows of a long text, cut at a word, for the end screen's first page; `more` says where the rest is */
function cut(text: string, rows: number, columns: number, more = '(m: the whole message)'): string {
  const room = rows * Math.max(20, columns - 8);
  if (text.length <= room) return text;
  const keep = Math.max(10, room - more.length - 6);
  const at = text.lastIndexOf(' ', keep);
  return `${text.slice(0, at > 0 ? at : keep)} ... ${more}`;
}

/**
 * a caution said shorter: its long asides in parentheses (more than 24 characters: an explanation, never
 * the hazard's name or its fill) left out; the whole is on the end screen's cautions page (c)
 */
export function withoutAsides(text: string): string {
  let out = text;
  for (let prev = ''; prev !== out;) {
    prev = out;
    out = out.replace(/ \(([^()]*)\)/g, (whole, inner: string) => (inner.length > 24 ? '' : whole));
  }
  return out;
}

/**
 * the cautions beside the verdict (check's caveats) in the rows the first page has for them: whole where
 * they fit; else each without its long asides; else each cut to an equal share of the rows. Every
 * caution keeps its first words (what it is: DANGER, ACCEPTED HAZARD...); `cut` says c shows them whole.
 */
export function cautionRows(caveats: readonly string[], room: number, columns: number) {
  const rowsAll = (xs: readonly string[]) => xs.reduce((n, c) => n + rowsOf(`! ${c}`, columns), 0);
  if (rowsAll(caveats) <= room) return { lines: [...caveats], cut: false };
  const short = caveats.map(withoutAsides);
  if (rowsAll(short) <= room) return { lines: short, cut: true };
  // the rows shared out, the shorter cautions taking any rows left over (nearer whole)
  const n = Math.max(1, caveats.length);
  const byLength = short.map((c, i) => [c.length, i]).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const extra = new Set(byLength.slice(0, Math.max(0, room) % n).map(([, i]) => i));
  const each = (i: number) => Math.max(1, Math.floor(room / n) + (extra.has(i) ? 1 : 0));
  return { lines: short.map((c, i) => elide(c, each(i), columns - 2)), cut: true };
}

/**
 * a caution in `rows` rows: its first words (what it is, what was found) and its last (what to do),
 * joined by "...", cut at words; c shows it whole
 */
function elide(text: string, rows: number, columns: number): string {
  const more = ' (c: in full)';
  const room = rows * Math.max(20, columns - 8) - more.length - 5;
  if (text.length + more.length <= rows * Math.max(20, columns - 8)) return text;
  const headAt = text.lastIndexOf(' ', Math.ceil(room * 0.45));
  const head = text.slice(0, headAt > 0 ? headAt : Math.ceil(room * 0.45));
  const tailAt = text.indexOf(' ', text.length - (room - head.length));
  const tail = tailAt > head.length ? text.slice(tailAt + 1) : '';
  return `${head} ...${tail ? ` ${tail}` : ''}${more}`;
}

/**
 * The end screen fits the terminal (80 x 24 included): its first page gives the title, what happened
 * (a long message cut, m shows it whole), check's verdict and caveats, the stage's lines (the premix
 * as filled and the stage-2 command), the log and the commands to run next, and the tank label when
 * there is room; else the label is its own page (l). b goes back, q or Enter quits.
 */
/**
 * the notes under the end screen's verdict: check's caveats, and each premix drawn before its least
 * mixing time (the verdict's PREMIX DRAWN EARLY) in check's own words: how long after the premix log
 * closed, of the least mixing time asked, confirmed by whom (premixCheckText)
 */
export function endNotes(report: CheckReport | undefined): string[] {
  if (!report) return [];
  const early = (report.premixChecks ?? []).filter((c) => c.kind === 'mixed' && c.early);
  return [
    ...report.caveats,
    // the note typed with it is the log's (check prints it): the end screen keeps to what stands
    ...early.map((c) => `PREMIX DRAWN EARLY: ${premixCheckText({ ...c, note: undefined }, premixPressure)}`),
  ];
}

/** the end screen's verdict line: check's verdict, and the notes (endNotes) that follow it */
export function verdictLine(report: CheckReport | undefined): string | undefined {
  if (!report) return undefined;
  // check's word points below for each finding it names: the notes below are one place, said once, and
  // only where there are notes below
  const word = verdictWord(report);
  const bare = word.replace(/ \(see below\)/g, '');
  const refer = endNotes(report).length > 0;
  return `Re-check of the log (mixwright check): ${bare}${refer ? ' (see the notes below)' : ''}`;
}

/**
 * what the end screen's title says of a finished batch: how the last fill ended against its target (as
 * computed from the readings, fillEnding); "all fills logged" only where every fill reached its band
 */
export function endWords(s: FillState, record: EndRecord = {}): string {
  const K = s.setup.steps.length;
  const e = fillEnding(s);
  const withdrawn = withdrawnOverLimit(record.report);
  if (!e) return `${withdrawn ? `${withdrawn}; ` : ''}STOPPED after fill ${s.done.length} of ${K}`;
  const vs = `${e.reached} (target ${e.target})`;
  const head = {
    within: `all ${K} fills logged`,
    above: `fill ${e.step} of ${K} ABOVE ITS BAND: ${vs}`,
    'over-limit': `fill ${e.step} of ${K} KEPT ABOVE THE WORKING LIMIT: ${vs}`,
    below: `CLOSED BELOW THE LAST TARGET: fill ${e.step} of ${K} at ${vs}`,
    vented: `CLOSED AFTER VENTING: fill ${e.step} of ${K} read ${vs}`,
  }[e.kind];
  // the fills before the last read outside their band, below (gone on from) and above, from the readings
  const listed = (xs: readonly number[], how: string) =>
    xs.length
      ? `; fill${xs.length > 1 ? 's' : ''} ${xs.join(', ')} ${how} ${xs.length > 1 ? 'their' : 'its'} band`
      : '';
  const outside = listed(e.short, 'left BELOW') + listed(e.over, 'read ABOVE');
  // "all N fills logged" only where every fill was read within its band
  const lead = e.kind === 'within' && outside ? `${K} fills logged, the last within its band` : head;
  if (withdrawn) return `${withdrawn}; ${lead}${outside}`;
  if (e.kind !== 'within' || outside) return lead + outside;
  // "each within its band" only once the re-check has found no withdrawn reading past the limit; each band
  // is its own fill's, so readings inside every band may still be no pass: then said in the same breath
  if (record.pending) return `${head} (the re-check of the log follows)`;
  const notPass = record.report && overallVerdict(record.report) !== 'pass';
  return `${head}, each within its band${notPass ? '; not a pass (below)' : ''}`;
}

/** what the end screen's title is told of the re-check: its report, or that it is still running */
export interface EndRecord {
  readonly report?: CheckReport;
  readonly pending?: boolean;
}

/**
 * the caution of check's caveat "A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn"
 * (check-shared verdictCaveats: an above-working-limit finding replaced, not a reading after venting read
 * again), in the title's words: the end screen's title never reassures while it stands
 */
export function withdrawnOverLimit(report: CheckReport | undefined): string | undefined {
  const over = (report?.findings ?? []).filter(
    (f): f is Extract<CheckReport['findings'][number], { code: 'above-working-limit' }> =>
      f.code === 'above-working-limit' && f.replaced && !f.ventedAgain,
  );
  if (!over.length) return undefined;
  // the numbers as check's caveat gives them (6 significant digits, trailing zeros dropped)
  const shown = (pa: number, unit: PressureUnit) => `${Number(fromPa(pa, unit).toPrecision(6))} ${unit}`;
  const at = over
    .map(
      (f) => `fill ${f.step ?? '?'}: ${shown(f.pressurePa, f.unit)} vs the limit ${shown(f.limitPa, f.unit)}`,
    )
    .join('; ');
  return (
    `A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn (${at}): ` +
    `the tank may have been above its limit`
  );
}

/** what the end screen's first page shows (endLayout) */
interface EndParts {
  readonly title: string;
  readonly above?: string;
  readonly verdict?: string;
  readonly caveats: readonly string[];
  readonly stage: readonly string[];
  readonly logLine: string;
  readonly message?: string;
  readonly label?: readonly string[];
}

/**
 * the end screen's first page in `rows` x `columns`: the title, the tank above its limit, the verdict, the
 * stage lines, the log line and the keys are whole; every caution is there (cautionRows: shortened or cut
 * where they do not fit whole, c shows them whole); the message takes the rows left, at least 2 (m:
 * whole); the label only where all of it fits (l: its own page)
 */
export function endLayout(p: EndParts, rows: number, columns: number) {
  const keyRow = 1;
  const others =
    rowsOf(p.title, columns) +
    (p.above ? rowsOf(p.above, columns) : 0) +
    1 +
    (p.verdict ? rowsOf(p.verdict, columns) : 1) +
    (p.stage.length ? 1 + p.stage.reduce((n, l) => n + rowsOf(l, columns), 0) : 0) +
    rowsOf(p.logLine, columns) +
    keyRow;
  const messageMin = p.message ? Math.min(2, rowsOf(p.message, columns)) : 0;
  const cautions = cautionRows(p.caveats, rows - 1 - others - messageMin, columns);
  const cautionsRows = cautions.lines.reduce((n, c) => n + rowsOf(`! ${c}`, columns), 0);
  // the message: whole where the rows left hold it, else cut to them, at least 2 (m: whole); the label
  // comes after it, only where it fits whole
  const message = p.message
    ? cut(p.message, Math.max(2, rows - 1 - others - cautionsRows), columns)
    : undefined;
  const fixed = others + cautionsRows + (message ? rowsOf(message, columns) : 0);
  const labelRows = p.label ? 3 + p.label.reduce((n, l) => n + rowsOf(l, columns - 4), 0) : 0;
  const labelHere = Boolean(p.label) && fixed + labelRows <= rows - 1;
  const messageCut = Boolean(p.message) && message !== p.message;
  // ? shows what the page cut, whole (as on the other screens): both, or the one cut
  const cutKeys =
    cautions.cut && messageCut
      ? ['?: the whole text (c: cautions, m: message)']
      : cautions.cut
        ? ['c or ?: cautions in full']
        : messageCut
          ? ['m or ?: the whole message']
          : [];
  const keys = [...(p.label && !labelHere ? ['l: the tank label'] : []), ...cutKeys, 'q or Enter: quit'].join(
    '  ',
  );
  return { message, cautions, labelHere, keys };
}

/**
 * the end screen's pages: l the label, c the cautions, m the message, ? what the first page cut, whole; b back;
 * n and p page through a long one
 */
function useEndKeys() {
  const [page, setPage] = useState<'main' | 'label' | 'message' | 'cautions' | 'whole'>('main');
  // the page is chosen whatever this render's closure holds (a key may come before the handler of the
  // latest render is attached); a page without its content shows the first page
  const [labelPart, setLabelPart] = useState(0);
  useInput((input) => {
    if (input === 'l') {
      setPage('label');
      setLabelPart(0);
    } else if (input === 'c') {
      setPage('cautions');
      setLabelPart(0);
    } else if (input === 'm') setPage('message');
    else if (input === '?') {
      // ? as on the other screens: the text the first page cut (the message, the cautions), whole
      setPage('whole');
      setLabelPart(0);
    } else if (input === 'b') setPage('main');
    else if (input === 'n') setLabelPart((k) => k + 1);
    else if (input === 'p') setLabelPart((k) => Math.max(0, k - 1));
  });
  return { page, labelPart };
}

function EndScreen({
  state,
  check,
  recheck,
  logFile,
}: ScreenProps & { check: Recheck; recheck: boolean; logFile: string }) {
  const h = state.setup.header;
  const K = state.setup.steps.length;
  const { stdout } = useStdout();
  const rows = stdout?.rows || 24;
  const columns = stdout?.columns || 80;
  // the label's lines wrapped to the box's inside (its edges and padding: 4 columns), so ink never re-wraps them
  const model = check && 'report' in check ? labelModel(check.report, check.log) : undefined;
  const label = model ? labelLines(model, Math.max(20, columns - 4)) : undefined;
  // what stands beside the verdict (a danger in the record, an edited record): beside it and on the label
  const report = check && 'report' in check ? check.report : undefined;
  const caveats = endNotes(report);
  const stage = h.stage ? stageEndLines(h, report, state.phase === 'done') : [];
  const { page, labelPart } = useEndKeys();
  const withdrawn = withdrawnOverLimit(report);
  const title = `${fillTitle(h)} - ${
    state.phase === 'done'
      ? endWords(state, { report, pending: recheck && !check })
      : `${withdrawn ? `${withdrawn}; ` : ''}STOPPED after fill ${state.current} of ${K}`
  }`;
  const verdict = verdictLine(report);
  const logLine = `The log's full budget: \`mixwright check ${logFile}\``;
  // the tank above its working limit (a reading there accepted): said whole, whatever the message
  const above = state.aboveLimitText ? `! ${state.aboveLimitText}` : undefined;
  const lay = endLayout(
    { title, above, verdict, caveats, stage, logLine, message: state.message, label },
    rows,
    columns,
  );
  const { message, cautions, labelHere, keys } = lay;
  if (page === 'label' && label)
    // the label's own lines carry check's caveats already (once): none is added to the box
    return (
      <PartsPage title={title} lines={label} part={labelPart} rows={rows} columns={columns} box={caveats} />
    );
  if (page === 'cautions' && cautions.cut)
    return (
      <PartsPage
        title={title}
        lines={caveats.map((c) => `! ${c}`)}
        part={labelPart}
        rows={rows}
        columns={columns}
      />
    );
  const messageCut = Boolean(state.message) && message !== state.message;
  if (page === 'whole' && (cautions.cut || messageCut))
    return (
      <PartsPage
        title={title}
        lines={rowLines(
          [...(messageCut ? [state.message!] : []), ...(cautions.cut ? caveats.map((c) => `! ${c}`) : [])],
          columns,
        )}
        part={labelPart}
        rows={rows}
        columns={columns}
      />
    );
  if (page === 'message' && state.message)
    return (
      <Box flexDirection="column">
        <Text bold>{title}</Text>
        <Para>{state.message}</Para>
        <Text>b: back q or Enter: quit</Text>
      </Box>
    );
  return (
    <Box flexDirection="column">
      <Para bold>{title}</Para>
      {message ? <Para>{message}</Para> : null}
      {above ? <Para bold>{above}</Para> : null}
      <Text> </Text>
      {state.judgement && !label ? <JudgementView j={state.judgement} /> : null}
      {recheck && !check ? <Text>Re-checking the log as `mixwright check` does...</Text> : null}
      {check && 'error' in check ? (
        <Para>
          ! the re-check of the log failed: {check.error}; run `mixwright check {logFile}`
        </Para>
      ) : null}
      {verdict ? <Para bold>{verdict}</Para> : null}
      {cautions.lines.map((c, i) => (
        <Para key={i} bold>
          ! {c}
        </Para>
      ))}
      {label && labelHere ? <LabelBox caveats={[]} label={label} double={caveats.length > 0} /> : null}
      {/* two-stage preparation: the premix's re-check, mixing time and stage-2 command (stage-view.tsx) */}
      {h.stage ? <StageEnd header={h} report={report} closed={state.phase === 'done'} /> : null}
      <Para>{logLine}</Para>
      <Text>{keys}</Text>
    </Box>
  );
}

/**
 * a page of the end screen taller than the terminal, shown in parts (n, p), each within its rows: the
 * tank label (in its box, double-edged where check's caveats stand beside the verdict) or the cautions
 */
function PartsPage({
  title,
  lines,
  part,
  rows,
  columns,
  box,
  back,
}: {
  readonly title: string;
  readonly lines: readonly string[];
  readonly part: number;
  readonly rows: number;
  readonly columns: number;
  readonly box?: readonly string[];
  /** the keys that leave the page (the end screen's by default) */
  readonly back?: string;
}) {
  const parts = labelParts([], lines, rows - (box ? 5 : 2) - rowsOf(title, columns), columns - (box ? 4 : 0));
  const k = Math.min(part, parts.length - 1);
  const more = parts.length > 1 ? `part ${k + 1} of ${parts.length}   n: next part   p: previous   ` : '';
  return (
    <Box flexDirection="column">
      <Para bold>{title}</Para>
      {box ? (
        <LabelBox caveats={parts[k].caveats} label={parts[k].label} double={box.length > 0} />
      ) : (
        parts[k].label.map((c, i) => (
          <Para key={i} bold>
            {c}
          </Para>
        ))
      )}
      <Text>{`${more}${back ?? 'b: back   q or Enter: quit'}`}</Text>
    </Box>
  );
}

/** the label's lines (caveats first) in parts that each fit `room` rows, none split */
function labelParts(
  caveats: readonly string[],
  label: readonly string[],
  room: number,
  columns: number,
): { caveats: string[]; label: string[] }[] {
  const parts: { caveats: string[]; label: string[]; rows: number }[] = [{ caveats: [], label: [], rows: 0 }];
  const add = (line: string, kind: 'caveats' | 'label') => {
    const r = rowsOf(line, columns);
    let last = parts[parts.length - 1];
    if (last.rows + r > Math.max(4, room) && last.rows > 0) {
      last = { caveats: [], label: [], rows: 0 };
      parts.push(last);
    }
    last[kind].push(line);
    last.rows += r;
  };
  caveats.forEach((c) => add(c, 'caveats'));
  label.forEach((l) => add(l, 'label'));
  return parts;
}

function LabelBox({
  caveats,
  label,
  double,
}: {
  caveats: readonly string[];
  label: readonly string[];
  double?: boolean;
}) {
  return (
    <Box
      flexDirection="column"
      borderStyle={(double ?? caveats.length > 0) ? 'double' : 'single'}
      paddingX={1}
    >
      <Text bold>Tank label (as filled, from the readings)</Text>
      {caveats.map((c, i) => (
        <Para key={`c${i}`} bold>
          {c}
        </Para>
      ))}
      {label.map((l, i) => (
        <Para key={i}>{l}</Para>
      ))}
    </Box>
  );
}

function BelowScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const K = state.setup.steps.length;
  // the fill read below its band: the last one read (the last fill, or one before it: incomplete)
  const m = state.done.length;
  const ls = state.setup.steps[m - 1];
  const lastFill = m >= K;
  const lu = unitOf(ls);
  const ld = ls.gauge ? decimalsFor(fromPa(ls.gauge.resolutionPa, lu)) : 3;
  const t = state.targetsPa[m - 1];
  const st = shownPa(state, ls, t);
  const stop = `${fromPa(st, lu).toFixed(ld)}`;
  const noneInside = noneInsideText(state, ls, t);
  // no value the gauge shows is inside the band: no reading to stop at, and continuing cannot complete it
  const cannot = noneInside
    ? `cannot complete this fill: no value ${ls.gauge?.id ?? 'the gauge'} shows is inside its band, so a ` +
      'further reading (more gas) is logged outside it too'
    : undefined;
  return (
    <Box flexDirection="column">
      <ScreenTitle
        base={fillTitle(h)}
        what={`fill ${m} of ${K}${chargeSuffixOf(ls)}: ${lastFill ? 'BELOW THE TARGET' : 'BELOW ITS BAND'}`}
      />
      {/* a refusal stands in for the message (the box keeps the target and the reading): 24 rows */}
      {state.error ? null : <Para>{state.message ?? ' '}</Para>}
      <Box borderStyle="single" paddingX={2} flexDirection="column">
        <Text bold>
          {noneInside
            ? `TARGET ${fromPa(st, lu).toFixed(ld + 2)} ${lu} (no stop to read)`
            : `STOP AT ${stop} ${lu}`}
        </Text>
        <Text>
          band {bandText(ls, st, lu, ld)} on {ls.gauge?.id ?? 'the gauge'}; logged now:{' '}
          {state.done[m - 1]?.text}
        </Text>
        {noneInside ? <Text bold>{noneInside}</Text> : null}
      </Box>
      {lastFill && state.judgement ? <JudgementView j={state.judgement} compact /> : null}
      {lastFill ? (
        <LastWaysView state={state} stop={`${stop} ${lu}`} cannot={cannot} />
      ) : (
        <BelowWaysView state={state} stop={`${stop} ${lu}`} cannot={cannot} />
      )}
      <ReadingFields
        state={state}
        reading={`new reading [${lu}] and initials`}
        temperature="tank temperature"
      />
      <ErrorLine state={state} />
      <Text>
        Enter: log Tab: temp Ctrl-C: stop ({lastFill ? 'the batch stays open; resume it' : 'readings kept'})
      </Text>
    </Box>
  );
}

/** who fills in this session: initials once, then on every reading the session logs */
function OperatorScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(h)} what="who fills" />
      {state.message ? <Para>{state.message}</Para> : null}
      <Text> </Text>
      <Para>
        Type your initials (e.g. AB). Every reading of this session is logged with them, so the record says
        who read the tank; a resumed fill asks again. Decisions (undo, fix, accept, vent...) still take the
        initials of whoever makes them.
      </Para>
      <Text>
        &gt; initials: {state.input}
        <Text inverse> </Text>
      </Text>
      <ErrorLine state={state} />
      <Text>Enter: go on Ctrl-C: stop (nothing logged)</Text>
    </Box>
  );
}

/**
 * a review's hazards on a way on, in words: never "safe", only what it found or that it found nothing new.
 * The hazards accepted at an earlier review that it finds again (acc) are named: "nothing new" is said only
 * against what was computed, never over an accepted danger that stands.
 */
const passes = (xs: readonly string[], acc: readonly string[] = []) => {
  const accepted = acc.length ? `the accepted ${acc.join(', ')} (they stand)` : '';
  if (xs.length) return `passes ${xs.join(', ')}${accepted ? ` and ${accepted}` : ''}`;
  return accepted ? `passes ${accepted}, no hazard beyond those` : 'passes no hazard the plan did not have';
};

/**
 * what the reviews of the ways on found (belowBandWays), as the below screens and the capped screen say
 * it: continuing the fill (still passes...), and the tank as it stands now (for a stop or a close)
 */
function waysFound(w: BelowWays | undefined): { readonly still: string; readonly tank: string } {
  const cont = w?.continuing;
  return {
    still: cont
      ? cont.still.length || cont.stillAccepted.length
        ? `still ${passes(cont.still, cont.stillAccepted)}`
        : passes([])
      : 'not reviewed',
    tank: w
      ? w.tankNow.length
        ? `the tank NOW holds ${w.tankNow.join(', ')}`
        : 'no flammable, detonable or danger state in the tank now'
      : 'not reviewed',
  };
}

/** a below screen's ways: the stop to continue to, or why continuing cannot complete the fill */
interface WaysProps {
  readonly stop: string;
  readonly cannot?: string;
}

/**
 * the ways on from an incomplete fill before the last, each with what its review found (belowWays): a way
 * is never called safe here unless its review found nothing the plan did not have
 */
function BelowWaysView({ state, stop, cannot }: ScreenProps & WaysProps) {
  const w = state.belowWays;
  const m = state.done.length;
  const ls = state.setup.steps[m - 1];
  const { still, tank } = waysFound(w);
  const cont = w?.continuing;
  const onNext = w ? [w.goingOn.map(hazardShort), w.goingOnAccepted.map(hazardShort)] : undefined;
  // the same hazards as continuing (both computed): said once, on the continue line
  const same =
    !cannot &&
    cont !== undefined &&
    onNext !== undefined &&
    onNext[0].length + onNext[1].length > 0 &&
    onNext[0].join('\u0000') === cont.still.join('\u0000') &&
    onNext[1].join('\u0000') === cont.stillAccepted.join('\u0000');
  const next = !onNext
    ? 'not reviewed'
    : same
      ? 'passes the same hazards as continue, named above' +
        // "stand" only of a hazard accepted at a review that this review finds again
        (onNext[1].length ? ' (the accepted ones stand)' : '') +
        ', no hazard beyond those'
      : passes(onNext[0], onNext[1]);
  // the re-target from the reading (the targets the screen holds): a final pressure off the design's is said
  const K = state.setup.steps.length;
  const last = state.setup.steps[K - 1];
  const finalPa = state.targetsPa[K - 1];
  const designPa = state.setup.header.final_pressure_Pa;
  const fu = unitOf(last);
  const ends =
    finalPa !== undefined && designPa !== undefined && Math.abs(finalPa - designPa) > last.bandPa
      ? `; the batch ends at ${fromPa(finalPa, fu).toFixed(1)} ${fu} instead of ` +
        `${fromPa(designPa, fu).toFixed(1)} ${fu}`
      : '';
  return (
    <Box flexDirection="column">
      <Text>The ways on, each reviewed (every state and fill path ahead):</Text>
      {cannot ? (
        <Para>- continue: {cannot}</Para>
      ) : (
        <Para>
          - continue: fill on from {ls.source.id} to {stop}, type the new reading and initials (e.g.{' '}
          {stop.split(' ')[0]} AB): {still}
        </Para>
      )}
      <Para>
        - next AB (go on from {state.done[m - 1]?.text}
        {ends}): {next}
      </Para>
      <Para>- stop AB (the cylinder cannot give more: the batch closed here, incomplete): {tank}</Para>
      <UndoFixOptions
        state={state}
        note={`A further reading: a correction of fill ${m} (more gas added; the log keeps both).`}
      />
    </Box>
  );
}

/** undo and fix on a below-band screen, one row each, then the note on further readings (not beside a refusal) */
function UndoFixOptions({ state, note }: ScreenProps & { readonly note: string }) {
  return (
    <Options
      options={[
        ['undo AB', 'withdraw it'],
        ['fix N AB', 'correct fill N'],
      ]}
      // a refusal names the choices again: the note gives it its row
      after={state.error ? undefined : note}
    />
  );
}

/**
 * the ways on from the last fill read below its band, each with what its review found (belowWays): the
 * tank as it stands is reviewed for the close offer, as the stop offer of a fill before the last is
 */
function LastWaysView({ state, stop, cannot }: ScreenProps & WaysProps) {
  const w = state.belowWays;
  const ls = state.setup.steps[state.done.length - 1];
  const { still, tank } = waysFound(w);
  return (
    <Box flexDirection="column">
      <Text>The ways on, each reviewed (the tank as it stands, and the rest of the fill):</Text>
      {cannot ? (
        <Para>- continue: {cannot}</Para>
      ) : (
        <Para>
          - continue: add {ls.species} from {ls.source.id} to {stop}, type the new reading and initials (e.g.{' '}
          {stop.split(' ')[0]} AB): {still}
        </Para>
      )}
      <Para bold={Boolean(w?.tankNow.length)}>
        - close AB (close the batch below the target; the re-check judges it): {tank}
      </Para>
      <UndoFixOptions
        state={state}
        note="A new reading corrects the logged one (more gas added; the log keeps both)."
      />
    </Box>
  );
}

function StartScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const { step, unit, absText } = stepView(state);
  const start = state.start!;
  const comp = Object.entries(start.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => `${k} ${fixedSig(v, 4)}`)
    .join(', ');
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(h)} what="top-up: the gas already in the tank" />
      <Para>
        The plan assumed {absText(start.pressurePa)} of {comp} in {h.tank.id}. Read the tank now, before any
        fill, on {step.gauge?.id ?? 'the gauge'}, and its temperature; the targets are re-computed from what
        you read.
      </Para>
      <ReadingFields
        state={state}
        reading={`tank reading [${unit}] and your initials (e.g. 120.4 AB)`}
        temperature="tank temperature"
      />
      <ErrorLine state={state} />
      <Text>Enter: log the starting pressure Tab: temperature Ctrl-C: stop</Text>
    </Box>
  );
}

function CorrectScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const c = state.correcting!;
  const d = state.done.find((x) => x.step === c.step)!;
  const cs = state.setup.steps[c.step - 1];
  return (
    <Box flexDirection="column">
      <ScreenTitle
        base={fillTitle(h)}
        what={
          `correct the reading of fill ${c.step} (${cs.species}` +
          `${isSplit(cs.charge) ? `, ${chargeWords(cs.charge)}` : ''} on ${cs.gauge?.id ?? 'no gauge'})`
        }
      />
      <Text>
        logged: {d.text} at {(d.temperatureK - 273.15).toFixed(1)} degC; the original stays in the log, the
        correction is added with your initials ({c.by}) and reason
      </Text>
      {c.pending ? (
        <>
          <Text>
            new: {c.pending.done.text} at {(c.pending.done.temperatureK - 273.15).toFixed(1)} degC
          </Text>
          <Text>
            reason: {state.input}
            <Text inverse> </Text>
          </Text>
        </>
      ) : (
        <>
          <ReadingFields
            state={state}
            reading={`right reading [${unitOf(cs)}]`}
            temperature="tank temperature then"
          />
        </>
      )}
      <ErrorLine state={state} />
      <Text>Enter: {c.pending ? 'log the correction' : 'next: the reason'} Esc: cancel (nothing logged)</Text>
    </Box>
  );
}

/**
 * what a finding asks of the operator, short enough for the step screen: its last clause (the advice
 * the message ends with: after its last sentence break, "; " or ": "), at most about two rows; the full
 * text is on the plan, the sheet, the acknowledgement and the reminder screens
 */
export function adviceOf(message: string, max = 120): string {
  // what to do follows the last sentence, clause or dash ("... 2700.22 Torr - lower the pressure ...")
  const cuts = ['. ', '; ', ': ', ' - '].map((sep) => message.lastIndexOf(sep) + sep.length);
  const at = Math.max(...cuts.filter((c) => c > 1 && c < message.length - 8), 0);
  const tail = message.slice(at).replace(/\.$/, '');
  if (tail.length <= max) return tail;
  const cut = tail.lastIndexOf(' ', max - 3);
  return `${tail.slice(0, cut > 0 ? cut : max - 3)}...`;
}

/** a line of a fill screen's findings: its text, and whether it stands out (a danger) */
interface FindingLine {
  readonly text: string;
  readonly bold?: boolean;
}

/**
 * the plan's findings at this fill, every time its screen is shown, one line each: its dangers
 * (accepted at the start; the full text was on that screen and the reminder), those accepted at a
 * review of the remaining fills, and its warnings (compression heating, oxygen compression: throttle the
 * fill...). Notes and findings of no one fill stay on the plan and the sheet. `short` (a crowded screen):
 * each by its name and what to do, in fewer words (the whole text on the ? page)
 */
export function stepFindingLines(state: FillState, short = false): FindingLine[] {
  const index = state.setup.steps[state.current].index;
  // a plan danger the review of the current targets avoids is said so (computed), never as if it stood
  const avoided = avoidedDangers(state, index);
  const plan = state.setup.dangers.filter((d) => d.step === index && !avoided.includes(d.code));
  const review = (state.acceptedHazards ?? []).filter((h) => h.step === index);
  // a plan warning the review of the current targets avoids: said so, as a danger is
  const avoidedW = avoidedWarnings(state, index);
  const warnings = (state.setup.header.findings ?? []).filter(
    (f) => f.severity === 'warning' && f.step === index && !avoidedW.includes(f.code),
  );
  const out: FindingLine[] = [];
  // short: two rows each at 80 columns, the hazard's name and what to do
  const said = (head: string, text: string) => head + adviceOf(text, short ? 150 - head.length : 120);
  for (const d of plan)
    out.push({
      text: said(`DANGER ${d.code} (${short ? '' : 'this fill; '}accepted at the start): `, d.message),
      bold: true,
    });
  if (avoided.length)
    out.push({
      text:
        `the plan's DANGER ${avoided.join(', ')} (this fill; accepted at the start): not reached by the ` +
        `re-targeted fills (the review of the current targets does not find ${avoided.length === 1 ? 'it' : 'them'})`,
    });
  for (const h of review)
    out.push({
      text: short
        ? said(`${h.severity.toUpperCase()} ${h.code} (accepted at a review, logged): `, h.text)
        : `${h.severity.toUpperCase()} ${h.code} (this fill; accepted at the review of the remaining fills, ` +
          `logged): ${h.numbers || h.text}`,
      bold: true,
    });
  for (const f of warnings) {
    // two screen rows at most
    const head = `warning ${f.code} (this fill, the plan): `;
    // a precision warning says what is over the tolerance (its first clause), not its advice
    const body =
      f.code === 'predicted-u-over-tolerance'
        ? f.message.split(':')[0].slice(0, 156 - head.length)
        : adviceOf(f.message, 156 - head.length);
    out.push({ text: head + body });
  }
  if (avoidedW.length)
    out.push({
      text:
        `the plan's warning ${avoidedW.join(', ')} (this fill): not reached by the re-targeted fills (the ` +
        `review of the current targets does not find ${avoidedW.length === 1 ? 'it' : 'them'})`,
    });
  if (plan.length || review.length)
    out.push({ text: 'Go on only with the protection your procedure requires for it.' });
  return out;
}

function FindingLines({ lines }: { readonly lines: readonly FindingLine[] }) {
  if (!lines.length) return null;
  return (
    <Box flexDirection="column">
      {lines.map((l, i) => (
        <Para key={i} bold={l.bold}>
          {l.text}
        </Para>
      ))}
    </Box>
  );
}

/** what a screen of the current fill is, for its title: "fill 2 of 4 (Ar, charge 1 of 2): WORDS" */
function stepWhat(state: FillState, words: string): string {
  const K = state.setup.steps.length;
  return `fill ${state.current + 1} of ${K}${chargeSuffixOf(state.setup.steps[state.current])}: ${words}`;
}

function ReminderScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const { step } = stepView(state);
  const { stdout } = useStdout();
  const rows = stdout?.rows || 24;
  const columns = stdout?.columns || 80;
  // the plan's dangers as the review of the current (re-targeted) targets finds them: reached (its words
  // now), avoided (said, not reminded), or not known (the plan's words)
  const now = state.setup.dangers
    .filter((d) => d.step === step.index)
    .map((d) => ({ d, now: planDangerNow(state, d) }));
  const ds = now.filter((x) => x.now.kind !== 'avoided');
  const avoided = now.filter((x) => x.now.kind === 'avoided').map((x) => x.d.code);
  const rs = (state.acceptedHazards ?? []).filter((h) => h.step === step.index && h.severity === 'danger');
  const intro =
    `This fill (${step.species} from ${step.source.id}) creates the state of the danger finding` +
    (ds.length ? ' accepted at the start:' : ' accepted at the review of the remaining fills (logged):');
  const whole = [
    ...ds.map(
      ({ d, now: n }) =>
        `- ${d.code}${n.kind === 'reached' ? ' (as the review of the current targets finds it)' : ''}: ` +
        (n.kind === 'reached' ? n.text : d.message),
    ),
    ...(avoided.length
      ? [
          `(the plan's ${avoided.join(', ')} at this fill is not reached by the re-targeted fills: the review ` +
            'of the current targets does not find it)',
        ]
      : []),
    ...(rs.length && ds.length
      ? ['and of the danger accepted at the review of the remaining fills (logged):']
      : []),
    ...rs.map((z) => `- ${z.code}: ${z.numbers}. ${z.text}`),
  ];
  // the title, the intro, a spacer, the protection line and the two choices: whole; the dangers whole where
  // they fit, else each by its name and what to do (? shows them whole)
  const fixed = 2 + wrapRows(intro, columns) + 1 + 1 + 2;
  const fits = fixed + whole.reduce((n, l) => n + wrapRows(l, columns), 0) <= rows - 1;
  const lines = fits
    ? whole
    : whole.map((l) => {
        const m = /^- ([a-z0-9-]+)[^:]*: (.*)$/.exec(l);
        return m ? `- ${m[1]}: ${adviceOf(m[2], 150 - m[1].length)}` : l;
      });
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(h)} what={stepWhat(state, 'DANGER AT THIS FILL')} />
      <Para>{intro}</Para>
      {lines.map((l, i) => (
        <Para key={i}>{l}</Para>
      ))}
      <Text> </Text>
      <Para>Go on only with the protection your procedure requires for it.</Para>
      <Options
        options={[
          ['Enter', 'go on to the fill'],
          ['Ctrl-C', `stop (logged readings are kept)${fits ? '' : '   ?: the whole text'}`],
        ]}
      />
    </Box>
  );
}

function ConfirmScreen({ state }: ScreenProps) {
  const pending = state.pending!;
  return (
    <Box flexDirection="column">
      <ScreenTitle base={fillTitle(state.setup.header)} what={stepWhat(state, 'CHECK THIS READING')} />
      <Text>typed: {pending.done.text}</Text>
      <Para>{pending.reason}</Para>
      <Text> </Text>
      <Options
        options={[
          ['y', 'it is right, log it as typed'],
          ['n', 'back to the reading (not logged)'],
        ]}
      />
      <ErrorLine state={state} />
    </Box>
  );
}

/**
 * a value typed past the range of the fill's gauge (logged as typed, not as a reading): read the tank on a
 * gauge that covers it (named), or say it was a typing slip
 */
function OverRangeScreen({ state }: ScreenProps) {
  const o = state.overRange!;
  const tank = state.setup.header.tank.id;
  const example = overRangeExample(state, o);
  return (
    <AskScreen state={state} what={stepWhat(state, `PAST THE RANGE OF ${o.gaugeId}`)}>
      <Para>{o.words}</Para>
      <Text> </Text>
      <Para>
        {o.covering.length
          ? `If ${o.gaugeId} shows over-range, or the value may be real: close ${o.gaugeId}'s valve and read ` +
            `${tank} on a gauge that covers it (${o.covering.join(', ')}), then type the gauge, its reading and ` +
            `your initials (e.g. ${example}): logged as this fill's reading on that gauge, and judged as any ` +
            `reading is.`
          : `No gauge of the lab profile covers it: stop adding gas, close the cylinder and tank valves and ` +
            `ask; the value stays logged, and the batch is not called clean.`}
      </Para>
      <Options
        options={[
          ...(o.covering.length
            ? [['GAUGE VALUE INITIALS', `the tank read on ${o.covering[0]} or another`] as const]
            : []),
          ['slip INITIALS', 'it was a typing slip: type the reading again (logged)'],
        ]}
        after="Ctrl-C leaves: the value typed stays logged, the tank counts as not read."
      />
    </AskScreen>
  );
}

/** a reading typed in another unit than the target's, far from it: log it as typed (initials) or re-type */
function UnitCheckScreen({ state }: ScreenProps) {
  const pending = state.pending!;
  return (
    <AskScreen state={state} what={stepWhat(state, 'CHECK THE UNIT')}>
      <Para>{pending.reason}</Para>
      <Para>
        Nothing is logged yet, and nothing is converted: the reading is logged as typed or not at all.
      </Para>
      <Text> </Text>
      <Options
        options={[
          ['log INITIALS', `it is right, log ${pending.done.text} as typed (with your initials)`],
          ['n or Esc', 're-type it (not logged)'],
        ]}
      />
    </AskScreen>
  );
}

function OverLimitScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const K = state.setup.steps.length;
  const { step, unit, dec, absText } = stepView(state);
  const o = state.overLimit!;
  const pending = state.pending!;
  const p = pending.done.pressurePa;
  return (
    <AskScreen state={state} what={`fill ${state.current + 1} of ${K}: DANGER - ABOVE THE WORKING LIMIT`}>
      <Para>
        The tank reads {absText(p)}, {fromPa(p - o.limitPa, unit).toFixed(dec)} {unit} above the working limit
        of {h.tank.id} ({absText(o.limitPa)}).
      </Para>
      <Para bold>Close the cylinder valve and the tank valve now.</Para>
      <Para>
        The reading is logged ({pending.done.line !== undefined ? `line ${pending.done.line}` : 'as typed'})
        {pending.resumed
          ? '; RESUMED: no choice for it was logged before the fill stopped. What you choose now is logged ' +
            'beside it.'
          : '; what you choose is logged beside it.'}
      </Para>
      <Para>
        Vent or pump back by {fromPa(p - o.ventToPa, unit).toFixed(dec)} {unit}, until{' '}
        {step.gauge?.id ?? 'the gauge'} reads at most {atMostOnGauge(state, step, o.ventToPa)} (the vent
        target {fromPa(o.ventToPa, unit).toPrecision(6)} {unit} absolute, rounded down to what the gauge
        shows): {o.why}.{' '}
        {o.last ? o.after.charAt(0).toUpperCase() + o.after.slice(1) : `From there: ${o.after}`}.
      </Para>
      <Para bold>
        {o.within
          ? 'After venting (venting keeps the composition) the composition is within the tolerance.'
          : `After venting the composition is NOT within the tolerance (${o.outside.join(', ')} ` +
            `outside): venting keeps the composition, it cannot repair it.`}
      </Para>
      <Text> </Text>
      <Options
        options={[
          [
            'vent INITIALS',
            o.last
              ? "you vent back (logged; then read the tank after venting: its reading is the batch's final " +
                'pressure)'
              : 'you vent back (logged; then read the tank after venting; the fill stops there and says how ' +
                'to finish it as a top-up batch: its recipe lines, gases, readings and gauges)',
          ],
          [
            'accept INITIALS',
            'keep the tank as it is, ABOVE its working limit (logged; the re-check reports DANGER)',
          ],
          ['edit INITIALS', 'it was mistyped (withdrawn, with a trace)'],
        ]}
      />
    </AskScreen>
  );
}

/** undo INITIALS typed: the reading to be withdrawn, and a short reason asked (Enter alone skips it) */
function UndoReasonScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const last = state.done[state.done.length - 1];
  return (
    <Box flexDirection="column">
      <ScreenTitle
        base={fillTitle(h)}
        what={`undo the reading of fill ${last.step} (${last.text}, line ${last.line})`}
      />
      <Para>
        {state.undoing!.by} withdraws it: the log keeps the reading and adds the withdrawal with your initials
        and the reason; fill {last.step} is read again.
      </Para>
      <Para>
        Why? A few words (e.g. &quot;misread the head&quot;, &quot;valve left open&quot;), then Enter; Enter
        alone logs it without a reason. Esc: do not undo (nothing logged).
      </Para>
      <Text>
        reason: {state.input}
        <Text inverse> </Text>
      </Text>
      <ErrorLine state={state} />
    </Box>
  );
}

/**
 * the re-target held below the working limit at the cost of the composition: what it costs, the
 * targets it gives, and an explicit choice (go, undo, stop), logged with initials
 */
function CappedScreen({ state }: ScreenProps) {
  const c = state.capped!;
  const K = state.setup.steps.length;
  const ahead = state.setup.steps.slice(state.current).map((st, i) => {
    const u = unitOf(st);
    const dec = st.gauge ? decimalsFor(fromPa(st.gauge.resolutionPa, u)) : 3;
    const t = state.targetsPa[state.current + i];
    const shown = fromPa(shownPa(state, st, t), u).toFixed(dec);
    const last = state.current + i === K - 1;
    const gaugeRef = st.gauge?.reference === 'gauge';
    return (
      `fill ${st.index} ${st.species}: ${shown} ${u} on ${st.gauge?.id ?? 'no gauge'}` +
      (last
        ? gaugeRef
          ? ` (= ${c.finalText} absolute, the capped final pressure)`
          : ' (the capped final pressure)'
        : '')
    );
  });
  // what each choice's review found (fill-review belowBandWays): never called safe unless it found nothing
  const w = c.ways;
  const goFound = w
    ? [
        w.goingOn.length
          ? `the review finds ${w.goingOn.map(hazardShort).join(', ')}, which the plan did not have`
          : w.goingOnAccepted.length
            ? 'the review finds no hazard beyond those accepted'
            : 'the review finds no hazard the plan did not have',
        w.goingOnAccepted.length ? `the accepted ${w.goingOnAccepted.map(hazardShort).join(', ')} stand` : '',
      ]
        .filter(Boolean)
        .join('; ')
    : 'not reviewed';
  const stopFound = waysFound(w).tank;
  return (
    <AskScreen
      state={state}
      what={
        `before fill ${c.step} of ${K}: THE WORKING LIMIT HOLDS THE FINAL PRESSURE` +
        (c.outside.length ? ` - ${c.outside.join(', ')} OUTSIDE THE TOLERANCE` : '')
      }
    >
      {state.message ? <Para>{state.message}</Para> : null}
      <Para bold>{c.cost}.</Para>
      <Para>Capped targets: {ahead.join('; ')}.</Para>
      <Text> </Text>
      <Options
        options={[
          [
            'go INITIALS',
            `fill to the capped targets (the tank ends at ${c.finalText}` +
              `${c.outside.length ? ', OFF THE DESIGN' : ''}): ${goFound}`,
          ],
          ['stop INITIALS', `stop the batch here (incomplete): ${stopFound}`],
          ['undo INITIALS', 'the last reading was mistyped'],
        ]}
        after="Each choice is logged; Ctrl-C stops without one (resuming asks again)."
      />
    </AskScreen>
  );
}

/**
 * stage 2, before the first fill from the premix: the premix confirmed mixed (mixed INITIALS), then
 * the premix tank read on its gauge against the minimum the plan needs (VALUE INITIALS); both logged
 */
function PremixScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const pc = state.setup.premixCheck!;
  const K = state.setup.steps.length;
  const first = pc.fills[0];
  const mixed = state.premix?.mixedBy;
  const last = state.premix?.reading;
  const planned = `${fromPa(pc.plannedPa, 'Torr').toFixed(1)} Torr`;
  return (
    <AskScreen state={state} what={`before fill ${first} of ${K}: THE PREMIX TANK ${pc.tank}`}>
      <Para>
        Fill {first} draws the premix from {pc.tank}
        {pc.premixLog ? ` (premix log ${pc.premixLog})` : ''}. Before it:
      </Para>
      <Para bold={!mixed}>
        1. {mixed ? `[${state.premix?.mixedEarly ? 'mixed early' : 'done'}, ${mixed}] ` : ''}The premix in{' '}
        {pc.tank} mixed: {premixMixingWords(pc)}.
      </Para>
      <Para bold={Boolean(mixed)}>
        2. {last?.enough ? `[done, ${last.by}] ` : ''}
        {premixCloseOffLine(pc, tankName(h.tank.id))}With the {h.tank.id} valve closed and the line filled
        from {pc.tank}, read {pc.tank} on {pc.gauge?.id ?? 'a gauge that reads it'}: at least {pc.minimum}{' '}
        (planned about {planned})
        {last && !last.enough ? `; last read ${last.text} (${last.by}), BELOW the minimum` : ''}.
      </Para>
      {state.message ? <Para>{state.message}</Para> : null}
      <Text> </Text>
      <Options
        options={[
          mixed
            ? [
                `the reading of ${pc.tank} and your initials`,
                `e.g. ${planned.replace(' Torr', '')} AB (logged)`,
              ]
            : ['mixed INITIALS', `once the premix in ${pc.tank} was mixed (logged)`],
          ['stop INITIALS', 'stop the batch here'],
          ['undo INITIALS / fix N INITIALS', 'an earlier reading'],
        ]}
      />
    </AskScreen>
  );
}

/**
 * the stage-2 sheet's close-off before the line is filled from the premix tank (same function, same
 * words); an older log that does not record the heads says to close every head below the tank's pressure
 */
function premixCloseOffLine(pc: PremixCheck, batchTank: string): string {
  const tank = tankName(pc.tank);
  if (!pc.closeOff)
    return (
      `Close off every head whose range ends below ${tank}'s pressure before the line is filled from ` +
      `${tank} (this log does not record which: see the stage-2 sheet). `
    );
  return premixCloseOffWords(pc.closeOff, tank, batchTank, 'Torr');
}

/** after `vent INITIALS`: vent back, let the tank settle, read it; the reading is logged as the tank's pressure */
function VentedScreen({ state }: ScreenProps) {
  const h = state.setup.header;
  const v = state.venting!;
  const step = state.setup.steps.find((x) => x.index === v.step)!;
  const unit = unitOf(step);
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const shown = (pa: number) => `${fromPa(shownPa(state, step, pa), unit).toFixed(dec)} ${unit}`;
  return (
    <Box flexDirection="column">
      <ScreenTitle
        base={fillTitle(h)}
        what={`fill ${v.step} of ${state.setup.steps.length}: VENTING (logged) - read the tank after venting`}
      />
      <Para>{state.message ?? ' '}</Para>
      <Box borderStyle="single" paddingX={2} flexDirection="column">
        <Text bold>
          VENT TO AT MOST {atMostOnGauge(state, step, v.targetPa)} on {step.gauge?.id ?? 'the gauge'}
        </Text>
        <Text>
          read before venting: {shown(v.beforePa)}; working limit {shown(v.limitPa)}
        </Text>
      </Box>
      <Para>
        Close the vent valve, let the tank settle (pressure and temperature steady), then type the reading on{' '}
        {step.gauge?.id ?? 'the gauge'} and your initials (e.g. 1490.2 AB); Tab: the tank temperature. It is
        logged as the tank&apos;s pressure after venting{v.last ? ": the batch's final pressure" : ''}.
        Venting keeps the composition.
      </Para>
      <ReadingFields
        state={state}
        reading={`reading after venting [${unit}] and initials`}
        temperature="tank temperature"
      />
      <ErrorLine state={state} />
      <Text>
        Enter: log the reading Tab: temp Ctrl-C: stop (the vent stays logged; resume asks for the reading)
      </Text>
    </Box>
  );
}

/** " (Ar, charge 1 of 2)" after a fill's number, for a charge of a split source */
const chargeSuffixOf = (step: FillStep) =>
  isSplit(step.charge) ? ` (${step.species}, ${chargeWords(step.charge)})` : '';

/**
 * a charge of a split source: the valve instruction names the charge, where it stops and the other
 * charges of the same cylinder (the earlier one with its logged reading), so the two are never confused
 */
function ChargeLine({ state }: ScreenProps) {
  const { step, onGauge } = stepView(state);
  if (!isSplit(step.charge)) return null;
  const same = state.setup.steps.filter((x) => x.source.id === step.source.id && x.index !== step.index);
  const others = same.map((x) => {
    const d = state.done.find((r) => r.step === x.index);
    return x.index < step.index
      ? `${chargeWords(x.charge)} was fill ${x.index}${d ? ` (logged ${d.text})` : ''}`
      : `${chargeWords(x.charge)} follows at fill ${x.index}`;
  });
  const last = step.charge.number === step.charge.of;
  const stop = onGauge(state.targetsPa[state.current]);
  return (
    <Para bold>
      {last
        ? `Open ${step.source.id} again for ${chargeWords(step.charge)} of ${step.species}: fill on to ${stop}`
        : `Open ${step.source.id} for ${chargeWords(step.charge)} of ${step.species} only: stop at ${stop}, ` +
          `then close the cylinder valve`}
      {`; ${others.join('; ')}.`}
    </Para>
  );
}

/** a hazard of a review, short: "DANGER detonable-state (fill 3)" */
const hazardShort = (z: { severity: string; code: string; step: number | null }) =>
  `${z.severity.toUpperCase()} ${z.code}${z.step ? ` (fill ${z.step})` : ''}`;

/**
 * the fill screen in `rows` (`fixed`: the rows of its parts that are always whole: the title, the gas,
 * the gauge, the box, the fields, the error and the keys), shortened step by step until it fits: the
 * composition compact (the species outside on one row: `crowded`), then the findings each by its name and
 * what to do (stepFindingLines short), then the message cut to the rows left (? shows the whole text)
 */
export function readingFit(state: FillState, fixed: number, rows: number, columns: number) {
  const linesRows = (ls: readonly FindingLine[]) => ls.reduce((n, l) => n + wrapRows(l.text, columns), 0);
  const j = state.error ? undefined : state.judgement;
  const jFull = j ? 1 + j.deviations.length : 0;
  const jCompact = j ? 2 : 0;
  const message = state.error ? '' : (state.message ?? ' ');
  const messageRows = message ? wrapRows(message, columns) : 1;
  const full = stepFindingLines(state);
  const room = rows - 1;
  const total = (ls: readonly FindingLine[], jr: number, mr: number) => fixed + linesRows(ls) + jr + mr;
  if (total(full, jFull, messageRows) <= room)
    return { lines: full, message, shortened: false, crowded: false };
  if (total(full, jCompact, messageRows) <= room)
    return { lines: full, message, shortened: false, crowded: true };
  const short = stepFindingLines(state, true);
  const left = room - total(short, jCompact, 0);
  const shown =
    messageRows <= left ? message : cutToRows(message, Math.max(1, left), columns, '(?: whole text)');
  return { lines: short, message: shown, shortened: true, crowded: true };
}

/** the ? page of a fill screen: its findings and its message whole, in parts that fit (n, p); b, Esc or ? goes back */
function WholeTextPage({ state, part }: ScreenProps & { readonly part: number }) {
  const { stdout } = useStdout();
  const index = state.setup.steps[state.current].index;
  const lines = [
    ...state.setup.dangers
      .filter((d) => d.step === index)
      .map((d) => `- DANGER ${d.code} (the plan; accepted at the start): ${d.message}`),
    ...(state.acceptedHazards ?? [])
      .filter((h) => h.step === index)
      .map(
        (h) =>
          `- ${h.severity.toUpperCase()} ${h.code} (accepted at the review of the remaining fills, logged): ` +
          `${h.numbers ? `${h.numbers}. ` : ''}${h.text}`,
      ),
    ...stepFindingLines(state)
      .filter((l) => !l.bold)
      .map((l) => l.text),
    ...(state.message ? [state.message] : []),
  ];
  return (
    <PartsPage
      title={`${fillTitle(state.setup.header)} - ${stepWhat(state, 'THE WHOLE TEXT')}`}
      lines={lines}
      part={part}
      rows={stdout?.rows || 24}
      columns={stdout?.columns || 80}
      back="b or ?: back   Ctrl-C: stop"
    />
  );
}

/**
 * the last fill's passing range (lastFillRange: the plan's band-edges-past-tolerance) in the gauge's
 * display, rounded inward; undefined where there is nothing narrower than the band to say
 */
function passRangeText(
  state: FillState,
  step: FillStep,
  unit: PressureUnit,
  dec: number,
): string | undefined {
  const r = lastFillRange(state);
  if (!r) return undefined;
  const at = `${(state.targetTemperatureK - 273.15).toFixed(1)} degC`;
  const none =
    '! No reading of this fill makes the re-check pass: even one at the target leaves the batch no pass, ' +
    'with the readings before it as logged (band-edges-past-tolerance). Fill to the target; `check` the log';
  if (r.kind === 'none') return none;
  const f = 10 ** dec;
  const low = Math.ceil(fromPa(shownPa(state, step, r.lowPa), unit) * f - 1e-7) / f;
  const high = Math.floor(fromPa(shownPa(state, step, r.highPa), unit) * f + 1e-7) / f;
  if (!(low <= high)) return none;
  return (
    `! The re-check passes only a reading from ${low.toFixed(dec)} to ${high.toFixed(dec)} ${unit} (at ${at}): ` +
    'narrower than the band, as the readings before it leave less room (band-edges-past-tolerance)'
  );
}

function ReadingScreen({ state }: ScreenProps) {
  const { stdout } = useStdout();
  const rows = stdout?.rows || 24;
  const columns = stdout?.columns || 80;
  const h = state.setup.header;
  const K = state.setup.steps.length;
  const { step, unit, dec } = stepView(state);
  const target = state.targetsPa[state.current];
  const shown = shownPa(state, step, target);
  // the planned target as shown: "re-targeted" only when the target on screen differs from it
  const planned = fromPa(shownPa(state, step, h.steps[state.current].target_Pa), unit).toFixed(dec);
  const isolate = state.setup.header.gauges.filter((g) => {
    const top = g.reference === 'absolute' ? g.full_scale_Pa : g.full_scale_Pa + state.barometerPa;
    return top < target + step.bandPa && (state.current === 0 || top >= state.targetsPa[state.current - 1]);
  });
  const caution = gasCaution(step.source.composition);
  // the hints name this session's operator (after a resume by another, theirs), else an example
  const who = state.operator ?? 'AB';
  const band = bandText(step, shown, unit, dec);
  const noneInside = noneInsideText(state, step, target);
  const passRange = passRangeText(state, step, unit, dec);
  const gaugeLine =
    `Read on ${step.gauge?.id ?? 'NO GAUGE'}` +
    (step.gauge?.reference === 'gauge'
      ? ` (gauge-referenced: reads above ambient; barometer 0000.00 ${unit} typed today)`
      : ' (absolute)');
  // the rows always whole: title and rule, the gas, its charge, the gauge, close-off and caution (or a
  // blank row), the box, the two fields, the error row and the keys
  const fixed =
    2 +
    wrapRows(`Fill ${step.species} from ${step.source.id} (${step.source.label})${intoTank(h)}`, columns) +
    (isSplit(step.charge) ? 2 : 0) +
    wrapRows(gaugeLine, columns) +
    Math.max(1, (isolate.length ? 1 : 0) + (caution ? 1 : 0)) +
    3 +
    // inside the box: its edges and padding take 6 columns
    wrapRows(`band ${band} at 25.0 degC   (re-targeted; planned 0000.00)`, columns - 6) +
    (noneInside ? wrapRows(noneInside, columns - 6) : 0) +
    (passRange ? wrapRows(passRange, columns - 6) : 0) +
    2 +
    (state.error ? wrapRows(`! ${state.error}`, columns) : 1) +
    1;
  const fit = readingFit(state, fixed, rows, columns);
  const crowded = fit.crowded;
  return (
    <Box flexDirection="column">
      <Box justifyContent="space-between">
        <Text bold>{fillTitle(h)}</Text>
        <Text>
          fill {state.current + 1} of {K}
        </Text>
      </Box>
      <Text>{'-'.repeat(78)}</Text>
      <Text>
        Fill <Text bold>{step.species}</Text>
        {isSplit(step.charge) ? <Text bold>, {chargeWords(step.charge)}</Text> : null} from {step.source.id} (
        {step.source.label}){intoTank(h)}
      </Text>
      <ChargeLine state={state} />
      <Text>
        Read on {step.gauge?.id ?? 'NO GAUGE'}
        {step.gauge?.reference === 'gauge'
          ? ` (gauge-referenced: reads above ambient; barometer ${fromPa(state.barometerPa, unit).toFixed(dec)} ` +
            `${unit} typed today)`
          : ' (absolute)'}
      </Text>
      {isolate.length ? (
        <Text bold>Before this fill: close off {isolate.map((g) => g.id).join(', ')}</Text>
      ) : null}
      {caution ? <Text bold>{caution}</Text> : null}
      {!isolate.length && !caution ? <Text> </Text> : null}
      <Box borderStyle="single" paddingX={2} flexDirection="column">
        <Text bold>
          STOP AT {fromPa(shown, unit).toFixed(dec)} {unit}
        </Text>
        <Text>
          band {band} at {(state.targetTemperatureK - 273.15).toFixed(1)} degC
          {planned !== fromPa(shown, unit).toFixed(dec) ? `   (re-targeted; planned ${planned})` : ''}
        </Text>
        {noneInside ? <Text bold>{noneInside}</Text> : null}
        {passRange ? <Text bold>{passRange}</Text> : null}
      </Box>
      <FindingLines lines={fit.lines} />
      <ReadingFields state={state} reading={`actual reading [${unit}]`} temperature="tank temperature" />
      {fit.message ? <Para>{fit.message}</Para> : null}
      {/* an error (nothing logged) stands in for the last message and the composition until the next entry: the
          screen keeps 24 rows */}
      {state.judgement && !state.error ? <JudgementView j={state.judgement} compact={crowded} /> : null}
      <Para>{state.error ? `! ${state.error}` : ' '}</Para>
      <Text>
        {fit.shortened
          ? `Enter: log Tab: temp undo ${who}: undo fix N ${who}: correct ?: all text Ctrl-C: stop`
          : `Enter: log Tab: temp undo ${who}: undo last fix N ${who}: correct Ctrl-C: stop`}
      </Text>
    </Box>
  );
}
