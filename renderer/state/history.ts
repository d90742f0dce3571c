// Undo and redo over whole workspace states, as a pure value.
//
// Typing commits a new state on every keystroke; commits with the same coalesce key
// that arrive within a short window merge into one step, so one undo removes a burst of
// typing rather than one character.

export interface History<T> {
  readonly past: readonly T[];
  readonly present: T;
  readonly future: readonly T[];
  /** Key and time of the last commit, for coalescing. */
  readonly lastKey: string | null;
  readonly lastAtMs: number;
}

export const HISTORY_LIMIT = 200;
export const COALESCE_WINDOW_MS = 1200;

export function createHistory<T>(present: T): History<T> {
  return { past: [], present, future: [], lastKey: null, lastAtMs: -Infinity };
}

/**
 * Makes `next` the present state. With a coalesceKey equal to the last commit's, inside
 * COALESCE_WINDOW_MS, it replaces the present instead of adding an undo step.
 */
export function commit<T>(h: History<T>, next: T, nowMs: number, coalesceKey: string | null = null): History<T> {
  if (Object.is(next, h.present)) return h;
  const merge = coalesceKey !== null && coalesceKey === h.lastKey && nowMs - h.lastAtMs <= COALESCE_WINDOW_MS && h.past.length > 0;
  const past = merge ? h.past : [...h.past, h.present].slice(-HISTORY_LIMIT);
  return { past, present: next, future: [], lastKey: coalesceKey, lastAtMs: nowMs };
}

export function canUndo<T>(h: History<T>): boolean {
  return h.past.length > 0;
}

export function canRedo<T>(h: History<T>): boolean {
  return h.future.length > 0;
}

export function undo<T>(h: History<T>): History<T> {
  const previous = h.past[h.past.length - 1];
  if (previous === undefined) return h;
  return { past: h.past.slice(0, -1), present: previous, future: [h.present, ...h.future], lastKey: null, lastAtMs: -Infinity };
}

export function redo<T>(h: History<T>): History<T> {
  const [next, ...rest] = h.future;
  if (next === undefined) return h;
  return { past: [...h.past, h.present], present: next, future: rest, lastKey: null, lastAtMs: -Infinity };
}

/** Starts over from `present` (a workspace was opened or created): nothing to undo. */
export function resetHistory<T>(present: T): History<T> {
  return createHistory(present);
}
