// The supply of a source judged once (core/supply-check.ts) for the plan's steps, which the sequence
// search reviews for every candidate, and for the final delivery check (premixDeliveryCheck): the
// supply must stay at least 10 % above the reading the tank must reach (PREMIX_DELIVERY_MARGIN, our
// own choice, premix-tank.ts). The premix tank's end pressure is premixDelivery's (its worked example
// is checked against CoolProp 8.0.0 in premix-tank.test.ts); the margins here are arithmetic on it.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  designMixture,
  planFill,
  premixDeliveryCheck,
  premixSource,
  pureCylinder,
  PREMIX_DELIVERY_MARGIN,
  type PlanInput,
} from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { planSteps } from '../../src/core/plan/steps.js';
import { countsAgainstSequence } from '../../src/core/plan/search-eval.js';
import { hazardRank } from '../../src/core/supply-check.js';
import { head, workedInput } from './planner-input.js';
import { runCli, TORR } from '../helpers.js';

const T = 298.15;

function stepsOf(input: PlanInput) {
  const basis = validatePlanInput(input);
  const amounts = planAmounts(basis);
  return planSteps(basis, amounts, planSequence(basis, amounts));
}

describe('a regulated supply: at least the target plus the 10 % margin (arithmetic, 1e-12 relative)', () => {
  it('O2 regulated just short of its step target x 1.1 is a danger of that step, with the supply it needs; just above it, none', () => {
    const input = workedInput();
    const target = stepsOf(input).steps.find((s) => s.source.id === 'O2')!.targetPa;
    const withO2At = (supplyPa: number) =>
      stepsOf({
        ...input,
        sources: input.sources.map((s) => (s.id === 'O2' ? { ...s, supplyPressurePa: supplyPa } : s)),
      }).findings.filter((f) => f.code === 'supply-pressure-low');
    // above the target itself (the old test passed it) but below the margin
    const short = withO2At(target * 1.099);
    expect(short).toHaveLength(1);
    const f = short[0] as Extract<(typeof short)[number], { code: 'supply-pressure-low' }>;
    expect(f).toMatchObject({ severity: 'danger', source: 'O2' });
    expect(Math.abs(f.requiredPa / (target * (1 + PREMIX_DELIVERY_MARGIN)) - 1)).toBeLessThan(1e-12);
    expect(withO2At(target * 1.101)).toEqual([]);
  });
});

