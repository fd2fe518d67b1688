// The hazard marks of a tank as filled (report/tank-hazards.ts) on the plan, the sheet, the label and
// the certificate, and the certificate's title from the batch's own values. References: a gas is
// flammable in air when its mixing line with air enters the flammable region (ISO 10156's principle,
// from memory; core/tank-gas.ts, its own tests give the limits); oxygen-enriched above 23.5 % O2
// (thresholds.ts, from memory). The compositions by hand (Dalton's law, within the tolerance named).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { planFill, TORR_PA } from '../../src/core/index.js';
import { writeStepLog } from '../../scripts/log-writer.js';
import { certificateFlowed, labelBoxText, runCli } from '../helpers.js';

let dir = '';

/** a log of a recipe's plan read at its targets, with the readings of `over` (step -> Torr) instead */
function logOf(recipe: string, name: string, over: Record<number, number> = {}): string {
  const file = join(dir, `${name}.yaml`);
  writeFileSync(file, recipe);
  const req = buildPlanRequest(readRecipe(file));
  const plan = planFill(req.input);
  const log = join(dir, `${name}.jsonl`);
  const header = headerFromPlan(plan, req, name, '2026-12-02T09:00:00Z', log);
  const acks = plan.findings
    .filter((f) => f.severity === 'danger')
    .map((d) => ({
      kind: 'acknowledge' as const,
      code: d.code,
      step: d.step ?? null,
      by: 'TT',
      time: '2026-12-02T09:05:00Z',
    }));
  return writeStepLog(
    log,
    header,
    plan.steps,
    (s) => {
      const pa = over[s.index] !== undefined ? over[s.index] * TORR_PA : s.targetPa;
      const shown = s.gauge?.reference === 'gauge' ? pa - header.barometer.pressure_Pa : pa;
      return {
        reading: `${shown} Pa`,
        pressurePa: pa,
        temperature: `${plan.temperatureK} K`,
        temperatureK: plan.temperatureK,
        time: `2026-12-02T09:1${s.index}:00Z`,
        by: 'TT',
      };
    },
    { before: { [plan.steps[0].index]: acks }, close: { time: '2026-12-02T09:30:00Z' } },
  );
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'mw-marks-'));
});

describe('flammable in air: a gas that does not burn by itself', () => {
  it('plan: 10 % H2 in Ar has the flammable-in-air finding with its caution; 2 % H2 in N2 has none', async () => {
    const base = ['--tank', 'MT-2', '--pressure', '1500 Torr', '--temperature', '22 degC', '--json'];
    const h2 = JSON.parse((await runCli(['plan', '--fractions', 'H2:0.1,Ar:0.9', ...base])).stdout);
    const f = h2.findings.find((x: { code: string }) => x.code === 'flammable-in-air');
    expect(f?.severity).toBe('warning');
    const text = (await runCli(['plan', '--fractions', 'H2:0.1,Ar:0.9', ...base.slice(0, -1)])).stdout;
    expect(text.replace(/\s+/g, ' ')).toMatch(
      /flammable-in-air: .*vent it only to a safe exhaust, keep ignition sources away, and follow the supplier safety data and local codes/,
    );
    const low = JSON.parse((await runCli(['plan', '--fractions', 'H2:0.02,N2:0.98', ...base])).stdout);
    expect(low.findings.map((x: { code: string }) => x.code)).not.toContain('flammable-in-air');
  });

  it('sheet: the design label says FLAMMABLE IN AIR for 10 % H2 in Ar', async () => {
    const r = await runCli([
      'sheet',
      '--fractions',
      'H2:0.1,Ar:0.9',
      '--tank',
      'MT-2',
      '--pressure',
      '1500 Torr',
      '--temperature',
      '22 degC',
      '--format',
      'txt',
    ]);
    expect(r.stdout).toContain('FLAMMABLE IN AIR');
  });

  it('label and certificate: 50 % CH4, 5 % O2, 45 % Ar as filled is marked FLAMMABLE IN AIR, the finding as filled', async () => {
    const log = logOf(
      'id: ch4-rich\ntank: MT-2\nmixture:\n  fractions: { CH4: 0.5, O2: 0.05, Ar: 0.45 }\n' +
        'pressure: 1500 Torr\ntemperature: 22 degC\n',
      'ch4-rich',
    );
    const r = await runCli(['label', log, '--trials', '100000']);
    const box = labelBoxText(r.stdout);
    expect(box).toContain('FLAMMABLE IN AIR');
    expect(box).not.toContain('FLAMMABLE GAS MIXTURE');
    expect(certificateFlowed(r.stdout)).toContain('as filled (the finished gas): flammable-in-air:');
    // check gives the same marks, in its text and its JSON
    const check = await runCli(['check', log, '--trials', '100000']);
    expect(check.stdout).toMatch(/The gas as filled .*\n {2}FLAMMABLE IN AIR/);
    const j = JSON.parse((await runCli(['check', log, '--trials', '100000', '--json'])).stdout);
    expect(j.as_filled_hazards.marks).toEqual([
      'FLAMMABLE IN AIR - burns where it leaks or is vented into air',
    ]);
  });
});

