/** The guided fill screen (ink). Thin: the state machine is fill-state.ts; effects are written here, fsync'd, before the screen moves on. */
import { Box, Text, useApp, useInput } from 'ink';
import { useLatestState } from './latest-state.js';
import { fillReducer, shownPa, type FillAction, type FillState } from './fill-state.js';
import { fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import type { LogEvent } from '../io/batch-log.js';
import { splitChunk } from './keys.js';
import { decimalsFor, fixedSig } from '../report/format.js';

export interface FillAppProps {
  readonly initial: FillState;
  /** append one event to the batch log (with fsync); throws on failure */
  readonly write: (e: LogEvent) => void;
  readonly logFile: string;
  readonly now?: () => string;
}

export function toActions(input: string, key: { return?: boolean; tab?: boolean; backspace?: boolean; delete?: boolean }, now: string): FillAction[] {
  if (key.return) return [{ type: 'enter', now }];
  if (key.tab) return [{ type: 'tab' }];
  if (key.backspace || key.delete) return [{ type: 'backspace' }];
  return splitChunk(input).map((t): FillAction => (t.kind === 'text' ? { type: 'char', text: t.text } : t.kind === 'enter' ? { type: 'enter', now } : { type: t.kind }));
}

export function FillApp({ initial, write, logFile, now = () => new Date().toISOString() }: FillAppProps) {
  const [state, current, setState] = useLatestState(initial);
  const app = useApp();
  useInput((input, key) => {
    if (current().phase === 'done' && (input === 'q' || key.return || key.escape)) {
      app.exit();
      return;
    }
    let s = current();
    for (const a of toActions(input, key, now())) {
      const next = fillReducer(s, a);
      try {
        for (const e of next.effects) write(e);
      } catch (err) {
        s = { ...s, error: `could not write the log ${logFile}: ${(err as Error).message}; the reading was NOT recorded` };
        break;
      }
      s = next;
    }
    setState(s);
  });
  const h = state.setup.header;
  const K = state.setup.steps.length;
  if (state.phase === 'acknowledge') {
    return (
      <Box flexDirection="column">
        <Text bold>mixwright fill {h.id} - DANGER findings stand</Text>
        {state.setup.dangers.map((d, i) => (
          <Text key={i} wrap="wrap">
            - {d.code}
            {d.step ? ` (fill ${d.step})` : ''}: {d.message}
          </Text>
        ))}
        <Text> </Text>
        <Text wrap="wrap">The fill goes on only after you acknowledge these in words; the acknowledgement is logged. Type: accept INITIALS, then Enter. Ctrl-C stops.</Text>
        <Text>
          &gt; {state.input}
          <Text inverse> </Text>
        </Text>
        {state.error ? <Text wrap="wrap">! {state.error}</Text> : null}
      </Box>
    );
  }
  if (state.phase === 'done') {
    const comp = state.summary ? Object.entries(state.summary.composition).sort((a, b) => b[1].value - a[1].value) : [];
    return (
      <Box flexDirection="column">
        <Text bold>mixwright fill {h.id} - all {K} fills logged</Text>
        {state.message ? <Text wrap="wrap">{state.message}</Text> : null}
        <Text> </Text>
        <Text bold>Re-check of the logged readings (GUM)</Text>
        {comp.slice(0, 6).map(([k, st]) => (
          <Text key={k}>
            {'  '}
            {k.padEnd(9)} {fixedSig(st.value, 6).padStart(12)} u {fixedSig(st.u, 2)}
            {h.design.composition[k] !== undefined ? `   design ${fixedSig(h.design.composition[k], 6)}` : ''}
          </Text>
        ))}
        {state.summary?.phi ? <Text>{`  phi       ${state.summary.phi.value.toFixed(5)}   u ${fixedSig(state.summary.phi.u, 2)}`}</Text> : null}
        <Text> </Text>
        <Text bold>Tank label</Text>
        <Text>{`  ${h.id}`}</Text>
        <Text wrap="wrap">{`  ${Object.entries(h.design.composition)
          .sort((a, b) => b[1] - a[1])
          .map(([k, v]) => `${k} ${(v * 100).toPrecision(4)} %`)
          .join(', ')}`}</Text>
        <Text>{`  phi ${h.design.phi ?? 'n/a'}; filled ${new Date().toISOString().slice(0, 10)}`}</Text>
        <Text> </Text>
        <Text>Log: {logFile} - run `mixwright check {logFile}` for the full budget. Press q to quit.</Text>
      </Box>
    );
  }
  const step = state.setup.steps[state.current];
  const unit: PressureUnit = step.gauge && isPressureUnit(step.gauge.unit) ? step.gauge.unit : 'Torr';
  const dec = step.gauge ? decimalsFor(fromPa(step.gauge.resolutionPa, unit)) : 3;
  const target = state.targetsPa[state.current];
  const shown = shownPa(state, step, target);
  const lo = fromPa(shown - step.bandPa, unit).toFixed(dec);
  const hi = fromPa(shown + step.bandPa, unit).toFixed(dec);
  const plan = h.steps[state.current];
  const isolate = state.setup.header.gauges.filter((g) => {
    const top = g.reference === 'absolute' ? g.full_scale_Pa : g.full_scale_Pa + h.barometer.pressure_Pa;
    return top < target + step.bandPa && (state.current === 0 || top >= state.targetsPa[state.current - 1]);
  });
  return (
    <Box flexDirection="column">
      <Box justifyContent="space-between">
        <Text bold>mixwright fill {h.id}</Text>
        <Text>
          fill {state.current + 1} of {K}
        </Text>
      </Box>
      <Text>{'-'.repeat(78)}</Text>
      <Text>
        Fill <Text bold>{step.species}</Text> from {step.source.id} ({step.source.label})
      </Text>
      <Text>
        Read on {step.gauge?.id ?? 'NO GAUGE'}
        {step.gauge?.reference === 'gauge'
          ? ` (gauge-referenced: reads above ambient; barometer ${fromPa(h.barometer.pressure_Pa, unit).toFixed(dec)} ${unit} from the plan - give --barometer when it differs)`
          : ' (absolute)'}
      </Text>
      {isolate.length ? <Text bold>Before this fill: close off {isolate.map((g) => g.id).join(', ')}</Text> : <Text> </Text>}
      <Text> </Text>
      <Box borderStyle="single" paddingX={2} flexDirection="column">
        <Text bold>
          STOP AT {fromPa(shown, unit).toFixed(dec)} {unit}
        </Text>
        <Text>
          band {lo} - {hi} {unit}
          {Math.abs(target - plan.target_Pa) > 1e-9 * target ? `   (re-targeted; planned ${fromPa(shownPa(state, step, plan.target_Pa), unit).toFixed(dec)})` : ''}
        </Text>
      </Box>
      <Text wrap="wrap">Evacuate or purge the line, fill it from the cylinder above the tank pressure, then open the tank valve slowly; close it at the target.</Text>
      <Text> </Text>
      <Text>
        {state.field === 'reading' ? '> ' : '  '}actual reading [{unit}]: {state.input}
        {state.field === 'reading' ? <Text inverse> </Text> : null}
      </Text>
      <Text>
        {state.field === 'temperature' ? '> ' : '  '}tank temperature: {state.temperatureText}
        {state.field === 'temperature' ? <Text inverse> </Text> : null}
      </Text>
      <Text wrap="wrap">{state.message ?? ' '}</Text>
      <Text wrap="wrap">{state.error ? `! ${state.error}` : ' '}</Text>
      <Text>Enter: log the reading   Tab: temperature   Ctrl-C: stop (logged readings are kept)</Text>
    </Box>
  );
}
