/**
 * The fill order with charges: a gas named again is filled in another charge, and a charge that
 * is not its gas's last may stop at an absolute tank reading after "@" (`--order` and a recipe's
 * `order:`, as a string or a { fill, until } mapping). Parsing tests assert the exact problem.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProblemError, type Problem, type Where } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { mergeOptions, type DesignValues } from '../../src/cli/design-options.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
/** 1 Torr = 101325/760 Pa exactly (definition of the Torr, ISO 80000-4) */
const TORR = 101325 / 760;
/** 1 psi = 0.45359237 kg x 9.80665 m/s^2 / (0.0254 m)^2 exactly (NIST SP 811, exact conversion factors) */
const PSI = (0.45359237 * 9.80665) / 0.0254 ** 2;

const request = (o: DesignValues, recipe: string | undefined = RECIPE) =>
  buildPlanRequest(mergeOptions(recipe ? readRecipe(recipe) : undefined, o));

/** the problem and where a call is refused */
function refused(f: () => unknown): { problem: Problem; where: Where } {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return { problem: e.problem, where: e.where };
    throw e;
  }
  throw new Error('not refused');
}

const dir = mkdtempSync(join(tmpdir(), 'mw-order-'));
/** a recipe file: the demo CH4/O2/Ar design with this order (YAML lines) */
function recipeWithOrder(orderYaml: string, extra = ''): string {
  const f = join(dir, `r${Math.random().toString(36).slice(2)}.yaml`);
  writeFileSync(
    f,
    'id: split\ntank: MT-1\nmixture: { fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1, dilution: 0.98 }\n' +
      `pressure: 1500 Torr\ntemperature: 25 degC\n${extra}order:\n${orderYaml}`,
  );
  return f;
}

describe('charges reach PlanInput.charges', () => {
  it('--order "CH4,Ar@400 Torr,O2,Ar": four charges, Ar twice, the first stopping at 400 Torr = 53328.9 Pa', () => {
    const { input } = request({ order: 'CH4,Ar@400 Torr,O2,Ar' });
    expect(input.order).toBe('given');
    expect(input.sources.map((s) => s.id)).toEqual(['cyl-CH4', 'cyl-Ar', 'cyl-O2']);
    expect(input.charges!.map((c) => c.source.id)).toEqual(['cyl-CH4', 'cyl-Ar', 'cyl-O2', 'cyl-Ar']);
    // the same source object in both of its charges, and the one of `sources`
    expect(input.charges![1].source).toBe(input.sources[1]);
    expect(input.charges![3].source).toBe(input.sources[1]);
    expect(input.charges!.map((c) => c.stopPa === undefined)).toEqual([true, false, true, true]);
    // 400 x 101325/760 = 53328.947... Pa (definition of the Torr), to 1e-9 Pa
    expect(input.charges![1].stopPa).toBeCloseTo(400 * TORR, 9);
    expect(input.charges![1].stopPa!.toFixed(1)).toBe('53328.9');
  });

  it('a recipe gives the same charges as a string "Ar@400 Torr" or as { fill: Ar, until: 400 Torr }', () => {
    const asText = buildPlanRequest(
      readRecipe(recipeWithOrder('  - CH4\n  - Ar@400 Torr\n  - O2\n  - Ar\n')),
    );
    const asMap = buildPlanRequest(
      readRecipe(recipeWithOrder('  - CH4\n  - { fill: Ar, until: 400 Torr }\n  - O2\n  - fill: Ar\n')),
    );
    for (const { input } of [asText, asMap]) {
      expect(input.charges!.map((c) => [c.source.id, c.stopPa])).toEqual([
        ['cyl-CH4', undefined],
        ['cyl-Ar', 400 * TORR],
        ['cyl-O2', undefined],
        ['cyl-Ar', undefined],
      ]);
    }
  });

  it('a gauge-referenced stop is made absolute with the barometer, as other pressures are', () => {
    // demo lab barometer 760 Torr = 101325 Pa; --barometer overrides it
    const lab = request({ order: 'CH4,Ar@5 psig,O2,Ar' }).input.charges![1].stopPa!;
    expect(lab).toBeCloseTo(101325 + 5 * PSI, 6); // 135798.79 Pa
    const rs = mergeOptions(readRecipe(RECIPE), { order: 'CH4,Ar@5 psig,O2,Ar' });
    const given = buildPlanRequest(rs, undefined, { barometricPa: 750 * TORR });
    expect(given.input.charges![1].stopPa).toBeCloseTo(750 * TORR + 5 * PSI, 6);
  });

  it('an order that names every gas once gives no charges (one charge per source, in the order of sources)', () => {
    const { input } = request({ order: 'CH4,Ar,O2' });
    expect(input.charges).toBeUndefined();
    expect(input.sources.map((s) => s.mainSpecies)).toEqual(['CH4', 'Ar', 'O2']);
  });

  it('a gas named twice without a stop: two charges, the split point left to the planner', () => {
    const { input } = request({ order: 'CH4,Ar,O2,Ar' });
    expect(input.charges!.map((c) => [c.source.mainSpecies, c.stopPa])).toEqual([
      ['CH4', undefined],
      ['Ar', undefined],
      ['O2', undefined],
      ['Ar', undefined],
    ]);
  });
});

