// The ranking of two-stage choices (two-stage.ts rankKey / ranksBefore) against the single-tank
// search's (search-eval.ts notLessSafe): both order hazards by supply-check.ts hazardRank. These tests
// check ordering only (our own rules: a danger or a warning of the gas in a state or fill path ranks
// worse than any supply finding; a choice that meets the tolerance beats one that cannot, unless the
// other has fewer dangers or gas warnings); no computed value is checked, so no outside reference applies.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Finding } from '../../src/core/findings.js';
import { rankKey, ranksBefore, type RankedChoice } from '../../src/core/plan/two-stage.js';
import { hazardRank, isSupplyFinding } from '../../src/core/supply-check.js';
import { countsAgainstSequence, notLessSafe } from '../../src/core/plan/search-eval.js';

const TORR = 101325 / 760;

/** a flammable intermediate state of the batch (a warning, as the review gives it) */
const flammableState = (severity: Finding['severity'] = 'warning'): Finding => ({
  severity,
  code: 'flammable-state',
  step: 2,
  method: 'envelope',
  fuelFraction: 0.06,
  oxygenFraction: 0.12,
  lfl: 0.044,
  pressurePa: 800 * TORR,
});

/** a flammable stretch of a fill path */
const flammablePath = (severity: Finding['severity'] = 'warning'): Finding => ({
  severity,
  code: 'flammable-fill-path',
  step: 3,
  source: 'cyl-O2',
  detonable: false,
  inertFraction: 0.5,
  fromPa: 700 * TORR,
  toPa: 900 * TORR,
  method: 'envelope',
  fuelFraction: 0.05,
  oxygenFraction: 0.15,
  pressurePa: 800 * TORR,
});

/** a regulator set below what a charge needs (a supply danger) */
const supplyLow = (step = 1): Finding => ({
  severity: 'danger',
  code: 'supply-pressure-low',
  step,
  source: 'cyl-Ar',
  supplyPa: 1500 * TORR,
  targetPa: 1400 * TORR,
  requiredPa: 1540 * TORR,
});

/** the premix tank's fast delivery reading below what the batch needs (a supply warning) */
const coolsLow = (): Finding => ({
  severity: 'warning',
  code: 'premix-cools-low',
  step: 3,
  tank: 'MT-2',
  startPa: 1890 * TORR,
  endPa: 1200 * TORR,
  endK: 270,
  deliveredMol: 0.1,
  targetPa: 1050 * TORR,
  requiredPa: 1155 * TORR,
});

const choice = (batch: Finding[], worstRatio: number, premix: Finding[] = []): RankedChoice =>
  ({ premix: { findings: premix }, batch: { findings: batch }, worstRatio }) as unknown as RankedChoice;

/** the ranking before this change: every danger of the states first, then the supply's, then its warnings */
function oldKey(c: RankedChoice): number[] {
  const all = [...c.premix.findings, ...c.batch.findings];
  const dangers = all.filter((f) => f.severity === 'danger');
  const supply = dangers.filter(isSupplyFinding).length;
  return [
    dangers.length - supply,
    supply,
    all.filter((f) => f.severity === 'warning' && isSupplyFinding(f)).length,
    c.worstRatio <= 1 ? 0 : 1,
    all.filter((f) => f.severity === 'warning').length,
    c.worstRatio,
  ];
}
const lexLess = (a: number[], b: number[]) => {
  const i = a.findIndex((x, k) => x !== b[k]);
  return i >= 0 && a[i] < b[i];
};