describe('oxygen-enriched as filled', () => {
  it('CH4 in air with the O2 read at 990 Torr instead of its target: the label marks OXIDIZER, the certificate the as-filled finding', async () => {
    const log = logOf(
      'id: trace-ch4-air\ntitle: trace CH4 in air, 2600 Torr in MT-1\ntank: MT-1\nmixture:\n' +
        '  fractions: { CH4: 0.01, O2: 0.2, N2: 0.79 }\norder: ["N2@80 Torr", CH4, O2, N2]\n' +
        'pressure: 2600 Torr\ntemperature: 22 degC\n',
      'o2-rich',
      { 3: 990 },
    );
    const r = await runCli(['label', log, '--trials', '100000']);
    const box = labelBoxText(r.stdout);
    // by hand (Dalton): O2 (990 - 106.02) / 2600 = 34.0 % within 0.3 %-points (real gas, impurities)
    const m = /OXIDIZER - OXYGEN-ENRICHED: ([\d.]+) % O2 \(above 23\.5 %\)/.exec(box);
    expect(m).not.toBeNull();
    expect(Math.abs(Number(m![1]) - ((990 - 106.02) / 2600) * 100)).toBeLessThan(0.3);
    const cert = certificateFlowed(r.stdout);
    expect(cert).toMatch(/as filled \(the finished gas\): oxygen-enriched: the tank holds 3\d\.\d % oxygen/);
    // the plan's own note is there too, of its planned state (fill 3), under the key that says so
    expect(cert).toContain("FINDINGS (the plan's at its planned values;");
  });
});

describe("the certificate's title: the batch's own values", () => {
  it('a batch filled at 100 Torr from a recipe titled 500 Torr: titled by its own pressure, the recipe quoted', async () => {
    const log = logOf(
      'id: ng\ntitle: CH4/C2H6 0.9/0.1 in air, phi 0.8, 500 Torr in MT-2\ntank: MT-2\nmixture:\n' +
        '  fuel: { CH4: 0.9, C2H6: 0.1 }\n  oxidizer: air\n  phi: 0.8\npressure: 100 Torr\ntemperature: 23.5 degC\n',
      'ng-100',
    );
    const r = await runCli(['label', log, '--trials', '100000']);
    const cert = certificateFlowed(r.stdout);
    expect(cert).toContain('BATCH CERTIFICATE CH4+C2H6/O2+N2 phi 0.8, 100.0 Torr in MT-2 (recipe "');
    expect(cert).not.toMatch(/BATCH CERTIFICATE CH4\/C2H6 0\.9\/0\.1 in air, phi 0\.8, 500 Torr/);
    const md = await runCli(['label', log, '--trials', '100000', '--format', 'md']);
    expect(md.stdout).toContain('# Batch certificate — CH4+C2H6/O2+N2 phi 0.8, 100.0 Torr in MT-2');
  });
});
