#!/usr/bin/env node
/** fractozone command-line entry. Exit codes: 0 ok, 1 processing/input error, 2 usage error. */
import { CommanderError } from 'commander';
import { isFractozoneError } from '../core/errors.js';
import { printable } from '../core/text/printable.js';
import { installNodeZlib } from './nodeZlib.js';
import { buildProgram, exitCodeFor } from './program.js';

/**
 * Error messages are one printable line, whatever a library or a file put in them: line breaks
 * become spaces, other control characters are escaped (`\x1b`).
 */
const oneLine = (s: string): string => printable(s.replace(/\s*[\r\n]+\s*/g, ' ').trim());

async function main(argv: string[]): Promise<number> {
  installNodeZlib(); // PNG image data through Node's zlib (core/zlib.ts)
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
    return typeof process.exitCode === 'number' ? process.exitCode : 0;
  } catch (e) {
    if (e instanceof CommanderError) {
      // commander already printed its message (help, version or usage error)
      return e.exitCode === 0 ? 0 : 2;
    }
    if (isFractozoneError(e)) {
      process.stderr.write(`fractozone: error [${e.code}]: ${oneLine(e.message)}\n`);
      return exitCodeFor(e);
    }
    const msg = e instanceof Error ? e.message : String(e);
    process.stderr.write(`fractozone: internal error: ${oneLine(msg)}\n`);
    if (process.env.FRACTOZONE_DEBUG) process.stderr.write(`${(e as Error)?.stack ?? ''}\n`);
    return 1;
  }
}

main(process.argv).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.stderr.write(`fractozone: internal error: ${oneLine(String(e))}\n`);
    process.exitCode = 1;
  },
);