describe('two-stage ranking: a state or fill-path hazard always ranks worse than any supply finding', () => {
  it('a flammable intermediate state (a warning) against a regulator shortfall (a danger): the shortfall ranks first', () => {
    const hazard = choice([flammableState()], 0.3);
    const supply = choice([supplyLow()], 0.9);
    // the old ranking counted the supply danger first and picked the flammable state
    expect(lexLess(oldKey(hazard), oldKey(supply))).toBe(true);
    expect(ranksBefore(supply, hazard)).toBe(true);
    expect(ranksBefore(hazard, supply)).toBe(false);
    // the same ordering as the single-tank search's: hazardRank is the key's head
    expect(rankKey(supply).slice(0, 5)).toEqual(hazardRank([supplyLow()]));
    expect(rankKey(hazard).slice(0, 5)).toEqual(hazardRank([flammableState()]));
  });

  it('a flammable fill path in the premix stage against two supply dangers and a supply warning', () => {
    const hazard = choice([], 0.2, [flammablePath()]);
    const supply = choice([supplyLow(1), supplyLow(2), coolsLow()], 1.5);
    expect(lexLess(oldKey(hazard), oldKey(supply))).toBe(true);
    expect(ranksBefore(supply, hazard)).toBe(true);
  });

  it('property: a choice whose state and path dangers and warnings rank lower wins whatever its supply findings and U', () => {
    const stateHazard = fc.constantFrom<() => Finding>(
      () => flammableState('danger'),
      () => flammableState('warning'),
      () => flammableState('note'),
      () => flammablePath('warning'),
      () => flammablePath('danger'),
    );
    const supplyFinding = fc.constantFrom<() => Finding>(() => supplyLow(), coolsLow);
    const findings = fc
      .tuple(fc.array(stateHazard, { maxLength: 4 }), fc.array(supplyFinding, { maxLength: 4 }))
      .map(([h, s]) => [...h, ...s].map((make) => make()));
    const ranked = fc
      .tuple(findings, findings, fc.double({ min: 0.01, max: 5, noNaN: true }))
      .map(([batch, premix, ratio]) => choice(batch, ratio, premix));
    fc.assert(
      fc.property(ranked, ranked, (a, b) => {
        // dangers, then warnings of the states and paths (notes rank after the tolerance)
        const states = (c: RankedChoice) =>
          hazardRank([...c.premix.findings, ...c.batch.findings].filter((f) => !isSupplyFinding(f))).slice(
            0,
            2,
          );
        if (!lexLess(states(a), states(b))) return;
        expect(ranksBefore(a, b)).toBe(true);
        expect(ranksBefore(b, a)).toBe(false);
        // and the single-tank search judges the same pair the same way
        const count = (c: RankedChoice) => {
          const hazards = [...c.premix.findings, ...c.batch.findings].filter(countsAgainstSequence);
          const n = (sev: string) => hazards.filter((h) => h.severity === sev).length;
          return { danger: n('danger'), warning: n('warning'), note: n('note'), hazards, complete: true };
        };
        expect(notLessSafe(count(a), count(b))).toBe(true);
        expect(notLessSafe(count(b), count(a))).toBe(false);
      }),
      { numRuns: 300, seed: 5 },
    );
  });
});

/** the compression of oxygen-rich gas by a fill (a warning: throttle the fill) */
const oxygenCompression = (): Finding => ({
  severity: 'warning',
  code: 'oxygen-compression',
  step: 2,
  oxygenFraction: 1,
  fromPa: 45 * TORR,
  toPa: 2835 * TORR,
  gamma: 1.4,
  endK: 900,
  limitK: 573,
});

/** the order given makes hazardous states (a warning that no sequence search counts) */
const saferOrder = (): Finding => ({
  severity: 'warning',
  code: 'safer-order',
  order: ['Ar', 'O2'],
  reason: 'invented for the test',
});

/** a state near a flammability limit, outside its margin (a note) */
const nearLimit = (): Finding => ({ ...flammableState('note'), code: 'near-flammable' }) as Finding;

describe('two-stage ranking: meeting the tolerance against warnings', () => {
  // the 200 ppm CH4 case: a quiet premix whose batch U is 9.9 % of x(CH4) (ratio 19.8 to a 0.5 %
  // tolerance) against a premix within tolerance whose stage 1 compresses O2 and is filled minor-first
  const quietOver = choice([], 19.8);
  const preciseWarned = choice([], 0.45, [saferOrder(), oxygenCompression()]);

  it('within tolerance with warnings a fill procedure manages beats a quiet choice that cannot meet it', () => {
    expect(ranksBefore(preciseWarned, quietOver)).toBe(true);
    expect(ranksBefore(quietOver, preciseWarned)).toBe(false);
    // a note of a state (near a limit) does not outweigh the tolerance either
    expect(ranksBefore(choice([nearLimit()], 0.9), quietOver)).toBe(true);
  });

  it('between two choices within tolerance, the quieter one still wins (the demo keeps 13.4 % O2 over 4.0 %)', () => {
    const quietWithin = choice([], 0.72);
    expect(ranksBefore(quietWithin, choice([], 0.47, [saferOrder(), oxygenCompression()]))).toBe(true);
  });

  it('a flammable state or any danger outweighs the tolerance: the quiet choice over it wins', () => {
    expect(ranksBefore(quietOver, choice([flammableState()], 0.3))).toBe(true);
    expect(ranksBefore(quietOver, choice([supplyLow()], 0.3))).toBe(true);
    expect(ranksBefore(quietOver, choice([flammablePath('danger')], 0.3))).toBe(true);
  });

  it("property: a choice's findings without its prediction's, at ratio 0, bound its key element by element (the proposal's pruning)", () => {
    const any = fc.constantFrom<() => Finding>(
      () => flammableState('danger'),
      () => flammableState('warning'),
      () => flammableState('note'),
      () => flammablePath('warning'),
      () => supplyLow(),
      coolsLow,
      oxygenCompression,
      saferOrder,
      nearLimit,
    );
    const sets = fc.tuple(
      fc.array(any, { maxLength: 5 }),
      fc.array(any, { maxLength: 5 }),
      fc.double({ min: 0, max: 50, noNaN: true }),
    );
    fc.assert(
      fc.property(sets, ([known, more, ratio]) => {
        const bound = rankKey(
          choice(
            known.map((m) => m()),
            0,
          ),
        );
        const full = rankKey(
          choice(
            [...known, ...more].map((m) => m()),
            ratio,
          ),
        );
        expect(bound.length).toBe(full.length);
        bound.forEach((b, i) => expect(b).toBeLessThanOrEqual(full[i]));
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});
