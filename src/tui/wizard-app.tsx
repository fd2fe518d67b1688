/** The design wizard screen (ink): fields left, live preview right, actions below. */
import { Box, Text, useApp, useInput } from 'ink';
import { useLatestState } from './latest-state.js';
import { splitChunk } from './keys.js';
import { ACTIONS, FIELD_HELP, FIELDS, currentField, typeAhead, wizardReducer, type Evaluate, type WizardAction, type WizardState } from './wizard-state.js';

export interface WizardAppProps {
  readonly initial: WizardState;
  readonly evaluate: Evaluate;
  /** carry out an action; returns the message to show. 'start guided fill' may hand over to the fill screen */
  readonly act: (s: WizardState, action: (typeof ACTIONS)[number]) => string | { handOver: true };
}

export function wizardActions(input: string, key: { upArrow?: boolean; downArrow?: boolean; return?: boolean; backspace?: boolean; delete?: boolean; tab?: boolean }): WizardAction[] {
  if (key.upArrow) return [{ type: 'up' }];
  if (key.downArrow) return [{ type: 'down' }];
  if (key.return) return [{ type: 'enter' }];
  if (key.tab) return [{ type: 'complete' }];
  if (key.backspace || key.delete) return [{ type: 'backspace' }];
  return splitChunk(input).map((t): WizardAction => (t.kind === 'text' ? { type: 'char', text: t.text } : t.kind === 'enter' ? { type: 'enter' } : t.kind === 'tab' ? { type: 'complete' } : { type: 'backspace' }));
}

export function WizardApp({ initial, evaluate, act }: WizardAppProps) {
  const [state, current, setState] = useLatestState(initial);
  const app = useApp();
  useInput((input, key) => {
    if (key.escape) {
      app.exit();
      return;
    }
    let s = current();
    for (const a of wizardActions(input, key)) {
      s = wizardReducer(s, a, evaluate);
      if (s.request) {
        const r = act(s, s.request);
        if (typeof r !== 'string') {
          app.exit();
          return;
        }
        s = wizardReducer(s, { type: 'done', message: r }, evaluate);
      }
    }
    setState(s);
  });
  const field = currentField(state);
  const err = state.evaluation.error;
  const suggestions = field && ['fuel', 'oxidizer', 'diluent'].includes(field) ? typeAhead(state.values[field]) : [];
  return (
    <Box flexDirection="column" width={80}>
      <Text bold>mixwright - new mixture design (demo lab unless --lab)</Text>
      <Box>
        <Box flexDirection="column" width={44}>
          {FIELDS.map((f, i) => (
            <Text key={f}>
              {state.focus === i ? '>' : ' '} {f.padEnd(12)}
              {state.values[f]}
              {state.focus === i ? <Text inverse> </Text> : null}
              {err?.field === f ? ' !' : ''}
            </Text>
          ))}
        </Box>
        <Box flexDirection="column" width={36} borderStyle="single" paddingX={1}>
          <Text bold>preview</Text>
          {(state.evaluation.preview?.lines ?? ['(fix the marked field)']).slice(0, 9).map((l, i) => (
            <Text key={i} wrap="truncate-end">
              {l}
            </Text>
          ))}
        </Box>
      </Box>
      <Text wrap="wrap">{field ? (err?.field === field ? `! ${err.message}` : FIELD_HELP[field]) : err ? `! ${err.message}` : ' '}</Text>
      <Text wrap="truncate-end">{suggestions.length ? `Tab completes: ${suggestions.join(' ')}` : ' '}</Text>
      <Box>
        {ACTIONS.map((a, i) => (
          <Text key={a} inverse={state.focus === FIELDS.length + i}>
            {` [${a}] `}
          </Text>
        ))}
      </Box>
      <Text wrap="wrap">{state.message ?? ' '}</Text>
      <Text>Up/Down: move  Enter: next / do  Tab: complete a species  Esc: quit</Text>
    </Box>
  );
}
