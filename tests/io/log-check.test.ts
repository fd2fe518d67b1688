// check LOG on the record itself: corrections and withdrawals applied and listed, readings past
// the working limit or a gauge's range as dangers, edited lines and text/number disagreements.
import { describe, expect, it } from 'vitest';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  appendEvent,
  createLog,
  LOG_FORMAT,
  openLogForFill,
  readLog,
  type LogHeader,
  type NewLogEvent,
} from '../../src/io/batch-log.js';
import { checkFile, headerFromPlan } from '../../src/io/check.js';
import { findingsOf } from '../../src/io/log-audit.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { describeProblem, planFill, ProblemError } from '../../src/core/index.js';
import { fixture, runCli, TORR } from '../helpers.js';

/** the refusal's sentence, as the CLI and the fill screen show it */
function refusal(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return describeProblem(e.problem);
    throw e;
  }
  return 'no refusal';
}

const tmp = () => mkdtempSync(join(tmpdir(), 'mw-chk-'));

// reference: CoolProp 8.0 HEOS mixture model, case ch4-o2-ar-1000torr of
// tests/fixtures/reference/mixture-plans-coolprop.json (scripts/reference/gen_mixture_plans.py):
// the cumulative readings of 5 % CH4, 10 % O2, 85 % Ar at 298.15 K, 1000 Torr
const ref = fixture('mixture-plans-coolprop.json').cases.find(
  (c: { id: string }) => c.id === 'ch4-o2-ar-1000torr',
) as {
  composition: Record<string, number>;
  order: string[];
  readings: { pressure_Pa: number; temperature_K: number }[];
};

const cyl = (sp: string) => ({
  id: `cyl-${sp}`,
  label: sp,
  kind: 'cylinder' as const,
  composition: { [sp]: 1 },
  unidentified: 0,
  main_species: sp,
});
const refHeader: LogHeader = {
  kind: 'batch',
  format: LOG_FORMAT,
  id: 'ref-ch4-o2-ar',
  created: '2026-12-02T09:00:00Z',
  lab: 'test bench (invented)',
  tank: { id: 'T-9', volume_m3: 0.02, rated_pressure_Pa: 4e5, working_limit_Pa: 3.6e5 },
  design: { composition: ref.composition, phi: 1, diluent: ['Ar'], diluent_fraction: 0.85 },
  tolerance: { relative: 0.005, absolute: 0 },
  temperature_K: 298.15,
  final_pressure_Pa: ref.readings[2].pressure_Pa,
  barometer: { pressure_Pa: 101325, u_Pa: 50 },
  thermometer: { u_K: 0.3, resolution_K: 0.1 },
  gauges: [
    {
      id: 'head-2kT',
      label: '2000 Torr head',
      reference: 'absolute',
      full_scale_Pa: 2000 * TORR,
      minimum_Pa: 0,
      accuracy_of_reading: 0.0012,
      accuracy_of_full_scale: 0,
      resolution_Pa: 0.001 * TORR,
      unit: 'Torr',
    },
  ],
  sources: ref.order.map(cyl),
  steps: ref.order.map((sp, i) => ({
    step: i + 1,
    source: `cyl-${sp}`,
    species: sp,
    target_Pa: ref.readings[i].pressure_Pa,
    band_Pa: 5,
    gauge: 'head-2kT',
  })),
};

function refReading(i: number, pa = ref.readings[i].pressure_Pa): Extract<NewLogEvent, { kind: 'reading' }> {
  return {
    kind: 'reading',
    step: i + 1,
    source: `cyl-${ref.order[i]}`,
    gauge: 'head-2kT',
    reading: `${pa / TORR} Torr`,
    pressure_Pa: pa,
    temperature: '25 degC',
    temperature_K: 298.15,
    time: `2026-12-02T09:1${i}:00Z`,
    by: 'QX',
  };
}

