// Waiting for an ink screen or a state in the tui tests: `untilWithin(ms)` gives the file's `until`, which
// polls `cond` every 10 ms and fails naming `what` after `ms` (each file keeps its own default wait).
export function untilWithin(
  defaultMs: number,
): (cond: () => boolean, what: string, ms?: number) => Promise<void> {
  return async (cond, what, ms = defaultMs) => {
    const t0 = Date.now();
    while (!cond()) {
      if (Date.now() - t0 > ms) throw new Error(`timed out waiting for ${what}`);
      await new Promise((r) => setTimeout(r, 10));
    }
  };
}
