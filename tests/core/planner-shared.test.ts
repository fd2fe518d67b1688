// planFill's shared stages (src/core/planner.ts, SharedStages): plans of one input that differ only in
// their gauges (a premix's head choices) share the amounts, the fill order and the safety review of
// their states and fill paths. Sharing must give the plan planning alone gives, to the bit: compared
// whole (toEqual on the Plan objects, no tolerance).
import { describe, expect, it } from 'vitest';
import { planFill, sharedStages } from '../../src/core/planner.js';
import { pureCylinder } from '../../src/core/index.js';
import { GAUGES, pureInput } from './planner-input.js';
import { TORR } from '../helpers.js';

// a premix of a few % O2 in Ar, as a two-stage plan's stage 1 makes it (invented demo numbers)
const premix = (order: 'given' | 'recommend') => ({
  ...pureInput({ O2: 0.134, Ar: 0.866 }, ['O2', 'Ar'], 298.15, 2000 * TORR),
  order,
});

describe('plans that differ only in their gauges share amounts and order', () => {
  it.each(['given', 'recommend'] as const)('order %s: each head choice plans as it would alone', (order) => {
    const base = premix(order);
    const shared = sharedStages();
    const choices = [GAUGES, [GAUGES[1], GAUGES[2]], [GAUGES[2]]];
    let kept: unknown;
    for (const gauges of choices) {
      const input = { ...base, gauges };
      expect(planFill(input, shared)).toEqual(planFill(input));
      kept ??= [...shared.stages.values()][0];
    }
    // one entry, the first choice's: the second and third used its stages (a replan would replace it)
    expect(shared.stages.size).toBe(1);
    expect([...shared.stages.values()][0]).toBe(kept);
    // the same targets on every head: one safety review served all three
    expect(shared.reviews.size).toBe(1);
  });

  it('another pressure, or other source objects, plan afresh (never a stale amount)', () => {
    const base = premix('given');
    const shared = sharedStages();
    const first = planFill(base, shared);
    const higher = { ...base, finalPressurePa: 2500 * TORR };
    expect(planFill(higher, shared)).toEqual(planFill(higher));
    expect(shared.stages.size).toBe(2);
    expect(shared.reviews.size).toBe(2);
    // equal gases from new source objects: the stages are planned again (later stages look sources up)
    const fresh = {
      ...base,
      sources: base.sources.map((s) => pureCylinder({ id: s.id, species: s.mainSpecies, purity: 1 })),
    };
    const again = planFill(fresh, shared);
    expect(again.steps[0].source).toBe(fresh.sources[0]);
    expect(again.steps.map((s) => s.targetPa)).toEqual(first.steps.map((s) => s.targetPa));
  });

  it('a review with findings is shared whole: a fuel with oxygen in argon on three head choices', () => {
    // a flammable-looking stage 1 (invented demo numbers): its states and fill paths have findings
    const base = {
      ...pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 1500 * TORR),
      order: 'given' as const,
    };
    const shared = sharedStages();
    for (const gauges of [GAUGES, [GAUGES[1], GAUGES[2]], [GAUGES[2]]]) {
      const input = { ...base, gauges };
      const alone = planFill(input);
      expect(planFill(input, shared)).toEqual(alone);
      expect(alone.findings.some((f) => f.severity !== 'note')).toBe(true);
    }
    expect(shared.reviews.size).toBe(1);
    const [kept] = [...shared.reviews.values()];
    expect(kept.length).toBeGreaterThan(0);
  });
});
