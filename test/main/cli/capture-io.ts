// A CliIo for in-process CLI tests: stdout and stderr are collected, the rest is given.
import type { CliIo } from '../../../main/cli/io';

export type CapturedIo = CliIo & { readonly out: string[]; readonly err: string[] };

/** Collects output; `base` supplies readInput, cwd and the TTY flag (by default none, '/', false). */
export function captureIo(base: Partial<CliIo> = {}, onStderr?: (text: string) => void): CapturedIo {
  const out: string[] = [];
  const err: string[] = [];
  return {
    cwd: '/',
    readInput: async (p) => {
      throw new Error(`no such file: ${p}`);
    },
    ...base,
    stderrIsTty: base.stderrIsTty ?? false,
    out,
    err,
    stdout: (t) => void out.push(t),
    stderr: (t) => {
      err.push(t);
      onStderr?.(t);
    },
  };
}
