// Builds every runnable piece of Layline into dist/ with esbuild.
//
//   dist/main/main.cjs, preload.cjs   Electron main process and sandboxed preload
//   dist/main/engine-thread.cjs       the worker thread that parses and scores for the main process
//   dist/main/score-pair-worker.cjs   its helper thread for large scoring runs
//   dist/cli/layline.cjs              the `layline` command
//   dist/web/serve.cjs                the plain-page server (`npm run web`)
//   dist/renderer/                    the page: index.html, app.js, engine-worker.js, styles.css
//   dist/bench/run.cjs                `npm run bench`, and risk-pair-worker.cjs, its scoring helper
import { build } from 'esbuild';
import { chmod, copyFile, mkdir, readFile, rm } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const out = path.join(root, 'dist');
const pkg = JSON.parse(await readFile(path.join(root, 'package.json'), 'utf8'));
const define = { LAYLINE_VERSION: JSON.stringify(pkg.version) };
const quiet = process.argv.includes('--quiet');

const node = { absWorkingDir: root, bundle: true, platform: 'node', target: 'node20', format: 'cjs', sourcemap: 'linked', define, logLevel: 'warning' };

await rm(out, { recursive: true, force: true });
await mkdir(path.join(out, 'renderer'), { recursive: true });

const jobs = [
  build({ ...node, entryPoints: { main: 'main/electron/main.ts', preload: 'main/electron/preload.ts', 'engine-thread': 'main/electron/engine-thread.ts', 'score-pair-worker': 'main/electron/score-pair-worker.ts' }, outdir: 'dist/main', outExtension: { '.js': '.cjs' }, external: ['electron'] }),
  // playwright-core stays external: it reads its own package files at run time and cannot be bundled.
  build({ ...node, entryPoints: { layline: 'main/cli/layline.ts' }, outdir: 'dist/cli', outExtension: { '.js': '.cjs' }, banner: { js: '#!/usr/bin/env node' }, external: ['playwright-core'] }),
  build({ ...node, entryPoints: { serve: 'main/web/serve.ts' }, outdir: 'dist/web', outExtension: { '.js': '.cjs' } }),
  build({ ...node, entryPoints: { run: 'main/bench/run.ts', 'risk-pair-worker': 'main/bench/risk-pair-worker.ts' }, outdir: 'dist/bench', outExtension: { '.js': '.cjs' }, external: ['playwright-core'] }),
  build({
    absWorkingDir: root,
    bundle: true,
    platform: 'browser',
    target: 'chrome120',
    format: 'esm',
    sourcemap: 'linked',
    define,
    logLevel: 'warning',
    jsx: 'automatic',
    jsxImportSource: 'preact',
    entryPoints: { app: 'renderer/index.tsx', 'engine-worker': 'renderer/api/engine-worker.ts' },
    outdir: 'dist/renderer',
  }),
];
await Promise.all(jobs);
await copyFile(path.join(root, 'renderer/index.html'), path.join(out, 'renderer/index.html'));
for (const asset of ['styles.css', 'icon.svg']) await copyFile(path.join(root, 'renderer', asset), path.join(out, 'renderer', asset));
await chmod(path.join(out, 'cli/layline.cjs'), 0o755);
if (!quiet) process.stdout.write(`built Layline ${pkg.version} into ${path.relative(process.cwd(), out) || 'dist'}/\n`);
