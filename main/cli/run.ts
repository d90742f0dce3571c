// The `layline` command line: dispatches to subcommands and maps errors to exit codes.
//
// Exit codes: 0 success, 1 a failure in the work itself, 2 a usage error.
import { APP_NAME, APP_VERSION } from '../../shared/app-identity';
import type { CliCommand } from './command';
import { commands as defaultCommands } from './commands';
import { CliFailure, UsageError, type CliIo } from './io';

export function overviewUsage(commands: readonly CliCommand[]): string {
  const width = Math.max(9, ...commands.map((c) => c.name.length));
  const lines = [
    `${APP_NAME} ${APP_VERSION}: connection and trip risk from Bayesian flight-delay posteriors.`,
    '',
    'Usage: layline <command> [options]',
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    'Options:',
    `  ${'--help'.padEnd(width)}  Show this help, or a command's help: layline <command> --help`,
    `  ${'--version'.padEnd(width)}  Print the version`,
    '',
    'Probabilities are estimates from historical delay data, not guarantees; airline rules and local regulations decide.',
  ];
  return lines.join('\n') + '\n';
}

export async function runCli(argv: string[], io: CliIo, commands: readonly CliCommand[] = defaultCommands): Promise<number> {
  const [first, ...rest] = argv;
  try {
    if (first === undefined || first === '--help' || first === '-h' || first === 'help') {
      if (first === 'help' && rest[0]) return await runCli([rest[0], '--help'], io, commands);
      io.stdout(overviewUsage(commands));
      return first === undefined ? 2 : 0;
    }
    if (first === '--version' || first === '-v') {
      if (rest.length > 0) throw new UsageError(`--version takes no arguments, got: ${rest.join(' ')}`);
      io.stdout(`${APP_VERSION}\n`);
      return 0;
    }
    if (first.startsWith('-')) throw new UsageError(`unknown option ${first}`);
    const command = commands.find((c) => c.name === first);
    if (!command) throw new UsageError(`unknown command '${first}'. Commands: ${commands.map((c) => c.name).join(', ') || '(none)'}`);
    if (rest.includes('--help') || rest.includes('-h')) {
      io.stdout(command.usage.endsWith('\n') ? command.usage : command.usage + '\n');
      return 0;
    }
    return await command.run(rest, io);
  } catch (err) {
    if (err instanceof UsageError) {
      io.stderr(`layline: ${err.message}\nRun 'layline --help' for usage.\n`);
      return 2;
    }
    if (err instanceof CliFailure) {
      io.stderr(`layline: ${err.message}\n`);
      return err.exitCode;
    }
    io.stderr(`layline: unexpected error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    return 1;
  }
}
