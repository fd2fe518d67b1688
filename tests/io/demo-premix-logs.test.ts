// The demo logs of a two-stage preparation are what scripts/make-demo-premix-logs.ts writes, byte for
// byte, with the headers the guided fill writes (src/io/stage-log.ts): stage 1 the premix with the
// stage-2 command, stage 2 the batch naming its premix log by the hash of its last entry
// (premix_logs) and the sha256 of its bytes (stage.premix_log). Demo data: no outside reference.
import { execFileSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readLog } from '../../src/io/batch-log.js';
import { fileSha256 } from '../../src/io/stage-log.js';
import { certificateFlowed, runCli } from '../helpers.js';

const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const dir = mkdtempSync(join(tmpdir(), 'mw-demo-premix-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the demo premix and batch logs', () => {
  it('the script writes them again byte for byte (run in a folder with the recipes only)', () => {
    cpSync('recipes', join(dir, 'recipes'), { recursive: true });
    mkdirSync(join(dir, 'batches'));
    execFileSync(resolve('node_modules/.bin/tsx'), [resolve('scripts/make-demo-premix-logs.ts')], {
      cwd: dir,
      stdio: 'pipe',
    });
    for (const f of [PREMIX, BATCH])
      expect(readFileSync(join(dir, f), 'utf8'), f).toBe(readFileSync(f, 'utf8'));
  }, 60000);

  it('stage 1 and stage 2 headers as the guided fill writes them, the pair consistent', () => {
    const premix = readLog(PREMIX);
    const batch = readLog(BATCH);
    expect(premix.header.stage).toMatchObject({
      number: 1,
      of: 2,
      batch: 'demo-ch4-phi1-from-premix',
      next_command:
        'mixwright fill recipes/ch4-o2-ar-phi1.yaml --premix-log batches/demo-premix-o2-ar-mt2.jsonl ' +
        '--batch demo-ch4-phi1-from-premix --dir batches',
    });
    expect(batch.header.stage).toMatchObject({
      number: 2,
      of: 2,
      batch: 'demo-ch4-phi1-from-premix',
      premix_log: { file: 'demo-premix-o2-ar-mt2.jsonl', id: premix.header.id, sha256: fileSha256(PREMIX) },
      // the premix tank check the guided fill asks for before the first fill from the premix
      premix_check: { tank: 'MT-2', minimum: '621.7 Torr', fills: [3] },
    });
    // and the two events it logs there, mixed first, then the premix tank read, before fill 3's reading
    const fill3 = batch.readings.find((r) => r.step === 3)!;
    expect(batch.premixMixed.map((e) => e.by)).toEqual(['KL']);
    expect(batch.premixReadings.map((e) => [e.reading, e.enough])).toEqual([['1890.1 Torr', true]]);
    expect(batch.premixMixed[0].line).toBeLessThan(batch.premixReadings[0].line);
    expect(batch.premixReadings[0].line).toBeLessThan(fill3.line);
    // the premix check the fill asks, with the premix log's close time and last reading it is judged by
    expect(batch.header.stage?.premix_check).toMatchObject({
      tank: 'MT-2',
      premix_log_closed: premix.closeTime,
      premix_log_last_Pa: premix.readings.at(-1)!.pressure_Pa,
      premix_log_draws: 0,
    });
    expect(batch.header.premix_logs).toEqual([
      { source: 'premix-MT-2', path: 'demo-premix-o2-ar-mt2.jsonl', last_entry_sha256: premix.lastLink },
    ]);
    expect(premix.closed && batch.closed).toBe(true);
  });

  it("the premix log's certificate is titled as the premix of its batch (its header carries the batch's recipe)", async () => {
    const r = await runCli(['label', PREMIX, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(0);
    // the certificate's title wraps at 80 columns: read whole
    expect(certificateFlowed(r.stdout)).toContain(
      'BATCH CERTIFICATE premix of batch demo-ch4-phi1-from-premix (stage 1 of 2; the batch: CH4/O2 phi 1 ' +
        'in 98 % Ar, 1500 Torr in MT-1): Ar/O2 in MT-2',
    );
  });
});
