/** The design wizard screen (ink): fields left, live preview right, actions below. */
import { useEffect, useState } from 'react';
import { Box, Text, useApp, useInput, useStdout } from 'ink';
import { useLatestState } from './latest-state.js';
import { splitChunk } from './keys.js';
import {
  ACTIONS,
  FIELD_HELP,
  FIELDS,
  SPECIES_FIELDS,
  completionLine,
  currentField,
  wizardReducer,
  type ActOutcome,
  type Evaluate,
  type WizardAction,
  type WizardState,
} from './wizard-state.js';
import { Para } from './para.js';
import { previewRows } from './stage-preview.js';

export interface WizardAppProps {
  readonly initial: WizardState;
  readonly evaluate: Evaluate;
  /**
   * carry out an action (replace: the user said yes to replacing its file); returns what to
   * show, a question, or a hand-over to the fill screen ('start guided fill')
   */
  readonly act: (
    s: WizardState,
    action: (typeof ACTIONS)[number],
    replace: boolean,
  ) => ActOutcome | { readonly kind: 'handOver' };
  /** the lab profile's name and where it came from, for the title */
  readonly lab?: string;
}

export function wizardActions(
  input: string,
  key: {
    upArrow?: boolean;
    downArrow?: boolean;
    return?: boolean;
    backspace?: boolean;
    delete?: boolean;
    tab?: boolean;
    escape?: boolean;
    ctrl?: boolean;
  },
): WizardAction[] {
  if (key.escape || (key.ctrl && input === 'c')) return [{ type: 'escape' }];
  if (key.upArrow) return [{ type: 'up' }];
  if (key.downArrow) return [{ type: 'down' }];
  if (key.return) return [{ type: 'enter' }];
  if (key.tab) return [{ type: 'complete' }];
  if (key.backspace || key.delete) return [{ type: 'backspace' }];
  return splitChunk(input).map((t): WizardAction =>
    t.kind === 'text'
      ? { type: 'char', text: t.text }
      : t.kind === 'enter'
        ? { type: 'enter' }
        : t.kind === 'tab'
          ? { type: 'complete' }
          : { type: 'backspace' },
  );
}

/**
 * preview rows shown (a line too wide for the box takes two: previewRows), one tank or two stages
 * (both stages' fills): the screen has 24 rows
 */
const PREVIEW_LINES = 13;
/** the wizard's width: the terminal's from 80 to 100 columns (the preview box takes what the fields leave) */
const FIELDS_WIDTH = 44;
export const wizardWidth = (columns: number | undefined) => Math.min(100, Math.max(80, columns || 80));
/** the pause in typing after which a two-stage design is planned (a plan takes about a second) */
export const EVALUATE_PAUSE_MS = 400;

/** the preview's lines in `rows`: past them, the last row says how many more there are (none cut silently) */
export function fitLines(lines: readonly string[], rows: number): readonly string[] {
  if (lines.length <= rows) return lines;
  return [...lines.slice(0, rows - 1), `+${lines.length - rows + 1} more lines: mixwright plan`];
}

/** a two-stage design is evaluated after a pause in typing: each change restarts the wait */
function usePausedEvaluation(
  state: WizardState,
  current: () => WizardState,
  setState: (s: WizardState) => void,
  evaluate: Evaluate,
): void {
  const { pending } = state.evaluation;
  const { values } = state;
  useEffect(() => {
    if (!pending) return undefined;
    const t = setTimeout(() => {
      const evaluation = evaluate(values, true);
      setState(wizardReducer(current(), { type: 'evaluated', values, evaluation }, evaluate));
    }, EVALUATE_PAUSE_MS);
    return () => clearTimeout(t);
  }, [pending, values, current, setState, evaluate]);
}

export function WizardApp({ initial, evaluate, act, lab }: WizardAppProps) {
  const [state, current, setState] = useLatestState(initial);
  const app = useApp();
  const { stdout } = useStdout();
  const width = wizardWidth(stdout?.columns);
  // the hand-over to the guided fill: the wizard's last frame (its message: danger findings stand) is
  // drawn before it leaves, so that it stays on the terminal above the fill
  const [leaving, setLeaving] = useState(false);
  useEffect(() => {
    if (leaving) app.exit();
  }, [leaving, app]);
  useInput((input, key) => {
    if (leaving) return;
    let s = current();
    for (const a of wizardActions(input, key)) {
      s = wizardReducer(s, a, evaluate);
      if (s.request) {
        const r = act(s, s.request, Boolean(s.replace));
        if (r.kind === 'handOver') {
          setState(s);
          setLeaving(true);
          return;
        }
        s = wizardReducer(s, { type: 'result', outcome: r }, evaluate);
      }
      if (s.quit) {
        setState(s);
        app.exit();
        return;
      }
    }
    setState(s);
  });
  usePausedEvaluation(state, current, setState, evaluate);
  const field = currentField(state);
  const err = state.evaluation.error;
  const tabLine = field && SPECIES_FIELDS.includes(field) ? completionLine(state.values[field], field) : '';
  return (
    <Box flexDirection="column" width={width}>
      <Text bold wrap="truncate-end">
        {lab
          ? `mixwright - new mixture design - lab: ${lab}`
          : 'mixwright - new mixture design (demo lab unless --lab)'}
      </Text>
      <Box>
        <Box flexDirection="column" width={FIELDS_WIDTH}>
          {FIELDS.map((f, i) => (
            <Text key={f}>
              {state.focus === i ? '>' : ' '} {f.padEnd(12)}
              {state.values[f]}
              {state.focus === i ? <Text inverse> </Text> : null}
              {err?.field === f ? ' !' : ''}
            </Text>
          ))}
        </Box>
        <Box flexDirection="column" width={width - FIELDS_WIDTH} borderStyle="single" paddingX={1}>
          <Text bold>preview</Text>
          {fitLines(
            (
              state.evaluation.preview?.lines ?? [
                err?.field ? `(fix ${err.field}, marked !)` : '(no plan: see the message below)',
              ]
            ).flatMap((l) => previewRows(l, width - FIELDS_WIDTH - 4)),
            PREVIEW_LINES,
          ).map((l, i) => (
            <Text key={i} wrap="truncate-end">
              {l}
            </Text>
          ))}
        </Box>
      </Box>
      <Para>
        {field
          ? err?.field === field
            ? `! ${err.message}`
            : FIELD_HELP[field]
          : err
            ? `! ${err.message}`
            : ' '}
      </Para>
      <Text wrap="truncate-end">{tabLine || ' '}</Text>
      <Box>
        {ACTIONS.map((a, i) => (
          <Text key={a} inverse={state.focus === FIELDS.length + i}>
            {` [${a}] `}
          </Text>
        ))}
      </Box>
      {state.question ? (
        <Para color="yellow" bold>
          {state.question.text}
        </Para>
      ) : null}
      <Para>{state.message ?? ' '}</Para>
      <Text>
        {state.question
          ? 'y: yes   n, Enter or Esc: no'
          : 'Up/Down: move  Enter: next / do  Tab: complete a species  Esc: leave'}
      </Text>
    </Box>
  );
}
