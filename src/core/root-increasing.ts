/**
 * Root of an increasing function on an interval, for the equilibrium wrappers and the
 * detonation module: secant steps from a guess until the root is bracketed, then the
 * Illinois variant of regula falsi (Dowell & Jarratt, BIT 11, 168 (1971)).
 */

/**
 * root of an increasing f on [lo, hi], starting at `guess` (so the first equilibrium is
 * solved near the answer and the rest warm-start): secant steps until the root is
 * bracketed, then Illinois regula falsi. undefined when f has no sign change on [lo, hi].
 */
export function rootIncreasing(
  f: (x: number) => number,
  lo: number,
  hi: number,
  guess: number,
  tol: number,
  firstStep = 100,
): number | undefined {
  let x0 = Math.min(hi, Math.max(lo, guess));
  let f0 = f(x0);
  if (f0 === 0) return x0;
  let step = f0 > 0 ? -firstStep : firstStep;
  let a = NaN;
  let fa = NaN;
  let b = NaN;
  let fb = NaN;
  for (let it = 0; it < 60; it++) {
    const x1 = Math.min(hi, Math.max(lo, x0 + step));
    const f1 = f(x1);
    if (f1 === 0) return x1;
    if (f1 > 0 !== f0 > 0) {
      [a, fa, b, fb] = x1 < x0 ? [x1, f1, x0, f0] : [x0, f0, x1, f1];
      break;
    }
    if (x1 === lo || x1 === hi) return undefined;
    // secant estimate of the distance left, at least doubling the step
    const secant = (f1 * (x1 - x0)) / (f0 - f1);
    const next = Number.isFinite(secant)
      ? Math.sign(step) * Math.max(Math.abs(secant) * 1.2, 2 * Math.abs(step))
      : 2 * step;
    x0 = x1;
    f0 = f1;
    step = next;
  }
  if (Number.isNaN(a)) return undefined;
  let side = 0;
  for (let it = 0; it < 200; it++) {
    let c = b - (fb * (b - a)) / (fb - fa);
    if (!(c > a && c < b)) c = (a + b) / 2;
    const fc = f(c);
    if (fc === 0) return c;
    if (fc < 0) {
      a = c;
      fa = fc;
      if (side === -1) fb /= 2;
      side = -1;
    } else {
      b = c;
      fb = fc;
      if (side === 1) fa /= 2;
      side = 1;
    }
    if (b - a < tol) return (a * fb - b * fa) / (fb - fa);
  }
  return (a + b) / 2;
}

/**
 * root of an increasing f near a good guess (a smooth f, the previous root of a nearby
 * problem extrapolated): secant steps from `guess` and `guess` +- `step`; when the next step
 * is below `tol`, the last point evaluated is returned (within `tol` of the root: the secant
 * converges faster than linearly, so the step left is about its error), so the caller has f
 * evaluated there; rootIncreasing from the last point when a step leaves [lo, hi], the slope
 * is not positive, or 30 steps do not converge.
 */
export function rootNear(
  f: (x: number) => number,
  lo: number,
  hi: number,
  guess: number,
  tol: number,
  step: number,
): number | undefined {
  let x0 = Math.min(hi, Math.max(lo, guess));
  let f0 = f(x0);
  if (f0 === 0) return x0;
  let x1 = Math.min(hi, Math.max(lo, x0 + (f0 > 0 ? -step : step)));
  let f1 = f(x1);
  for (let it = 0; it < 30; it++) {
    if (f1 === 0) return x1;
    const slope = (f1 - f0) / (x1 - x0);
    if (!(slope > 0) || !Number.isFinite(slope)) break;
    const x2 = x1 - f1 / slope;
    if (!(x2 >= lo && x2 <= hi)) break;
    if (Math.abs(x2 - x1) < tol) return x1;
    x0 = x1;
    f0 = f1;
    x1 = x2;
    f1 = f(x2);
  }
  return rootIncreasing(f, lo, hi, x1, tol, step);
}
