/**
 * The guided-fill state machine under random operator input: whatever is typed, the reducer
 * never throws (a throw inside the key handler would end the fill without a word), every
 * reading it asks to log is a valid log line in fill order, and a danger finding is passed
 * only by "accept INITIALS".
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader, type FillAction } from '../../src/tui/fill-state.js';
import { parseLog } from '../../src/io/batch-log.js';

const RUNS = Number(process.env.FUZZ_RUNS ?? 40);

function headerFor(recipe: string) {
  const req = buildPlanRequest(readRecipe(recipe));
  return headerFromPlan(planFill(req.input), req, 'fz', '2026-12-02T00:00:00Z');
}

// the demo recipe with O2 filled straight onto the methane: a detonable intermediate state, a danger finding
const dangerous = join(mkdtempSync(join(tmpdir(), 'mw-fz-fill-')), 'ch4-o2-first.yaml');
writeFileSync(dangerous, readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8') + 'order: [CH4, O2, Ar]\n');

const typed = fc.oneof(
  fc.constantFrom(
    '10.0128',
    '10.01',
    '1480',
    '1480.02',
    '1500',
    '1500.0',
    '0',
    '-5',
    '1e9',
    '9999',
    'abc',
    '10 Torr',
    '1.5 kPa',
    '2 bar',
    '1480 Torr',
    '30 L',
    'NaN',
    '.',
    '',
    'accept AB',
    'accept',
    'accept ABCDEFG',
    '  accept xy  ',
  ),
  fc.string({ maxLength: 6 }),
);
const entry = (t: string, now: string): FillAction[] => [
  ...[...t].map((c): FillAction => ({ type: 'char', text: c })),
  { type: 'enter', now },
];
/** random operator input; `targetsPa` adds readings near the plan's own targets (in Pa, with their unit) */
const actionsFor = (targetsPa: readonly number[]): fc.Arbitrary<FillAction[]> =>
  fc.oneof(
    action,
    fc
      .tuple(fc.constantFrom(...targetsPa), fc.double({ min: -0.01, max: 0.01, noNaN: true }))
      .map(([t, d]) => entry(`${(t * (1 + d)).toPrecision(7)} Pa`, '2026-12-02T00:03:00Z')),
  );
const action: fc.Arbitrary<FillAction[]> = fc.oneof(
  typed.map((t) => [...t].map((c): FillAction => ({ type: 'char', text: c }))),
  fc.constant<FillAction[]>([{ type: 'backspace' }]),
  fc.constant<FillAction[]>([{ type: 'tab' }]),
  fc
    .constantFrom('25', '-300 degC', '22 degC', '700 K', 'x')
    .map((t): FillAction[] => [
      { type: 'tab' },
      ...[...t].map((c): FillAction => ({ type: 'char', text: c })),
      { type: 'tab' },
    ]),
  fc.constant<FillAction[]>([{ type: 'enter', now: '2026-12-02T00:01:00Z' }]),
  // whole entries, so that runs get past the first screen often enough to matter
  fc
    .constantFrom('accept AB', '10.0128', '10.02', '1480', '1480.1', '1500', '25.2', '1470', '2.5')
    .map((t) => entry(t, '2026-12-02T00:02:00Z')),
);

describe('fuzz: guided fill under random input', () => {
  for (const recipe of ['recipes/ch4-o2-ar-phi1.yaml', 'recipes/ng-blend-air.yaml', dangerous]) {
    it(`${recipe.split('/').pop()}: no throw; logged readings are valid log lines, in fill order, rising; dangers pass only by accept INITIALS`, () => {
      const h = headerFor(recipe);
      const setup = setupFromHeader(h);
      let withReadings = 0;
      fc.assert(
        // half the runs begin with a proper acknowledgement, so that runs past a danger screen are common
        fc.property(
          fc.boolean(),
          fc.array(actionsFor(h.steps.map((x) => x.target_Pa)), { maxLength: 40 }),
          (ack, chunks) => {
            let s = initialState(setup);
            const events: { kind: string }[] = [];
            for (const a of [...(ack ? entry('accept AB', '2026-12-02T00:00:30Z') : []), ...chunks.flat()]) {
              s = fillReducer(s, a);
              events.push(...(s.effects as readonly { kind: string }[]));
            }
            const text = [JSON.stringify(h), ...events.map((e) => JSON.stringify(e))].join('\n') + '\n';
            const log = parseLog(text, 'fz.jsonl');
            const readings = log.readings;
            readings.forEach((r, i) => {
              expect(r.step).toBe(i + 1);
              expect(Number.isFinite(r.pressure_Pa) && r.pressure_Pa > 0).toBe(true);
              if (i) expect(r.pressure_Pa).toBeGreaterThan(readings[i - 1].pressure_Pa);
              expect(r.temperature_K).toBeGreaterThanOrEqual(200);
              expect(r.temperature_K).toBeLessThanOrEqual(600);
            });
            expect(readings.length).toBeLessThanOrEqual(setup.steps.length);
            if (setup.dangers.length) {
              const firstReading = events.findIndex((e) => e.kind === 'reading');
              const firstAck = events.findIndex((e) => e.kind === 'acknowledge');
              if (firstReading >= 0)
                expect(
                  firstAck,
                  'a reading logged before the danger was acknowledged',
                ).toBeGreaterThanOrEqual(0);
              if (firstReading >= 0) expect(firstAck).toBeLessThan(firstReading);
            }
            if (readings.length) withReadings++;
          },
        ),
        { numRuns: RUNS * 5 },
      );
      if (setup.dangers.length) expect(setup.dangers.length).toBeGreaterThan(0);
      expect(withReadings, 'runs that logged a reading').toBeGreaterThan(0);
    });
  }
});
