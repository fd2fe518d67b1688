/**
 * Split charges in words: a source filled in more than one charge (Ar to 400 Torr, then O2, then
 * Ar to the final pressure) is named with its charge everywhere a fill is shown, so the two
 * openings of the same cylinder are never mistaken for each other. Pure; the plan's renderers,
 * the guided fill and the batch log share these words.
 */

import { chargeNumbers } from '../core/index.js';

/** charge `number` of the `of` charges its source is filled in */
export interface ChargeOf {
  readonly number: number;
  readonly of: number;
}

/** a source filled in one charge needs no charge named */
export const isSplit = (c: ChargeOf | undefined): c is ChargeOf => c !== undefined && c.of > 1;

/** "charge 1 of 2" */
export const chargeWords = (c: ChargeOf): string => `charge ${c.number} of ${c.of}`;

/** "Ar, charge 1 of 2" for a split source, "Ar" for a source filled once */
export function chargeName(gas: string, c: ChargeOf | undefined): string {
  return isSplit(c) ? `${gas}, ${chargeWords(c)}` : gas;
}

/** " (charge 1 of 2)" after a name, or nothing for a source filled once */
export function chargeSuffix(c: ChargeOf | undefined): string {
  return isSplit(c) ? ` (${chargeWords(c)})` : '';
}

/** "Ar 1/2": the short form for narrow columns and the fill order */
export function chargeShort(gas: string, c: ChargeOf | undefined): string {
  return isSplit(c) ? `${gas} ${c.number}/${c.of}` : gas;
}

/**
 * The charge of every fill of a list, counted from the sources in fill order: the k-th fill from
 * a source is its charge k, of as many as the list holds. This is how a plan numbers its charges
 * (one source id is one cylinder), so a record that predates the charge numbers gets the same ones.
 */
export function chargesOf(fills: readonly { readonly source: string }[]): ChargeOf[] {
  return chargeNumbers(fills.map((f) => f.source));
}

/**
 * The other charges of the same source, in words, for the line under a split fill: "charge 2 of 2
 * follows at fill 4" / "charge 1 of 2 was fill 2".
 */
export function siblingWords(
  fills: readonly { readonly index: number; readonly source: string; readonly charge: ChargeOf }[],
  k: number,
): string {
  const me = fills[k];
  if (!isSplit(me.charge)) return '';
  return fills
    .filter((f, j) => j !== k && f.source === me.source)
    .map((f) =>
      f.index < me.index
        ? `${chargeWords(f.charge)} was fill ${f.index}`
        : `${chargeWords(f.charge)} follows at fill ${f.index}`,
    )
    .join('; ');
}
