import { describe, expect, it } from 'vitest';
import type { CliCommand } from '../../../main/cli/command';
import { parseFlags } from '../../../main/cli/command';
import type { CliIo } from '../../../main/cli/io';
import { runCli } from '../../../main/cli/run';

function captureIo(): CliIo & { out: string[]; err: string[] } {
  const out: string[] = [];
  const err: string[] = [];
  return { out, err, stdout: (t) => out.push(t), stderr: (t) => err.push(t), stderrIsTty: false, cwd: '/', readInput: async () => '' };
}

const echo: CliCommand = {
  name: 'echo',
  summary: 'Echo a word',
  usage: 'Usage: layline echo <word> [--loud]',
  run: async (argv, io) => {
    const { values, positionals } = parseFlags(argv, { loud: { type: 'boolean' } }, 'echo');
    io.stdout((values.loud ? positionals.join(' ').toUpperCase() : positionals.join(' ')) + '\n');
    return 0;
  },
};

describe('runCli', () => {
  it('prints usage listing the subcommands for --help', async () => {
    const io = captureIo();
    expect(await runCli(['--help'], io, [echo])).toBe(0);
    expect(io.out.join('')).toMatch(/Usage: layline <command>/);
    expect(io.out.join('')).toMatch(/echo\s+Echo a word/);
  });

  it('prints the version', async () => {
    const io = captureIo();
    expect(await runCli(['--version'], io, [])).toBe(0);
    expect(io.out.join('')).toMatch(/^\d+\.\d+\.\d+/);
  });

  it('exits 2 with a clear message for an unknown flag', async () => {
    const io = captureIo();
    expect(await runCli(['--frobnicate'], io, [echo])).toBe(2);
    expect(io.err.join('')).toContain('unknown option --frobnicate');
  });

  it("exits 2 for an unknown flag of a subcommand", async () => {
    const io = captureIo();
    expect(await runCli(['echo', 'hi', '--shout'], io, [echo])).toBe(2);
    expect(io.err.join('')).toMatch(/echo: Unknown option '--shout'/);
  });

  it('exits 2 for an unknown command', async () => {
    const io = captureIo();
    expect(await runCli(['fly'], io, [echo])).toBe(2);
    expect(io.err.join('')).toContain("unknown command 'fly'");
  });

  it('runs a subcommand and shows its own help', async () => {
    const io = captureIo();
    expect(await runCli(['echo', 'hi', '--loud'], io, [echo])).toBe(0);
    expect(io.out.join('')).toBe('HI\n');
    const help = captureIo();
    expect(await runCli(['echo', '--help'], help, [echo])).toBe(0);
    expect(help.out.join('')).toContain('Usage: layline echo');
  });
});
