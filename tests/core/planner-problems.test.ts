import { describe, expect, it } from 'vitest';
import {
  allocate,
  describeProblem,
  designMixture,
  pureCylinder,
  type Problem,
} from '../../src/core/index.js';
import { refusal as raised } from './planner-input.js';

// the typed problems of the planner, design and supply: each condition its own kind with typed fields,
// and the sentence it prints the same as the free-text reason it replaces (quoted here)

const base = { kind: 'phi' as const, fuel: { CH4: 1 }, oxidizer: { O2: 1 }, diluent: { Ar: 1 } };
const dilution = (value: number) => ({ kind: 'dilution' as const, value });

describe('typed problems of the design', () => {
  const cases: [string, () => unknown, Problem, string, string][] = [
    [
      'an inert named as fuel',
      () => designMixture({ ...base, fuel: { Ar: 1 }, phi: 1, basis: dilution(0.5) }),
      { code: 'design-conflict', kind: 'not-a-fuel', species: 'Ar' },
      'fuel',
      'Ar is not a fuel (it needs no oxygen to burn); list it as oxidizer or diluent',
    ],
    [
      'a fuel in the oxidizer',
      () => designMixture({ ...base, oxidizer: { O2: 0.5, CH4: 0.5 }, phi: 1, basis: dilution(0.5) }),
      { code: 'design-conflict', kind: 'fuel-in-oxidizer', species: 'CH4' },
      'oxidizer',
      'CH4 is a fuel and cannot be part of the oxidizer',
    ],
    [
      'an oxidizer as diluent',
      () => designMixture({ ...base, diluent: { O2: 1 }, phi: 1, basis: dilution(0.5) }),
      { code: 'design-conflict', kind: 'reactive-diluent', species: 'O2' },
      'diluent',
      'O2 takes part in combustion and cannot be a diluent; use an inert gas (Ar, He, N2, CO2, ...)',
    ],
    [
      'an empty fuel blend',
      () => designMixture({ ...base, fuel: {}, phi: 1, basis: dilution(0.5) }),
      { code: 'design-missing', kind: 'empty-blend', blend: 'fuel' },
      'fuel',
      'fuel names no species',
    ],
    [
      'a dilution without a diluent',
      () => designMixture({ ...base, diluent: {}, phi: 1, basis: dilution(0.5) }),
      { code: 'design-missing', kind: 'diluent-for-dilution', dilution: 0.5 },
      'diluent',
      'dilution is 0.5 but no diluent is named; add a diluent (e.g. Ar)',
    ],
    [
      'a diluent ratio without a diluent',
      () => designMixture({ ...base, diluent: {}, phi: 1, basis: { kind: 'diluent-ratio', value: 3.76 } }),
      { code: 'design-missing', kind: 'diluent-for-ratio', ratio: 3.76 },
      'diluent',
      'diluent ratio is 3.76 but no diluent is named; add a diluent (e.g. N2)',
    ],
  ];
  for (const [what, f, problem, field, text] of cases) {
    it(`${what}: ${problem.code} / ${'kind' in problem ? problem.kind : ''}, worded as before`, () => {
      const r = raised(f);
      expect(r.problem).toEqual(problem);
      expect(r.field).toBe(field);
      expect(describeProblem(r.problem)).toBe(text);
    });
  }

  it('a fuel fraction that leaves no room: phi 1 CH4/O2 allows at most 1/3 fuel (CH4 + 2 O2, textbook stoichiometry), to 1e-12', () => {
    const r = raised(() => designMixture({ ...base, phi: 1, basis: { kind: 'fuel-fraction', value: 0.5 } }));
    expect(r.problem).toMatchObject({ code: 'design-conflict', kind: 'fuel-fraction-too-large', phi: 1 });
    if (
      r.problem.code !== 'design-conflict' ||
      !('kind' in r.problem) ||
      r.problem.kind !== 'fuel-fraction-too-large'
    )
      return;
    expect(Math.abs(r.problem.maxFuelFraction - 1 / 3)).toBeLessThan(1e-12);
    expect(describeProblem(r.problem)).toBe(
      'at phi 1 a fuel fraction of 0.5 leaves no room: fuel and oxidizer alone would be 1.5000 of the ' +
        'mixture; the largest fuel fraction is 0.33333',
    );
  });

  it('a fuel fraction that leaves room for a diluent nobody named', () => {
    const r = raised(() =>
      designMixture({ ...base, diluent: {}, phi: 1, basis: { kind: 'fuel-fraction', value: 0.1 } }),
    );
    expect(r.problem).toMatchObject({ code: 'design-missing', kind: 'diluent-for-fuel-fraction' });
    expect(describeProblem(r.problem)).toBe(
      'the fuel fraction 0.1 leaves 0.7000 of the mixture for a diluent, but none is named',
    );
  });

  it('an oxidizer that carries no oxygen is refused (typed) before any arithmetic', () => {
    // every species of the oxidizer group that is not a fuel is an oxidizer or inert; an inert-only oxidizer
    const r = raised(() => designMixture({ ...base, oxidizer: { N2: 1 }, phi: 1, basis: dilution(0.5) }));
    expect(r.problem).toEqual({ code: 'design-conflict', kind: 'oxidizer-without-oxygen' });
    expect(describeProblem(r.problem)).toBe('the oxidizer carries no oxygen; it needs O2 (or N2O, NO)');
  });
});

