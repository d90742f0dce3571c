// Denies navigation and new windows, and opens only allow-listed https links outside.
import type { WebContents } from 'electron';
import { shell } from 'electron';

const EXTERNAL_HOSTS: readonly string[] = [];

export function isAllowedExternal(url: string): boolean {
  try {
    const u = new URL(url);
    return u.protocol === 'https:' && EXTERNAL_HOSTS.includes(u.hostname);
  } catch {
    return false;
  }
}

export function hardenWebContents(contents: Pick<WebContents, 'on' | 'setWindowOpenHandler'>): void {
  contents.on('will-navigate', (event) => event.preventDefault());
  contents.setWindowOpenHandler(({ url }) => {
    if (isAllowedExternal(url)) void shell.openExternal(url);
    return { action: 'deny' };
  });
}
