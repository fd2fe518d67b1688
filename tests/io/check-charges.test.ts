// check of CSV rows that repeat a source (each row a charge, in fill order) or name a premix fill
// by its gases or its cylinder id, of batch logs whose steps charge a source twice, and of
// readings past the tank's working limit, its rating or a gauge's range.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, readLog, sourceToLog, type LogHeader } from '../../src/io/batch-log.js';
import { checkFile, checkLog, headerFromPlan, type CheckReport } from '../../src/io/check.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction } from '../../src/io/plan-predict.js';
import { parseReadingsCsv } from '../../src/io/readings-csv.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { planFill, ProblemError } from '../../src/core/index.js';
import { fixture, runCli, TORR } from '../helpers.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'mw-charges-'));
const H = 'species,pressure,temperature,gauge\n';

function csvFile(rows: readonly string[], name = 'r.csv'): string {
  const f = join(tmp(), name);
  writeFileSync(f, H + rows.join('\n') + '\n');
  return f;
}

/** the refusal's code and line, or 'no refusal' */
async function refusal(f: () => Promise<unknown>): Promise<string> {
  try {
    await f();
  } catch (e) {
    if (e instanceof ProblemError) return `${e.problem.code}@${e.where.line ?? '-'}`;
    throw e;
  }
  return 'no refusal';
}

