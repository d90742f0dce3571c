// Navigation and new windows are denied; only allow-listed https links go to the browser.
import { describe, expect, it, vi } from 'vitest';

const openExternal = vi.fn(async () => undefined);
vi.mock('electron', () => ({ shell: { openExternal } }));
const { hardenWebContents, isAllowedExternal } = await import('../../../main/electron/harden');

describe('hardenWebContents', () => {
  it('prevents every navigation and denies new windows', () => {
    const listeners = new Map<string, (e: { preventDefault: () => void }) => void>();
    let windowOpen: ((d: { url: string }) => { action: string }) | null = null;
    hardenWebContents({
      on: ((name: string, fn: (e: { preventDefault: () => void }) => void) => listeners.set(name, fn)) as never,
      setWindowOpenHandler: ((fn: (d: { url: string }) => { action: string }) => (windowOpen = fn)) as never,
    });
    for (const name of ['will-navigate', 'will-redirect', 'will-attach-webview']) {
      const preventDefault = vi.fn();
      listeners.get(name)?.({ preventDefault });
      expect(preventDefault, name).toHaveBeenCalled();
    }
    expect(windowOpen!({ url: 'https://evil.example/' })).toEqual({ action: 'deny' });
    expect(openExternal).not.toHaveBeenCalled();
    expect(windowOpen!({ url: 'https://www.transtats.bts.gov/' })).toEqual({ action: 'deny' });
    expect(openExternal).toHaveBeenCalledWith('https://www.transtats.bts.gov/');
  });

  it.each([
    ['https://www.iana.org/time-zones', true],
    ['http://www.iana.org/time-zones', false],
    ['https://www.iana.org.evil.example/', false],
    ['https://user:pw@www.iana.org/', false],
    ['https://www.iana.org:8443/', false],
    ['file:///etc/passwd', false],
    ['javascript:alert(1)', false],
    ['not a url', false],
  ])('%s allowed: %s', (url, allowed) => {
    expect(isAllowedExternal(url)).toBe(allowed);
  });
});