describe('corrections and withdrawals in check', () => {
  it('a mistyped first reading corrected: check applies the correction and recovers the CoolProp composition within 2e-4 relative; lists who, when, old, new, why', async () => {
    const dir = tmp();
    const file = join(dir, 'c.jsonl');
    createLog(file, refHeader);
    const mistyped = ref.readings[0].pressure_Pa * 1.02; // 2 % high: a wrong digit
    appendEvent(file, refReading(0, mistyped));
    appendEvent(file, refReading(1));
    appendEvent(file, refReading(2));
    const uncorrected = await checkFile(file, { trials: 0, seed: 1 });
    expect(Math.abs(uncorrected.result.composition.CH4.value / ref.composition.CH4 - 1)).toBeGreaterThan(
      0.01,
    );
    const o = openLogForFill(file);
    // the writer refuses a correction without its reason, or naming a line that is not the reading in force
    expect(
      refusal(() =>
        o.handle.append({ ...refReading(0), kind: 'correction', by: 'QX', reason: ' ', replaces_line: 2 }),
      ),
    ).toMatch(/a correction needs its reason/);
    expect(
      refusal(() =>
        o.handle.append({
          ...refReading(0),
          kind: 'correction',
          by: 'QX',
          reason: 'misread',
          replaces_line: 3,
        }),
      ),
    ).toMatch(/amends step 1 naming line 3/);
    o.handle.append({
      ...refReading(0),
      kind: 'correction',
      time: '2026-12-02T09:30:00Z',
      by: 'QX',
      reason: 'misread the third digit on the head',
      replaces_line: 2,
    });
    o.handle.release();
    expect(readFileSync(file, 'utf8').trim().split('\n')).toHaveLength(5);
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    for (const [k, truth] of Object.entries(ref.composition))
      expect(Math.abs(rep.result.composition[k].value / truth - 1), k).toBeLessThan(2e-4);
    expect(rep.amendments).toHaveLength(1);
    expect(rep.amendments[0]).toMatchObject({
      kind: 'correction',
      step: 1,
      line: 5,
      by: 'QX',
      time: '2026-12-02T09:30:00Z',
      reason: 'misread the third digit on the head',
      old: { line: 2, pressure_Pa: mistyped },
    });
    expect(rep.findings).toEqual([]);
    const text = await runCli(['check', file, '--trials', '100000']);
    expect(text.stdout).toMatch(
      /line 5 {2}fill 1 {2}corrected by QX at 2026-12-02T09:30:00Z: 51\.0\d+ Torr at 25 degC \(line 2\) -> 50\.0\d+ Torr at 25 degC; reason: misread the third digit/,
    );
    const j = JSON.parse((await runCli(['check', file, '--json', '--trials', '100000'])).stdout);
    expect(j.corrections[0]).toMatchObject({
      kind: 'correction',
      step: 1,
      by: 'QX',
      reason: 'misread the third digit on the head',
      old: { line: 2, pressure_Pa: mistyped },
      new: { line: 5, pressure_Pa: ref.readings[0].pressure_Pa },
    });
  });

  it('the last reading withdrawn and read again: check uses the new reading, lists the withdrawal; only the last reading can be withdrawn', async () => {
    const dir = tmp();
    const file = join(dir, 'w.jsonl');
    createLog(file, refHeader);
    const o = openLogForFill(file);
    o.handle.append(refReading(0));
    o.handle.append(refReading(1, ref.readings[1].pressure_Pa + 200));
    expect(
      refusal(() => o.handle.append({ kind: 'withdraw', step: 1, withdraws_line: 2, by: 'QX', time: 't' })),
    ).toMatch(/only the last reading can be withdrawn/);
    o.handle.append({
      kind: 'withdraw',
      step: 2,
      withdraws_line: 3,
      by: 'QX',
      time: '2026-12-02T09:20:00Z',
      reason: 'read before the gauge settled',
    });
    expect(
      refusal(() => o.handle.append({ kind: 'withdraw', step: 2, withdraws_line: 3, by: 'QX', time: 't' })),
    ).toMatch(/no reading in force/);
    o.handle.append(refReading(1));
    o.handle.append(refReading(2));
    o.handle.release();
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    for (const [k, truth] of Object.entries(ref.composition))
      expect(Math.abs(rep.result.composition[k].value / truth - 1), k).toBeLessThan(2e-4);
    expect(rep.amendments).toMatchObject([
      {
        kind: 'withdraw',
        step: 2,
        line: 4,
        by: 'QX',
        reason: 'read before the gauge settled',
        old: { line: 3 },
        new: null,
      },
    ]);
  });
});

