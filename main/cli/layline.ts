// Entry point of the `layline` binary.
import { nodeIo } from './node-io';
import { runCli } from './run';

runCli(process.argv.slice(2), nodeIo()).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    process.stderr.write(`layline: ${String(err)}\n`);
    process.exitCode = 1;
  },
);
