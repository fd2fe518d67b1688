/**
 * The argument parser's own refusals in the house form where it names a choice: "mixwright: --units:
 * "kpa" is not one of the choices: ...; did you mean kPa?" (what, where, why, what to do), as our own
 * refusals say them. Other parser messages pass as they are.
 */
const INVALID_CHOICE =
  /^error: option '(\S+)[^']*' argument '(.*)' is invalid\. Allowed choices are (.*)\.\n?$/s;

export function parserErrorText(s: string): string {
  const m = INVALID_CHOICE.exec(s);
  if (!m) return s;
  const [, option, given, list] = m;
  const choices = list.split(', ');
  // a choice spelled in another case is the likely one, but not taken for it (a unit's case counts: mPa is
  // not MPa); a nearer spelling is not guessed (a5 is no misspelt a4, MPa no kPa)
  const near = choices.find((c) => c.toLowerCase() === given.toLowerCase());
  return (
    `mixwright: ${option}: "${given}" is not one of the choices: ${choices.join(', ')}` +
    (near ? `; did you mean ${near}? The case counts:` : ';') +
    ` give one exactly as listed\n  (error code: usage)\n`
  );
}
