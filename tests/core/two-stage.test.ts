// Two-stage preparation of the demo batch ch4-o2-ar-phi1 (0.667 % CH4, 1.333 % O2 in Ar, 1500 Torr in MT-1,
// tolerance 0.5 %) with a premix in MT-2: the figures the README's accuracy section records.
import { describe, expect, it } from 'vitest';
import {
  allStageFindings,
  describeFinding,
  planTwoStage,
  predictPlan,
  type PredictedPlan,
  type TwoStagePlan,
} from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { TORR } from '../helpers.js';

const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
const mt2 = req.lab.tanks.find((t) => t.id === 'MT-2')!;
// the demo lab's thermometer (0.3 K, 0.1 K display) and the default settling value (predict.ts)
const thermometer = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };
const relU = (p: PredictedPlan, name: string) => {
  const r = p.predicted!.rows.find((x) => x.name === name)!;
  return r.expandedU / r.design;
};
/** the batch predicted again with the premix's composition terms changed (default: removed, the premix exact) */
function withoutPremixU(two: TwoStagePlan, terms?: TwoStagePlan['source']['compositionTerms']) {
  const bare = { ...two.source, compositionTerms: terms };
  const steps = two.batch.steps.map((s) => (s.source.id === bare.id ? { ...s, source: bare } : s));
  return predictPlan({
    plan: { ...two.batch, steps },
    gauges: req.input.gauges,
    reading: req.input.reading,
    thermometer,
  })!;
}

