// Events for the page, delivered through the contract's long-poll request nextAppEvent:
// pushed here by the menu, the OS and nativeTheme, taken one at a time by the page.
import type { AppEvent } from '../../shared/api/contract';

export class AppEventQueue {
  private readonly queued: AppEvent[] = [];
  private waiting: ((event: AppEvent) => void)[] = [];

  push(event: AppEvent): void {
    const waiter = this.waiting.shift();
    if (waiter) waiter(event);
    else this.queued.push(event);
  }

  next(): Promise<AppEvent> {
    const event = this.queued.shift();
    if (event) return Promise.resolve(event);
    return new Promise((resolve) => this.waiting.push(resolve));
  }
}
