// Re-check throughput, bundled into dist/bench-check.mjs by scripts/build.mjs and run by scripts/bench.mjs:
//  1. the Monte Carlo re-check of a 4-gas batch with 1e6 trials (in-process wall time);
//  2. writes a folder of 1000 batch logs for the folder re-check that bench.mjs times as a cold command;
//  3. ('equilibrium') the time per state of the closed-vessel equilibrium and of the CJ detonation state;
//  4. ('search') the size and time of the sequence search of each demo recipe and of a 5-source design.
//  5. ('proposal') the size and time of the two-stage proposal's search for the same designs.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { chapmanJouguet, equilibriumUV, planFill, planTwoStage, ProblemError } from '../src/core/index.js';
import { planWithPrediction, predictionThermometer } from '../src/io/plan-predict.js';
import { twoStageProposal } from '../src/io/two-stage-request.js';
import { evaluateUncertaintyParallel } from '../src/io/parallel-mc.js';
import { buildPlanRequest, loadLab } from '../src/io/load.js';
import { appendEvent, createLog } from '../src/io/batch-log.js';
import { headerFromPlan } from '../src/io/check.js';
import { readRecipe, validateRecipeObject, type RecipeSource } from '../src/io/load.js';
import { validatePlanInput } from '../src/core/plan/validate.js';
import { planAmounts } from '../src/core/plan/amounts.js';
import { searchSequence } from '../src/core/plan/search.js';

const recipe = validateRecipeObject(
  {
    id: 'bench-4gas',
    tank: 'MT-2',
    mixture: { fractions: { CH4: 0.02, O2: 0.04, He: 0.2, Ar: 0.74 } },
    pressure: '1500 Torr',
    temperature: '22 degC',
  },
  'bench',
  () => ({}),
);
const req = buildPlanRequest({ recipe, locate: () => ({}), baseDir: process.cwd(), origin: 'bench' });
const plan = planFill(req.input);
const lab = loadLab();
const readings = plan.steps.map((s) => ({
  step: s.index,
  source: s.source,
  pressurePa: s.targetPa,
  temperatureK: plan.temperatureK,
  gauge: lab.gauges.find((g) => g.id === s.gauge!.id)!,
}));
const mode = process.argv[2];
if (mode === 'mc') {
  const trials = Number(process.argv[3] ?? 1e6);
  const t0 = performance.now();
  const r = await evaluateUncertaintyParallel(readings, {
    barometricPa: 101325,
    barometricUncertaintyPa: 50,
    thermometerUncertaintyK: 0.3,
    thermometerResolutionK: 0.1,
    trials,
    seed: 1,
  });
  const ms = performance.now() - t0;
  console.log(
    JSON.stringify({
      trials,
      ms,
      u_CH4: r.composition.CH4.u,
      mc_u_CH4: r.composition.CH4.mc?.u,
      heapMB: process.memoryUsage().heapUsed / 1e6,
      rssMB: process.memoryUsage().rss / 1e6,
    }),
  );
} else if (mode === 'folder') {
  const dir = process.argv[3];
  const n = Number(process.argv[4] ?? 1000);
  mkdirSync(dir, { recursive: true });
  for (let i = 0; i < n; i++) {
    const file = join(dir, `b${String(i).padStart(4, '0')}.jsonl`);
    createLog(file, headerFromPlan(plan, req, `bench-${i}`, '2026-12-01T00:00:00Z'));
    for (const s of plan.steps) {
      const p = s.targetPa * (1 + ((i % 7) - 3) * 1e-5);
      appendEvent(file, {
        kind: 'reading',
        step: s.index,
        source: s.source.id,
        gauge: s.gauge!.id,
        reading: `${p} Pa`,
        pressure_Pa: p,
        temperature: '22 degC',
        temperature_K: 295.15,
        time: 't',
      });
    }
  }
  console.log(JSON.stringify({ wrote: n, dir }));
}
if (mode === 'equilibrium') {
  // flammable tank states of the kinds the review meets; each timed call uses a new pressure so no cache answers it
  const states: Record<string, number>[] = [
    { CH4: 0.095, O2: 0.19, N2: 0.715 },
    { CH4: 1 / 3, O2: 2 / 3 },
    { H2: 0.296, O2: 0.148, N2: 0.556 },
    { C2H4: 0.24, O2: 0.24, N2: 0.52 },
    { C2H4: 0.6, O2: 0.4 },
    { CH4: 0.05, O2: 0.1, Ar: 0.85 },
    { H2: 0.2, O2: 0.1, He: 0.7 },
    { C3H8: 0.04, O2: 0.2, CO2: 0.76 },
  ];
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const time = (f: (y: Record<string, number>, p: number) => unknown, rounds: number) => {
    const t0 = performance.now();
    f(states[0], 1e5 - 1);
    const first = performance.now() - t0;
    const each: number[] = [];
    for (let r = 0; r < rounds; r++) {
      for (const y of states) {
        const t = performance.now();
        f(y, 1e5 + r * 97 + 1);
        each.push(performance.now() - t);
      }
    }
    return { first, median: median(each), max: Math.max(...each) };
  };
  const uv = time((y, p) => equilibriumUV(y, 298.15, p), 20);
  const cj = time((y, p) => chapmanJouguet(y, 298.15, p), 3);
  console.log(JSON.stringify({ uv, cj }));
}
/** the demo recipes and a 5-source design: what the search and proposal modes time */
function benchDesigns(): [string, RecipeSource][] {
  return [
    ...['ch4-o2-ar-phi1', 'c2h4-o2-ar-phi05', 'nc7h16-o2-ar', 'ng-blend-air'].map(
      (n): [string, RecipeSource] => [n, readRecipe(`recipes/${n}.yaml`)],
    ),
    [
      '5 sources (CH4+H2, O2, Ar+He)',
      {
        recipe: validateRecipeObject(
          {
            id: 'bench-5',
            tank: 'MT-2',
            mixture: {
              fuel: { CH4: 0.5, H2: 0.5 },
              oxidizer: 'O2',
              diluent: { Ar: 0.5, He: 0.5 },
              phi: 0.5,
              dilution: 0.9,
            },
            pressure: '1500 Torr',
            temperature: '22 degC',
          },
          'bench',
          () => ({}),
        ),
        locate: () => ({}),
        baseDir: process.cwd(),
        origin: 'bench',
      },
    ],
  ];
}