describe('two-stage demo: ch4-o2-ar-phi1 with a premix in MT-2', () => {
  const two = planTwoStage({ batch: req.input, premixTank: mt2, thermometer });

  it('the chosen premix: 13.42 % O2 in Ar to 1890 Torr in MT-2, Ar then O2, both read on head-10kT', () => {
    expect(two.choice.species).toEqual(['O2']);
    // 10 x the design's O2 : (O2 + Ar) ratio 1.3333/99.3333 (identity of the search's grid)
    expect(two.choice.composition.O2).toBeCloseTo((10 * 0.0133333333) / 0.9933333333, 6);
    expect(two.choice.pressurePa / TORR).toBeCloseTo((0.4 * 0.9 * 7e5) / TORR, 3);
    expect(two.choice.gauges).toEqual(['head-10kT']);
    expect(two.premix.steps.map((s) => s.species)).toEqual(['Ar', 'O2']);
    // the sequence search splits the Ar so that the premix is read on the 1000 Torr head
    expect(two.batch.steps.map((s) => s.species)).toEqual(['CH4', 'Ar', 'Ar+O2', 'Ar']);
    expect(two.candidates).toBeGreaterThan(1);
  });

  it('every design fraction within the 0.5 % tolerance, no danger and no warning in either stage', () => {
    for (const r of two.batch.predicted!.rows.filter((x) => x.kind === 'fraction'))
      expect(r.within).toBe(true);
    expect(allStageFindings(two.batch).filter((f) => f.severity !== 'note')).toEqual([]);
    // the O2/Ar premix is never flammable: no flammability finding in stage 1 (the review's verdict)
    expect(two.premix.findings.filter((f) => /flammable/.test(f.code))).toEqual([]);
  });

  it('predicted U (k = 2), relative, of every design fraction and phi (regression of this model, +-0.005 % abs)', () => {
    // stage 1: the premix
    expect(relU(two.premix, 'O2')).toBeCloseTo(0.002576, 4);
    expect(relU(two.premix, 'Ar')).toBeCloseTo(0.000399, 4);
    // stage 2: the batch, the premix's own uncertainty included
    expect(relU(two.batch, 'CH4')).toBeCloseTo(0.002328, 4);
    expect(relU(two.batch, 'O2')).toBeCloseTo(0.00361, 4);
    expect(relU(two.batch, 'Ar')).toBeCloseTo(0.00006, 4);
    expect(relU(two.batch, 'phi')).toBeCloseTo(0.002904, 4);
  });

  it("the batch's U includes the premix's: larger than with the premix taken as exact, and its budget names it", () => {
    const bare = withoutPremixU(two);
    const o2 = (p: { rows: readonly { name: string; expandedU: number }[] }) =>
      p.rows.find((r) => r.name === 'O2')!.expandedU;
    expect(o2(two.batch.predicted!)).toBeGreaterThan(o2(bare));
    // JCGM 100 5.1.2 with the premix inputs independent of the batch's (no instrument shared): u^2
    // adds (identity, 1e-12 relative)
    const unshared = (two.source.compositionTerms ?? []).map((t) => ({ ...t, shared: undefined }));
    const r = withoutPremixU(two, unshared).result;
    const premixU2 = r.components.reduce(
      (a, c, i) => a + (c.about.kind === 'source-composition' ? r.composition.O2.contributions![i] ** 2 : 0),
      0,
    );
    expect(r.composition.O2.u ** 2).toBeCloseTo(bare.result.composition.O2.u ** 2 + premixU2, 14);
  });

  it('the premix tank stays above the batch reading it must reach: 1890.2 -> 1840.9 Torr, 572.3 Torr needed (its charge ends at 520.28 Torr, + 10 %)', () => {
    expect(two.delivery.startPa / TORR).toBeCloseTo(1890.2, 1);
    expect(two.delivery.endPa / TORR).toBeCloseTo(1840.9, 1);
    expect(two.delivery.requiredPa / TORR).toBeCloseTo(572.3, 1);
  });

  it('the more precise choice: 4.03 % O2 in Ar, O2 first, reaches 0.235 % on O2 but carries oxygen-compression', () => {
    const m = two.mostPrecise!;
    expect(m.choice.order).toBe('minor-first');
    expect(m.warnings).toContain('oxygen-compression');
    const precise = planTwoStage({
      batch: req.input,
      premixTank: mt2,
      thermometer,
      premixSpecies: m.choice.species,
      premixFraction: m.choice.composition.O2,
      premixPressurePa: m.choice.pressurePa,
      premixOrder: m.choice.order,
    });
    expect(relU(precise.premix, 'O2')).toBeCloseTo(0.000655, 4);
    expect(relU(precise.batch, 'O2')).toBeCloseTo(0.002349, 4);
    expect(relU(precise.batch, 'CH4')).toBeCloseTo(0.002328, 4);
    expect(relU(precise.batch, 'phi')).toBeCloseTo(0.000965, 4);
    expect(precise.worstRatio).toBeCloseTo(m.worstRatio, 9);
    // its order is the premix choice's, not one the user gave: the reason says why, never "as given"
    expect(precise.premix.orderReason).not.toBe('as given');
    expect(precise.premix.orderReason).toMatch(/^minor gases first/);
    // nor "recommended", and the safer-order warning names the premix's order, not "the order given"
    expect(precise.premix.orderRecommended).toBe(false);
    const safer = precise.premix.findings.filter((f) => f.code === 'safer-order');
    expect(safer).toHaveLength(1);
    const words = describeFinding(safer[0], String);
    expect(words).toMatch(/^the premix's order \(minor gases first: O2 -> Ar\) makes/);
    expect(words).not.toMatch(/order given/);
  });

  it('refuses the batch tank as the premix tank (two-stage-refused, same-tank)', () => {
    const mt1 = req.lab.tanks.find((t) => t.id === 'MT-1')!;
    expect(() => planTwoStage({ batch: req.input, premixTank: mt1, thermometer })).toThrowError(
      expect.objectContaining({ problem: { code: 'two-stage-refused', kind: 'same-tank', tank: 'MT-1' } }),
    );
  });
});

// The proposal's search leaves out the premix pressures whose tank certainly runs low (premix-runs-low,
// a danger it never offers): its choice is the full search's whenever that one has no danger, and a
// premix tank too small for every choice yields no proposal. Structural identities, no outside number.
describe('two-stage search for a proposal (plan without --premix-tank)', () => {
  it('ch4-o2-ar-phi1 in MT-1 with MT-2: the same choice, batch and U as the full search', () => {
    const full = planTwoStage({ batch: req.input, premixTank: mt2, thermometer });
    const proposal = planTwoStage({ batch: req.input, premixTank: mt2, thermometer }, 'proposal');
    expect(proposal.choice).toEqual(full.choice);
    expect(proposal.worstRatio).toBe(full.worstRatio);
    expect(proposal.batch.steps.map((s) => s.targetPa)).toEqual(full.batch.steps.map((s) => s.targetPa));
  });

  it('the 5-source demo design (CH4+H2, O2, Ar+He, 1500 Torr in the 30 L MT-2) from the 10 L MT-1: every full-search choice runs low (danger); the proposal search plans none', () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-two-'));
    const file = join(dir, 'five.yaml');
    writeFileSync(
      file,
      [
        'id: five',
        'tank: MT-2',
        'mixture:',
        '  fuel: { CH4: 0.5, H2: 0.5 }',
        '  oxidizer: O2',
        '  diluent: { Ar: 0.5, He: 0.5 }',
        '  phi: 0.5',
        '  dilution: 0.9',
        'pressure: 1500 Torr',
        'temperature: 22 degC',
        '',
      ].join('\n'),
    );
    const five = buildPlanRequest(readRecipe(file));
    const mt1 = five.lab.tanks.find((t) => t.id === 'MT-1')!;
    const full = planTwoStage({ batch: five.input, premixTank: mt1, thermometer });
    expect(allStageFindings(full.batch).some((f) => f.code === 'premix-runs-low')).toBe(true);
    expect(() => planTwoStage({ batch: five.input, premixTank: mt1, thermometer }, 'proposal')).toThrow(
      /two-stage-refused/,
    );
  });
});

describe('two-stage-proposed wording', () => {
  const base = {
    severity: 'note',
    code: 'two-stage-proposed',
    premixTank: 'MT-2',
    premix: '0.12 % O2 in Ar',
    species: 'O2',
    singleU: 0.094,
    twoStageU: 0.0023,
    tolerance: 0.005,
    twoStageWorst: 0.45,
    command: 'mixwright plan r.yaml --premix-tank MT-2',
  } as const;
  it('names the warnings the proposed plan carries, before its command', () => {
    const words = describeFinding({ ...base, warnings: ['safer-order', 'oxygen-compression'] }, String);
    expect(words).toBe(
      'a premix of 0.12 % O2 in Ar in MT-2 first would give U of x(O2) 0.23 % instead of 9.4 %; its plan ' +
        'carries warnings (safer-order, oxygen-compression): read them in the two-stage plan before ' +
        'choosing it: mixwright plan r.yaml --premix-tank MT-2',
    );
    expect(describeFinding({ ...base, warnings: [] }, String)).not.toMatch(/warning/);
  });
});
