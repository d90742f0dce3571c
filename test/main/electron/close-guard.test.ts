// The unsaved-changes prompt on close.
import { describe, expect, it, vi } from 'vitest';
import { CloseGuard, type CloseChoice } from '../../../main/electron/close-guard';
import { AppEventQueue } from '../../../main/electron/app-events';

function guardAnswering(choice: CloseChoice) {
  const deps = { ask: vi.fn(async () => choice), requestSave: vi.fn(), discard: vi.fn(async () => undefined), close: vi.fn() };
  return { guard: new CloseGuard(deps), deps };
}

describe('CloseGuard', () => {
  it('lets a clean window close without asking', () => {
    const { guard, deps } = guardAnswering('cancel');
    expect(guard.shouldPreventClose()).toBe(false);
    expect(deps.ask).not.toHaveBeenCalled();
  });

  it('keeps a window with unsaved changes open when the user cancels', async () => {
    const { guard, deps } = guardAnswering('cancel');
    guard.setDirty(true);
    expect(guard.shouldPreventClose()).toBe(true);
    await vi.waitFor(() => expect(deps.ask).toHaveBeenCalled());
    expect(deps.close).not.toHaveBeenCalled();
  });

  it('discards and closes on "Don\'t save"', async () => {
    const { guard, deps } = guardAnswering('discard');
    guard.setDirty(true);
    guard.shouldPreventClose();
    await vi.waitFor(() => expect(deps.close).toHaveBeenCalled());
    expect(deps.discard).toHaveBeenCalled();
    expect(guard.shouldPreventClose()).toBe(false);
  });

  it('asks the page to save and closes only once it reports no unsaved changes', async () => {
    const { guard, deps } = guardAnswering('save');
    guard.setDirty(true);
    guard.shouldPreventClose();
    await vi.waitFor(() => expect(deps.requestSave).toHaveBeenCalled());
    expect(deps.close).not.toHaveBeenCalled();
    guard.setDirty(false);
    expect(deps.close).toHaveBeenCalled();
  });
});

describe('CloseGuard, after a cancelled save', () => {
  it('stays open and does not close on a later, unrelated save', async () => {
    const { guard, deps } = guardAnswering('save');
    guard.setDirty(true);
    guard.shouldPreventClose();
    await vi.waitFor(() => expect(deps.requestSave).toHaveBeenCalled());
    guard.saveDidNotHappen();
    guard.setDirty(false);
    expect(deps.close).not.toHaveBeenCalled();
  });
});

describe('AppEventQueue', () => {
  it('hands an event to the newest waiter only (an older one belongs to a reloaded page)', async () => {
    const q = new AppEventQueue();
    let staleSettled = false;
    void q.next().then(() => (staleSettled = true));
    const live = q.next();
    q.push({ kind: 'menu', command: 'open' });
    await expect(live).resolves.toEqual({ kind: 'menu', command: 'open' });
    // A resolved promise settles within the microtask queue, which has run by now.
    await Promise.resolve();
    expect(staleSettled).toBe(false);
  });

  it('delivers events in order to waiting and later callers', async () => {
    const q = new AppEventQueue();
    const first = q.next();
    q.push({ kind: 'menu', command: 'save' });
    q.push({ kind: 'theme', dark: true });
    await expect(first).resolves.toEqual({ kind: 'menu', command: 'save' });
    await expect(q.next()).resolves.toEqual({ kind: 'theme', dark: true });
  });
});