describe('a premix tank: the plan judges its falling pressure as the final delivery check does', () => {
  // CH4 phi 1 in 90 % Ar, 10 L to 1000 Torr; the fuel from a premix of 10 % CH4 in Ar in a 5 L tank
  const design = designMixture({
    kind: 'phi',
    fuel: { CH4: 1 },
    oxidizer: { O2: 1 },
    diluent: { Ar: 1 },
    phi: 1,
    basis: { kind: 'dilution', value: 0.9 },
  });
  const premixTank = { id: 'PT', label: 'PT', volumeM3: 0.005 };
  const premixAt = (startPa: number) =>
    premixSource({
      id: 'premix-PT',
      tank: 'PT',
      gases: ['CH4', 'Ar'],
      composition: { CH4: 0.1, Ar: 0.9 },
      unidentified: 0,
      pressurePa: startPa,
      tankVolumeM3: premixTank.volumeM3,
    });
  const cyl = (s: string) => pureCylinder({ id: s, species: s, purity: 1 });
  const planWith = (startPa: number, order: 'given' | 'recommend') => {
    const premix = premixAt(startPa);
    const plan = planFill({
      design,
      finalPressurePa: 1000 * TORR,
      temperatureK: T,
      tank: { id: 'T', label: 'T', volumeM3: 0.01 },
      // given: Ar, then the premix (its charge ends near 933 Torr), then O2
      sources: [cyl('Ar'), premix, cyl('O2')],
      order,
      gauges: [head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)],
      reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
      tolerance: { relative: 0.005, absolute: 0 },
    });
    return { plan, final: premixDeliveryCheck(plan, premix, premixTank, startPa) };
  };
  const codes = <F extends { code: string }>(fs: readonly F[]) =>
    fs.filter((f) => f.code === 'premix-runs-low' || f.code === 'premix-cools-low');

  /** bisection on the start pressure (the settled end rises with it) to the margin itself */
  function settledEdge(): number {
    let lo = 1000 * TORR;
    let hi = 5000 * TORR;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      const { final } = planWith(mid, 'given');
      if (final.check.endPa < final.check.requiredPa) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  }

  it('the start pressure that leaves the tank settled exactly at target x 1.1 after Ar, premix, O2: 0.1 % less is refused by both, 0.1 % more by neither', () => {
    const edge = settledEdge();
    const short = planWith(edge * 0.999, 'given');
    expect(short.plan.steps.map((s) => s.source.id)).toEqual(['Ar', 'premix-PT', 'O2']);
    expect(codes(short.final.findings).map((f) => f.code)).toEqual(['premix-runs-low']);
    // the plan's own steps (what the search reviews) carry the same finding, with the same numbers
    expect(codes(short.plan.findings)).toEqual(codes(short.final.findings));
    expect(Math.abs(short.final.check.requiredPa / (short.final.check.targetPa * 1.1) - 1)).toBeLessThan(
      1e-12,
    );
    const enough = planWith(edge * 1.001, 'given');
    expect(codes(enough.final.findings).filter((f) => f.code === 'premix-runs-low')).toEqual([]);
    expect(codes(enough.plan.findings)).toEqual(codes(enough.final.findings));
  });

  // our own ranking (supply-check.ts, no outside reference): the supply's dangers after those of the
  // states and fills, then its warnings; the sequence search counts each against a sequence
  it("premix-cools-low (settled end enough, the fast delivery's cold gas short) is counted: hazardRank's last count (the supply's warnings), and against a sequence in the search", () => {
    const edge = settledEdge();
    const cool = planWith(edge * 1.001, 'given');
    const found = codes(cool.plan.findings);
    expect(found.map((f) => [f.code, f.severity])).toEqual([['premix-cools-low', 'warning']]);
    expect(hazardRank(found)).toEqual([0, 0, 0, 0, 1]);
    expect(hazardRank(cool.plan.findings)[4]).toBe(1);
    expect(countsAgainstSequence(found[0])).toBe(true);
    // a supply danger stays counted as one, before any warning
    const short = codes(planWith(edge * 0.999, 'given').plan.findings);
    expect(hazardRank(short)).toEqual([0, 0, 0, 1, 0]);
  });

  it('the search picks an order whose premix charge the final check accepts, when one exists', () => {
    // from 1500 Torr the tank ends near 834 Torr: short for a charge to 933 Torr (needs 1027), enough
    // for the premix first (to about 333 Torr, needs 367)
    const { plan, final } = planWith(1500 * TORR, 'recommend');
    expect(codes(final.findings)).toEqual([]);
    expect(codes(plan.findings)).toEqual([]);
    const given = planWith(1500 * TORR, 'given');
    expect(codes(given.plan.findings).map((f) => f.code)).toEqual(['premix-runs-low']);
  });
});

describe('a supply that runs short never buys a more hazardous sequence', () => {
  it('a premix tank filled to 240 Torr, short for every order: the batch keeps the premix after CH4 and Ar, no flammable or detonable state, and names the shortfall', async () => {
    // with the supply's danger counted like a state's, the search split the premix around CH4
    // (its last charge to 159 Torr passes the margin) through a detonable state; with the supply's
    // dangers counted before the states' warnings, it read the premix at 213 Torr (one supply danger
    // fewer) through a flammable state: a state hazard of any severity now ranks first (hazardRank)
    const dir = mkdtempSync(join(tmpdir(), 'mw-supply-'));
    const recipe = join(dir, 'low.yaml');
    writeFileSync(
      recipe,
      'id: low\ntank: MT-1\nmixture: {fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1, dilution: 0.98}\n' +
        'pressure: 1500 Torr\ntemperature: 25 degC\npremix: {tank: MT-2, pressure: 240 Torr, gases: [O2]}\n',
    );
    const r = await runCli(['plan', recipe, '--json']);
    expect(r.code).toBe(3);
    const plan = JSON.parse(r.stdout) as { findings: { severity: string; code: string }[] };
    const dangers = plan.findings.filter((f) => f.severity === 'danger').map((f) => f.code);
    expect(dangers).toEqual(['supply-pressure-low', 'premix-runs-low']);
    const states = plan.findings.filter((f) => /flammable|detonable|closed-vessel/.test(f.code));
    expect(states).toEqual([]);
  });
});
