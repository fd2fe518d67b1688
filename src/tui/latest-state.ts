/**
 * Screen state that key handlers read synchronously. ink re-attaches an input handler only after
 * React has re-rendered, so a handler that reads the render's `state` can see a stale value when
 * keys arrive in quick succession (fast typing, a paste split into chunks, a scanner): typed
 * characters would be lost, or Enter would log a reading that is not the one on the screen.
 * Handlers read `current()` instead, which every update sets before React renders.
 */
import { useCallback, useRef, useState } from 'react';

export function useLatestState<T>(initial: T): [state: T, current: () => T, set: (s: T) => void] {
  const [state, setState] = useState(initial);
  const ref = useRef(initial);
  const current = useCallback(() => ref.current, []);
  const set = useCallback((s: T) => {
    ref.current = s;
    setState(s);
  }, []);
  return [state, current, set];
}
