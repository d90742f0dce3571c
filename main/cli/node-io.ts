// The real process streams and file system behind CliIo.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { CliFailure, type CliIo } from './io';

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(typeof chunk === 'string' ? Buffer.from(chunk) : chunk);
  return Buffer.concat(chunks).toString('utf8');
}

export function nodeIo(): CliIo {
  return {
    stdout: (text) => void process.stdout.write(text),
    stderr: (text) => void process.stderr.write(text),
    stderrIsTty: Boolean(process.stderr.isTTY),
    cwd: process.cwd(),
    readInput: async (p) => {
      if (p === '-') return readStdin();
      try {
        return await readFile(path.resolve(process.cwd(), p), 'utf8');
      } catch (err) {
        const code = (err as NodeJS.ErrnoException).code;
        throw new CliFailure(code === 'ENOENT' ? `no such file: ${p}` : `cannot read ${p}: ${(err as Error).message}`);
      }
    },
  };
}
