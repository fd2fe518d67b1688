// `check` reviews the fill as recorded at the temperatures recorded with its readings: each state at
// its reading's, each fill's path (and the compression it makes) at the warmer of its two readings.
// Reference: the planner's own review of its targets (plan/review.ts safetyFindings, one code with
// core/sequence-review.ts). A log read exactly at a plan's targets at the plan's temperature gives the
// plan's review back: every number within 1e-9 relative (the inverse model's density solve stops at
// 1e-13 and the equilibrium flame temperature's at about 1e-10 relative: 1.9e-10 measured on
// ng-blend-air), and the worded findings, at six figures, equal to the letter.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkFile } from '../../src/io/check.js';
import { buildPlanRequest, readRecipe, type PlanRequest } from '../../src/io/load.js';
import {
  describeFinding,
  planFill,
  reviewFill,
  reviewRecordedFill,
  reviewState,
  TORR_PA,
  type Finding,
  type Plan,
} from '../../src/core/index.js';
import { checkToText } from '../../src/report/check-report.js';
import { logAtTargets } from '../log-at-targets.js';

const dir = mkdtempSync(join(tmpdir(), 'mw-recorded-T-'));
const torr = (pa: number) => `${(pa / TORR_PA).toPrecision(6)} Torr`;
const key = (f: { code: string; step?: number | null }) => `${f.code}@${f.step ?? ''}`;

/** the CH4/O2/Ar recipe filled CH4, O2, Ar (undiluted CH4/O2 after fill 2: detonable, common practice) */
function inOrder(): { req: PlanRequest; plan: Plan } {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const by = (sp: string) => req.input.sources.find((s) => s.mainSpecies === sp)!;
  const input = { ...req.input, sources: [by('CH4'), by('O2'), by('Ar')], order: 'given' as const };
  delete (input as { charges?: unknown }).charges;
  return { req, plan: planFill(input) };
}
function asPlanned(recipe: string): { req: PlanRequest; plan: Plan } {
  const req = buildPlanRequest(readRecipe(recipe));
  return { req, plan: planFill(req.input) };
}

/** the relative differences of every number of two findings (same keys), and any other field that differs */
function differences(a: object, b: object, path = ''): { worst: number; other: string[] } {
  let worst = 0;
  const other: string[] = [];
  for (const [k, v] of Object.entries(a)) {
    const w = (b as Record<string, unknown>)[k];
    if (typeof v === 'number' && typeof w === 'number')
      worst = Math.max(worst, Math.abs(v - w) / Math.max(Math.abs(v), Number.MIN_VALUE));
    else if (v && typeof v === 'object' && w && typeof w === 'object') {
      const d = differences(v, w, `${path}${k}.`);
      worst = Math.max(worst, d.worst);
      other.push(...d.other);
    } else if (v !== w) other.push(`${path}${k}`);
  }
  return { worst, other };
}

const readingsOf = (plan: Plan, T: (step: number) => number) =>
  plan.steps.map((s) => ({
    step: s.index,
    source: s.source,
    pressurePa: s.targetPa,
    temperatureK: T(s.index),
  }));
const safetyOf = (req: PlanRequest) => ({
  tankId: req.input.tank.id,
  workingLimitPa:
    req.input.tank.ratedPressurePa === undefined
      ? undefined
      : req.input.tank.ratedPressurePa * (req.input.tank.workingFraction ?? 1),
  coldestK: req.input.safety?.coldestK,
  condensationFraction: req.input.safety?.condensationFraction,
});

