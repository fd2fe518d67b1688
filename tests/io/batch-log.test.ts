import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync, appendFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, parseLog, readLog } from '../../src/io/batch-log.js';
import { headerFromPlan, checkFile } from '../../src/io/check.js';
import { checkOutcomes } from '../../src/report/check-outcome.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { parseReadingsCsv } from '../../src/io/readings-csv.js';
import { planFill, ProblemError } from '../../src/core/index.js';

const code = (f: () => unknown) => {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return `${e.problem.code}@${e.where.line ?? '-'}`;
    throw e;
  }
  return 'ok';
};

function demoLog(dir: string, readingsTorr: number[]): string {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const plan = planFill({
    ...req.input,
    thermometer: undefined,
  }); /* the demo log: the advised order CH4, Ar, O2, without the sequence search */
  const file = join(dir, 'b.jsonl');
  createLog(file, headerFromPlan(plan, req, 'test-batch', '2026-12-01T10:00:00Z'));
  readingsTorr.forEach((t, i) => {
    const s = plan.steps[i];
    appendEvent(file, {
      kind: 'reading',
      step: s.index,
      source: s.source.id,
      gauge: s.gauge!.id,
      reading: `${t} Torr`,
      pressure_Pa: (t * 101325) / 760,
      temperature: '25 degC',
      temperature_K: 298.15,
      time: '2026-12-01T10:0' + i + ':00Z',
    });
  });
  return file;
}

describe('batch log', () => {
  it('writes one JSON object per line, never overwrites, and reads back header and readings', () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const file = demoLog(dir, [10.0128, 1480.025, 1500]);
    const lines = readFileSync(file, 'utf8').trim().split('\n');
    expect(lines).toHaveLength(4);
    expect(JSON.parse(lines[0]).format).toBe('mixwright-batch/2');
    const log = readLog(file);
    expect(log.readings.map((r) => r.step)).toEqual([1, 2, 3]);
    expect(code(() => createLog(file, log.header))).toBe('write-failed@-');
    expect(readFileSync(file, 'utf8').trim().split('\n')).toHaveLength(4);
  });

  it('a torn last line (crash mid-write) is reported and ignored; the complete lines are re-checked', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const file = demoLog(dir, [10.0128, 1480.025]);
    appendFileSync(file, '{"kind":"reading","step":3,"sour');
    const log = readLog(file);
    expect(log.readings).toHaveLength(2);
    expect(log.warnings[0]).toMatch(/line 4 is incomplete/);
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    expect(rep.incomplete).toEqual(['step 3']);
    expect(rep.verdict.verdict).toBe('fail');
    expect(rep.warnings.some((w) => w.includes('incomplete'))).toBe(true);
  });

  it('a correction replaces the reading of its step; the original stays in the file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const file = demoLog(dir, [10.0128, 1480.025, 1500]);
    appendEvent(file, {
      kind: 'correction',
      step: 1,
      source: 'cyl-CH4',
      gauge: 'head-1kT',
      reading: '10.0140 Torr',
      pressure_Pa: (10.014 * 101325) / 760,
      temperature: '25 degC',
      temperature_K: 298.15,
      time: 't',
      reason: 'misread',
      by: 'QX',
      replaces_line: 2,
    });
    const log = readLog(file);
    expect(log.readings[0].reading).toBe('10.0140 Torr');
    expect(readFileSync(file, 'utf8')).toContain('10.0128 Torr');
  });

  it('refuses: a newer format version, a non-JSON middle line, a second reading for one step, decreasing readings - each with its line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const file = demoLog(dir, [10.0128, 1480.025, 1500]);
    const text = readFileSync(file, 'utf8');
    const lines = text.trim().split('\n');
    const newer = JSON.stringify({ ...JSON.parse(lines[0]), format: 'mixwright-batch/3' });
    expect(code(() => parseLog([newer, ...lines.slice(1)].join('\n') + '\n', 'x'))).toBe('schema@1');
    expect(code(() => parseLog([lines[0], 'not json', ...lines.slice(1)].join('\n') + '\n', 'x'))).toBe(
      'schema@2',
    );
    // a second reading whose line carries no chain (off the chain, it would be a removed withdrawal:
    // a record altered, tests/io/withdraw-removed.test.ts)
    const again = lines[1].replace(/,"chain":"[0-9a-f]{64}"/, '');
    expect(again).not.toBe(lines[1]);
    expect(code(() => parseLog([...lines, again].join('\n') + '\n', 'x'))).toBe('schema@5');
    const swapped =
      [lines[0], lines[1], lines[2].replace(/"pressure_Pa":[0-9.e+]+/, '"pressure_Pa":1000'), lines[3]].join(
        '\n',
      ) + '\n';
    writeFileSync(join(dir, 'd.jsonl'), swapped);
    // a typed problem of its own since the re-check's problems were typed (was `schema`)
    await expect(checkFile(join(dir, 'd.jsonl'), { trials: 0, seed: 1 })).rejects.toMatchObject({
      problem: { code: 'reading-not-rising' },
      where: { line: 3 },
    });
  });
});

