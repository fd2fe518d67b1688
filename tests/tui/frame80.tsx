// the guided fill's screens as an 80-column terminal shows them, and a typed entry with its log line
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { fillReducer, type FillState } from '../../src/tui/fill-state.js';

const NOW = '2026-12-01T01:00:00Z';

/** type `text`, Enter; where it logged an event and `line` is given, the log line is acknowledged */
export function read(s: FillState, text: string, line?: number): FillState {
  const r = fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });
  return line !== undefined && r.effects.length
    ? fillReducer(r, { type: 'logged', step: r.done.length, line })
    : r;
}

/** the screen of `s` rendered at 80 columns */
export function frame80(s: FillState): string {
  const ui = render(<FillApp initial={s} write={() => {}} logFile="b1.jsonl" />);
  Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
  ui.rerender(<FillApp initial={s} write={() => {}} logFile="b1.jsonl" />);
  const f = ui.lastFrame()!;
  ui.unmount();
  return f;
}
