/** Numbers and pressures typed as options, refused with the option's name when they cannot be read. */
import { ProblemError } from '../core/index.js';
import { parseQuantity } from '../io/quantity.js';

/** the most Monte Carlo trials `check` runs (memory: about 1.2 GB at this count) */
export const MAX_TRIALS = 10_000_000;

export function numberOption(text: string, option: string): number {
  const s = text.trim();
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s))
    throw new ProblemError({ code: 'not-a-number', text }, { field: option });
  const v = Number(s);
  if (!Number.isFinite(v)) throw new ProblemError({ code: 'number-too-large', text }, { field: option });
  return v;
}

/** --barometer: an absolute pressure in the range of the atmosphere anywhere people work */
export function parseBarometer(text: string): number {
  const pa = parseQuantity(text, 'pressure', { field: '--barometer' });
  if (!(pa >= 30000 && pa <= 110000)) {
    throw new ProblemError(
      {
        code: 'out-of-range',
        what: 'barometric pressure',
        value: pa,
        text,
        allowed:
          '300 hPa to 1100 hPa (225 to 825 Torr), absolute: the atmosphere from high mountains to below sea level',
      },
      { field: '--barometer' },
    );
  }
  return pa;
}

/**
 * --trials: a whole number from 1e5 to MAX_TRIALS, else `fallback`; `why` is what the
 * refusal says of the range (check explains both ends, label names them)
 */
export function parseTrials(text: string | undefined, fallback: number, why: 'explain' | 'plain'): number {
  if (text === undefined) return fallback;
  const trials = numberOption(text, '--trials');
  // the trials are kept in memory for the interval: about 1.2 GB at 1e7 (measured), so that is the ceiling
  if (!(Number.isInteger(trials) && trials >= 1e5 && trials <= MAX_TRIALS))
    throw new ProblemError(
      {
        code: 'out-of-range',
        what: 'Monte Carlo trials',
        value: trials,
        // the range first: the message reads "... is outside the allowed range 100000 to 10000000, ..."
        allowed:
          `100000 to ${MAX_TRIALS}, a whole number` +
          (why === 'explain'
            ? ` (JCGM 101 needs enough trials for a 95 % interval; the trials are held in memory, about ` +
              `1.2 GB at ${MAX_TRIALS})`
            : '') +
          `: give one in that range, or leave --trials out ` +
          (fallback > 0 ? `for the default ${fallback}` : '(no Monte Carlo then)'),
      },
      { field: '--trials' },
    );
  return trials;
}
