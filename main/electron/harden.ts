// Denies navigation and new windows, and opens only allow-listed https links outside.
import type { WebContents } from 'electron';
import { shell } from 'electron';
import { isAllowedExternal } from './external-links';

export { isAllowedExternal } from './external-links';

export function hardenWebContents(contents: Pick<WebContents, 'on' | 'setWindowOpenHandler'>): void {
  // The page is a single-page app loaded once; any navigation is an attack or a stray link.
  contents.on('will-navigate', (event) => event.preventDefault());
  contents.on('will-redirect', (event) => event.preventDefault());
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(({ url }) => {
    if (isAllowedExternal(url)) void shell.openExternal(url);
    return { action: 'deny' };
  });
}
