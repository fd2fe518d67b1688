/**
 * The wizard keeps work: Esc or Ctrl-C with unsaved changes asks first; saving a recipe or
 * sheet whose file exists asks (naming the file) instead of refusing or replacing silently;
 * Tab completes to the first species of the "did you mean" list (one ranking, rankSpecies).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { render } from 'ink-testing-library';
import {
  existsSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  utimesSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  getSpecies,
  rankSpecies,
  resolveSpeciesKey,
  speciesKeys,
  suggestSpecies,
} from '../../src/core/index.js';
import { WizardApp, wizardActions } from '../../src/tui/wizard-app.js';
import {
  DEFAULTS,
  FIELDS,
  completionOf,
  unsavedFields,
  wizardInit,
  wizardReducer,
  type ActOutcome,
  type WizardAction,
  type WizardState,
} from '../../src/tui/wizard-state.js';
import { makeEvaluator } from '../../src/tui/wizard-eval.js';
import { wizardAct } from '../../src/tui/run.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { untilWithin } from './until.js';

const evaluate = makeEvaluator();
const start = () => wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' });
const run = (s: WizardState, ...actions: WizardAction[]) =>
  actions.reduce((t, a) => wizardReducer(t, a, evaluate), s);
const SAVE_FOCUS = FIELDS.length; // the first action, [save recipe]

const until = untilWithin(5000);

describe('wizard reducer: leaving', () => {
  it('Esc with nothing changed leaves at once', () => {
    const s = run(start(), { type: 'escape' });
    expect(s.quit).toBe(true);
    expect(s.question).toBeUndefined();
  });

  it('Esc after an edit asks, naming the changed fields; n, Enter and Esc stay and keep the values; y leaves', () => {
    const edited = run(
      start(),
      { type: 'down' },
      { type: 'down' },
      { type: 'backspace' },
      { type: 'char', text: '0.8' },
    ); // phi 1 -> 0.8
    expect(unsavedFields(edited)).toEqual(['phi']);
    const asked = run(edited, { type: 'escape' });
    expect(asked.quit).toBeFalsy();
    expect(asked.question?.kind).toBe('leave');
    expect(asked.question?.text).toMatch(/not saved as a recipe \(phi\)\. Leave without saving\? y: leave/);
    for (const no of [{ type: 'char', text: 'n' }, { type: 'enter' }, { type: 'escape' }] as WizardAction[]) {
      const s = run(asked, no);
      expect(s.quit).toBeFalsy();
      expect(s.question).toBeUndefined();
      expect(s.values.phi).toBe('0.8');
      expect(s.message).toMatch(/staying/);
    }
    expect(run(asked, { type: 'char', text: 'y' }).quit).toBe(true);
    expect(run(asked, { type: 'char', text: 'Y' }).quit).toBe(true);
  });

  it('keys other than an answer do not touch the design while a question is up', () => {
    const asked = run(start(), { type: 'char', text: 'x' }, { type: 'escape' });
    const s = run(
      asked,
      { type: 'char', text: 'CH4' },
      { type: 'backspace' },
      { type: 'down' },
      { type: 'complete' },
    );
    expect(s.values).toEqual(asked.values);
    expect(s.focus).toBe(asked.focus);
    expect(s.question).toEqual(asked.question);
    expect(s.message).toMatch(/answer the question first: y for yes, n/);
  });

  it('a saved recipe makes the design clean; a later edit makes it unsaved again', () => {
    const edited = run(start(), { type: 'char', text: '6' }); // fuel CH46
    const saved = run(edited, {
      type: 'result',
      outcome: { kind: 'message', text: 'saved recipes/my-design.yaml', savedRecipe: true },
    });
    expect(unsavedFields(saved)).toEqual([]);
    expect(run(saved, { type: 'escape' }).quit).toBe(true);
    // a written sheet is not a saved recipe
    const sheet = run(edited, {
      type: 'result',
      outcome: { kind: 'message', text: 'saved fill-my-design.html' },
    });
    expect(run(sheet, { type: 'escape' }).question?.kind).toBe('leave');
    expect(run(saved, { type: 'backspace' }, { type: 'escape' }).question?.kind).toBe('leave');
  });

  it('Esc and Ctrl-C are the same key to the wizard', () => {
    expect(wizardActions('', { escape: true })).toEqual([{ type: 'escape' }]);
    expect(wizardActions('c', { ctrl: true })).toEqual([{ type: 'escape' }]);
    expect(wizardActions('c', {})).toEqual([{ type: 'char', text: 'c' }]);
  });
});

describe('wizard reducer: saving again', () => {
  const confirm: ActOutcome = {
    kind: 'confirm',
    action: 'save recipe',
    file: 'recipes/my-design.yaml',
    text: 'recipes/my-design.yaml exists. Replace it? y/n',
  };
  it('a question from the shell is shown; y asks the shell again with replace, n keeps the file and says so', () => {
    const s = run({ ...start(), focus: SAVE_FOCUS }, { type: 'enter' });
    expect(s.request).toBe('save recipe');
    expect(s.replace).toBeFalsy();
    const asked = run(s, { type: 'result', outcome: confirm });
    expect(asked.question).toMatchObject({
      kind: 'replace',
      file: 'recipes/my-design.yaml',
      action: 'save recipe',
    });
    const yes = run(asked, { type: 'char', text: 'y' });
    expect(yes.request).toBe('save recipe');
    expect(yes.replace).toBe(true);
    expect(yes.question).toBeUndefined();
    const no = run(asked, { type: 'char', text: 'n' });
    expect(no.request).toBeUndefined();
    expect(no.message).toBe(
      'kept recipes/my-design.yaml as it was; nothing written. To keep both, change the id and save again',
    );
    // the replace flag lasts one step only
    expect(run(yes, { type: 'down' }).replace).toBeUndefined();
  });

  it('a key typed while the cursor is on an action is not dropped silently: the message says where the cursor is', () => {
    const s = run({ ...start(), focus: SAVE_FOCUS }, { type: 'char', text: 'y' });
    expect(s.values).toEqual(start().values);
    expect(s.message).toBe(
      '"y" not taken: the cursor is on [save recipe]; Up moves to the fields, Enter does the action',
    );
  });
});

describe('Tab completion and "did you mean" share one ranking', () => {
  // a blend separates entries with "," and fractions with ":", so a typed species name holds neither
  const names = speciesKeys()
    .flatMap((k) => [k, getSpecies(k).name, ...getSpecies(k).aliases])
    .map((n) => n.split(/[,:]/)[0]);
  const prefix = fc
    .constantFrom(...names)
    .chain((n) => fc.integer({ min: 1, max: n.length }).map((i) => n.slice(0, i)));
  const scribble = fc.string({
    minLength: 1,
    maxLength: 6,
    unit: fc.constantFrom(...'abcdeghilmnorstuxyzCHNOS0123456789-'.split('')),
  });
  const query = fc.oneof(
    prefix,
    scribble,
    prefix.map((p) => p.toUpperCase()),
    prefix.map((p) => p.toLowerCase()),
  );
  const onFuel = (fuel: string) =>
    run(wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', fuel }), { type: 'complete' });
  const firstSuggestion = (message: string | undefined) => /did you mean ([^,?\s]+)/.exec(message ?? '')?.[1];

  it('property: for any prefix, Tab completes to the first species of the "did you mean" list the screen shows', () => {
    fc.assert(
      fc.property(query, (q) => {
        const known = resolveSpeciesKey(q);
        const after = onFuel(q).values.fuel;
        if (known) {
          // a known species is not turned into another one; at most its spelling becomes the key
          expect(after).toBe(known);
          return;
        }
        const shown = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', fuel: q }).evaluation.error;
        expect(shown?.field).toBe('fuel');
        const first = firstSuggestion(shown?.message);
        expect(after).toBe(first ?? q);
        expect(first).toBe(suggestSpecies(q)[0]);
        expect(completionOf(q).target).toBe(rankSpecies(q)[0]);
      }),
      { numRuns: 300 },
    );
  });

  it('property: in the oxidizer, where a whole "air" is allowed, Tab completes to the first "did you mean" too (air first)', () => {
    const airish = fc.oneof(query, fc.constantFrom('a', 'ai', 'A', 'AI', 'Ai'));
    fc.assert(
      fc.property(airish, (q) => {
        const init = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', oxidizer: q });
        const after = run({ ...init, focus: FIELDS.indexOf('oxidizer') }, { type: 'complete' }).values
          .oxidizer;
        const known = q.toLowerCase() === 'air' ? 'air' : resolveSpeciesKey(q);
        if (known) {
          expect(after).toBe(known);
          return;
        }
        expect(init.evaluation.error?.field).toBe('oxidizer');
        expect(after).toBe(firstSuggestion(init.evaluation.error?.message) ?? q);
      }),
      { numRuns: 200 },
    );
    const a = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', oxidizer: 'a' });
    expect(a.evaluation.error?.message).toMatch(/did you mean air, Ar/);
    expect(run({ ...a, focus: FIELDS.indexOf('oxidizer') }, { type: 'complete' }).values.oxidizer).toBe(
      'air',
    );
  });

  it('property: in a blend, Tab completes the last entry, fraction kept, to the first suggestion for it', () => {
    fc.assert(
      fc.property(query, (q) => {
        fc.pre(!resolveSpeciesKey(q) && !/CH4/i.test(q));
        const s = onFuel(`CH4:0.5,${q}:0.5`);
        const shown = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', fuel: `CH4:0.5,${q}:0.5` }).evaluation
          .error;
        const first = firstSuggestion(shown?.message);
        // a name with a space is refused as "not species:fraction" in a blend, with no list: Tab still takes the ranking's first
        const expected = first ?? rankSpecies(q)[0];
        if (/\S\s+\S/.test(q)) expect(first).toBeUndefined();
        expect(s.values.fuel).toBe(expected ? `CH4:0.5,${expected}:0.5` : `CH4:0.5,${q}:0.5`);
      }),
      { numRuns: 150 },
    );
  });

  it('examples: a valid species stays itself; names and aliases complete to keys; no match says so', () => {
    expect(onFuel('CO').values.fuel).toBe('CO'); // it used to become CO2
    expect(onFuel('H2').values.fuel).toBe('H2'); // it used to become H2O
    expect(onFuel('co').values.fuel).toBe('CO');
    expect(onFuel('eth').values.fuel).toBe('C2H6'); // ethane: the shortest completion, first in the table
    expect(onFuel('meth').values.fuel).toBe('CH4');
    expect(rankSpecies('eth').slice(0, 4)).toEqual(['C2H6', 'C2H4', 'C2H2', 'C2H5OH']);
    const none = onFuel('qqq');
    expect(none.values.fuel).toBe('qqq');
    expect(none.message).toMatch(
      /no known species starts with or is close to "qqq"; `mixwright species` lists them/,
    );
  });
});

describe('wizard screen (ink)', () => {
  it('Esc with changes shows the question; n keeps the design on screen; Ctrl-C asks the same', async () => {
    const ui = render(
      <WizardApp initial={start()} evaluate={evaluate} act={() => ({ kind: 'message', text: 'ok' })} />,
    );
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the preview');
    ui.stdin.write('X');
    await until(() => /fuel\s+CH4X/.test(ui.lastFrame() ?? ''), 'the edit');
    ui.stdin.write('\x1b');
    await until(() => !!ui.lastFrame()?.includes('Leave without saving?'), 'the question');
    expect(ui.lastFrame()).toMatch(/y: yes\s+n, Enter or Esc: no/);
    ui.stdin.write('n');
    await until(() => !!ui.lastFrame()?.includes('staying'), 'staying');
    expect(ui.lastFrame()).toMatch(/fuel\s+CH4X/);
    ui.stdin.write('\x03');
    await until(() => !!ui.lastFrame()?.includes('Leave without saving?'), 'the question after Ctrl-C');
    ui.unmount();
  });

  it('saving again: the question names the file; y calls the action again with replace; the answer is shown', async () => {
    const calls: boolean[] = [];
    const act = (_s: WizardState, _a: string, replace: boolean): ActOutcome => {
      calls.push(replace);
      return replace
        ? { kind: 'message', text: 'replaced recipes/my-design.yaml', savedRecipe: true }
        : {
            kind: 'confirm',
            action: 'save recipe',
            file: 'recipes/my-design.yaml',
            text: 'recipes/my-design.yaml exists (written by this wizard at 10:00:00). Replace it?',
          };
    };
    const ui = render(
      <WizardApp initial={{ ...start(), focus: SAVE_FOCUS }} evaluate={evaluate} act={act} />,
    );
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the preview');
    ui.stdin.write('\r');
    await until(() => !!ui.lastFrame()?.includes('recipes/my-design.yaml exists'), 'the question');
    ui.stdin.write('y');
    await until(() => !!ui.lastFrame()?.includes('replaced recipes/my-design.yaml'), 'the answer');
    expect(calls).toEqual([false, true]);
    ui.unmount();
  });

  it('the Tab line names what Tab will put in, and it is the first "did you mean"', async () => {
    const ui = render(
      <WizardApp
        initial={wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1', fuel: '' })}
        evaluate={evaluate}
        act={() => ({ kind: 'message', text: 'ok' })}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the preview');
    ui.stdin.write('iso');
    await until(() => !!ui.lastFrame()?.includes('Tab: i-C4H10 (isobutane)'), 'the Tab line');
    expect(ui.lastFrame()).toContain('did you mean i-C4H10');
    ui.stdin.write('\t');
    await until(() => /fuel\s+i-C4H10\s/.test(ui.lastFrame() ?? ''), 'the completion');
    ui.unmount();
  });
});

describe('wizard actions on files', () => {
  const setup = () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-wizkeep-'));
    const ctx = {
      version: 'test',
      recipesDir: join(dir, 'recipes'),
      batchesDir: join(dir, 'b'),
      sheetsDir: dir,
      written: new Map<string, Date>(),
    };
    const s = wizardInit(evaluate, { ...DEFAULTS, id: 'wz2', tank: 'MT-1', dilution: '0.98' });
    return { dir, ctx, s };
  };

  it("save, save unchanged, save changed (asks, naming the file as this session's), replace", () => {
    const { ctx, s } = setup();
    const file = join(ctx.recipesDir, 'wz2.yaml');
    expect(wizardAct(s, 'save recipe', ctx)).toEqual({
      kind: 'message',
      text: `saved ${file}`,
      savedRecipe: true,
    });
    expect(wizardAct(s, 'save recipe', ctx)).toEqual({
      kind: 'message',
      text: `${file} already holds this recipe; nothing to write`,
      savedRecipe: true,
    });
    const changed = { ...s, values: { ...s.values, dilution: '0.97' } };
    const q = wizardAct(changed, 'save recipe', ctx) as ActOutcome;
    expect(q.kind).toBe('confirm');
    expect(q.text).toMatch(
      new RegExp(
        `^${file.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')} exists \\(written by this wizard at \\d\\d:\\d\\d:\\d\\d\\)\\. Replace it`,
      ),
    );
    expect(buildPlanRequest(readRecipe(file)).input.design.composition.Ar).toBeCloseTo(0.98, 12); // not replaced by asking
    expect(wizardAct(changed, 'save recipe', ctx, true)).toEqual({
      kind: 'message',
      text: `replaced ${file}`,
      savedRecipe: true,
    });
    expect(buildPlanRequest(readRecipe(file)).input.design.composition.Ar).toBeCloseTo(0.97, 12);
    // a yes for a file that is gone by then: saved, not "replaced"
    rmSync(file);
    expect(wizardAct(s, 'save recipe', ctx, true)).toEqual({
      kind: 'message',
      text: `saved ${file}`,
      savedRecipe: true,
    });
  });

  it('a file not written in this session: the question says so and when it last changed; its text stays until yes', () => {
    const { ctx, s } = setup();
    const sheet = join(ctx.sheetsDir, 'fill-wz2.html');
    writeFileSync(sheet, 'a sheet someone annotated');
    utimesSync(sheet, new Date('2026-11-30T08:15:00Z'), new Date('2026-11-30T08:15:00Z'));
    const q = wizardAct(s, 'write fill sheet', ctx) as ActOutcome;
    expect(q).toMatchObject({ kind: 'confirm', action: 'write fill sheet', file: sheet });
    expect(q.text).toContain(
      `${sheet} exists (not written in this session, last changed 2026-11-30 08:15 UTC). Replace it with the fill sheet on screen?`,
    );
    expect(readFileSync(sheet, 'utf8')).toBe('a sheet someone annotated');
    expect(wizardAct(s, 'write fill sheet', ctx, true)).toMatchObject({
      kind: 'message',
      text: `replaced ${sheet} (open it in a browser to print)`,
    });
    expect(readFileSync(sheet, 'utf8')).toContain('<svg');
  });

  it('a folder that cannot be made is a message, not a crash that would lose the design', () => {
    const { dir, s } = setup();
    writeFileSync(join(dir, 'not-a-folder'), '');
    const r = wizardAct(s, 'save recipe', {
      version: 'test',
      recipesDir: join(dir, 'not-a-folder'),
    }) as ActOutcome;
    expect(r.kind).toBe('message');
    expect(r.text).toMatch(
      /^recipe not written: .*not-a-folder.*The design is still on screen; check the folder/,
    );
  });

  it('two guided fills of one design within a minute get two logs; neither is refused', () => {
    const { ctx, s } = setup();
    const a = wizardAct(s, 'start guided fill', ctx) as { logFile: string };
    const b = wizardAct(s, 'start guided fill', ctx) as { logFile: string };
    expect(a.logFile).not.toBe(b.logFile);
    expect(existsSync(a.logFile) && existsSync(b.logFile)).toBe(true);
    expect(readdirSync(ctx.batchesDir)).toHaveLength(2);
  });
});
