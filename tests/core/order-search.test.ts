import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { adviseOrder, pureCylinder, type GasSource, type SafetyContext } from '../../src/core/index.js';
import { scoreOrder, type OrderScore } from '../../src/core/order.js';

// The advice's bounded depth-first search against the exhaustive enumeration it replaces: every
// permutation of the sources (smallest amount first, then in enumeration order) scored with the
// same per-fill reviews, the first strictly best kept. No outside number is checked here: the
// hazards themselves are checked against their references in safety.test.ts and fill-path.test.ts.
const ctx: SafetyContext = { temperatureK: 295.15, workingLimitPa: 2.7e5, tankId: 'T' };

function source(id: string): GasSource {
  return pureCylinder({ id: `cyl-${id}`, species: id, purity: 0.99999 });
}

function permutations<T>(xs: readonly T[]): T[][] {
  if (xs.length <= 1) return [[...xs]];
  return xs.flatMap((x, i) => permutations([...xs.slice(0, i), ...xs.slice(i + 1)]).map((p) => [x, ...p]));
}

const rank = (s: OrderScore) => [s.danger, s.warning, s.note, s.inversions];
function better(a: OrderScore, b: OrderScore): boolean {
  const x = rank(a);
  const y = rank(b);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return x[i] < y[i];
  return false;
}

function exhaustive(sources: GasSource[], amountsMol: number[], finalPa: number) {
  const amounts = new Map(sources.map((s, i) => [s, amountsMol[i]]));
  const ascending = [...sources].sort((a, b) => amounts.get(a)! - amounts.get(b)!);
  const common = { amounts, ascending, finalPa, ctx, cache: new Map() };
  let best = ascending;
  let bestScore = scoreOrder({ order: ascending, ...common });
  for (const c of permutations(ascending)) {
    const sc = scoreOrder({ order: c, ...common });
    if (better(sc, bestScore)) {
      best = c;
      bestScore = sc;
    }
  }
  return { best, bestScore };
}

describe('fill-order advice: the bounded search finds the exhaustive enumeration’s order', () => {
  it('4 and 5 sources (fuels, O2, diluents in random amounts and pressures): same order, same hazards (16 random designs)', () => {
    const fuels = fc.subarray(['CH4', 'H2', 'C2H4', 'C3H8', 'CO'], { minLength: 1, maxLength: 2 });
    const inerts = fc.subarray(['N2', 'Ar', 'CO2', 'He'], { minLength: 1, maxLength: 2 });
    fc.assert(
      fc.property(
        fuels,
        inerts,
        fc.array(fc.double({ min: 0.005, max: 1, noNaN: true }), { minLength: 5, maxLength: 5 }),
        fc.double({ min: 0.3, max: 2.5, noNaN: true }),
        (f, n, weights, bar) => {
          const ids = [...f, 'O2', ...n];
          fc.pre(ids.length >= 4);
          const sources = ids.map(source);
          const amounts = ids.map((_, i) => weights[i]);
          const adv = adviseOrder(sources, amounts, bar * 1e5, ctx);
          const ref = exhaustive(sources, amounts, bar * 1e5);
          expect(adv.sources.map((s) => s.id)).toEqual(ref.best.map((s) => s.id));
          expect(adv.score).toEqual(ref.bestScore);
        },
      ),
      { numRuns: 16 },
    );
  });
});
