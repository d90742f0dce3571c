// The layering rule must catch real violations with the project's own ESLint config.
import { ESLint } from 'eslint';
import path from 'node:path';
import ts from 'typescript';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { describe, expect, it } from 'vitest';

const repoRoot = path.resolve(__dirname, '..', '..', '..');
const eslint = new ESLint({ cwd: repoRoot });

async function layeringErrors(relativeFile: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: path.join(repoRoot, relativeFile) });
  return (result?.messages ?? []).filter((m) => m.ruleId === 'layline/layering' && m.severity === 2).map((m) => m.message);
}

describe('layline/layering', () => {
  it.each([
    ['shared/time/x.ts', "import { app } from 'electron';\nexport const a = app;\n", 'electron'],
    ['shared/time/x.ts', "import { readFileSync } from 'node:fs';\nexport const r = readFileSync;\n", 'node:fs'],
    ['shared/time/x.ts', "import fs from 'fs';\nexport const r = fs;\n", "'fs'"],
    ['shared/time/x.ts', "export { x } from '../../main/cli/run';\n", 'main/'],
    ['shared/time/x.ts', "import { h } from 'preact';\nexport const r = h;\n", 'preact'],
    ['shared/time/x.ts', "export const load = () => import('node:path');\n", 'node:path'],
    ['renderer/app/x.ts', "import { readFile } from 'node:fs/promises';\nexport const r = readFile;\n", 'node:fs/promises'],
    ['renderer/app/x.ts', "import { ipcRenderer } from 'electron';\nexport const r = ipcRenderer;\n", 'electron'],
    ['renderer/app/x.ts', "import { runCli } from '../../main/cli/run';\nexport const r = runCli;\n", 'main/'],
    ['main/cli/x.ts', "import { App } from '../../renderer/app/app';\nexport const r = App;\n", 'renderer/'],
  ])('rejects in %s: %s', async (file, code, mention) => {
    const errors = await layeringErrors(file, code);
    expect(errors.length).toBe(1);
    expect(errors[0]).toContain(mention);
  });

  it.each([
    ['main/cli/x.ts', "import { app } from 'electron';\nimport fs from 'node:fs';\nimport { APP_NAME } from '../../shared/app-identity';\nexport const r = [app, fs, APP_NAME];\n"],
    ['renderer/app/x.ts', "import { h } from 'preact';\nimport { APP_NAME } from '../../shared/app-identity';\nexport const r = [h, APP_NAME];\n"],
    ['shared/time/x.ts', "import * as v from 'valibot';\nimport { APP_NAME } from '../app-identity';\nexport const r = [v, APP_NAME];\n"],
  ])('allows the layered imports of %s', async (file, code) => {
    expect(await layeringErrors(file, code)).toEqual([]);
  });
});

describe("shared/'s own tsconfig", () => {
  // A stray DOM or Node global must fail to compile in shared/, even without an import.
  function diagnosticsFor(source: string): string[] {
    const configPath = path.join(repoRoot, 'shared', 'tsconfig.json');
    const config = ts.getParsedCommandLineOfConfigFile(configPath, {}, { ...ts.sys, onUnRecoverableConfigFileDiagnostic: () => undefined });
    if (!config) throw new Error('cannot read shared/tsconfig.json');
    const dir = mkdtempSync(path.join(tmpdir(), 'layline-layering-'));
    const file = path.join(dir, 'probe.ts');
    writeFileSync(file, source);
    try {
      const program = ts.createProgram([file], config.options);
      return ts.getPreEmitDiagnostics(program).map((d) => ts.flattenDiagnosticMessageText(d.messageText, '\n'));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }

  it('has no DOM: window does not exist', () => {
    expect(diagnosticsFor('export const w = window.innerWidth;\n').join('\n')).toMatch(/Cannot find name 'window'/);
  });

  it('has no Node types: Buffer does not exist', () => {
    expect(diagnosticsFor("export const b = Buffer.from('x');\n").join('\n')).toMatch(/Cannot find name 'Buffer'/);
  });

  it('compiles plain TypeScript', () => {
    expect(diagnosticsFor('export const x: number = [1, 2].reduce((a, b) => a + b, 0);\n')).toEqual([]);
  });
});