describe('refusals of an order with charges: exact problems, at the option or the recipe line', () => {
  const at = { field: '--order' };
  const cases: [string, string, Problem][] = [
    [
      'a stop on the last charge of its gas',
      'CH4,Ar,O2,Ar@400 Torr',
      {
        code: 'order-stop',
        entry: 'Ar@400 Torr',
        fault: { kind: 'on-last-charge', source: 'Ar', charges: 2 },
      },
    ],
    [
      'a stop on the only charge of its gas',
      'CH4@5 Torr,Ar,O2',
      {
        code: 'order-stop',
        entry: 'CH4@5 Torr',
        fault: { kind: 'on-last-charge', source: 'CH4', charges: 1 },
      },
    ],
    [
      'a stop without a unit',
      'CH4,Ar@400,O2,Ar',
      { code: 'order-stop', entry: 'Ar@400', fault: { kind: 'unit-missing' } },
    ],
    [
      'a stop that is not a pressure',
      'CH4,Ar@30 L,O2,Ar',
      { code: 'order-stop', entry: 'Ar@30 L', fault: { kind: 'not-a-pressure', got: 'volume' } },
    ],
    ['nothing after @', 'CH4,Ar@,O2,Ar', { code: 'order-stop', entry: 'Ar@', fault: { kind: 'empty' } }],
    [
      'a stop that is no quantity',
      'CH4,Ar@soon,O2,Ar',
      {
        code: 'order-stop',
        entry: 'Ar@soon',
        fault: { kind: 'unreadable', quantity: { kind: 'not-number-and-unit' } },
      },
    ],
    [
      'a stop not above the stop before it',
      'CH4,Ar@400 Torr,O2,Ar@300 Torr,Ar',
      {
        code: 'order-stop',
        entry: 'Ar@300 Torr',
        fault: {
          kind: 'not-above-previous',
          stopPa: 300 * TORR,
          previous: { kind: 'stop', entry: 'Ar@400 Torr', stopPa: 400 * TORR },
        },
      },
    ],
    [
      'a stop of zero: not above the evacuated tank',
      'CH4,Ar@0 Torr,O2,Ar',
      {
        code: 'order-stop',
        entry: 'Ar@0 Torr',
        fault: { kind: 'not-above-previous', stopPa: 0, previous: { kind: 'evacuated' } },
      },
    ],
    [
      'a stop at or above the final pressure (1500 Torr)',
      'CH4,Ar@1500 Torr,O2,Ar',
      {
        code: 'order-stop',
        entry: 'Ar@1500 Torr',
        fault: { kind: 'not-below-final', stopPa: 1500 * TORR, finalPa: 1500 * TORR },
      },
    ],
    [
      'a gas the mixture does not fill',
      'CH4,Ar,O2,He@10 Torr,He',
      {
        code: 'order-unknown',
        unknown: ['He'],
        choices: ['CH4', 'O2', 'Ar'],
      },
    ],
    ['a gas left out', 'CH4,Ar@400 Torr,Ar', { code: 'order-missing', missing: ['O2'] }],
  ];
  for (const [what, order, problem] of cases)
    it(`${what}: ${order}`, () => {
      const r = refused(() => request({ order }));
      expect(r.problem).toEqual(problem);
      expect(r.where).toEqual(at);
    });

  it('a stop below the gas already in the tank', () => {
    const f = recipeWithOrder(
      '  - CH4\n  - Ar@100 Torr\n  - O2\n  - Ar\n',
      'in_tank: { composition: { Ar: 1 }, pressure: 120 Torr }\n',
    );
    const r = refused(() => buildPlanRequest(readRecipe(f)));
    expect(r.problem).toEqual({
      code: 'order-stop',
      entry: 'Ar@100 Torr',
      fault: {
        kind: 'not-above-previous',
        stopPa: 100 * TORR,
        previous: { kind: 'in-tank', pressurePa: 120 * TORR },
      },
    });
  });

  it('in a recipe the refusal names the line of the entry', () => {
    const f = recipeWithOrder('  - CH4\n  - Ar\n  - O2\n  - { fill: Ar, until: 400 Torr }\n');
    const r = refused(() => buildPlanRequest(readRecipe(f)));
    expect(r.problem).toEqual({
      code: 'order-stop',
      entry: 'Ar@400 Torr',
      fault: { kind: 'on-last-charge', source: 'Ar', charges: 2 },
    });
    expect(r.where).toMatchObject({ file: f, line: 10, field: 'order[3]' });
  });
});
