/**
 * The safety review of a fill sequence: every tank state it passes through (the gas in the tank
 * at its start, then the state after each fill) and the path of every fill, in the tank and at
 * its inlet. One function for the plan (plan/review.ts, at the planned targets) and for the
 * guided fill's review of the re-targeted remainder (remainder-review.ts, from the tank as read),
 * so both judge a sequence by the same code. Findings only.
 */
import type { Fractions } from './composition.js';
import type { Finding } from './findings.js';
import {
  fillContext,
  reviewFillSequence,
  type FillEvent,
  type SafetyContext,
  type TankState,
} from './safety.js';
import { reviewFillPath } from './fill-path.js';

/** the gas in the tank where the sequence starts: after fill `step` (0 = before the first fill) */
export interface SequenceStart {
  readonly step: number;
  readonly composition: Fractions;
  readonly pressurePa: number;
  /** the temperature it was read at (a recorded fill); absent: the review's */
  readonly temperatureK?: number;
}

/** one fill of the sequence and the tank state it ends at */
export interface SequenceFill {
  /** 1-based fill number */
  readonly step: number;
  readonly sourceId: string;
  readonly sourceComposition: Fractions;
  readonly compositionAfter: Fractions;
  /** tank pressure after the fill (absolute), Pa */
  readonly pressurePa: number;
  /** the temperature the tank was read at after the fill (a recorded fill); absent: the review's */
  readonly temperatureK?: number;
}

/**
 * The states and fill events of a sequence; the last fill's state is the finished batch (the start's,
 * when no fill follows it).
 * `start` undefined: an evacuated tank (the first fill's path starts from nothing).
 */
export function sequenceEvents(
  start: SequenceStart | undefined,
  fills: readonly SequenceFill[],
): { states: TankState[]; events: FillEvent[] } {
  const states: TankState[] = [];
  const events: FillEvent[] = [];
  let before: TankState | undefined = start
    ? {
        step: start.step,
        composition: start.composition,
        pressurePa: start.pressurePa,
        // no fill after it: the gas it starts with is the finished batch (a batch closed as it stands)
        final: fills.length === 0,
        ...(start.temperatureK === undefined ? {} : { temperatureK: start.temperatureK }),
      }
    : undefined;
  if (before) states.push(before);
  fills.forEach((f, i) => {
    const after: TankState = {
      step: f.step,
      composition: f.compositionAfter,
      pressurePa: f.pressurePa,
      final: i === fills.length - 1,
      ...(f.temperatureK === undefined ? {} : { temperatureK: f.temperatureK }),
    };
    states.push(after);
    events.push({
      step: f.step,
      sourceId: f.sourceId,
      sourceComposition: f.sourceComposition,
      before,
      after,
    });
    before = after;
  });
  return { states, events };
}

/**
 * The review of every state and every fill path of a sequence (safety.ts for the states and
 * fills, fill-path.ts for the paths); `locate` false bisects the path boundaries 4 times instead
 * of 9 (enough for the severities, when the reported pressure range is not needed). A state with a
 * temperature of its own is judged at it, a fill at the warmer of its two ends (safety.ts
 * stateContext, fillContext); without: all at `ctx`'s.
 */
export function reviewSequence(
  start: SequenceStart | undefined,
  fills: readonly SequenceFill[],
  ctx: SafetyContext,
  locate = true,
): Finding[] {
  const { states, events } = sequenceEvents(start, fills);
  const out = [...reviewFillSequence(states, events, ctx)];
  for (const e of events) out.push(...reviewFillPath(e, fillContext(ctx, e), locate));
  return out;
}
