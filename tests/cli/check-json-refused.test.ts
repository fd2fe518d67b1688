// `check --json` of what it refuses (exit 2): a JSON document on stdout that says what was refused
// and why, never empty stdout, and never a result a tool could read as a re-check. The message on
// stderr and the exit code are those of any refusal.
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const dir = mkdtempSync(join(tmpdir(), 'mw-check-json-refused-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** stdout parsed, with the refusal's shape checked: exit 2, verdict "refused", no composition */
async function refused(args: string[]) {
  const r = await runCli(['check', ...args, '--json']);
  expect(r.code, r.stderr).toBe(2);
  expect(r.stdout).not.toBe('');
  const j = JSON.parse(r.stdout);
  expect(j).toMatchObject({ tool: 'mixwright', kind: 'check', verdict: 'refused', composition: null });
  // the same words as stderr's
  expect(r.stderr).toContain(j.refused.message);
  expect(r.stderr).toContain(`(error code: ${j.refused.code})`);
  return j;
}

describe('check --json of a batch whose premix log is refused', () => {
  it('premix log missing: premix-log-refused, cause unreadable (file-unreadable)', async () => {
    const folder = mkdtempSync(join(dir, 'gone-'));
    copyFileSync(BATCH, join(folder, 'batch.jsonl'));
    const j = await refused([join(folder, 'batch.jsonl'), '--trials', '100000']);
    expect(j.refused).toMatchObject({
      code: 'premix-log-refused',
      field: 'premix_logs',
      premix_log: {
        log: 'demo-premix-o2-ar-mt2.jsonl',
        cause: { kind: 'unreadable', code: 'file-unreadable' },
      },
    });
    expect(j.refused.message).toMatch(/premix log demo-premix-o2-ar-mt2\.jsonl cannot be read/);
    // placed at the batch log's premix_logs, the field that names the premix log (not at the missing file)
    expect(j.refused.file).toBe(join(folder, 'batch.jsonl'));
    expect(j.refused.message).toMatch(/batch\.jsonl premix_logs: premix log demo-premix-o2-ar-mt2\.jsonl/);
  });

  it('premix log changed since the batch recorded it: cause changed, with both hashes', async () => {
    const folder = mkdtempSync(join(dir, 'changed-'));
    copyFileSync(PREMIX, join(folder, 'demo-premix-o2-ar-mt2.jsonl'));
    // the batch's record of the premix log's last entry, one hex digit changed
    let recorded = '';
    const text = readFileSync(BATCH, 'utf8').replace(/"last_entry_sha256":"([0-9a-f])/, (_, c: string) => {
      recorded = c === '0' ? '1' : '0';
      return `"last_entry_sha256":"${recorded}`;
    });
    expect(recorded).not.toBe('');
    writeFileSync(join(folder, 'batch.jsonl'), text);
    const j = await refused([join(folder, 'batch.jsonl'), '--trials', '100000']);
    const cause = j.refused.premix_log.cause;
    expect(cause.kind).toBe('changed');
    expect(cause.recorded_last_entry_sha256).toMatch(new RegExp(`^${recorded}[0-9a-f]{63}$`));
    expect(cause.now_last_entry_sha256).not.toBe(cause.recorded_last_entry_sha256);
    expect(j.refused.message).toMatch(/has changed since the batch log recorded it/);
  });

  it('a premix log that is not a finished premix (an altered one) given to CSV readings: cause record-altered', async () => {
    const lines = readFileSync(PREMIX, 'utf8').split('\n');
    const i = lines.findIndex((l) => l.includes('"kind":"reading"'));
    lines[i] = lines[i].replace(/"time":"([^"]*)00Z"/, '"time":"$159Z"');
    const altered = join(dir, 'altered-premix.jsonl');
    writeFileSync(altered, lines.join('\n'));
    const j = await refused([
      'readings/ch4-phi1-from-premix.csv',
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--premix-log',
      altered,
    ]);
    expect(j.refused.code).toBe('premix-log-refused');
    expect(j.refused.premix_log.cause).toEqual({ kind: 'record-altered', lines: [i + 1] });
  });
});

describe('check --json: the other refusals print the document too', () => {
  it('a missing file, an option out of range, a folder with no logs', async () => {
    expect((await refused([join(dir, 'none.jsonl')])).refused.code).toBe('file-unreadable');
    const trials = await refused([BATCH, '--trials', '5']);
    expect(trials.refused).toMatchObject({ code: 'out-of-range', field: '--trials' });
    const empty = join(dir, 'empty');
    mkdirSync(empty);
    expect((await refused([empty])).refused).toMatchObject({ code: 'no-logs-in-folder', file: empty });
  });

  it('a folder: a file it cannot check is a row with verdict "refused" and the refusal', async () => {
    const folder = mkdtempSync(join(dir, 'folder-'));
    copyFileSync(BATCH, join(folder, 'batch.jsonl'));
    const r = await runCli(['check', folder, '--json']);
    expect(r.code).toBe(2);
    const rows = JSON.parse(r.stdout);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      verdict: 'refused',
      refused: { code: 'premix-log-refused', premix_log: { cause: { kind: 'unreadable' } } },
    });
  });
});
