// Events for the page, delivered through the contract's long-poll request nextAppEvent:
// pushed here by the menu, the OS and nativeTheme, taken one at a time by the page.
import type { AppEvent } from '../../shared/api/contract';

//
// A live page has at most one request waiting (it asks again after each event). A new
// request therefore replaces an older waiter, which can only belong to a page that was
// reloaded or closed: an event handed to it would be lost.
export class AppEventQueue {
  private readonly queued: AppEvent[] = [];
  private waiter: ((event: AppEvent) => void) | null = null;

  push(event: AppEvent): void {
    const waiter = this.waiter;
    this.waiter = null;
    if (waiter) waiter(event);
    else this.queued.push(event);
  }

  next(): Promise<AppEvent> {
    const event = this.queued.shift();
    if (event) return Promise.resolve(event);
    return new Promise((resolve) => (this.waiter = resolve));
  }
}
