// The prompt about unsaved changes when the window closes: Save (the page saves, then the
// window closes once the page reports it clean), Don't save, or Cancel.
export type CloseChoice = 'save' | 'discard' | 'cancel';

export interface CloseGuardDeps {
  readonly ask: () => Promise<CloseChoice>;
  /** Ask the page to save (it may still show a Save As dialog, which the user can cancel). */
  readonly requestSave: () => void;
  /** The user chose to throw the edits away: forget the recovery copy too. */
  readonly discard: () => Promise<void>;
  /** Closes the window for real. */
  readonly close: () => void;
}

export class CloseGuard {
  private dirty = false;
  private closeWhenClean = false;
  private asking = false;
  private allowed = false;

  constructor(private readonly deps: CloseGuardDeps) {}

  /** A save asked for by the prompt did not happen (cancelled or failed): stay open, stop waiting. */
  saveDidNotHappen(): void {
    this.closeWhenClean = false;
  }

  setDirty(dirty: boolean): void {
    this.dirty = dirty;
    if (!dirty && this.closeWhenClean) {
      this.closeWhenClean = false;
      this.closeNow();
    }
  }

  /** Call from the window's 'close' event; returns true when the close must be prevented. */
  shouldPreventClose(): boolean {
    if (this.allowed || !this.dirty) return false;
    if (!this.asking) void this.ask();
    return true;
  }

  private async ask(): Promise<void> {
    this.asking = true;
    try {
      const choice = await this.deps.ask();
      if (choice === 'save') {
        this.closeWhenClean = true;
        this.deps.requestSave();
      } else if (choice === 'discard') {
        await this.deps.discard();
        this.closeNow();
      }
    } finally {
      this.asking = false;
    }
  }

  private closeNow(): void {
    this.allowed = true;
    this.deps.close();
  }
}
