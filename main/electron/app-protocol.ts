// The renderer's own URL scheme, layline-app://renderer/…, served from dist/renderer.
//
// Pages loaded from file:// get an opaque origin, which Chromium will not load module
// scripts from, and every local file shares it. A privileged standard scheme gives the page
// one origin of its own, so the CSP's 'self' means exactly the app's files (Electron's
// security checklist recommends a custom protocol over file://).
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { MIME, resolveUnderRoot } from '../web/static-server';

export const APP_SCHEME = 'layline-app';
export const APP_HOST = 'renderer';
export const APP_INDEX_URL = `${APP_SCHEME}://${APP_HOST}/index.html`;

/** The privileges the scheme is registered with before the app is ready. */
export const APP_SCHEME_PRIVILEGES = { standard: true, secure: true, supportFetchAPI: true, corsEnabled: false, allowServiceWorkers: false, stream: false } as const;

/** The file a request URL names under the renderer folder, or null for anything else. */
export function rendererFileFor(rendererDir: string, requestUrl: string): string | null {
  let url: URL;
  try {
    url = new URL(requestUrl);
  } catch {
    return null;
  }
  if (url.protocol !== `${APP_SCHEME}:` || url.host !== APP_HOST) return null;
  return resolveUnderRoot(rendererDir, url.pathname);
}

/** Answers the scheme's requests with the renderer's files (GET only), and 404 for the rest. */
export function createAppProtocolHandler(rendererDir: string): (request: { url: string; method: string }) => Promise<Response> {
  return async (request) => {
    const file = request.method === 'GET' ? rendererFileFor(rendererDir, request.url) : null;
    if (!file) return new Response('not found', { status: 404 });
    try {
      const body = await readFile(file);
      return new Response(body, { status: 200, headers: { 'Content-Type': MIME[path.extname(file)] ?? 'application/octet-stream', 'X-Content-Type-Options': 'nosniff' } });
    } catch {
      return new Response('not found', { status: 404 });
    }
  };
}
