// The end screens of the fill fit an 80 x 24 terminal (ink-testing-library's frame, 24 rows assumed):
// the verdict and the commands to run next are on the first page; the label is on it when there is
// room, else its own page (l), and a long message is cut (m shows it whole).
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { appendEvent, createLog, readLog } from '../../src/io/batch-log.js';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, type FillState } from '../../src/tui/fill-state.js';
import { runCli } from '../helpers.js';
import { checkLog } from '../../src/io/check.js';
import { premixTargets, writePremixLog } from '../stage-logs.js';
import { untilWithin } from './until.js';

const until = untilWithin(15000);

/**
 * the text of a paged page's parts, without the title rows (the leading rows every part repeats) and each
 * part's key row, spaces made single
 */
function bodyOf(pages: readonly string[]): string {
  const rows = pages.map((p) => p.split('\n'));
  let title = 1;
  while (pages.length > 1 && rows.every((r) => r[title] === rows[0][title])) title++;
  return rows
    .map((r) => r.slice(title, -1).join(' '))
    .join(' ')
    .replace(/\s+/g, ' ');
}

/** every part of a paged page (n: next part), each frame within 24 rows */
async function allParts(ui: { lastFrame: () => string | undefined; stdin: { write: (t: string) => void } }) {
  const pages = [ui.lastFrame()!];
  const m = /part 1 of (\d+)/.exec(pages[0]);
  for (let k = 2; m && k <= Number(m[1]); k++) {
    ui.stdin.write('n');
    await until(() => !!ui.lastFrame()?.includes(`part ${k} of`), `part ${k}`);
    pages.push(ui.lastFrame()!);
  }
  for (const p of pages) expect(rowsOfFrame(p), p).toBeLessThanOrEqual(24);
  return pages;
}

/** rows of a frame (ink-testing-library draws 100 columns; the tmux test holds 80 x 24) */
const rowsOfFrame = (frame: string) => frame.split('\n').length;