if (mode === 'search') {
  // the sequence search (src/core/plan/search.ts) of each demo recipe and of a 5-source design:
  // its size (structures, candidates reviewed and predicted, distinct fill reviews) and its time in
  // this process, the first call (cold: the code not yet compiled) and the median of 3 more
  const designs = benchDesigns();
  const out = designs.map(([name, rs]) => {
    const r = buildPlanRequest(rs);
    const basis = validatePlanInput(r.input);
    const amounts = planAmounts(basis);
    const run = () => {
      const t0 = performance.now();
      const s = searchSequence(basis, amounts, r.input.thermometer!);
      return { s, ms: performance.now() - t0 };
    };
    const first = run();
    const warm = [run(), run(), run()].map((x) => x.ms).sort((a, b) => a - b)[1];
    const order = first.s.charges
      .map(
        (c) =>
          `${c.source.mainSpecies}${c.stopPa === undefined ? '' : `@${(c.stopPa / (101325 / 760)).toFixed(1)} Torr`}`,
      )
      .join(' -> ');
    return { name, ...first.s.stats, firstMs: first.ms, warmMs: warm, order };
  });
  console.log(JSON.stringify(out));
}

// 5. ('review') the guided fill's review of its re-targeted remainder (src/tui/fill-review.ts) per
// Enter: for each demo recipe (its planned sequence), every fill read at its target, the median time
// of the core review (reviewRemainder) and of the whole Enter (reducer, re-target and review), warm
// (the 2nd and 3rd pass), and the slowest Enter of the first pass (cold caches); and the deviating
// case (CH4, Ar@400 Torr, O2, Ar with CH4 read 40 % high), whose review also searches the safer stop.
if (mode === 'review') {
  const { initialState, setupFromHeader, fillReducer, retargetInput } =
    await import('../src/tui/fill-state.js');
  const { reviewRemainder } = await import('../src/core/index.js');
  const TORR = 101325 / 760;
  const headerOf = (file: string, order?: string[]) => {
    const rs = readRecipe(file);
    const r = buildPlanRequest(order ? { ...rs, recipe: { ...rs.recipe, order } } : rs);
    return headerFromPlan(planFill(r.input), r, 'bench', '2026-12-01T00:00:00Z');
  };
  type St = ReturnType<typeof initialState>;
  const enter = (s: St, text: string) => {
    let t = s;
    for (const c of text) t = fillReducer(t, { type: 'char', text: c });
    const t0 = performance.now();
    const out = fillReducer(t, { type: 'enter', now: '2026-12-01T01:00:00Z' });
    return { out, ms: performance.now() - t0 };
  };
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const rows: {
    name: string;
    enters: number;
    reviewMs: number;
    enterMs: number;
    maxEnterMs: number;
    coldEnterMs: number;
  }[] = [];
  for (const name of ['ch4-o2-ar-phi1', 'c2h4-o2-ar-phi05', 'nc7h16-o2-ar', 'ng-blend-air']) {
    const h = headerOf(`recipes/${name}.yaml`);
    const reviewMs: number[] = [];
    const enterMs: number[] = [];
    const coldMs: number[] = [];
    for (let rep = 0; rep < 3; rep++) {
      let s = initialState(setupFromHeader(h));
      // a plan with a danger finding opens on its acknowledgement (ng-blend-air)
      if (s.phase === 'acknowledge') s = enter(s, 'accept BE').out;
      for (let k = 0; k < h.steps.length - 1; k++) {
        const e = enter(s, (s.targetsPa[k] / TORR).toFixed(4));
        s = e.out;
        if (rep > 0) enterMs.push(e.ms);
        else coldMs.push(e.ms);
        const input = retargetInput(s, s.done, s.targetTemperatureK);
        const t0 = performance.now();
        reviewRemainder({
          retarget: input,
          safety: {
            workingLimitPa: s.setup.workingLimitPa,
            tankId: h.tank.id,
            coldestK: h.safety?.coldest_K,
            condensationFraction: h.safety?.condensation_fraction,
          },
          planned: h.findings ?? [],
        });
        if (rep > 0) reviewMs.push(performance.now() - t0);
      }
    }
    rows.push({
      name,
      enters: enterMs.length,
      reviewMs: median(reviewMs),
      enterMs: median(enterMs),
      maxEnterMs: Math.max(...enterMs),
      coldEnterMs: Math.max(...coldMs),
    });
  }
  const split = headerOf('recipes/ch4-o2-ar-phi1.yaml', ['CH4', 'Ar@400 Torr', 'O2', 'Ar']);
  const deviating: number[] = [];
  for (let rep = 0; rep < 3; rep++) deviating.push(enter(initialState(setupFromHeader(split)), '14.0179').ms);
  console.log(JSON.stringify({ rows, deviatingMs: median(deviating) }));
}

