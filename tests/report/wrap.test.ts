// The one word-wrapper (report/wrap.ts) in its styles: stderr's messages (STDERR_STYLE, what
// cli/context.ts wrapForStderr applies) and the tank label's lines (LABEL_STYLE, label-model.ts
// wrapLine). The variations the callers' own tests leave out are held here: the spacing of a broken
// message kept as typed, the label's spacing made one space, and the label's even measure (its first
// row measured at the continuation's indent). Layout only: no computed number is checked here.
import { describe, expect, it } from 'vitest';
import { wrapForStderr } from '../../src/cli/context.js';
import { wrapLine } from '../../src/report/label-model.js';
import { LABEL_STYLE, STDERR_STYLE, wrapWords } from '../../src/report/wrap.js';

describe('wrapWords', () => {
  it('stderr: a broken line keeps its spacing as typed; the break drops the spacing at it', () => {
    const line = `x${' aaaa'.repeat(3)}  two  spaces${' bbbb'.repeat(3)}`;
    expect(wrapWords(line, 24, STDERR_STYLE)).toEqual(['x aaaa aaaa aaaa  two', '  spaces bbbb bbbb bbbb']);
    expect(wrapForStderr(line, 24)).toBe('x aaaa aaaa aaaa  two\n  spaces bbbb bbbb bbbb');
  });

  it('label: the spacing made one space; the first row measured at the hanging indent (one text width)', () => {
    // 20 columns, hanging indent 4: every row's words take at most 16 columns, the first row's too
    const line = 'aaaa  bbbb cccc dddd eeee ffff gggg';
    const rows = wrapWords(line, 20, LABEL_STYLE);
    // greedy: 'aaaa bbbb cccc' (14), 'dddd eeee ffff' (14), 'gggg' alone: the orphan takes 'ffff'
    expect(rows).toEqual(['aaaa bbbb cccc', '    dddd eeee', '    ffff gggg']);
    expect(wrapLine(line, 20)).toEqual(rows);
    // stderr's style measures the first row at its own indent: one more word on it
    expect(wrapWords(line, 20, STDERR_STYLE)[0]).toBe('aaaa  bbbb cccc dddd');
  });

  it('never breaks inside "(k = 2)", "x +- U", a number and its unit, or a charge number, in every style', () => {
    // greedy at 20 columns, the break would fall after "(k" (row 1: "the predicted U (k =")
    const line = 'the predicted U (k = 2) of x(O2) is 0.98 % of 2.0 h';
    for (const style of [STDERR_STYLE, LABEL_STYLE]) {
      const rows = wrapWords(line, 20, style);
      expect(rows.join(' ').replace(/ +/g, ' ')).toBe(line);
      expect(rows.some((r) => r.includes('(k = 2)'))).toBe(true);
      expect(rows.some((r) => /\b0\.98 %/.test(r))).toBe(true);
      expect(rows.some((r) => /\b2\.0 h$/.test(r))).toBe(true);
    }
    expect(wrapWords('fill 4 Ar 1/2 x 0.0066667 +- 0.000016', 12, STDERR_STYLE)).toEqual([
      'fill 4',
      '  Ar 1/2 x',
      '  0.0066667 +- 0.000016',
    ]);
    // a word that is no unit, or a number before a word, still breaks
    expect(wrapWords('charge 1 of 2 follows at fill 4', 12, STDERR_STYLE)).toEqual([
      'charge 1 of',
      '  2 follows',
      '  at fill 4',
    ]);
  });
});
