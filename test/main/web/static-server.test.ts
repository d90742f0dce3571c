import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolveUnderRoot, startStaticServer, type RunningServer } from '../../../main/web/static-server';

describe('resolveUnderRoot', () => {
  it('maps / to index.html and refuses to leave the root', () => {
    expect(resolveUnderRoot('/srv/app', '/')).toBe(path.resolve('/srv/app/index.html'));
    expect(resolveUnderRoot('/srv/app', '/../../etc/passwd')).toBe(path.resolve('/srv/app/etc/passwd'));
    expect(resolveUnderRoot('/srv/app', '/%2e%2e/%2e%2e/etc/passwd')).toBe(path.resolve('/srv/app/etc/passwd'));
    expect(resolveUnderRoot('/srv/app', '/a%00b')).toBeNull();
    expect(resolveUnderRoot('/srv/app', '/%E0%A4%A')).toBeNull();
  });
});

describe('startStaticServer', () => {
  let server: RunningServer;
  beforeAll(async () => {
    const root = mkdtempSync(path.join(tmpdir(), 'layline-web-'));
    writeFileSync(path.join(root, 'index.html'), '<h1>hello</h1>');
    server = await startStaticServer(root, 0);
  });
  afterAll(() => server.close());

  it('serves files with their content type and 404s the rest', async () => {
    const page = await fetch(server.url);
    expect(page.status).toBe(200);
    expect(page.headers.get('content-type')).toContain('text/html');
    expect(await page.text()).toBe('<h1>hello</h1>');
    expect((await fetch(server.url + 'missing.js')).status).toBe(404);
  });
});
