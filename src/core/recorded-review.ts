/**
 * The safety review of a fill as it was recorded. The planner reviews the states and fill paths of
 * its planned targets (plan/review.ts); a re-check knows what was filled instead: the readings, in
 * the order they were taken. Between two readings the tank passed through every state on the path
 * from one to the next, so a fill recorded in another order than the plan's (CH4, then O2, then Ar:
 * undiluted fuel/O2 after the second reading) went through states the planner would have called
 * dangerous, whatever the final composition.
 *
 * The states: after each reading, the composition the re-check's own inverse model gives for the
 * readings up to it (recheck.ts, nominal values) at the reading's pressure, with each source's
 * unidentified share counted as its main gas as the planner reviews its states (plan/amounts.ts
 * eosComposition; the composition `check` reports is normalised over the identified species, a
 * difference of that share); the gas already in the tank before the first fill as the start. The
 * review: `reviewSequence` (sequence-review.ts), the code the planner and the guided fill's review of
 * the re-targeted remainder use, with the path of every fill located (9 bisections), against the
 * tank's working limit when it is known. Each state at the temperature recorded with its reading;
 * each fill's path (and its compression) at the warmer of its two readings, the conservative choice
 * since the flammable region only widens as the gas warms; condensation at the coldest wall given,
 * else at the coldest reading. A log read at a plan's targets at the plan's temperature so gives the
 * plan's own review, number for number.
 */
import type { Fractions } from './composition.js';
import type { Finding } from './findings.js';
import { inverseSetup, invertReadings, type ReadingInput } from './recheck.js';
import type { SafetyContext } from './safety.js';
import { reviewSequence, type SequenceFill } from './sequence-review.js';

/** one recorded reading: the source it ends a charge of, its absolute pressure and temperature */
export interface RecordedReading extends ReadingInput {
  /** 1-based fill number, as the record numbers it */
  readonly step: number;
}

export interface RecordedFillInput {
  readonly readings: readonly RecordedReading[];
  /** gas already in the tank before the first fill (a top-up) */
  readonly initial?: {
    readonly composition: Fractions;
    readonly pressurePa: number;
    readonly temperatureK: number;
  };
  /** the review's settings (the tank and its working limit, the coldest wall); the temperature is the readings' */
  readonly safety: Omit<SafetyContext, 'temperatureK'>;
}

/** the tank after one recorded reading, by the re-check's inverse model */
export interface RecordedState {
  readonly step: number;
  readonly sourceId: string;
  readonly composition: Fractions;
  readonly pressurePa: number;
  readonly temperatureK: number;
}

/** the span of the readings' temperatures (the gas already in the tank's included), K */
export interface ReadingTemperatures {
  readonly coldestK: number;
  readonly warmestK: number;
}

export interface RecordedFillReview {
  /** the temperatures the states were reviewed at (each its reading's) */
  readonly temperatures: ReadingTemperatures;
  readonly states: readonly RecordedState[];
  /** every finding of the review of the recorded states and fill paths */
  readonly findings: readonly Finding[];
}

/**
 * the composition after each reading: the inverse model on the readings up to it, each source's
 * unidentified share counted as its main gas (the EOS composition the planner reviews)
 */
export function recordedStates(
  readings: readonly RecordedReading[],
  initial?: RecordedFillInput['initial'],
): RecordedState[] {
  return readings.map((r, k) => {
    const upTo = readings.slice(0, k + 1);
    const setup = inverseSetup(upTo, initial);
    const inv = invertReadings(
      setup,
      undefined,
      upTo.map((x) => x.pressurePa),
    );
    const total = inv.amounts.reduce((a, b) => a + b, 0);
    const composition: Record<string, number> = {};
    setup.species.forEach((s, i) => {
      if (inv.amounts[i] > 0) composition[s] = inv.amounts[i] / total;
    });
    return {
      step: r.step,
      sourceId: r.source.id,
      composition,
      pressurePa: r.pressurePa,
      temperatureK: r.temperatureK,
    };
  });
}

/** the review of the fill as recorded (module comment) */
export function reviewRecordedFill(input: RecordedFillInput): RecordedFillReview {
  const { readings, initial } = input;
  const all = [...readings.map((r) => r.temperatureK), ...(initial ? [initial.temperatureK] : [])];
  const temperatures = { coldestK: Math.min(...all), warmestK: Math.max(...all) };
  const states = recordedStates(readings, initial);
  const fills: SequenceFill[] = states.map((s, i) => ({
    step: s.step,
    sourceId: s.sourceId,
    sourceComposition: readings[i].source.composition,
    compositionAfter: s.composition,
    pressurePa: s.pressurePa,
    temperatureK: s.temperatureK,
  }));
  const start = initial
    ? {
        step: 0,
        composition: initial.composition,
        pressurePa: initial.pressurePa,
        temperatureK: initial.temperatureK,
      }
    : undefined;
  // every state and fill carries its own temperature; the review's own (the coldest reading) is the
  // coldest wall where none is given, and the data gaps' (sequence-review.ts)
  const ctx = { ...input.safety, temperatureK: temperatures.coldestK };
  const findings = fills.length ? reviewSequence(start, fills, ctx, true) : [];
  return { temperatures, states, findings };
}