if (mode === 'proposal') {
  // the two-stage proposal (io/two-stage-request.ts) that \`plan\` runs when the single-tank plan is
  // predicted over its tolerance: for each design, the premix choices planned in every other tank of
  // the lab (planTwoStage, 'full' search: gas, fraction, pressure, stage-1 heads and order; one
  // batch draft searched per gas and fraction) and its time in this process, first call (cold) and
  // the median of 3 more; 0 choices when the single-tank plan is within its tolerance
  const out = benchDesigns().map(([name, rs]) => {
    const r = buildPlanRequest(rs);
    const plan = planWithPrediction(planFill(r.input), r);
    const over = plan.predicted?.rows.some((x) => x.kind === 'fraction' && !x.within) ?? false;
    let choices = 0;
    const thermometer = predictionThermometer(r.lab.thermometer);
    for (const tank of over ? r.lab.tanks.filter((t) => t.id !== plan.tank.id) : []) {
      try {
        const two = planTwoStage({ batch: r.input, premixTank: tank, thermometer }, 'full', plan);
        choices += two.candidates;
      } catch (e) {
        if (!(e instanceof ProblemError)) throw e;
      }
    }
    const run = () => {
      const t0 = performance.now();
      const f = twoStageProposal(plan, r, { command: 'bench' });
      return { f, ms: performance.now() - t0 };
    };
    const first = run();
    const warm = [run(), run(), run()].map((x) => x.ms).sort((a, b) => a - b)[1];
    return {
      name,
      choices,
      proposed: first.f?.code === 'two-stage-proposed',
      firstMs: first.ms,
      warmMs: warm,
    };
  });
  console.log(JSON.stringify(out));
}
