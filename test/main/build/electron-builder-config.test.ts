// electron-builder.yml is checked against the JSON schema electron-builder itself ships
// (node_modules/app-builder-lib/scheme.json), since packaging cannot run here.
import Ajv from 'ajv';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';

const repoRoot = path.resolve(__dirname, '..', '..', '..');
const require = createRequire(import.meta.url);
const schema = JSON.parse(readFileSync(require.resolve('app-builder-lib/scheme.json'), 'utf8')) as object;
const config = parse(readFileSync(path.join(repoRoot, 'electron-builder.yml'), 'utf8')) as Record<string, unknown>;

function validate(candidate: unknown) {
  const ajv = new Ajv({ allErrors: true, strict: false });
  const check = ajv.compile(schema);
  const ok = check(candidate);
  return { ok, errors: ajv.errorsText(check.errors) };
}

describe('electron-builder.yml', () => {
  it('is valid against app-builder-lib/scheme.json', () => {
    const result = validate(config);
    expect(result.errors).toBe('No errors');
    expect(result.ok).toBe(true);
  });

  it('names the app and targets Linux, macOS and Windows', () => {
    expect(config.appId).toBe('org.layline.desktop');
    expect(config.productName).toBe('Layline');
    expect(JSON.stringify(config.linux)).toContain('AppImage');
    expect(JSON.stringify(config.linux)).toContain('deb');
    expect(JSON.stringify(config.mac)).toContain('dmg');
    expect(JSON.stringify(config.win)).toContain('nsis');
  });

  it('packages the built main process and renderer', () => {
    expect(config.files).toEqual(expect.arrayContaining(['dist/main/**', 'dist/renderer/**', 'package.json']));
  });

  it('the schema check can fail: an unknown key is rejected', () => {
    expect(validate({ ...config, notAnOption: true }).ok).toBe(false);
  });
});
