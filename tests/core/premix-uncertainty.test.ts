// A source's own composition uncertainty (a premix made in a first stage) in the batch's GUM budget.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  compositionTermsOf,
  designMixture,
  planFill,
  predictPlan,
  premixSource,
  pureCylinder,
  type CompositionTerm,
  type Gauge,
  type GasSource,
  type Plan,
} from '../../src/core/index.js';
import { TORR } from '../helpers.js';

const head = (id: string, fsTorr: number, resTorr: number, acc: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: acc,
  accuracyOfFullScale: 0,
  resolutionPa: resTorr * TORR,
  unit: 'Torr',
});
const A = head('A-1kT', 1000, 0.01, 0.0012);
const B = head('B-10kT', 10000, 0.1, 0.0015);
const T = 298.15;
const reading = { barometricPa: 101325, barometricUncertaintyPa: 40 };
const thermometer = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };

/** a batch of 40 % of a 5 % O2 / Ar premix topped up with Ar: premix first, then Ar (given order) */
function batchWith(source: GasSource): Plan {
  return planFill({
    design: designMixture({ kind: 'fractions', fractions: { O2: 0.02, Ar: 0.98 } }),
    finalPressurePa: 1500 * TORR,
    temperatureK: T,
    tank: { id: 'T', label: 'T', volumeM3: 0.01 },
    sources: [source, pureCylinder({ id: 'cyl-Ar', species: 'Ar', purity: 1 })],
    order: 'given',
    gauges: [A, B],
    reading,
    tolerance: { relative: 0.005, absolute: 0 },
  });
}

const premixOf = (terms?: readonly CompositionTerm[]): GasSource => ({
  ...premixSource({
    id: 'PM',
    tank: 'T2',
    gases: ['O2', 'Ar'],
    composition: { O2: 0.05, Ar: 0.95 },
    unidentified: 0,
    pressurePa: 4e5,
  }),
  compositionTerms: terms,
});
const predict = (plan: Plan) => predictPlan({ plan, gauges: [A, B], reading, thermometer })!;

describe('premix composition terms in the batch budget: against a hand GUM calculation (JCGM 100:2008)', () => {
  /**
   * JCGM 100:2008 5.1.2 (law of propagation, independent inputs). The batch holds a share f = n_PM / n of
   * the premix, so x_O2 = p f with p the premix's O2 fraction. One composition input q of the premix,
   * rectangular with half-width a (GUM 4.3.7: u(q) = a / sqrt(3)), moving p by +1 and the premix's Ar by
   * -1 per unit: c = dx_O2/dq = f, so its contribution is f a / sqrt(3), the same for x_Ar (with the
   * opposite sign); the other inputs are those of the batch alone, so
   *   u_c^2(with) = u_c^2(without) + (f a / sqrt(3))^2.
   * f from the plan's own amounts (n_PM / n_final). Second-order effects (B_mix of the premix moving
   * with q) are below 1e-4 of the term here: tolerance 0.5 % on the term, identity on the rest.
   */
  it('one rectangular input of the premix: contribution f a / sqrt(3) on O2 and Ar', () => {
    const a = 2e-4;
    const term: CompositionTerm = {
      name: 'O2 share',
      dist: 'rectangular',
      scale: a,
      unit: '1',
      sensitivity: { O2: 1, Ar: -1 },
    };
    const plan = batchWith(premixOf([term]));
    const bare = predict(batchWith(premixOf()));
    const p = predict(plan);
    const f = plan.steps[0].amountMol / plan.final.amountMol;
    const hand = (f * a) / Math.sqrt(3);
    for (const k of ['O2', 'Ar']) {
      const i = p.result.components.findIndex((c) => c.name === 'PM: O2 share');
      expect(i).toBeGreaterThanOrEqual(0);
      const c = Math.abs(p.result.composition[k].contributions![i]);
      expect(Math.abs(c / hand - 1)).toBeLessThan(0.005);
      const u0 = bare.result.composition[k].u;
      // identity: the other inputs are unchanged, so u^2 adds
      expect(p.result.composition[k].u ** 2).toBeCloseTo(u0 ** 2 + c ** 2, 14);
    }
    expect(p.result.components.find((c) => c.name === 'PM: O2 share')?.about).toEqual({
      kind: 'source-composition',
      source: 'PM',
      input: 'O2 share',
    });
  });

  it("a first stage's budget as terms reproduces its own u of every fraction (identity: sum of (c u)^2)", () => {
    const stage1 = planFill({
      design: designMixture({ kind: 'fractions', fractions: { O2: 0.05, Ar: 0.95 } }),
      finalPressurePa: 3000 * TORR,
      temperatureK: T,
      tank: { id: 'T2', label: 'T2', volumeM3: 0.03 },
      sources: ['O2', 'Ar'].map((s) => pureCylinder({ id: `cyl-${s}`, species: s, purity: 0.99999 })),
      order: 'given',
      gauges: [A, B],
      reading,
      tolerance: { relative: 0.005, absolute: 0 },
    });
    const r = predict(stage1).result;
    const terms = compositionTermsOf(r);
    for (const k of ['O2', 'Ar']) {
      const u = Math.sqrt(
        terms.reduce((s, t, j) => {
          const ut = t.dist === 'rectangular' ? t.scale / Math.sqrt(3) : t.scale;
          return s + (t.sensitivity[k] * ut) ** 2 + 0 * j;
        }, 0),
      );
      expect(Math.abs(u / r.composition[k].u - 1)).toBeLessThan(1e-9);
    }
    // the fractions move together: every term's changes sum to zero (identity, 1e-9 of the largest change)
    for (const t of terms) {
      const v = Object.values(t.sensitivity);
      const largest = Math.max(...v.map(Math.abs));
      expect(Math.abs(v.reduce((a, b) => a + b, 0))).toBeLessThanOrEqual(1e-9 * largest);
    }
  });
});

describe('property: the premix uncertainty never lowers the batch U', () => {
  it('U with random premix terms >= U without them, for every fraction (identity of the GUM sum, 1e-15)', () => {
    const bare = predict(batchWith(premixOf()));
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            d: fc.double({ min: -1, max: 1, noNaN: true }),
            scale: fc.double({ min: 1e-7, max: 1e-3, noNaN: true }),
            normal: fc.boolean(),
          }),
          { minLength: 1, maxLength: 4 },
        ),
        (xs) => {
          const terms: CompositionTerm[] = xs.map((x, i) => ({
            name: `t${i}`,
            dist: x.normal ? 'normal' : 'rectangular',
            scale: x.scale,
            unit: '1',
            sensitivity: { O2: x.d, Ar: -x.d },
          }));
          const p = predict(batchWith(premixOf(terms)));
          for (const k of ['O2', 'Ar'])
            expect(p.result.composition[k].u).toBeGreaterThanOrEqual(
              bare.result.composition[k].u * (1 - 1e-15),
            );
        },
      ),
      { numRuns: 25 },
    );
  });
});
