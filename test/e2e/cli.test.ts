// The built `layline` binary, run as a user would run it.
import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { repoRoot } from './harness';

const run = promisify(execFile);
const cli = path.join(repoRoot, 'dist', 'cli', 'layline.cjs');

async function layline(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [cli, ...args], { cwd: repoRoot });
    return { code: 0, stdout, stderr };
  } catch (err) {
    const e = err as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

describe('the layline binary', () => {
  it('prints usage with --help and exits 0', async () => {
    const result = await layline(['--help']);
    expect(result.code).toBe(0);
    expect(result.stdout).toMatch(/Usage: layline <command>/);
  });

  it('runs through npx from the project folder', async () => {
    const { stdout } = await run('npx', ['--no-install', 'layline', '--version'], { cwd: repoRoot });
    expect(stdout.trim()).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it('exits 2 on an unknown flag', async () => {
    const result = await layline(['--nope']);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('unknown option --nope');
  });
});
