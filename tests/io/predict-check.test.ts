// Consistency: a log simulated at the plan's targets re-checks, through check's own code path
// (log file -> readLog -> checkLog -> the core's evaluation), to the predicted standard uncertainty.
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { checkFile } from '../../src/io/check.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction, predictionInput } from '../../src/io/plan-predict.js';
import { planFill, predictPlan } from '../../src/core/index.js';
import { logAtTargets } from '../log-at-targets.js';

const RECIPES = ['ch4-o2-ar-phi1', 'c2h4-o2-ar-phi05', 'nc7h16-o2-ar', 'ng-blend-air'];

describe('predicted u = the re-check of a perfect log (demo recipes, demo lab)', () => {
  for (const id of RECIPES) {
    it(`${id}: every fraction, phi and the dilution within 1 % of check's u`, async () => {
      const req = buildPlanRequest(readRecipe(`recipes/${id}.yaml`));
      const plan = planFill(req.input);
      // the log records the thermometer with its settling value (the lab's, else the default), and
      // check uses it: the plan's prediction is what check finds, settling included
      const p = planWithPrediction(plan, req).predicted!;
      const base = predictionInput(plan, req);
      const noSettling = predictPlan({ ...base, thermometer: { ...base.thermometer, settlingK: 0 } })!;
      const file = join(mkdtempSync(join(tmpdir(), 'mw-pred-')), `${id}.jsonl`);
      // read exactly at the targets, by QX, the fill left open (as the prediction knows no close)
      logAtTargets(file, plan, req, `${id}-sim`, undefined, { byOf: () => 'QX', close: false });
      const r = await checkFile(file, { trials: 0, seed: 1 });
      expect(r.readings.length).toBe(plan.steps.length);
      for (const [k, st] of Object.entries(r.result.composition)) {
        if (!(st.u > 0)) continue;
        expect(Math.abs(p.result.composition[k].u / st.u - 1), k).toBeLessThan(0.01);
        expect(noSettling.result.composition[k].u).toBeLessThanOrEqual(st.u * (1 + 1e-9));
      }
      if (r.result.phi) expect(Math.abs(p.result.phi!.u / r.result.phi.u - 1)).toBeLessThan(0.01);
      if (r.result.diluentFraction)
        expect(Math.abs(p.result.diluentFraction!.u / r.result.diluentFraction.u - 1)).toBeLessThan(0.01);
      // and the predicted value is what the perfect log re-checks to
      for (const [k, st] of Object.entries(r.result.composition))
        expect(Math.abs(p.result.composition[k].value - st.value)).toBeLessThan(1e-9);
    });
  }
});
