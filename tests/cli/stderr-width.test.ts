// Messages on stderr (a refusal: what, where, why, what to do) fit an 80-column terminal: every line
// at most 80 characters unless it is one word longer than that (a path is never cut), a continuation
// indented two spaces deeper than the line it continues, no word lost or split (cli/context.ts
// wrapForStderr, applied by cliOf's err to all that goes to stderr).
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { STDERR_WIDTH, wrapForStderr } from '../../src/cli/context.js';
import { runCli, stderrWords } from '../helpers.js';

/** the lines of a stderr text longer than 80 columns that are not a single word */
const overWide = (text: string) =>
  text.split('\n').filter((l) => l.length > STDERR_WIDTH && l.trim().includes(' '));

/** the words of a text, in order */
const words = (text: string) => text.split(/\s+/).filter(Boolean);

describe('wrapForStderr', () => {
  it('breaks at the last space that fits, continuations indented by two more; the words kept in order', () => {
    const text = `mixwright: ${'abcd '.repeat(40).trim()}\n  (error code: x)\n`;
    const shown = wrapForStderr(text);
    const lines = shown.split('\n');
    expect(lines[0]).toBe(`mixwright: ${'abcd '.repeat(14).trim()}`); // 11 + 14 x 5 - 1 = 80 columns
    expect(lines[0].length).toBe(80);
    expect(lines[1]).toMatch(/^ {2}abcd abcd/);
    expect(lines.slice(1, -2).every((l) => l.startsWith('  ') && !l.startsWith('   '))).toBe(true);
    expect(overWide(shown)).toEqual([]);
    expect(words(shown)).toEqual(words(text));
    expect(shown.endsWith('\n  (error code: x)\n')).toBe(true);
    // an indented line goes on two spaces deeper than its own indent
    const deep = wrapForStderr(`    ${'wxyz '.repeat(30).trim()}`).split('\n');
    expect(deep.length).toBeGreaterThan(1);
    expect(deep.slice(1).every((l) => /^ {6}\S/.test(l))).toBe(true);
  });

  it('a word longer than the width stands whole on its own line; lines that fit are left as they are', () => {
    const path = `/a/${'very-long-folder-name/'.repeat(6)}log.jsonl`;
    const shown = wrapForStderr(`mixwright: the log ${path} cannot be read`);
    expect(shown.split('\n')).toEqual(['mixwright: the log', `  ${path}`, '  cannot be read']);
    const fits = 'mixwright: note:  two  spaces kept\n\nand an empty line\n';
    expect(wrapForStderr(fits)).toBe(fits);
  });
});

describe('refusals on stderr fit 80 columns, in-process and from the bundle', () => {
  // each refusal's message is over 80 characters long in one piece
  const refusals = [
    ['check', 'readings/ch4-phi1-ar98.csv', '--premix-log', 'batches/demo-premix-o2-ar-mt2.jsonl'],
    ['plan', '--fuel', 'CH4'],
    ['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--premix-log', 'batches/demo-c2h4-phi05-ar-overshoot.jsonl'],
  ];
  it.each(refusals)('%s %s ...', async (...argv) => {
    const r = await runCli(argv);
    expect(r.code).toBe(2);
    expect(r.stderrShown.split('\n').some((l) => l.length > 60)).toBe(true);
    expect(r.stderr.split('\n')[0].length).toBeGreaterThan(STDERR_WIDTH); // the message, whole
    expect(overWide(r.stderrShown)).toEqual([]);
    expect(stderrWords(r.stderrShown)).toBe(r.stderr);
    const bin = spawnSync(process.execPath, ['dist/mixwright.mjs', ...argv], { encoding: 'utf8' });
    expect(bin.status).toBe(2);
    expect(bin.stderr).toBe(r.stderrShown);
  });
});
