// The renderer's URL scheme: only the renderer's own files, with the right MIME types.
import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { APP_INDEX_URL, createAppProtocolHandler, rendererFileFor } from '../../../main/electron/app-protocol';

let dir: string;
let renderer: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-proto-'));
  renderer = path.join(dir, 'renderer');
  await mkdir(renderer);
  await writeFile(path.join(renderer, 'index.html'), '<!doctype html>');
  await writeFile(path.join(renderer, 'app.js'), 'export {};');
  await writeFile(path.join(dir, 'secret.txt'), 'secret');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('the layline-app scheme', () => {
  it('maps the index URL and its assets into the renderer folder', () => {
    expect(rendererFileFor(renderer, APP_INDEX_URL)).toBe(path.join(renderer, 'index.html'));
    expect(rendererFileFor(renderer, 'layline-app://renderer/app.js?x=1')).toBe(path.join(renderer, 'app.js'));
  });

  it.each(['layline-app://renderer/../secret.txt', 'layline-app://renderer/%2e%2e/secret.txt', 'layline-app://renderer/..%2fsecret.txt'])('keeps %s inside the renderer folder', (url) => {
    const file = rendererFileFor(renderer, url);
    expect(file === null || file.startsWith(renderer + path.sep)).toBe(true);
  });

  it.each(['layline-app://other/index.html', 'file:///etc/passwd', 'https://renderer/index.html', 'not a url'])('refuses %s', (url) => {
    expect(rendererFileFor(renderer, url)).toBeNull();
  });

  it('serves module scripts as JavaScript and answers 404 otherwise', async () => {
    const handle = createAppProtocolHandler(renderer);
    const js = await handle({ url: 'layline-app://renderer/app.js', method: 'GET' });
    expect(js.status).toBe(200);
    expect(js.headers.get('content-type')).toMatch(/^text\/javascript/);
    await expect(js.text()).resolves.toBe('export {};');
    expect((await handle({ url: 'layline-app://renderer/missing.js', method: 'GET' })).status).toBe(404);
    expect((await handle({ url: 'layline-app://renderer/app.js', method: 'POST' })).status).toBe(404);
    expect((await handle({ url: 'layline-app://renderer/../secret.txt', method: 'GET' })).status).toBe(404);
  });
});
