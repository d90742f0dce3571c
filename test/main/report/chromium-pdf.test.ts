import { describe, expect, it } from 'vitest';
import { PdfPrinterMissingError, chromiumCandidates, findChromium } from '../../../main/report/chromium-pdf';

const only = (...paths: string[]) => (p: string) => paths.includes(p);

describe('findChromium', () => {
  it('takes an explicit path first, then LAYLINE_CHROMIUM, then the usual places', () => {
    expect(findChromium({ explicitPath: '/opt/c', env: { LAYLINE_CHROMIUM: '/opt/env' }, exists: only('/opt/c', '/opt/env') })).toBe('/opt/c');
    expect(findChromium({ env: { LAYLINE_CHROMIUM: '/opt/env' }, exists: only('/opt/env', '/usr/bin/chromium') })).toBe('/opt/env');
    expect(findChromium({ env: {}, platform: 'linux', exists: only('/usr/bin/google-chrome') })).toBe('/usr/bin/google-chrome');
  });

  it('names a missing explicit or configured path', () => {
    expect(() => findChromium({ explicitPath: '/nope', env: {}, exists: only() })).toThrow('--chromium points to /nope, which does not exist');
    expect(() => findChromium({ env: { LAYLINE_CHROMIUM: '/gone' }, exists: only() })).toThrow('LAYLINE_CHROMIUM points to /gone');
  });

  it('says what is missing, where it looked and how to fix it when no browser is found', () => {
    let error: unknown;
    try {
      findChromium({ env: {}, platform: 'linux', exists: only() });
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(PdfPrinterMissingError);
    const message = (error as Error).message;
    expect(message).toContain('PDF output needs a Chromium-family browser');
    expect(message).toContain('/usr/bin/chromium');
    expect(message).toContain('apt-get install chromium');
    expect(message).toContain('--out report.html');
  });

  it('knows the usual install places on macOS and Windows', () => {
    expect(chromiumCandidates('darwin', {})).toContain('/Applications/Google Chrome.app/Contents/MacOS/Google Chrome');
    expect(chromiumCandidates('win32', { PROGRAMFILES: 'C:\\Program Files' })).toContain('C:\\Program Files\\Google\\Chrome\\Application\\chrome.exe');
  });
});
