// The table of subcommands. Each lives in its own file under commands/.
import type { CliCommand } from './command';

export const commands: readonly CliCommand[] = [];
