/**
 * The last fill's passing range where readings inside every band can fail together (the plan's
 * band-edges-past-tolerance). The guided fill re-targets each fill from the readings before it, so at
 * the last fill every reading but one is known: the range of the last reading inside which `check`
 * passes the batch is then computed exactly, with check's own GUM budget (linear) of the readings so far
 * and a last reading at the tank temperature the screen assumes, its edges found by bisection to a tenth
 * of the gauge's display step. Before the last fill the later readings are not known (each is re-targeted
 * from the one before it): no range is said there.
 */
import { ProblemError } from '../core/index.js';
import { budgetOf, type FillState } from './fill-state.js';

export type LastFillRange =
  /** the readings of the last fill inside which the re-check passes the batch (Pa, as the fill's targets) */
  | { readonly kind: 'range'; readonly lowPa: number; readonly highPa: number }
  /** even a reading at the re-targeted target does not pass: no range to read to */
  | { readonly kind: 'none' };

/** whether the plan found that readings inside every band can fail together (the log header's findings) */
const bandEdgesFired = (s: FillState) =>
  (s.setup.header.findings ?? []).some((f) => f.code === 'band-edges-past-tolerance');

let memo: { readonly key: string; readonly range: LastFillRange | undefined } | undefined;

/**
 * at the last fill of a plan with band-edges-past-tolerance: the range of the last reading that passes
 * the re-check (or that none does, even at the target); undefined elsewhere, or where the range is the
 * whole band (nothing narrower to say), or where a step has no gauge (no budget)
 */
export function lastFillRange(s: FillState): LastFillRange | undefined {
  const K = s.setup.steps.length;
  if (!bandEdgesFired(s) || s.current !== K - 1 || s.done.length !== K - 1) return undefined;
  if (!s.setup.steps.every((st) => st.gauge)) return undefined;
  const step = s.setup.steps[K - 1];
  const target = s.targetsPa[K - 1];
  const T = s.targetTemperatureK;
  // the same readings give the same range: computed once for the screen's renders
  const key = JSON.stringify([s.setup.header.id, s.done, target, T, s.barometerPa]);
  if (memo?.key === key) return memo.range;
  const passes = (p: number) => {
    try {
      return (
        budgetOf(s, [...s.done, { step: step.index, pressurePa: p, temperatureK: T }]).v.verdict === 'pass'
      );
    } catch (e) {
      if (e instanceof ProblemError) return false;
      throw e;
    }
  };
  const tol = Math.max(step.gauge!.resolutionPa / 10, 1e-9);
  // the edge between a passing reading `inside` and the band's end `outside` (the end itself if it passes)
  const edge = (inside: number, outside: number) => {
    if (passes(outside)) return outside;
    let [a, b] = [inside, outside];
    while (Math.abs(b - a) > tol) {
      const m = (a + b) / 2;
      if (passes(m)) a = m;
      else b = m;
    }
    return a;
  };
  let range: LastFillRange | undefined;
  if (!passes(target)) range = { kind: 'none' };
  else {
    const lowPa = edge(target, target - step.bandPa);
    const highPa = edge(target, target + step.bandPa);
    const whole = lowPa === target - step.bandPa && highPa === target + step.bandPa;
    range = whole ? undefined : { kind: 'range', lowPa, highPa };
  }
  memo = { key, range };
  return range;
}