describe('typed problems of the supply', () => {
  it('a cylinder listing its own gas as an impurity, and impurities over 1 - purity', () => {
    const own = raised(() =>
      pureCylinder({ id: 'c1', species: 'N2', purity: 0.99, impurities: { N2: 0.001 } }),
    );
    expect(own.problem).toEqual({
      code: 'design-conflict',
      kind: 'impurity-is-main-gas',
      cylinder: 'c1',
      species: 'N2',
    });
    expect(describeProblem(own.problem)).toBe('cylinder c1 lists its own gas N2 as an impurity');
    const over = raised(() =>
      pureCylinder({ id: 'c2', species: 'N2', purity: 0.999, impurities: { O2: 0.002 } }),
    );
    expect(over.problem).toMatchObject({
      code: 'design-conflict',
      kind: 'impurities-over-purity',
      cylinder: 'c2',
    });
    expect(describeProblem(over.problem)).toBe(
      'cylinder c2: impurities add up to 0.002, more than 1 - purity = 0.00100',
    );
  });

  it('a design species no source carries, and gas in the tank holding too much of one', () => {
    const ar = pureCylinder({ id: 'ar', species: 'Ar' });
    const none = raised(() => allocate([ar], { Ar: 0.9, O2: 0.1 }, 1));
    expect(none.problem).toEqual({ code: 'no-supply', kind: 'no-cylinder', species: 'O2' });
    expect(describeProblem(none.problem)).toBe(
      'no source can supply O2: no cylinder in the lab profile carries it; add one under cylinders',
    );
    const o2 = pureCylinder({ id: 'o2', species: 'O2' });
    const excess = raised(() =>
      allocate([ar, o2], { Ar: 0.9, O2: 0.1 }, 1, { composition: { O2: 1 }, amountMol: 0.5 }),
    );
    expect(excess.problem).toEqual({ code: 'design-conflict', kind: 'in-tank-excess', species: ['O2'] });
    expect(describeProblem(excess.problem)).toBe(
      'the gas already in the tank holds more O2 than the finished batch should; evacuate the tank or ' +
        'raise the final pressure',
    );
  });
});

describe('the typed planner problems do not capture other problems', () => {
  it('an unknown-reference whose kind happens to read like a planner kind keeps its own wording', () => {
    const p: Problem = { code: 'unknown-reference', kind: 'temperature', id: 'x', choices: ['a'] };
    expect(describeProblem(p)).toBe('no temperature "x" in the lab profile; it lists a');
  });
});
