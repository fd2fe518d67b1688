// The guided fill of a two-stage preparation, as far as it runs before the screens open: its
// refusals (exit 2 and the problem code, no log written or changed), the stage-2 command stage 1
// records, and a fill order together with a premix tank, refused alike by plan, sheet and fill.
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';
import { stage2Command } from '../../src/cli/stage-fill.js';
import { createLog, readLog } from '../../src/io/batch-log.js';
import { fileSha256, stage2Header } from '../../src/io/stage-log.js';
import { premixTargets, twoStagePlanned, writePremixLog } from '../stage-logs.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-stagefill-'));

describe('fill --premix-tank: refusals before any gas flows (exit 2)', () => {
  it('a stage-1 log that exists is never overwritten: refused, naming the resume command (stage-fill, log-exists)', async () => {
    const dir = tmp();
    const file = join(dir, 'b1-premix.jsonl');
    writeFileSync(file, 'kept\n');
    const r = await runCli(['fill', RECIPE, '--premix-tank', 'MT-2', '--batch', 'b1', '--dir', dir], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: stage-fill)');
    expect(r.stderr).toContain(`the stage-1 log ${file} exists`);
    expect(r.stderr).toContain(`mixwright fill --resume ${file}`);
    expect(readFileSync(file, 'utf8')).toBe('kept\n');
  });

  it('stage 1 run again after it finished: the premix log is closed, so it says so and gives the stage-2 command, not --resume', async () => {
    const dir = tmp();
    const { file } = writePremixLog(dir, premixTargets);
    const before = readFileSync(file, 'utf8');
    const r = await runCli(['fill', RECIPE, '--premix-tank', 'MT-2', '--batch', 'b1', '--dir', dir], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: stage-fill)');
    expect(r.stderr).toContain(`the stage-1 log ${file} exists and is finished (closed)`);
    // the header's stage-2 command (tests/stage-logs.ts writes 'mixwright fill X')
    expect(r.stderr).toContain('fill the batch from it with `mixwright fill X`');
    expect(r.stderr).not.toContain('--resume');
    expect(readFileSync(file, 'utf8')).toBe(before);
  });

  it("the batch's own log taken already: stage 1 is refused too (stage 2 could not write it)", async () => {
    const dir = tmp();
    writeFileSync(join(dir, 'b1.jsonl'), 'kept\n');
    const r = await runCli(['fill', RECIPE, '--premix-tank', 'MT-2', '--batch', 'b1', '--dir', dir], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      `the stage-2 log ${join(dir, 'b1.jsonl')} exists: a fill of this batch was started`,
    );
    expect(readdirSync(dir)).toEqual(['b1.jsonl']);
  });

  it('a premix tank that would run below the batch reading it must reach: refused (stage-fill, premix-low), no log', async () => {
    const dir = tmp();
    const recipe = join(dir, 'low.yaml');
    writeFileSync(
      recipe,
      'id: low\ntank: MT-1\nmixture: {fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1, dilution: 0.98}\n' +
        'pressure: 1500 Torr\ntemperature: 25 degC\npremix: {tank: MT-2, pressure: 240 Torr, gases: [O2]}\n',
    );
    const r = await runCli(['fill', recipe, '--batch', 'b1', '--dir', join(dir, 'batches')], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: stage-fill)');
    // the plan's delivery check (plan prints it as the premix-runs-low danger): 240 Torr falls to 190.62
    expect(r.stderr).toMatch(/the premix tank MT-2, filled to 240 Torr as planned, falls to 190\.62 Torr/);
    // the batch reads the premix at 520.28 Torr after CH4 and Ar 1/2 (not at 212.87 Torr through a
    // flammable state: the search never trades a state hazard for a supply finding)
    expect(r.stderr).toContain('must reach 520.28 Torr');
    expect(existsSync(join(dir, 'batches'))).toBe(false);
  });

  it('not in a terminal: exit 2, pointing to plan, sheet and check (as every fill)', async () => {
    const r = await runCli(['fill', RECIPE, '--premix-tank', 'MT-2', '--dir', tmp()]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: needs-terminal)');
  });
});

