// Gauge pressures typed in options, recipes and CSV readings ("15 psig") are made absolute with a
// barometer, and the output says with which one; a lab profile without a barometer refuses them.
// Reference: 1 psi = 6894.757293 Pa (NIST SP 811, exact), 1 Torr = 101325/760 Pa (exact): 15 psig on
// 760 Torr is 775.7 + 760.0 = 1535.7 Torr; 45 psig 3087.2 Torr; on 750 Torr, 1525.7 Torr.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { planFill } from '../../src/core/index.js';
import { designOptions, runCli, TORR } from '../helpers.js';

const PSI = 6894.757293168361;
const INLINE = ['plan', ...designOptions({ pressure: '15 psig', rating: '45 psig' })];
const dir = mkdtempSync(join(tmpdir(), 'mw-psig-'));
const noBaroLab = join(dir, 'lab-no-baro.yaml');
writeFileSync(noBaroLab, DEMO_LAB_YAML.replace(/^barometer:\n( {2}.*\n)+/m, ''));

describe('gauge pressures are stated as read', () => {
  it('the worked values (arithmetic on the exact unit definitions)', () => {
    expect(((15 * PSI) / TORR + 760).toFixed(1)).toBe('1535.7');
    expect(((45 * PSI) / TORR + 760).toFixed(1)).toBe('3087.2');
    expect(((15 * PSI) / TORR + 750).toFixed(1)).toBe('1525.7');
  });

  it("plan: each option's gauge pressure on stderr, with the lab profile's barometer; the plan itself unchanged", async () => {
    const r = await runCli(INLINE);
    expect(r.stderr).toContain(
      "mixwright: note: 15 psig (--pressure) read as 1535.7 Torr absolute with the lab profile's barometer 760.0 Torr",
    );
    expect(r.stderr).toContain(
      "mixwright: note: 45 psig (--rating) read as 3087.2 Torr absolute with the lab profile's barometer 760.0 Torr",
    );
    expect(r.stdout).toMatch(/^Fill plan/);
    const json = await runCli([...INLINE, '--json']);
    expect(() => JSON.parse(json.stdout)).not.toThrow();
    expect(json.stderr).toContain('15 psig (--pressure) read as 1535.7 Torr absolute');
  });

  it('with --barometer, that one is named', async () => {
    const r = await runCli([...INLINE, '--barometer', '750 Torr']);
    expect(r.stderr).toContain(
      '15 psig (--pressure) read as 1525.7 Torr absolute with the barometer of --barometer 750.0 Torr',
    );
  });

  it('a lab profile without a barometer: refused with what to do, not the default assumed (exit 2)', async () => {
    const r = await runCli([...INLINE, '--lab', noBaroLab]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/"(15|45) psig" is a gauge pressure .* Give it with --barometer/);
    expect(r.stdout).toBe('');
    // the same plan in absolute pressures goes through with that profile
    const abs = INLINE.map((a) => (a === '15 psig' ? '1535.7 Torr' : a === '45 psig' ? '4 bar' : a));
    expect((await runCli([...abs, '--lab', noBaroLab])).code).not.toBe(2);
  });

  it('a premix pressure in psig with that profile: refused too (it was converted with the default 101325 Pa)', async () => {
    const recipe = join(dir, 'premix-psig.yaml');
    writeFileSync(
      recipe,
      readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8') + '\npremix:\n  tank: MT-2\n  pressure: 20 psig\n',
    );
    const r = await runCli(['plan', recipe, '--lab', noBaroLab]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/"20 psig" is a gauge pressure/);
    const ok = await runCli(['plan', recipe]);
    expect(ok.stderr).toContain(
      "20 psig (premix.pressure) read as 1794.3 Torr absolute with the lab profile's barometer 760.0 Torr",
    );
  }, 60_000);

  it('check of CSV readings: a psig reading is stated among the warnings, with its line', async () => {
    const csv = join(dir, 'r.csv');
    const text = readFileSync('readings/ch4-phi1-ar98.csv', 'utf8').replace(
      '1480.02 Torr',
      `${((1480.02 - 760) * (TORR / PSI)).toFixed(4)} psig`,
    );
    writeFileSync(csv, text);
    const r = await runCli(['check', csv, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml', '--trials', '100000']);
    expect(r.stdout).toMatch(
      /warning: reading 13\.9229 psig \(line 3\) read as 1480\.0 Torr absolute with the lab profile's barometer 760\.0 Torr/,
    );
    const refused = await runCli([
      'check',
      csv,
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--lab',
      noBaroLab,
    ]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/"13\.9229 psig" is a gauge pressure/);
  }, 60_000);

  it('the batch log header records the conversions and whose barometer the plan took', () => {
    const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
    const req = buildPlanRequest({
      ...rs,
      recipe: { ...(rs.recipe as unknown as Record<string, unknown>), pressure: '15 psig' } as never,
    });
    const h = headerFromPlan(planFill(req.input), req, 'b', '2026-12-01T00:00:00Z');
    expect(h.barometer.from).toBe('lab-profile');
    expect(h.gauge_pressures).toEqual([
      "15 psig (pressure) read as 1535.7 Torr absolute with the lab profile's barometer 760.0 Torr",
    ]);
  });
});
