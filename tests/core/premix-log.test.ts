// A batch drawn from an existing premix: the shared instrument inputs between the stages (a hand GUM
// calculation, JCGM 100:2008) and the core's refusals (planFromPremix).
import { describe, expect, it } from 'vitest';
import {
  amountDrawn,
  evaluateUncertainty,
  planFromPremix,
  planTwoStage,
  premixSource,
  ProblemError,
  pureCylinder,
  type CheckedReading,
  type Gauge,
  type UncertaintySettings,
} from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { TORR } from '../helpers.js';

const T = 298.15;
/** a capacitance head whose only error is its span (rectangular, +-a of reading) */
const head = (id: string, a: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: 1e6,
  minimumPa: 0,
  accuracyOfReading: a,
  accuracyOfFullScale: 0,
  resolutionPa: 0,
  unit: 'Torr',
});
const A = head('head-A', 0.0012);
const B = head('head-B', 0.0015);
// only the spans are uncertain: thermometer, barometer and resolution exact
const settings: UncertaintySettings = {
  barometricPa: 101325,
  barometricUncertaintyPa: 0,
  thermometerUncertaintyK: 0,
  thermometerResolutionK: 0,
  temperatureSettlingK: 0,
  trials: 0,
  seed: 1,
};
const o2 = pureCylinder({ id: 'cyl-O2', species: 'O2' });
const ar = pureCylinder({ id: 'cyl-Ar', species: 'Ar' });
const at = (step: number, source: CheckedReading['source'], torr: number, gauge: Gauge): CheckedReading => ({
  step,
  source,
  pressurePa: torr * TORR,
  temperatureK: T,
  gauge,
});

describe('a gauge shared by the premix stage and the batch stage is one input (hand GUM calculation)', () => {
  // Stage 1: O2 to P1 = 50 Torr read on head-A, Ar to P2 = 500 Torr read on head-B.
  // Stage 2: the premix to P3 = 100 Torr on head-A, Ar to P4 = 500 Torr on head-B.
  // Ideal gas: x_p = P1/P2 and x(O2) = x_p P3/P4 = P1 P3 / (P2 P4). A span error s_A multiplies every
  // reading of head-A by (1 + s_A), s_B those of head-B (JCGM 100 4.3.7: rectangular, u = a/sqrt(3)).
  // Shared (one s_A, one s_B for both stages), JCGM 100 5.1.2 with the sensitivity coefficients
  //   d ln x / d s_A = +2 (P1 and P3),  d ln x / d s_B = -2 (P2 and P4):
  //   u(x)/x = sqrt((2 u_A)^2 + (2 u_B)^2)
  // Counted as four independent inputs (one per stage and gauge, each coefficient +-1):
  //   u(x)/x = sqrt(2 u_A^2 + 2 u_B^2), smaller by sqrt(2).
  // The virial correction changes each d ln n / d ln P by about B rho (|B rho| < 5e-4 at 500 Torr):
  // tolerance 1e-3 relative on the span contributions.
  const uA = 0.0012 / Math.sqrt(3);
  const uB = 0.0015 / Math.sqrt(3);
  const stage1 = evaluateUncertainty([at(1, o2, 50, A), at(2, ar, 500, B)], settings, ['Ar']);
  const premixOf = (shared: boolean) =>
    premixSource({
      id: 'premix-MT-2',
      tank: 'MT-2',
      gases: ['O2', 'Ar'],
      composition: Object.fromEntries(stage1.species.map((k) => [k, stage1.composition[k].value])),
      unidentified: stage1.unidentified,
      pressurePa: 2000 * TORR,
      budget: stage1,
      sharedInstruments: shared,
    });
  const batchOf = (shared: boolean) =>
    evaluateUncertainty([at(1, premixOf(shared), 100, A), at(2, ar, 500, B)], settings, ['Ar']);
  const spanU = (r: ReturnType<typeof batchOf>) =>
    Math.sqrt(
      r.components.reduce(
        (a, c, j) => a + (/span of head-/.test(c.name) ? r.composition.O2.contributions![j] ** 2 : 0),
        0,
      ),
    );

  it('shared: u(x_O2)/x = sqrt((2 u_A)^2 + (2 u_B)^2) = 0.002218 (within 1e-3 relative)', () => {
    const r = batchOf(true);
    const x = r.composition.O2.value;
    const hand = Math.sqrt((2 * uA) ** 2 + (2 * uB) ** 2);
    expect(hand).toBeCloseTo(0.0022181, 6);
    expect(Math.abs(spanU(r) / x / hand - 1)).toBeLessThan(1e-3);
    // one component per gauge span in the batch's budget: the premix's terms moved onto them
    expect(r.components.filter((c) => /span of head-/.test(c.name)).map((c) => c.name)).toEqual([
      'span of head-A',
      'span of head-B',
    ]);
  });

  it('independent (another lab: no instrument shared): u(x_O2)/x = sqrt(2 u_A^2 + 2 u_B^2), a factor sqrt(2) less', () => {
    const r = batchOf(false);
    const x = r.composition.O2.value;
    const hand = Math.sqrt(2 * uA ** 2 + 2 * uB ** 2);
    expect(Math.abs(spanU(r) / x / hand - 1)).toBeLessThan(1e-3);
    expect(spanU(batchOf(true)) / spanU(r)).toBeCloseTo(Math.SQRT2, 3);
  });
});

