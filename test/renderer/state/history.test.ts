// Undo and redo as a pure value.
import { describe, expect, it } from 'vitest';
import { canRedo, canUndo, COALESCE_WINDOW_MS, commit, createHistory, HISTORY_LIMIT, redo, undo } from '../../../renderer/state/history';

describe('history', () => {
  it('undoes and redoes in order, and a new edit clears the redo list', () => {
    let h = createHistory('a');
    h = commit(h, 'b', 0);
    h = commit(h, 'c', 10_000);
    h = undo(h);
    expect(h.present).toBe('b');
    h = undo(h);
    expect(h.present).toBe('a');
    expect(canUndo(h)).toBe(false);
    h = redo(h);
    expect(h.present).toBe('b');
    h = commit(h, 'x', 20_000);
    expect(canRedo(h)).toBe(false);
    expect(undo(h).present).toBe('b');
  });

  it('merges a burst of typing into one step, but not typing after a pause', () => {
    let h = createHistory('');
    h = commit(h, 'h', 0, 'typing');
    h = commit(h, 'he', 100, 'typing');
    h = commit(h, 'hey', 200, 'typing');
    h = commit(h, 'hey!', 200 + COALESCE_WINDOW_MS + 1, 'typing');
    expect(undo(h).present).toBe('hey');
    expect(undo(undo(h)).present).toBe('');
  });

  it('keeps a paste as its own step between bursts of typing', () => {
    let h = createHistory('');
    h = commit(h, 'a', 0, 'typing');
    h = commit(h, 'a pasted', 50, null);
    h = commit(h, 'a pasted!', 100, 'typing');
    expect(undo(h).present).toBe('a pasted');
    expect(undo(undo(h)).present).toBe('a');
  });

  it('forgets the oldest steps beyond the limit', () => {
    let h = createHistory(0);
    for (let i = 1; i <= HISTORY_LIMIT + 50; i++) h = commit(h, i, i * 10_000);
    expect(h.past).toHaveLength(HISTORY_LIMIT);
  });

  it('does nothing when there is nothing to undo or redo', () => {
    const h = createHistory('a');
    expect(undo(h)).toBe(h);
    expect(redo(h)).toBe(h);
  });
});