describe('the end screen fits 80 x 24', () => {
  it('stage 1 closed at its targets: verdict, the premix as filled and the stage-2 command on the first page; the label on l', async () => {
    const { file } = writePremixLog(mkdtempSync(join(tmpdir(), 'mw-end-fit-')), premixTargets, {
      close: true,
    });
    const log = readLog(file);
    const s = initialState(setupFromHeader(log.header), log, '');
    expect(s.phase).toBe('done');
    const recheck = async () => ({ report: await checkLog(readLog(file), { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile={file} recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('Re-check of the log (mixwright check): PASS');
    expect(f.replace(/\s+/g, ' ')).toContain('mixwright fill X'); // the stage-2 command the header records
    expect(f).toContain('l: the tank label');
    expect(f).not.toContain('Tank label (as filled');
    ui.stdin.write('l');
    await until(
      () => !!ui.lastFrame()?.includes('Tank label (as filled'),
      `the label page in ${ui.lastFrame()}`,
      3000,
    );
    expect(rowsOfFrame(ui.lastFrame()!)).toBeLessThanOrEqual(24);
    ui.stdin.write('b');
    await until(() => !!ui.lastFrame()?.includes('l: the tank label'), 'back');
    ui.unmount();
  });

  it('a single-tank batch: the label on the first page, within 24 rows', async () => {
    const log = readLog('batches/demo-ch4-phi1-ar98.jsonl');
    const s = initialState(setupFromHeader(log.header), log, '');
    const recheck = async () => ({ report: await checkLog(log, { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile="demo.jsonl" recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('Tank label (as filled');
    expect(f).toContain('`mixwright check demo.jsonl`');
    ui.unmount();
  });

  it('a long message is cut on the first page (m shows it whole), the verdict and the log line stay', async () => {
    const log = readLog('batches/demo-ch4-phi1-ar98.jsonl');
    const long = `stopped after fill 2: ${'the tank read 1498.2 Torr after venting, and more words '.repeat(40)}END`;
    const s = { ...initialState(setupFromHeader(log.header), log, ''), message: long };
    const recheck = async () => ({ report: await checkLog(log, { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile="demo.jsonl" recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('(m: the whole message)');
    expect(f).toContain('m or ?: the whole message');
    expect(f).not.toContain('END');
    expect(f).toContain('`mixwright check demo.jsonl`');
    ui.stdin.write('m');
    await until(() => !!ui.lastFrame()?.includes('END'), 'the whole message');
    ui.stdin.write('b');
    await until(() => !ui.lastFrame()?.includes('END'), 'back');
    // ? shows it whole too, as on the other screens
    ui.stdin.write('?');
    await until(() => !!ui.lastFrame()?.includes('part 1 of'), 'the whole text');
    const text = bodyOf(await allParts(ui));
    expect(text).toContain('END');
    ui.unmount();
  });

  it('three cautions beside the verdict and the tank above its limit: every caution on the first page (shortened), whole on c; the label box at 80 columns without a stranded word', async () => {
    const { file, log } = dangerLog();
    const report = await checkLog(log, { trials: 0, seed: 1 });
    expect(report.caveats).toHaveLength(3);
    const s = initialState(setupFromHeader(log.header), log, '');
    expect(s.phase).toBe('done');
    const recheck = async () => ({ report, log });
    const app = <FillApp initial={s} write={() => {}} logFile={file} recheck={recheck} />;
    const ui = render(app);
    Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
    ui.rerender(app);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    const fit = (frame: string) => {
      const rows = frame.split('\n');
      expect(rows.length, frame).toBeLessThanOrEqual(23);
      for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
      expect(rows[0]).toMatch(/^mixwright fill /);
    };
    fit(f);
    const flat = f.replace(/\s+/g, ' ');
    // the title says the tank was kept above the limit; the tank's state is said whole
    expect(flat).toMatch(/KEPT ABOVE THE WORKING LIMIT: 2800 Torr \(target 1500\.\d Torr\)/);
    expect(flat).toContain("do not use it until then; defer to local rules and the tank's rating");
    // each caution is there by what it is, and what to do (its end)
    for (const head of ['! DANGER IN THE RECORDED FILL:', '! ACCEPTED HAZARD:', '! DANGER: a logged reading'])
      expect(flat).toContain(head);
    expect(flat).toContain(
      'do not label or use this tank as fit until it and its gauges have been inspected',
    );
    expect(flat).toContain('c or ?: cautions in full');
    ui.stdin.write('c');
    await until(() => !ui.lastFrame()!.includes('c or ?: cautions in full'), 'the cautions page');
    const c = ui.lastFrame()!;
    fit(c);
    for (const caveat of report.caveats)
      expect(c.replace(/\s+/g, ' ')).toContain(caveat.replace(/\s+/g, ' '));
    ui.stdin.write('b');
    await until(() => !!ui.lastFrame()?.includes('c or ?: cautions in full'), 'back');
    // ? shows the same, as on the other screens
    ui.stdin.write('?');
    await until(() => !ui.lastFrame()!.includes('c or ?: cautions in full'), 'the whole-text page');
    const whole = await allParts(ui);
    whole.forEach(fit);
    for (const caveat of report.caveats) expect(bodyOf(whole)).toContain(caveat.replace(/\s+/g, ' '));
    ui.stdin.write('b');
    await until(() => !!ui.lastFrame()?.includes('c or ?: cautions in full'), 'back again');
    ui.stdin.write('l');
    await until(() => !!ui.lastFrame()?.includes('Tank label (as filled'), 'the label');
    const pages = [ui.lastFrame()!];
    const lastPart = (p: string) => !/n: next part/.test(p) || /part (\d+) of \1\b/.test(p);
    for (let k = 2; !lastPart(pages[pages.length - 1]); k++) {
      ui.stdin.write('n');
      await until(() => !!ui.lastFrame()?.includes(`part ${k} of`), `label part ${k}`);
      pages.push(ui.lastFrame()!);
    }
    for (const p of pages) {
      fit(p);
      // inside the box: no row of a single word (ink never re-wraps a label line: they are cut to 76 columns)
      for (const r of p.split('\n').filter((x) => /^[│║]/.test(x)))
        expect(r.replace(/[│║]/g, '').trim().split(/\s+/).length, r).toBeGreaterThan(1);
    }
    ui.unmount();
    // the `label` command's text box: 80 columns, no stranded word
    const out = await runCli(['label', file, '--trials', '100000']);
    const box = out.stdout.slice(0, out.stdout.indexOf('\n\n')).split('\n').slice(1);
    expect(box.length).toBeGreaterThan(10);
    for (const r of box) expect(r.length, r).toBeLessThanOrEqual(80);
    for (const r of box.filter((x) => /^[#|]/.test(x)))
      expect(r.slice(1, -1).trim().split(/\s+/).length, r).toBeGreaterThan(1);
  }, 60000);
});

const NOW = '2026-12-01T01:00:00Z';
/**
 * order CH4, O2, Ar: the plan's danger accepted, fill 3 read at 2800 Torr (above MT-1's working limit
 * 2700.2 Torr) and kept (accept JD): a closed log whose re-check has three cautions
 */
function dangerLog() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, order: ['CH4', 'O2', 'Ar'] } });
  const h = headerFromPlan(planFill(req.input), req, 'b1', '2026-12-01T00:00:00Z');
  const file = join(mkdtempSync(join(tmpdir(), 'mw-end-caveats-')), 'b1.jsonl');
  createLog(file, h);
  let s: FillState = initialState(setupFromHeader(h));
  // every effect appended (chained, fsync'd), its line fed back as the fill's component does
  const step = (a: Parameters<typeof fillReducer>[1]) => {
    s = fillReducer(s, a);
    for (const e of s.effects) {
      const w = appendEvent(file, e);
      if (e.kind === 'reading') s = fillReducer(s, { type: 'logged', step: e.step, line: w.line });
    }
  };
  const typed = (t: string) => {
    step({ type: 'char', text: t });
    step({ type: 'enter', now: NOW });
  };
  typed('accept JD');
  typed('10.01');
  step({ type: 'enter', now: NOW });
  typed('30.04');
  typed('2800');
  typed('accept JD');
  expect(s.phase).toBe('done');
  return { file, log: readLog(file) };
}
