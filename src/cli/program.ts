/**
 * fractozone command line: the program definition (no side effects on import). Thin shell: parses arguments, reads and writes files, calls core.
 * Exit codes: 0 ok, 1 processing/input error, 2 usage error. With --json only JSON goes to stdout.
 */
import { Command, CommanderError } from 'commander';
import { isFractozoneError } from '../core/errors.js';
import { printableLines } from '../core/text/printable.js';
import { TOOL_VERSION } from '../core/version.js';
import { commands } from './commands/index.js';

export function buildProgram(): Command {
  const program = new Command();
  program
    .name('fractozone')
    .description(
      'Measure the smooth rim band on fracture-surface images of notched bars and compare its width with the critical distance (Theory of Critical Distances).',
    )
    .version(TOOL_VERSION, '-V, --version')
    .showHelpAfterError('(add --help for usage)')
    // commander quotes the user's arguments in its messages: no control characters to the terminal
    .configureOutput({ writeErr: (s) => process.stderr.write(printableLines(s)) })
    .exitOverride();
  for (const register of commands) register(program);
  program.commands.forEach((c) => c.exitOverride().configureOutput({ writeErr: (s) => process.stderr.write(printableLines(s)) }));
  return program;
}

export function exitCodeFor(e: unknown): number {
  if (isFractozoneError(e)) return e.kind === 'usage' ? 2 : 1;
  if (e instanceof CommanderError) return e.exitCode === 0 ? 0 : 2;
  return 1;
}

