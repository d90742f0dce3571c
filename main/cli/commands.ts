// The table of subcommands. Each lives in its own file under commands/.
import type { CliCommand } from './command';
import { fitCommand } from './commands/fit';
import { parseCommand } from './commands/parse';
import { predictCommand } from './commands/predict';
import { reportCommand } from './commands/report';
import { scoreCommand } from './commands/score';

export const commands: readonly CliCommand[] = [fitCommand, parseCommand, scoreCommand, reportCommand, predictCommand];
