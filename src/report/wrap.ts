/**
 * One word-wrapper for every shell that fits text to a width: stderr's messages (cli/context.ts
 * wrapForStderr), the tank label's lines (label-model.ts wrapLine) and the text certificate's
 * paragraphs (label-render.ts). A line is broken at spaces, greedily; a word longer than the width
 * is never cut (it stands whole on its own row); each continuation hangs deeper than the line's
 * lead. What differs between them is a WrapStyle. Some spaces never break, in every style (`bound`):
 * "(k = 2)" and "0.0066667 +- 0.000016" stay whole, and so do a number and its unit ("2.0 h", "0.014 %")
 * and a charge's number ("Ar 1/2").
 */

export interface WrapStyle {
  /** what of a line heads its first row and sets the hanging indent: its indent, and a marker ("! ") */
  readonly lead: RegExp;
  /** the continuation rows' indent: the lead's width plus `deeper` columns, at least `least` */
  readonly deeper: number;
  readonly least?: number;
  /** true: the spacing between words kept as typed (a message); false: one space between words */
  readonly keepSpacing: boolean;
  /** true: the first row's words measured at the continuation's indent too (one text width for every row) */
  readonly evenMeasure?: boolean;
  /**
   * true: no orphan: a last row of one word or under 12 characters takes words from the row before it,
   * where that row keeps two words at least and the moved words fit
   */
  readonly noOrphan?: boolean;
}

/** a word with the spacing before it, as typed */
interface Word {
  readonly gap: string;
  readonly word: string;
}

/** the units a number is never parted from at a break ("1500.0 Torr", "0.98 %") */
const UNITS = new Set(
  '% ppm Torr Pa kPa MPa bar mbar psi psia psig atm mmHg inHg K degC degF mol L mL g kg h min s ms'.split(
    ' ',
  ),
);

/**
 * whether the space before `next` (after `prev`) never breaks: at a lone "=" or "+-" ("k = 2",
 * "x +- U"), between a number and its unit, and before a charge's number ("Ar 1/2")
 */
function bound(prev: string, next: string): boolean {
  if (/^(=|\+-)$/.test(prev) || /^(=|\+-)$/.test(next)) return true;
  if (/\d$/.test(prev) && UNITS.has(next.replace(/[);:,.]+$/, ''))) return true;
  return /^\d+\/\d+[);:,.]*$/.test(next) && /^[A-Za-z]/.test(prev);
}

/** the words with every space that never breaks (`bound`) taken into the word, as typed */
function joined(words: readonly Word[]): Word[] {
  const out: Word[] = [];
  for (const w of words) {
    const last = out[out.length - 1];
    if (last && bound(last.word.split(/\s/).pop()!, w.word))
      out[out.length - 1] = { gap: last.gap, word: last.word + w.gap + w.word };
    else out.push(w);
  }
  return out;
}

/**
 * One line (no line feed) as rows of at most `width` characters, broken at spaces by `style`; a line
 * that fits is returned as it is.
 */
export function wrapWords(line: string, width: number, style: WrapStyle): string[] {
  if (line.length <= width) return [line];
  const lead = style.lead.exec(line)?.[0] ?? '';
  const pad = ' '.repeat(Math.max(style.least ?? 0, lead.length + style.deeper));
  // a message breaks at its spaces only (a tab stays inside its word); the label at any white space
  const split = style.keepSpacing ? / *[^ ]+/g : /\s*\S+/g;
  const words = joined(
    [...line.slice(lead.length).matchAll(split)].map((m) => ({
      gap: style.keepSpacing ? /^ */.exec(m[0])![0] : ' ',
      word: m[0].trimStart(),
    })),
  );
  const text = (r: readonly Word[]) => r.map((w, i) => (i ? w.gap : '') + w.word).join('');
  // the width a row takes: its indent (the lead on the first row, unless measured evenly) and its words
  const taken = (r: readonly Word[], first: boolean) =>
    (first && !style.evenMeasure ? lead.length : pad.length) + text(r).length;
  const rows: Word[][] = [[]];
  for (const w of words) {
    const row = rows[rows.length - 1];
    if (row.length && taken([...row, w], rows.length === 1) > width) rows.push([w]);
    else row.push(w);
  }
  if (style.noOrphan) {
    const last = rows[rows.length - 1];
    const prev = rows[rows.length - 2];
    while (
      prev &&
      (last.length === 1 || text(last).length < 12) &&
      prev.length > 2 &&
      taken([prev[prev.length - 1], ...last], false) <= width
    )
      last.unshift(prev.pop()!);
  }
  return rows.map((r, i) => `${i === 0 ? lead : pad}${text(r)}`);
}

/** stderr: each line's indent kept, a continuation two columns deeper, the spacing as typed */
export const STDERR_STYLE: WrapStyle = { lead: /^ */, deeper: 2, keepSpacing: true };

/**
 * the tank label's lines: a hanging indent of four columns at least (two deeper than the line's text:
 * a line of the label starts at 0 or 2 columns, or after "! ", so a continuation never reads as a line
 * of its own), one text width for every row, no orphan (a label reads as text, not a stranded word)
 */
export const LABEL_STYLE: WrapStyle = {
  lead: /^\s*(?:! )?/,
  deeper: 2,
  least: 4,
  keepSpacing: false,
  evenMeasure: true,
  noOrphan: true,
};