interface RefCase {
  id: string;
  composition: Record<string, number>;
  temperature_K: number;
  readings: { source: string; pressure_Pa: number; temperature_K: number }[];
}
// reference: CoolProp 8.0.0 HEOS mixture model, tests/fixtures/reference/csv-charges-coolprop.json
// (scripts/reference/gen_csv_charges.py): cumulative readings of charges in fill order
const refs = fixture<{ cases: RefCase[] }>('csv-charges-coolprop.json').cases;
const refCase = (id: string) => refs.find((c) => c.id === id)!;

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('CSV rows that repeat a source: each row a charge, in fill order', () => {
  const split = refCase('ch4-o2-ar-split-1500torr');
  const name: Record<string, string> = { 'cyl-CH4': 'CH4', 'cyl-Ar': 'Ar', 'cyl-O2': 'O2' };
  const gaugeOf = (pa: number) => (pa < 9 * TORR ? 'head-10T' : pa < 900 * TORR ? 'head-1kT' : 'head-10kT');
  const rows = split.readings.map(
    (r) => `${name[r.source]},${r.pressure_Pa} Pa,${r.temperature_K} K,${gaugeOf(r.pressure_Pa)}`,
  );

  /** a batch log of the split fill, its header as a split plan writes it: one step per charge, the source per step */
  function splitLog(): string {
    const recipe = 'recipes/ch4-o2-ar-phi1.yaml';
    const req = buildPlanRequest(readRecipe(recipe));
    const plan = planFill(req.input);
    const base = headerFromPlan(plan, req, 'split-sim', '2026-12-02T09:00:00Z');
    const byId = new Map(plan.steps.map((s) => [s.source.id, s.source]));
    const header: LogHeader = {
      ...base,
      sources: split.readings.map((r) => sourceToLog(byId.get(r.source)!)),
      steps: split.readings.map((r, i) => ({
        step: i + 1,
        source: r.source,
        species: name[r.source],
        target_Pa: r.pressure_Pa,
        band_Pa: 5,
        gauge: gaugeOf(r.pressure_Pa),
      })),
    };
    const file = join(tmp(), 'split.jsonl');
    createLog(file, header);
    split.readings.forEach((r, i) =>
      appendEvent(file, {
        kind: 'reading',
        step: i + 1,
        source: r.source,
        gauge: gaugeOf(r.pressure_Pa),
        reading: `${r.pressure_Pa} Pa`,
        pressure_Pa: r.pressure_Pa,
        temperature: `${r.temperature_K} K`,
        temperature_K: r.temperature_K,
        time: `2026-12-02T09:1${i}:00Z`,
        by: 'QX',
      }),
    );
    return file;
  }

  it('CH4, Ar, O2, Ar (pure gases, no recipe): the CoolProp 8.0.0 composition within 2e-4 relative', async () => {
    // 2e-4: the tolerance of the other re-checks against CoolProp near 1-2 bar (tests/core/recheck.test.ts);
    // the difference is our virial model against CoolProp's multi-fluid mixture model
    const r = await checkFile(csvFile(rows), { trials: 0, seed: 1 });
    expect(r.readings.map((x) => x.source.id)).toEqual(['CH4', 'Ar', 'O2', 'Ar']);
    for (const [k, truth] of Object.entries(split.composition))
      expect(rel(r.result.composition[k].value, truth), k).toBeLessThan(2e-4);
    expect(r.readings.map((x) => x.charge)).toEqual([
      { number: 1, of: 1 },
      { number: 1, of: 2 },
      { number: 1, of: 1 },
      { number: 2, of: 2 },
    ]);
  });

  it('the same CSV with the recipe equals a batch log whose steps charge cyl-Ar twice (identity of the same model, 1e-12 relative)', async () => {
    const recipe = 'recipes/ch4-o2-ar-phi1.yaml';
    const csv = await checkFile(csvFile(rows), { trials: 0, seed: 1, recipeFile: recipe });
    const file = splitLog();
    const log = await checkFile(file, { trials: 0, seed: 1 });
    expect(log.incomplete).toEqual([]);
    for (const [k, st] of Object.entries(csv.result.composition)) {
      expect(rel(log.result.composition[k].value, st.value), k).toBeLessThan(1e-12);
      expect(rel(log.result.composition[k].u, st.u), k).toBeLessThan(1e-12);
    }
    expect(rel(log.result.phi!.u, csv.result.phi!.u)).toBeLessThan(1e-12);
    expect(log.readings[3].charge).toEqual({ number: 2, of: 2 });
    // GUM (JCGM 100 5.2): the one Ar cylinder's unidentified impurity is one input, shared by both charges
    expect(log.result.components.filter((c) => c.name === 'purity of cyl-Ar')).toHaveLength(1);
    // a log that records each step's charge (a field the guided fill may add): read where present
    const parsed = readLog(file);
    const marked = {
      ...parsed,
      header: {
        ...parsed.header,
        steps: parsed.header.steps.map((s, i) => ({ ...s, charge: { number: i === 3 ? 2 : 1, of: 9 } })),
      },
    };
    const withField = await checkLog(marked, { trials: 0, seed: 1 });
    expect(withField.readings[3].charge).toEqual({ number: 2, of: 9 });
  });

  it('label of the split log: the exit of check, both Ar charges among its readings', async () => {
    const file = splitLog();
    const check = await runCli(['check', file, '--json', '--trials', '100000']);
    const label = await runCli(['label', file, '--format', 'md', '--trials', '100000']);
    expect(label.code).toBe(check.code);
    // both charges of cyl-Ar are readings of the certificate (their numbering there is the guided fill's branch)
    expect(label.stdout.match(/\| 2 \| cyl-Ar\b/g)).toHaveLength(1);
    expect(label.stdout.match(/\| 4 \| cyl-Ar\b/g)).toHaveLength(1);
  });

  it('the text names each charge of a source; the JSON gives every reading its charge', async () => {
    const f = csvFile(rows);
    const t = await runCli(['check', f, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml', '--trials', '100000']);
    expect(t.stdout).toMatch(/2\s+cyl-Ar \(charge 1 of 2\)/);
    expect(t.stdout).toMatch(/4\s+cyl-Ar \(charge 2 of 2\)/);
    const j = await runCli([
      'check',
      f,
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--json',
      '--trials',
      '100000',
    ]);
    const doc = JSON.parse(j.stdout);
    expect(doc.readings.map((x: { charge: { number: number } }) => x.charge.number)).toEqual([1, 1, 1, 2]);
  });
});

describe('plan -> CSV -> check with a split plan (CH4, Ar, O2, Ar on recipes/ch4-o2-ar-phi1.yaml)', () => {
  it("a CSV at the split plan's targets, written with the plan's step labels, re-checks to its predicted u within 1 % (an identity of the same model)", async () => {
    const recipe = 'recipes/ch4-o2-ar-phi1.yaml';
    const req = buildPlanRequest(readRecipe(recipe));
    const src = (sp: string) => req.input.sources.find((x) => x.mainSpecies === sp)!;
    const order = ['CH4', 'Ar', 'O2', 'Ar'];
    const plan = planFill({
      ...req.input,
      order: 'given',
      sources: [...new Set(order)].map(src),
      charges: order.map((sp) => ({ source: src(sp) })),
    });
    expect(plan.steps.map((x) => `${x.species} ${x.charge.number}/${x.charge.of}`)).toEqual([
      'CH4 1/1',
      'Ar 1/2',
      'O2 1/1',
      'Ar 2/2',
    ]);
    const p = planWithPrediction(plan, req).predicted!;
    const T = plan.temperatureK;
    const f = csvFile(plan.steps.map((x) => `${x.species},${x.targetPa} Pa,${T} K,${x.gauge!.id}`));
    const r = await checkFile(f, { trials: 0, seed: 1, recipeFile: recipe });
    expect(r.readings.map((x) => x.charge)).toEqual(plan.steps.map((x) => x.charge));
    for (const [k, st] of Object.entries(r.result.composition)) {
      if (!(st.u > 0)) continue;
      expect(rel(p.result.composition[k].u, st.u), k).toBeLessThan(0.01);
      expect(Math.abs(p.result.composition[k].value - st.value), k).toBeLessThan(1e-9);
    }
    expect(rel(p.result.phi!.u, r.result.phi!.u)).toBeLessThan(0.01);
  });
});

describe('a CSV row naming a premix fill: by its gases ("N2+O2") or its cylinder id', () => {
  const recipe = 'recipes/ng-blend-air.yaml';
  const req = buildPlanRequest(readRecipe(recipe));
  const plan = planFill(req.input);
  const predicted = planWithPrediction(plan, req).predicted!;
  const T = plan.temperatureK;
  const targets = (air: string) =>
    plan.steps.map(
      (s) => `${s.source.kind === 'premix' ? air : s.species},${s.targetPa} Pa,${T} K,${s.gauge!.id}`,
    );

  it('the plan labels the air fill "N2+O2"; a CSV at the targets re-checks to the predicted u within 1 % (an identity of the same model)', async () => {
    expect(plan.steps.map((s) => s.species)).toEqual(['C2H6', 'CH4', 'N2+O2']);
    const r = await checkFile(csvFile(targets('N2+O2')), { trials: 0, seed: 1, recipeFile: recipe });
    expect(r.readings[2].source.id).toBe('cyl-air');
    for (const [k, st] of Object.entries(r.result.composition)) {
      if (!(st.u > 0)) continue;
      expect(rel(predicted.result.composition[k].u, st.u), k).toBeLessThan(0.01);
    }
    expect(rel(predicted.result.phi!.u, r.result.phi!.u)).toBeLessThan(0.01);
    expect(r.verdict.verdict).toBe('pass');
    // the same fill by its cylinder id, or its gases in another order: the same re-check
    for (const air of ['cyl-air', 'O2+N2']) {
      const again = await checkFile(csvFile(targets(air)), { trials: 0, seed: 1, recipeFile: recipe });
      expect(again.result.composition.O2.value).toBe(r.result.composition.O2.value);
      expect(again.result.composition.O2.u).toBe(r.result.composition.O2.u);
    }
  });

  it('readings from the CoolProp 8.0.0 mixture model, air as one premix row: the composition within 2e-4 relative', async () => {
    // no recipe: C2H6 and CH4 as pure gases, "N2+O2" the lab profile's air cylinder (O2 0.21, N2 0.79)
    const c = refCase('ng-air-premix-500torr');
    const label: Record<string, string> = { 'cyl-C2H6': 'C2H6', 'cyl-CH4': 'CH4', 'cyl-air': 'N2+O2' };
    const gauges = ['head-10T', 'head-1kT', 'head-1kT'];
    const f = csvFile(
      c.readings.map((r, i) => `${label[r.source]},${r.pressure_Pa} Pa,${r.temperature_K} K,${gauges[i]}`),
    );
    const r = await checkFile(f, { trials: 0, seed: 1 });
    expect(r.readings[2].source.id).toBe('cyl-air');
    for (const [k, truth] of Object.entries(c.composition))
      expect(rel(r.result.composition[k].value, truth), k).toBeLessThan(2e-4);
  });

  it('a gas that comes only inside the premix is refused, naming the fill (never read as a charge of air)', async () => {
    const rows = targets('N2+O2');
    rows[2] = rows[2].replace('N2+O2', 'O2');
    const f = csvFile(rows);
    expect(await refusal(() => checkFile(f, { trials: 0, seed: 1, recipeFile: recipe }))).toBe(
      'csv-name-in-premix@4',
    );
    const cli = await runCli(['check', f, '--recipe', recipe]);
    expect(cli.code).toBe(2);
    expect(cli.stderr).toContain('O2 is not filled on its own here: it comes in cyl-air (N2+O2)');
  });

  it('an ambiguous name is refused with the choices (a lab with two N2+O2 premixes)', async () => {
    const dir = tmp();
    const lab = join(dir, 'lab.yaml');
    writeFileSync(
      lab,
      DEMO_LAB_YAML +
        '  - id: cyl-air-lean\n    label: synthetic air, 20 % O2 (invented)\n' +
        '    composition: { O2: 0.20, N2: 0.80 }\n',
    );
    const f = csvFile(['CH4,36.25 Torr,23.5 degC,head-1kT', 'N2+O2,500 Torr,23.5 degC,head-1kT']);
    const cli = await runCli(['check', f, '--lab', lab]);
    expect(cli.code).toBe(2);
    expect(cli.stderr).toContain('r.csv:3 species: "N2+O2" names more than one source');
    expect(cli.stderr).toContain('cyl-air (N2+O2)');
    expect(cli.stderr).toContain('cyl-air-lean (N2+O2)');
    expect(cli.stderr).toContain('(error code: csv-name-ambiguous)');
    // the cylinder id settles it
    const byId = csvFile(['CH4,36.25 Torr,23.5 degC,head-1kT', 'cyl-air-lean,500 Torr,23.5 degC,head-1kT']);
    const ok = await checkFile(byId, { trials: 0, seed: 1, labFile: lab });
    expect(ok.readings[1].source.composition).toEqual({ O2: 0.2, N2: 0.8 });
  });

  it('the reader keeps a non-species name only where the context accepts it', () => {
    const text = H + 'cyl-air,500 Torr,23.5 degC,head-1kT\n';
    expect(parseReadingsCsv(text, 'r.csv', { acceptsName: (n) => n === 'cyl-air' })[0].species).toBe(
      'cyl-air',
    );
    let code = '';
    try {
      parseReadingsCsv(text, 'r.csv');
    } catch (e) {
      code = (e as ProblemError).problem.code;
    }
    expect(code).toBe('unknown-species');
  });
});

describe('CSV readings against the tank: working limit, rating, gauge range', () => {
  const recipe = 'recipes/ch4-o2-ar-phi1.yaml';
  // the demo CSV scaled to 2800 Torr: MT-1 is rated 4 bar (3000.25 Torr) with a working fraction of 0.9
  // (limit 2700.22 Torr); same composition, so the verdict stays a pass and the danger decides the exit
  const past = [
    'CH4,18.6902 Torr,25.0 degC,head-1kT',
    'Ar,2762.70 Torr,25.0 degC,head-10kT',
    'O2,2800.0 Torr,25.0 degC,head-10kT',
  ];

  it('a reading past the working limit is a danger worded as the log audit words it; exit 3', async () => {
    const f = csvFile(past);
    const r = await checkFile(f, { trials: 0, seed: 1, recipeFile: recipe });
    const d = r.findings.filter((x) => x.code === 'above-working-limit');
    expect(d.map((x) => [x.severity, x.line])).toEqual([
      ['danger', 3],
      ['danger', 4],
    ]);
    expect(d[0].message).toMatch(
      /^line 3, fill 2: the tank reading 2762\.7 Torr \(absolute\) is above the tank's working limit of 2700\.22 Torr/,
    );
    expect(d[0].message).not.toContain('rating');
    expect(r.caveats.join(' ')).toMatch(/DANGER: 2 recorded readings went past the tank's working limit/);
    expect(r.tank).toEqual({ id: 'MT-1', ratedPa: 4e5, limitPa: 3.6e5, from: 'recipe' });
    const cli = await runCli(['check', f, '--recipe', recipe, '--trials', '100000']);
    expect(['pass', 'pass-uncertain']).toContain(r.verdict.verdict);
    expect(cli.code, cli.stderr).toBe(3);
    expect(cli.stdout).toContain('The record (the readings as typed)');
    const j = await runCli(['check', f, '--recipe', recipe, '--json', '--trials', '100000']);
    const doc = JSON.parse(j.stdout);
    expect(doc.danger).toBe(true);
    expect(doc.tank).toEqual({ id: 'MT-1', rated_pressure_Pa: 4e5, working_limit_Pa: 3.6e5, from: 'recipe' });
    expect(j.code).toBe(3);
  });

  it('above the rating it says so too; --tank checks a CSV without a recipe', async () => {
    const f = csvFile([
      'CH4,20.0 Torr,25.0 degC,head-1kT',
      'Ar,3000.0 Torr,25.0 degC,head-10kT',
      'O2,3050.0 Torr,25.0 degC,head-10kT',
    ]);
    const r = await checkFile(f, { trials: 0, seed: 1, tankId: 'MT-1' });
    const d = r.findings.filter((x) => x.code === 'above-working-limit');
    expect(d).toHaveLength(2);
    expect(d[0].message).not.toContain('rating'); // 3000.0 Torr is below the 3000.25 Torr rating
    expect(d[1].message).toMatch(
      /above the tank's working limit of 2700\.22 Torr and above its pressure rating of 3000\.25 Torr/,
    );
    const cli = await runCli(['check', f, '--tank', 'MT-1', '--trials', '100000']);
    expect(cli.code).toBe(3);
    expect((await runCli(['check', f, '--tank', 'MT-7'])).stderr).toContain(
      'no tank "MT-7" in the lab profile',
    );
    expect((await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--tank', 'MT-1'])).code).toBe(2);
  });

  it('without a recipe or --tank the limits are not checked, and the report says so (tank null; no design: exit 7)', async () => {
    const f = csvFile(past);
    const j = await runCli(['check', f, '--json', '--trials', '100000']);
    // no recipe, no design: nothing is shown within tolerance, so no pass (README "Exit codes": 7)
    expect(j.code).toBe(7);
    const doc = JSON.parse(j.stdout);
    expect(doc.verdict).toBe('no-design');
    expect(doc.tank).toBeNull();
    expect(doc.danger).toBe(false);
    expect(doc.warnings.join(' ')).toContain(
      "the tank is not known (no --recipe, no --tank): the readings were NOT checked against a tank's working limit",
    );
    // the text: the review of the fill never says the limit was judged, and the verdict line marks it
    const t = await runCli(['check', f, '--trials', '100000']);
    expect(t.stdout).not.toContain('judged with the record above');
    expect(t.stdout).toContain(
      "of the hazards it checks; the readings were NOT checked against a tank's working limit: the tank is not known)",
    );
    expect(t.stdout).toMatch(/^Verdict {5}NO DESIGN - not a pass: .* - tank limits NOT checked$/m);
    // with the recipe's tank: checked, and said so
    const k = await runCli(['check', f, '--recipe', recipe, '--trials', '100000']);
    expect(k.stdout).not.toContain('tank limits NOT checked');
    expect(k.stdout).not.toContain('NOT checked against');
  });

  it('a row on a named gauge above its full scale is a danger (as in the log audit)', async () => {
    const f = csvFile([
      'CH4,10.0126 Torr,25.0 degC,head-1kT',
      'Ar,1480.02 Torr,25.0 degC,head-1kT',
      'O2,1500.0 Torr,25.0 degC,head-10kT',
    ]);
    const r = await checkFile(f, { trials: 0, seed: 1, recipeFile: recipe });
    expect(r.findings.map((x) => [x.code, x.severity, x.line])).toEqual([['above-gauge-range', 'danger', 3]]);
    expect(r.findings[0].message).toContain(
      'gauge head-1kT shows 1480.02 Torr, above its full scale of 1000 Torr',
    );
  });

  it('label never prints from a CSV: refused (exit 2), so no label leaves without the danger', async () => {
    const cli = await runCli(['label', csvFile(past), '--trials', '100000']);
    expect(cli.code).toBe(2);
    expect(cli.stdout).toBe('');
  });
});

describe('an older CSV is re-checked as before', () => {
  it('readings/ch4-phi1-ar98.csv: the values and u recorded with the version before this change (f32d2b0), 1e-12 relative', async () => {
    const r: CheckReport = await checkFile('readings/ch4-phi1-ar98.csv', {
      trials: 0,
      seed: 1,
      recipeFile: 'recipes/ch4-o2-ar-phi1.yaml',
    });
    // regression pin, not an outside reference: `check readings/ch4-phi1-ar98.csv --recipe
    // recipes/ch4-o2-ar-phi1.yaml --json` of commit f32d2b0 (its text output is byte-identical too)
    const before: Record<string, [number, number]> = {
      CH4: [0.006666556275947358, 0.00000775934730242941],
      O2: [0.013335072764053777, 0.00019413872017471766],
      Ar: [0.9799980375999154, 0.00019363947795436896],
    };
    for (const [k, [value, u]] of Object.entries(before)) {
      expect(rel(r.result.composition[k].value, value), k).toBeLessThan(1e-12);
      expect(rel(r.result.composition[k].u, u), k).toBeLessThan(1e-12);
    }
    expect(r.findings).toEqual([]);
    expect(r.readings.every((x) => x.charge?.of === 1)).toBe(true);
  });
});

describe('a row naming the premix of an earlier stage needs that stage log', () => {
  // the demo's stage-2 readings: row 3 (file line 4) is premix-MT-2, the premix filled in tank MT-2
  const CSV = 'readings/ch4-phi1-from-premix.csv';

  it('without --premix-log: a typed problem at the row, saying what it names and which option to give', async () => {
    for (const recipeFile of [undefined, 'recipes/ch4-o2-ar-phi1.yaml']) {
      let problem: ProblemError | undefined;
      try {
        await checkFile(CSV, { trials: 0, seed: 1, recipeFile });
      } catch (e) {
        if (e instanceof ProblemError) problem = e;
        else throw e;
      }
      expect(problem?.problem).toEqual({
        code: 'csv-premix-needs-log',
        name: 'premix-MT-2',
        tank: 'MT-2',
        tankKnown: true,
        given: undefined,
      });
      expect(problem?.where).toMatchObject({ file: CSV, line: 4, field: 'species' });
    }
    for (const json of [[], ['--json']]) {
      const cli = await runCli(['check', CSV, ...json]);
      expect(cli.code).toBe(2);
      expect(cli.stderr).toContain(
        'ch4-phi1-from-premix.csv:4 species: "premix-MT-2" names the premix filled in tank MT-2 in an earlier stage',
      );
      expect(cli.stderr).toContain('add --premix-log LOG with the stage-1 log of tank MT-2');
      expect(cli.stderr).toContain('(error code: csv-premix-needs-log)');
      expect(cli.stderr).not.toContain('unknown species');
    }
  });

  it('with the log of another premix: says what the given log is, which log the row needs, and what to do', async () => {
    const f = csvFile(['CH4,10.0129 Torr,25 degC,head-1kT', 'premix-MT-3,520.27 Torr,25 degC,head-1kT']);
    const cli = await runCli(['check', f, '--premix-log', 'batches/demo-premix-o2-ar-mt2.jsonl']);
    expect(cli.code).toBe(2);
    expect(cli.stderr).toContain('(error code: premix-log-refused)');
    expect(cli.stderr).toMatch(
      /--premix-log: premix log batches\/demo-premix-o2-ar-mt2\.jsonl is the log of .*tank MT-2 /,
    );
    expect(cli.stderr).toMatch(/r\.csv line 3 names premix-MT-3, the premix filled in tank MT-3 /);
    expect(cli.stderr).toContain('the lab profile lists no tank MT-3: check the name');
    expect(cli.stderr).toContain(
      'so --premix-log must be the log of that premix (the stage-1 log of tank MT-3)',
    );
    expect(cli.stderr).toContain('give the stage-1 log of tank MT-3');
  });

  // a batch log given in place of the premix log: its re-check was reported (a single-tank batch
  // "cannot be shown within its tolerance", a batch of another design "fails its re-check"), or it
  // was called "another premix"; the refusal now says what the log is and which log to give
  const withRecipe = ['--recipe', 'recipes/ch4-o2-ar-phi1.yaml'];
  /** `check CSV --recipe (the demo's) --premix-log LOG`, its exit asserted: 2, refused as premix-log-refused */
  async function withPremixLog(csv: string, log: string, exit = 2) {
    const r = await runCli(['check', csv, ...withRecipe, '--premix-log', log]);
    expect(r.code, r.stderr).toBe(exit);
    if (exit === 2) expect(r.stderr).toContain('(error code: premix-log-refused)');
    return r;
  }
  it('a batch filled from the premix (stage 2) in its place: names it a batch and gives the premix log it names', async () => {
    const cli = await withPremixLog(CSV, 'batches/demo-ch4-phi1-from-premix.jsonl');
    expect(cli.stderr).toContain(
      '--premix-log: batches/demo-ch4-phi1-from-premix.jsonl (given as the premix log) is the log of batch ' +
        'demo-ch4-phi1-from-premix, filled in tank MT-1 from a premix (stage 2 of batch demo-ch4-phi1-from-premix): a ' +
        'batch, not a premix; ' +
        'readings/ch4-phi1-from-premix.csv line 4 names premix-MT-2, the premix filled in tank MT-2, so ' +
        '--premix-log must be the log of that premix (the stage-1 log of tank MT-2) - give --premix-log ' +
        'batches/demo-premix-o2-ar-mt2.jsonl, the premix log that batch was filled from (the batch log records it)',
    );
    expect(cli.stderr).not.toMatch(/another premix|re-check/);
  });

  it('the premix row named by its gases (Ar+O2): a stage-2 batch log or a single-tank batch log is named as such', async () => {
    const f = join(mkdtempSync(join(tmpdir(), 'mw-gases-')), 'r.csv');
    const text = readFileSync(CSV, 'utf8');
    expect(text).toMatch(/^premix-MT-2,/m);
    writeFileSync(f, text.replace(/^premix-MT-2,/m, 'Ar+O2,'));
    const stage2 = await withPremixLog(f, 'batches/demo-ch4-phi1-from-premix.jsonl');
    expect(stage2.stderr).toContain(
      'filled in tank MT-1 from a premix (stage 2 of batch demo-ch4-phi1-from-premix): a batch, not a premix; ' +
        `${f} line 4 names Ar+O2, a premix fill by its gases, so --premix-log must be the log of the premix that ` +
        'gas came from (its stage-1 log) - give --premix-log batches/demo-premix-o2-ar-mt2.jsonl',
    );
    expect(stage2.stderr).not.toMatch(/is not filled in the design/);
    const single = await withPremixLog(f, 'batches/demo-ch4-phi1-ar98.jsonl');
    expect(single.stderr).toContain(
      'batches/demo-ch4-phi1-ar98.jsonl (given as the premix log) is the log of demo-ch4-phi1-ar98, a single-tank ' +
        'fill in tank MT-1',
    );
    expect(single.stderr).not.toMatch(
      /the premix fill|premix log batches|cannot be shown within its tolerance/,
    );
    // the stage-1 log it names: the row is that premix's fill, the re-check runs
    await withPremixLog(f, 'batches/demo-premix-o2-ar-mt2.jsonl', 0);
  });

  it('a single-tank batch of another tank in its place: what it is, the row, the log to give', async () => {
    const cli = await withPremixLog(CSV, 'batches/demo-ch4-phi1-ar98.jsonl');
    expect(cli.stderr).toContain(
      'batches/demo-ch4-phi1-ar98.jsonl (given as the premix log) is the log of demo-ch4-phi1-ar98, a single-tank fill ' +
        'in tank MT-1 (its header records no stage); readings/ch4-phi1-from-premix.csv line 4 names ' +
        'premix-MT-2',
    );
    expect(cli.stderr).not.toMatch(/cannot be shown within its tolerance/);
  });

  it("a batch of another design in the premix's tank: the gas the design has not, not its re-check", async () => {
    const cli = await withPremixLog(CSV, 'batches/demo-c2h4-phi05-ar-overshoot.jsonl');
    expect(cli.stderr).toContain(
      'premix log batches/demo-c2h4-phi05-ar-overshoot.jsonl holds C2H4, which the design (CH4, O2, Ar) ' +
        "does not: it is not a premix of this design's gases",
    );
    expect(cli.stderr).not.toMatch(/fails its re-check/);
  });

  it('with the stage-1 log: the row is that premix (the re-check runs)', async () => {
    const r = await checkFile(CSV, {
      trials: 0,
      seed: 1,
      premixLog: 'batches/demo-premix-o2-ar-mt2.jsonl',
    });
    expect(r.readings[2].source.id).toBe('premix-MT-2');
  });
});
