// A hashed batch log (format /2) whose line hashes were stripped and whose header was set back to
// "mixwright-batch/1" must not pass as an old log that merely predates the hashes: it carries header
// fields and events no /1 writer wrote (tank.working_limit_Pa, in_tank, thermometer.settling_K,
// steps[].charge, stage, ...), so `check` reports it as a record altered after writing (exit 5, no
// pass; README "Exit codes") and names what gives it away. Real /1 logs keep their note.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readLog } from '../../src/io/batch-log.js';
import { checkFile } from '../../src/io/check.js';
import { hashedOnlyMarks } from '../../src/io/log-audit.js';
import { runCli } from '../helpers.js';

/** the log set back to /1 with every chain removed, then `edit` applied to its events */
function setBack(file: string, edit: (events: Record<string, unknown>[]) => void): string {
  const events = readFileSync(file, 'utf8')
    .split('\n')
    .filter(Boolean)
    .map((l) => JSON.parse(l) as Record<string, unknown>);
  events[0].format = 'mixwright-batch/1';
  for (const e of events) delete e.chain;
  edit(events);
  const f = join(mkdtempSync(join(tmpdir(), 'mw-set-back-')), 'b.jsonl');
  writeFileSync(f, events.map((e) => JSON.stringify(e) + '\n').join(''));
  return f;
}

const TORR = 101325 / 760;

describe('a hashed log set back to format /1', () => {
  it('a reading changed: RECORD ALTERED AFTER WRITING (line 1), the fields named, exit 5, no pass', async () => {
    const f = setBack('batches/demo-ch4-phi1-ar98.jsonl', (ev) => {
      ev[1].reading = '10.0100 Torr';
      ev[1].pressure_Pa = 10.01 * TORR;
    });
    const r = await checkFile(f, { trials: 0, seed: 1 });
    expect(r.record?.alteredLines).toEqual([1]);
    const set = r.findings.find((x) => x.code === 'format-set-back');
    expect(set?.message).toContain('(tank.working_limit_Pa, in_tank)');
    expect(r.findings.some((x) => /predates the line hashes/.test(x.message))).toBe(false);
    const cli = await runCli(['check', f]);
    expect(cli.code).toBe(5);
    const verdict = cli.stdout.split('\n').find((l) => l.startsWith('Verdict'))!;
    expect(verdict).toMatch(/^Verdict {5}RECORD ALTERED AFTER WRITING \(line 1\) - not a pass/);
    const label = await runCli(['label', f, '--trials', '100000']);
    expect(label.code).toBe(5);
    expect(label.stdout).toContain('RECORD ALTERED AFTER WRITING: NOT A PASS');
  });

  it('a two-stage log: every giveaway of the header and its lines is named', () => {
    const f = setBack('batches/demo-ch4-phi1-from-premix.jsonl', () => {});
    expect(hashedOnlyMarks(readLog(f))).toEqual([
      'tank.working_limit_Pa',
      'thermometer.settling_K',
      'steps[].charge',
      'in_tank',
      'premix_logs',
      'stage',
      'safety',
      'a reading or correction with by, charge or replaces_line (lines 3, 7)',
      'a premix-mixed line (line 4)',
      'a premix-reading line (line 5)',
    ]);
  });

  it('real /1 logs (as a /1 writer made them) carry none: the note that they predate the hashes stays', async () => {
    for (const f of ['tests/io/fixtures/demo-format1.jsonl', 'batches/demo-c2h4-phi05-ar-overshoot.jsonl'])
      expect(hashedOnlyMarks(readLog(f)), f).toEqual([]);
    const r = await checkFile('tests/io/fixtures/demo-format1.jsonl', { trials: 0, seed: 1 });
    expect(r.record?.alteredLines).toEqual([]);
    expect(r.findings.map((x) => x.message).join('\n')).toContain('predates the line hashes');
  });

  it('a /2 log as written has no marks (the test applies to set-back logs only)', () => {
    expect(hashedOnlyMarks(readLog('batches/demo-ch4-phi1-ar98.jsonl'))).toEqual([]);
  });
});