describe("a log read at the plan's targets at the plan's temperature: the plan's review, number for number", () => {
  it.each([
    ['CH4, O2, Ar (detonable-state at fill 2, compression at fill 3)', inOrder],
    [
      'ng-blend-air (a flammable mixture: its equilibrium flame temperature)',
      () => asPlanned('recipes/ng-blend-air.yaml'),
    ],
    ['c2h4-o2-ar-phi05 as planned', () => asPlanned('recipes/c2h4-o2-ar-phi05.yaml')],
  ])('%s', async (_name, make) => {
    const { req, plan } = make();
    const review = reviewRecordedFill({
      readings: readingsOf(plan, () => plan.temperatureK),
      safety: safetyOf(req),
    });
    const listed = review.findings.filter((f) => f.severity !== 'note');
    for (const f of review.findings) {
      const same = plan.findings.filter(
        (p) => key(p) === key(f) && p.code === f.code && p.severity === f.severity,
      );
      expect(same.length, key(f)).toBeGreaterThan(0);
      // of the plan's findings of that code and fill, the one nearest (a data note can be said twice)
      const d = same
        .map((p) => differences(f, p))
        .sort((x, y) => x.other.length - y.other.length || x.worst - y.worst)[0];
      expect(d.other, key(f)).toEqual([]);
      expect(d.worst, key(f)).toBeLessThan(1e-9);
    }
    // check of that log words the same findings as the plan does, to the letter
    const file = logAtTargets(
      join(dir, `${plan.steps.length}-${listed.length}-${Date.now()}.jsonl`),
      plan,
      req,
      'tt',
      undefined,
    );
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    const worded = (fs: readonly Finding[]) =>
      fs
        .filter((f) => f.severity !== 'note' && f.code !== 'tank-rating-unknown')
        .map((f) => `${key(f)} ${describeFinding(f, torr)}`)
        .sort();
    const planSafety = plan.findings.filter((p) =>
      listed.some((f) => key(f) === key(p) && f.code === p.code),
    );
    expect(rep.recordedFill!.findings.map((f) => `${key(f)} ${f.message}`).sort()).toEqual(
      worded(planSafety),
    );
    expect(rep.recordedFill!.temperatures).toEqual({
      coldestK: plan.temperatureK,
      warmestK: plan.temperatureK,
    });
  });
});

describe('readings at other temperatures: each state at its own, each fill at the warmer of its two readings', () => {
  const { req, plan } = inOrder();
  const T: Record<number, number> = { 1: 298.15, 2: 313.15, 3: 303.15 };
  const review = reviewRecordedFill({ readings: readingsOf(plan, (k) => T[k]), safety: safetyOf(req) });
  const [s1, s2, s3] = review.states.map((s, i) => ({ ...s, final: i === 2 }));
  const ctx = { ...safetyOf(req), temperatureK: 298.15, coldestK: safetyOf(req).coldestK ?? 298.15 };
  const found = (code: string, step: number) =>
    review.findings.find((f) => f.code === code && f.step === step);

  it('the detonable state after fill 2 is judged at 40 degC, its own reading (the same review at 25 degC differs)', () => {
    const at = (K: number) =>
      reviewState(s2, { ...ctx, temperatureK: K }).findings.find((f) => f.code === 'detonable-state');
    expect(found('detonable-state', 2)).toEqual(at(313.15));
    expect(found('detonable-state', 2)).not.toEqual(at(298.15));
  });

  it("fill 3's compression starts from the warmer end, 40 degC (not fill 3's own 30 degC)", () => {
    const at = (K: number) =>
      reviewFill(
        {
          step: 3,
          sourceId: 'cyl-Ar',
          sourceComposition: plan.steps[2].source.composition,
          before: s2,
          after: s3,
        },
        { ...ctx, temperatureK: K },
      ).find((f) => f.code === 'compression-heating');
    expect(found('compression-heating', 3)).toEqual(at(313.15));
    expect(found('compression-heating', 3)).not.toEqual(at(303.15));
    expect(s1.temperatureK).toBe(298.15);
  });

  it('check says so: each state at its reading, 25.0 to 40.0 degC, each path at the warmer end', async () => {
    const file = logAtTargets(join(dir, 'warm.jsonl'), plan, req, 'warm', undefined, {
      temperatureOf: (k) => T[k],
    });
    const text = checkToText(await checkFile(file, { trials: 0, seed: 1 }));
    expect(text.replace(/\s+/g, ' ')).toContain(
      "of each fill's path; each state at its reading's temperature (25.0 to 40.0 degC), each fill's path " +
        'at the warmer of its two readings)',
    );
  });
});
