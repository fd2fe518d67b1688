import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { hasTmux, tmuxSession } from './tmux.js';

// A real terminal: the wizard saves a recipe, saves it again unchanged, then changed (it asks,
// naming the file; n keeps the file, y replaces it); after one more edit Esc asks before
// leaving, n stays, Ctrl-C asks the same, y leaves with exit 0 and the file as last saved.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');

describe.runIf(hasTmux || required)('wizard keeps work in a real terminal (tmux)', () => {
  it('save again asks before replacing; Esc and Ctrl-C with unsaved changes ask before leaving', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-e2e-keep-'));
    const t = tmuxSession(`mw-e2e-keep-${process.pid}`, dir);
    const recipe = join(dir, 'recipes', 'my-design.yaml');
    const dilution = () => /dilution: ([\d.]+)/.exec(readFileSync(recipe, 'utf8'))![1];
    const setDilution = async (last: string) => {
      // from [save recipe] up to dilution, change its last digit, back down to [save recipe]
      await t.keys('Up', 'Up', 'Up', 'Up', 'Up', 'BSpace');
      await t.type(last);
      await t.waitFor(new RegExp(`dilution\\s+0\\.9${last}`));
      await t.keys('Down', 'Down', 'Down', 'Down', 'Down');
    };
    try {
      t.start(`node ${BIN}; echo EXIT=$?`);
      await t.waitFor(/preview/);
      // from fuel down to [save recipe]
      await t.keys('Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Enter');
      await t.waitFor(/saved recipes\/my-design\.yaml/);
      expect(dilution()).toBe('0.95');
      await t.keys('Enter');
      await t.waitFor(/recipes\/my-design\.yaml already holds this recipe; nothing to write/);

      await setDilution('8');
      await t.keys('Enter');
      let s = await t.waitFor(/Replace it/);
      expect(s.replace(/\s+/g, ' ')).toMatch(
        /recipes\/my-design\.yaml exists \(written by this wizard at \d\d:\d\d:\d\d\)\. Replace it with the recipe on screen\?/,
      );
      await t.keys('n');
      await t.waitFor(/kept recipes\/my-design\.yaml as it was; nothing written/);
      expect(dilution()).toBe('0.95');
      await t.keys('Enter');
      await t.waitFor(/Replace it/);
      await t.keys('y');
      await t.waitFor(/replaced recipes\/my-design\.yaml/);
      expect(dilution()).toBe('0.98');

      await setDilution('7');
      await t.keys('Escape');
      s = await t.waitFor(/Leave without saving\?/);
      expect(s.replace(/\s+/g, ' ')).toContain('changes not saved as a recipe (dilution)');
      await t.keys('n');
      await t.waitFor(/staying: the design is kept on screen/);
      expect(t.screen()).toMatch(/dilution\s+0\.97/);
      await t.keys('C-c');
      await t.waitFor(/Leave without saving\?/);
      await t.keys('y');
      await t.waitFor(/EXIT=0/);
      expect(dilution()).toBe('0.98');
    } finally {
      t.close();
    }
  }, 60000);
});