describe('CSV readings', () => {
  const H = 'species,pressure,temperature\n';
  it('reads species, pressures and temperatures with units; quoted notes may hold commas', () => {
    const r = parseReadingsCsv(
      'species,pressure,temperature,note\nCH4,50.04 Torr,25 degC,"purged, then filled"\nO2,150.1 Torr,25 degC,\n',
      'r.csv',
    );
    expect(r.map((x) => x.species)).toEqual(['CH4', 'O2']);
    expect(r[0].pressurePa).toBeCloseTo((50.04 * 101325) / 760, 9);
    expect(r[0].note).toBe('purged, then filled');
  });
  it('refuses with the line: decreasing readings, a missing unit, an impossible temperature, an unknown species, a bad header', () => {
    // typed problems of their own since the re-check's problems were typed (were `schema`)
    expect(code(() => parseReadingsCsv(H + 'CH4,50 Torr,25 degC\nO2,40 Torr,25 degC\n', 'r.csv'))).toBe(
      'csv-not-rising@3',
    );
    expect(code(() => parseReadingsCsv(H + 'CH4,50,25 degC\n', 'r.csv'))).toBe('bad-quantity@2');
    expect(code(() => parseReadingsCsv(H + 'CH4,50 Torr,-300 degC\n', 'r.csv'))).toBe('out-of-range@2');
    expect(code(() => parseReadingsCsv(H + 'CH5,50 Torr,25 degC\n', 'r.csv'))).toBe('unknown-species@2');
    expect(code(() => parseReadingsCsv('species,pressure\nCH4,50 Torr\n', 'r.csv'))).toBe(
      'csv-missing-column@1',
    );
  });
});

describe('danger findings in the re-check', () => {
  it('a log whose plan had danger findings says whether and by whom they were acknowledged', async () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const input = { ...req.input, finalPressurePa: 3.8e5 };
    const plan = planFill(input);
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const file = join(dir, 'd.jsonl');
    createLog(file, headerFromPlan(plan, { ...req, input }, 'danger-batch', 't'));
    plan.steps.forEach((s) =>
      appendEvent(file, {
        kind: 'reading',
        step: s.index,
        source: s.source.id,
        gauge: s.gauge!.id,
        reading: 'x',
        pressure_Pa: s.targetPa,
        temperature: '25 degC',
        temperature_K: 298.15,
        time: 't',
      }),
    );
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    // no acknowledgement: not a warning but a caveat and an outcome of its own (never a pass, exit 6)
    expect(rep.planDangersNotAcknowledged?.map((d) => d.code)).toContain('tank-over-rating');
    expect(rep.caveats.some((c) => /^PLAN DANGER NOT ACKNOWLEDGED: .*tank-over-rating/.test(c))).toBe(true);
    // (its readings go past the rating too: a danger of the record, which takes precedence)
    expect(checkOutcomes(rep)).toContain('plan-danger-not-acknowledged');
    appendEvent(file, { kind: 'acknowledge', code: 'tank-over-rating', step: 3, by: 'AB', time: 't2' });
    const rep2 = await checkFile(file, { trials: 0, seed: 1 });
    expect(rep2.planDangersNotAcknowledged).toEqual([]);
    expect(rep2.caveats.some((c) => c.includes('NOT ACKNOWLEDGED'))).toBe(false);
    expect(rep2.warnings.some((w) => w.includes('acknowledged by AB'))).toBe(true);
    // acknowledged: an accepted hazard of the plan
    expect(checkOutcomes(rep2)).toContain('accepted-hazard');
    expect(checkOutcomes(rep2)).not.toContain('plan-danger-not-acknowledged');
  });
});