describe('planFromPremix: the demo batch from the premix of its two-stage plan', () => {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const mt2 = req.lab.tanks.find((t) => t.id === 'MT-2')!;
  const thermometer = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };
  const two = planTwoStage({ batch: req.input, premixTank: mt2, thermometer });
  const base = {
    batch: req.input,
    premix: two.source,
    premixTank: mt2,
    startPa: two.choice.pressurePa,
    thermometer,
    log: 'premix.jsonl',
  };
  const refusal = (f: () => unknown) => {
    try {
      f();
    } catch (e) {
      if (e instanceof ProblemError && e.problem.code === 'premix-log-refused') return e.problem.cause;
      throw e;
    }
    throw new Error('not refused');
  };

  it("with the two-stage plan's predicted premix, the same sequence and predicted U (consistency, 1e-6 relative)", () => {
    const p = planFromPremix(base);
    expect(p.batch.steps.map((s) => s.source.id)).toEqual(two.batch.steps.map((s) => s.source.id));
    const rows = two.batch.predicted!.rows;
    for (const r of p.batch.predicted!.rows) {
      const w = rows.find((x) => x.name === r.name)!;
      expect(Math.abs(r.expandedU / w.expandedU - 1), r.name).toBeLessThan(1e-6);
    }
    expect(p.delivery.endPa).toBeCloseTo(two.delivery.endPa, 6);
  });

  it('refuses a premix tank left at 189 Torr: its last charge must reach 520.27 Torr (+ 10 %)', () => {
    const c = refusal(() => planFromPremix({ ...base, startPa: 189 * TORR }));
    expect(c.kind).toBe('too-little-gas');
    if (c.kind === 'too-little-gas') {
      expect(c.targetPa / TORR).toBeCloseTo(520.27, 1);
      expect(c.requiredPa / c.targetPa).toBeCloseTo(1.1, 12);
    }
  });

  it('refuses the batch tank as the premix tank, a premix with a gas not in the design, an order without the premix', () => {
    expect(refusal(() => planFromPremix({ ...base, premixTank: req.input.tank })).kind).toBe('same-tank');
    const he = { ...two.source, composition: { ...two.source.composition, He: 0.01 } };
    const foreign = refusal(() => planFromPremix({ ...base, premix: he }));
    expect(foreign).toMatchObject({ kind: 'foreign-gas', species: ['He'] });
    const given = { ...req.input, order: 'given' as const };
    expect(refusal(() => planFromPremix({ ...base, batch: given }))).toMatchObject({
      kind: 'not-in-order',
      source: 'premix-MT-2',
    });
  });

  it('honours a given order that names the premix: CH4, premix, Ar', () => {
    const cyl = (sp: string) => req.input.sources.find((s) => s.mainSpecies === sp)!;
    const p = planFromPremix({
      ...base,
      batch: { ...req.input, order: 'given', sources: [cyl('CH4'), two.source, cyl('Ar')] },
    });
    expect(p.batch.steps.map((s) => s.source.id)).toEqual(['cyl-CH4', 'premix-MT-2', 'cyl-Ar']);
  });

  it('amountDrawn: the premix fill of the planned batch, read back from its targets, is the amount planned (identity, 1e-9)', () => {
    const p = planFromPremix(base);
    const readings = p.batch.steps.map((s) => ({
      step: s.index,
      source: s.source,
      pressurePa: s.targetPa,
      temperatureK: p.batch.temperatureK,
      gauge: req.input.gauges.find((g) => g.id === s.gauge!.id)!,
    }));
    const planned = p.batch.steps.filter((s) => s.source.id === 'premix-MT-2')[0].amountMol;
    const drawn = amountDrawn(readings, 'premix-MT-2', req.input.tank.volumeM3);
    expect(Math.abs(drawn / planned - 1)).toBeLessThan(1e-9);
  });
});
