// The table of subcommands. Each lives in its own file under commands/.
import type { CliCommand } from './command';
import { fitCommand } from './commands/fit';
import { parseCommand } from './commands/parse';
import { scoreCommand } from './commands/score';
import { predictCommand } from './commands/predict';

export const commands: readonly CliCommand[] = [fitCommand, parseCommand, predictCommand, scoreCommand];
