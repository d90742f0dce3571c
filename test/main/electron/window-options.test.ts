import { describe, expect, it } from 'vitest';
import { mainWindowOptions } from '../../../main/electron/window-options';

describe('mainWindowOptions', () => {
  it('turns on every isolation setting the app relies on', () => {
    const prefs = mainWindowOptions('/app/preload.cjs').webPreferences;
    expect(prefs).toMatchObject({
      preload: '/app/preload.cjs',
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
    });
  });
});

describe('mainWindowOptions, further', () => {
  it('never enables node in subframes and keeps the window hidden until ready', () => {
    const options = mainWindowOptions('/app/preload.cjs');
    expect(options.webPreferences?.nodeIntegrationInSubFrames).toBe(false);
    expect(options.show).toBe(false);
  });
});