describe('--order with a premix tank: refused alike by plan, sheet and fill (stage-order)', () => {
  for (const argv of [
    ['plan', RECIPE],
    ['sheet', RECIPE, '--format', 'txt'],
    ['fill', RECIPE, '--batch', 'o1'],
  ])
    it(`${argv[0]}: exit 2, the order named, nothing written`, async () => {
      const dir = tmp();
      const extra = argv[0] === 'fill' ? ['--dir', dir] : [];
      const r = await runCli([...argv, '--premix-tank', 'MT-2', '--order', 'CH4,Ar,O2', ...extra], true);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('(error code: stage-order)');
      expect(r.stderr).toContain(
        '--order: a fill order (CH4,Ar,O2) is not taken together with a premix tank (MT-2)',
      );
      expect(r.stdout).toBe('');
      expect(readdirSync(dir)).toEqual([]);
    });

  it("a recipe's order with its premix block: refused at the recipe line", async () => {
    const dir = tmp();
    const recipe = join(dir, 'o.yaml');
    writeFileSync(
      recipe,
      'id: o\ntank: MT-1\nmixture: {fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1, dilution: 0.98}\n' +
        'pressure: 1500 Torr\ntemperature: 25 degC\norder: [CH4, "Ar@400 Torr", O2, Ar]\npremix: {tank: MT-2}\n',
    );
    const r = await runCli(['plan', recipe]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${recipe}:6:8 order: a fill order (CH4,Ar@400 Torr,O2,Ar) is not taken`);
  });
});

describe('the stage-2 command stage 1 records', () => {
  it('repeats the recipe and the design options given (not the premix tank), quoting what a shell needs', () => {
    expect(
      stage2Command(
        'recipes/a b.yaml',
        { premixTank: 'MT-2', pressure: '1400 Torr', phi: '0.9' },
        'batches/b1-premix.jsonl',
        'b1',
        'batches',
      ),
    ).toBe(
      "mixwright fill 'recipes/a b.yaml' --phi 0.9 --pressure '1400 Torr' --premix-log batches/b1-premix.jsonl " +
        '--batch b1 --dir batches',
    );
  });
});

describe('fill --premix-log: stage 2 refusals before any gas flows (exit 2, no batch log)', () => {
  const TORR = 101325 / 760;
  const stage2 = (file: string, extra: string[] = []) =>
    runCli(['fill', RECIPE, '--premix-log', file, ...extra], true);
  const noBatchLog = (dir: string) => expect(readdirSync(dir).filter((f) => f === 'b1.jsonl')).toEqual([]);

  it('an unfinished premix log (premix-log-refused, not-finished)', async () => {
    const dir = tmp();
    const { file } = writePremixLog(dir, premixTargets, { close: false });
    const r = await stage2(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: premix-log-refused)');
    noBatchLog(dir);
  });

  it('a premix whose re-check is not shown within tolerance: O2 read 1 Torr high (premix-log-refused)', async () => {
    const dir = tmp();
    const { file } = writePremixLog(dir, [premixTargets[0], premixTargets[1] + TORR]);
    const r = await stage2(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: premix-log-refused)');
    expect(r.stderr).toMatch(/O2/);
    noBatchLog(dir);
  });

  it('a premix log with a reading past its working limit: a danger in its record (premix-log-refused)', async () => {
    const dir = tmp();
    const limit = twoStagePlanned.plan.twoStage!.premix.tank.ratedPressurePa! * 0.9;
    const { file } = writePremixLog(dir, [premixTargets[0], limit * 1.01]);
    const r = await stage2(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: premix-log-refused)');
    noBatchLog(dir);
  });

  it('another batch than the one the premix was made for may draw from it: b2.jsonl is made beside it', async () => {
    // the premix holds gas for many batches; plan --premix-log subtracts the other batches' draws and
    // refuses only too little gas (was: refused as "made for batch b1, not b2")
    const dir = tmp();
    const { file } = writePremixLog(dir, premixTargets);
    const p = await import('../../src/cli/plan-from.js');
    const { createBatchStageLog } = await import('../../src/io/stage-log.js');
    const planned = p.planFrom(RECIPE, { premixLog: file });
    const made = createBatchStageLog(planned.plan, planned.req, { batch: 'b2' });
    expect(made).toBe(join(dir, 'b2.jsonl'));
    expect(readLog(made).header.stage).toMatchObject({ number: 2, batch: 'b2' });
    expect(readdirSync(dir).sort()).toEqual(['b1-premix.jsonl', 'b2.jsonl']);
  });

  it('the batch log beside the premix log exists already (stage-fill, log-exists)', async () => {
    const dir = tmp();
    const { file } = writePremixLog(dir, premixTargets);
    writeFileSync(join(dir, 'b1.jsonl'), 'kept\n');
    const r = await stage2(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`the stage-2 log ${join(dir, 'b1.jsonl')} exists`);
    expect(readFileSync(join(dir, 'b1.jsonl'), 'utf8')).toBe('kept\n');
  });

  it('resume of a stage-2 log whose premix log changed since: refused (stage-fill, premix-changed), log untouched', async () => {
    const dir = tmp();
    const { file } = writePremixLog(dir, premixTargets);
    const batchLog = join(dir, 'b1.jsonl');
    const p = await import('../../src/cli/plan-from.js');
    const planned = p.planFrom(RECIPE, { premixLog: file });
    const sha = fileSha256(file)!;
    createLog(
      batchLog,
      stage2Header(
        planned.plan,
        planned.req,
        'b1',
        '2026-12-03T10:00:00Z',
        { file, id: 'b1-premix', sha256: sha },
        batchLog,
      ),
    );
    expect(readLog(batchLog).header.stage?.premix_log).toEqual({
      file: 'b1-premix.jsonl',
      id: 'b1-premix',
      sha256: sha,
    });
    const before = readFileSync(batchLog, 'utf8');
    writeFileSync(file, readFileSync(file, 'utf8').replace('"QX"', '"QY"'));
    const r = await runCli(['fill', '--resume', batchLog], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: stage-fill)');
    expect(r.stderr).toContain(`the premix log ${file} has changed since this batch was started from it`);
    expect(readFileSync(batchLog, 'utf8')).toBe(before);
  });
});