describe('the record: edits after writing, text and number', () => {
  const demo = 'batches/demo-ch4-phi1-ar98.jsonl';

  it('an edited number is a hash break and a text/number disagreement; an edit of both a hash break; a removed line breaks the next; the verdict says so', async () => {
    const dir = tmp();
    const lines = readFileSync(demo, 'utf8').trim().split('\n');
    const num = join(dir, 'num.jsonl');
    writeFileSync(
      num,
      [
        ...lines.slice(0, 2),
        lines[2].replace('"pressure_Pa":197317.1052631579', '"pressure_Pa":197350'),
        ...lines.slice(3),
      ].join('\n') + '\n',
    );
    const r1 = await checkFile(num, { trials: 0, seed: 1 });
    expect(findingsOf(r1.findings, 'record').map((f) => [f.issue.code, f.line])).toEqual([
      ['line-edited', 3],
    ]);
    expect(findingsOf(r1.findings, 'text-number-mismatch').map((f) => [f.line, f.field])).toEqual([
      [3, 'reading'],
    ]);
    expect(r1.caveats.join(' ')).toMatch(/record was changed after it was written \(2 lines/);
    const both = join(dir, 'both.jsonl');
    writeFileSync(
      both,
      [
        ...lines.slice(0, 2),
        lines[2]
          .replace('"1480 Torr"', '"1480.3 Torr"')
          .replace('"pressure_Pa":197317.1052631579', `"pressure_Pa":${1480.3 * TORR}`),
        ...lines.slice(3),
      ].join('\n') + '\n',
    );
    const r2 = await checkFile(both, { trials: 0, seed: 1 });
    expect(r2.findings.map((f) => (f.code === 'record' ? `${f.issue.code}@${f.line}` : f.code))).toEqual([
      'line-edited@3',
    ]);
    const cut = join(dir, 'cut.jsonl');
    writeFileSync(cut, [lines[0], lines[1], lines[3], lines[4]].join('\n') + '\n');
    const r3 = readLog(cut);
    expect(r3.issues).toEqual([{ code: 'line-edited', line: 3 }]);
    const cli = await runCli(['check', num, '--trials', '100000']);
    expect(cli.stdout).toMatch(
      /warning: line 3 does not match its hash: it was changed after it was written/,
    );
    expect(cli.stdout).toMatch(/Verdict .*\n\s+the record was changed after it was written/);
  });

  it('the untouched demo log has no findings; a log of format /1 (no hashes) is read, with a note', async () => {
    expect((await checkFile(demo, { trials: 0, seed: 1 })).findings).toEqual([]);
    const old = await checkFile('tests/io/fixtures/demo-format1.jsonl', { trials: 0, seed: 1 });
    expect(old.findings.map((f) => [f.severity, f.code === 'record' ? f.issue.code : f.code])).toEqual([
      ['note', 'log-unhashed'],
    ]);
    expect(old.verdict.verdict).toBe((await checkFile(demo, { trials: 0, seed: 1 })).verdict.verdict);
  });
});

describe('dangers in a log', () => {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const plan = planFill({
    ...req.input,
    thermometer: undefined,
  }); /* the demo log: the advised order CH4, Ar, O2, without the sequence search */
  const header = headerFromPlan(plan, req, 'danger-test', '2026-12-02T10:00:00Z');
  const demoReadings = readFileSync('batches/demo-ch4-phi1-ar98.jsonl', 'utf8')
    .trim()
    .split('\n')
    .slice(1, 4)
    .map((l) => {
      const { chain: _c, ...e } = JSON.parse(l);
      void _c;
      return e as NewLogEvent;
    });

  it('a reading above the working limit: a danger finding with both pressures, exit 3 beside a passing composition, DANGER beside the verdict', async () => {
    const dir = tmp();
    const file = join(dir, 'lim.jsonl');
    createLog(file, { ...header, tank: { ...header.tank, working_limit_Pa: 1495 * TORR } });
    for (const e of demoReadings) appendEvent(file, e);
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    expect(['pass', 'pass-uncertain']).toContain(rep.verdict.verdict);
    const lim = findingsOf(rep.findings, 'above-working-limit');
    expect(lim.map((f) => [f.severity, f.step, f.line])).toEqual([['danger', 3, 4]]);
    const cli = await runCli(['check', file, '--trials', '100000']);
    expect(cli.code).toBe(3);
    expect(cli.stdout).toContain(
      "line 4, fill 3: the tank reading 1500 Torr (absolute) is above the tank's working limit of 1495 Torr",
    );
    expect(cli.stdout).toMatch(
      /Verdict {5}(NOT A PASS - the composition alone is within tolerance|NOT SHOWN WITHIN TOLERANCE).*\n {12}DANGER: a logged reading went past the tank's working limit/,
    );
    const j = JSON.parse((await runCli(['check', file, '--json', '--trials', '100000'])).stdout);
    expect(j.danger).toBe(true);
    expect(j.record_findings[0]).toMatchObject({
      severity: 'danger',
      code: 'above-working-limit',
      step: 3,
      line: 4,
    });
    // accepted at the manifold with initials (the fill logs the finding's code): named, and it stands
    appendEvent(file, {
      kind: 'acknowledge',
      code: 'above-working-limit',
      step: 3,
      by: 'QX',
      time: '2026-12-02T10:20:00Z',
    });
    const acc = await checkFile(file, { trials: 0, seed: 1 });
    expect(findingsOf(acc.findings, 'above-working-limit')[0]).toMatchObject({
      severity: 'danger',
      accepted: { by: 'QX', time: '2026-12-02T10:20:00Z' },
    });
    expect(acc.caveats[0]).toMatch(/^DANGER/);
    // a folder with that log: the summary marks it, exit 3
    const folder = await runCli(['check', dir, '--trials', '100000']);
    expect(folder.code).toBe(3);
    // the composition's cell never reads as a pass beside a danger (was "pass" / "pass-uncertain")
    expect(folder.stdout).toMatch(
      /lim\.jsonl\s+danger-test\s+-\s+(NOT A PASS \(composition alone within tolerance, which does not make the tank usable\)|not shown within tolerance - not a pass), DANGER/,
    );
  });

  it('an acceptance is credited to the reading it was given for, never to a reading withdrawn before it', async () => {
    // lines: 1 header, 2-3 fills 1-2, 4 fill 3 mistyped 5000 Torr, 5 withdrawn by AB, 6 fill 3 read again
    // 1500 Torr (above the 1495 Torr limit), 7 CD accepts it
    const file = join(tmp(), 'ack.jsonl');
    createLog(file, { ...header, tank: { ...header.tank, working_limit_Pa: 1495 * TORR } });
    const r3 = demoReadings[2] as Extract<NewLogEvent, { kind: 'reading' }>;
    appendEvent(file, demoReadings[0]);
    appendEvent(file, demoReadings[1]);
    appendEvent(file, { ...r3, reading: '5000 Torr', pressure_Pa: 5000 * TORR });
    const withdraw = {
      kind: 'withdraw',
      step: 3,
      withdraws_line: 4,
      by: 'AB',
      time: 't1',
      reason: 'mistyped',
    };
    appendEvent(file, withdraw as NewLogEvent);
    appendEvent(file, r3);
    const accept = {
      kind: 'acknowledge',
      code: 'above-working-limit',
      step: 3,
      by: 'CD',
      time: 't2',
    } as const;
    expect(appendEvent(file, accept).line).toBe(7);
    const lim = findingsOf((await checkFile(file, { trials: 0, seed: 1 })).findings, 'above-working-limit');
    expect(lim.map((f) => [f.line, f.severity, f.accepted?.by])).toEqual([
      [6, 'danger', 'CD'],
      [4, 'warning', undefined],
    ]);
    const cli = await runCli(['check', file, '--trials', '100000']);
    expect(cli.stdout).not.toMatch(/line 4, fill 3:[^\n]*accepted at the manifold/);
    expect(cli.stdout).toMatch(
      /line 6, fill 3:[^\n]*\(accepted at the manifold by CD at t2; it stands all the same\)/,
    );
    // an acceptance written before any reading of its step accepts none of them
    const early = join(tmp(), 'early.jsonl');
    createLog(early, { ...header, tank: { ...header.tank, working_limit_Pa: 1495 * TORR } });
    for (const e of [demoReadings[0], demoReadings[1], accept, r3]) appendEvent(early, e);
    const e2 = findingsOf((await checkFile(early, { trials: 0, seed: 1 })).findings, 'above-working-limit');
    expect(e2.map((f) => [f.line, f.accepted])).toEqual([[5, undefined]]);
  });

  it('a reading above its gauge full scale is a danger; corrected away it is a warning; out of tolerance still exits 4', async () => {
    const dir = tmp();
    const file = join(dir, 'fs.jsonl');
    createLog(file, header);
    const over = {
      ...(demoReadings[0] as Extract<NewLogEvent, { kind: 'reading' }>),
      reading: '1010 Torr',
      pressure_Pa: 1010 * TORR,
    };
    appendEvent(file, over);
    const rep1 = await checkFile(file, { trials: 0, seed: 1 });
    expect(findingsOf(rep1.findings, 'above-gauge-range').map((f) => [f.severity, f.gauge, f.line])).toEqual([
      ['danger', 'head-1kT', 2],
    ]);
    expect((await runCli(['check', file, '--trials', '100000'])).code).toBe(4); // incomplete: fail wins over the danger
    appendEvent(file, {
      ...(demoReadings[0] as Extract<NewLogEvent, { kind: 'reading' }>),
      kind: 'correction',
      by: 'QX',
      reason: 'typed 1010 for 10.0131',
      replaces_line: 2,
    } as NewLogEvent);
    const rep2 = await checkFile(file, { trials: 0, seed: 1 });
    expect(findingsOf(rep2.findings, 'above-gauge-range').map((f) => f.severity)).toEqual(['warning']);
  });

  it('a top-up: the start pressure is the re-check initial state; without it, a warning and the planned one', async () => {
    const dir = tmp();
    const file = join(dir, 'top.jsonl');
    const h: LogHeader = { ...refHeader, in_tank: { composition: { Ar: 1 }, pressure_Pa: 100 } };
    createLog(file, h);
    for (let i = 0; i < 3; i++) appendEvent(file, refReading(i));
    const plain = await checkFile(file, { trials: 0, seed: 1 });
    expect(findingsOf(plain.findings, 'start-not-read')).toHaveLength(1);
    expect(plain.start).toMatchObject({ pressurePa: 100, read: false });
    const file2 = join(dir, 'top2.jsonl');
    createLog(file2, h);
    appendEvent(file2, {
      kind: 'start-pressure',
      gauge: 'head-2kT',
      reading: '0.9 Torr',
      pressure_Pa: 0.9 * TORR,
      temperature: '25 degC',
      temperature_K: 298.15,
      by: 'QX',
      time: 't0',
    });
    for (let i = 0; i < 3; i++) appendEvent(file2, refReading(i));
    const read = await checkFile(file2, { trials: 0, seed: 1 });
    expect(read.findings).toEqual([]);
    expect(read.start).toMatchObject({ pressurePa: 0.9 * TORR, read: true, by: 'QX' });
    // 0.9 Torr of Ar first: the first fill adds (50.04 - 0.9) Torr of CH4, so CH4 is lower than without it (ideal-gas reasoning, from the readings alone)
    expect(read.result.composition.CH4.value).toBeLessThan(plain.result.composition.CH4.value);
    expect(
      refusal(() =>
        appendEvent(file2, {
          kind: 'start-pressure',
          gauge: 'head-2kT',
          reading: '1 Torr',
          pressure_Pa: TORR,
          temperature: '25 degC',
          temperature_K: 298.15,
          by: 'QX',
          time: 't9',
        }),
      ),
    ).toMatch(/read before the first fill/);
  });

  it('a barometer logged at the start is used for the gauge-referenced readings and shown', async () => {
    const dir = tmp();
    const file = join(dir, 'baro.jsonl');
    copyFileSync('batches/demo-ch4-phi1-ar98.jsonl', file);
    const text = readFileSync(file, 'utf8').trim().split('\n');
    writeFileSync(file, text[0] + '\n');
    appendEvent(file, {
      kind: 'barometer',
      reading: '748.2 Torr',
      pressure_Pa: 748.2 * TORR,
      by: 'QX',
      time: '2026-12-02T09:00:00Z',
    });
    for (const e of demoReadings) appendEvent(file, e);
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    expect(rep.barometer).toMatchObject({
      pressurePa: 748.2 * TORR,
      from: 'log',
      by: 'QX',
      text: '748.2 Torr',
    });
    expect(rep.findings).toEqual([]);
    expect((await runCli(['check', file, '--trials', '100000'])).stdout).toContain(
      'Barometer   748.2 Torr logged by QX at 2026-12-02T09:00:00Z',
    );
  });
});
