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

describe('--json and a command line the parser refuses (a usage error): the same document, stderr and exit as before', () => {
  /** exit 2, stderr the parser's own words, stdout the refusal document with code "usage" */
  async function usage(argv: string[], kind: string, message: string) {
    const r = await runCli(argv);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toContain(`error: ${message}`);
    expect(r.stderr).toContain('(run with --help for usage)');
    const j = JSON.parse(r.stdout);
    expect(j).toMatchObject({ tool: 'mixwright', kind, verdict: 'refused' });
    expect(j.refused).toEqual({
      code: 'usage',
      message,
      file: null,
      line: null,
      field: null,
      premix_log: null,
    });
    return j;
  }

  it('check: an unknown option, a missing option value, a missing argument, an extra argument', async () => {
    const unknown = await usage(['check', BATCH, '--json', '--bogus'], 'check', "unknown option '--bogus'");
    // the log as the parser read it, and no composition, as any refusal of check
    expect(unknown).toMatchObject({ file: BATCH, composition: null, composition_verdict: null, phi: null });
    const missing = await usage(
      ['check', '--json', '--trials'],
      'check',
      "option '--trials <n>' argument missing",
    );
    expect(missing.file).toBeNull();
    await usage(['check', '--json'], 'check', "missing required argument 'log'");
    await usage(
      ['check', BATCH, PREMIX, '--json'],
      'check',
      "too many arguments for 'check'. Expected 1 argument but got 2.",
    );
  });

  it('check: an option given twice is refused by its own code, the document printed all the same', async () => {
    const j = await refused([BATCH, '--trials', '100000', '--trials', '200000']);
    expect(j.refused).toMatchObject({ code: 'option-repeated', field: '--trials' });
  });

  it('plan and ready take --json: a usage error or a refusal prints the same document (kind plan / ready)', async () => {
    await usage(['plan', '--json', '--phi'], 'plan', "option '--phi <number>' argument missing");
    await usage(
      ['ready', 'recipes/ch4-o2-ar-phi1.yaml', '--json', '--bogus'],
      'ready',
      "unknown option '--bogus'",
    );
    const r = await runCli(['plan', join(dir, 'none.yaml'), '--json']);
    expect(r.code).toBe(2);
    const j = JSON.parse(r.stdout);
    expect(j).toMatchObject({ kind: 'plan', file: join(dir, 'none.yaml'), verdict: 'refused' });
    expect(j.refused.code).toBe('file-unreadable');
    expect(r.stderr).toContain(j.refused.message);
  });

  it('without --json a usage error prints nothing on stdout; --help with --json is help, exit 0', async () => {
    const r = await runCli(['check', BATCH, '--bogus']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    const help = await runCli(['check', '--json', '--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toContain('Usage: mixwright check');
    expect(() => JSON.parse(help.stdout)).toThrow();
  });
});
