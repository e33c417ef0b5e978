/** `fractozone report`: rebuild results.csv, results.jsonl and report.html from a batch output folder. */
import type { Command } from 'commander';
import { resolve, join } from 'node:path';
import { existsSync } from 'node:fs';
import { FractozoneError } from '../../core/errors.js';
import { acquireOutputLock, assertNotBusy } from '../batch/lock.js';
import { rebuildOutputs } from '../batch/outputs.js';
import { printable } from '../../core/text/printable.js';
import { stderrLine } from '../io.js';

export function register(program: Command): void {
  program
    .command('report')
    .description('Rebuild OUT/results.csv, OUT/results.jsonl and OUT/report.html from the per-image result files of a batch output folder.')
    .argument('<folder>', 'batch output folder')
    .option('--json', 'print a JSON summary on stdout')
    .action((folder: string, opts: { json?: boolean }) => {
      const out = resolve(folder);
      if (existsSync(out)) assertNotBusy(out);
      if (!existsSync(join(out, 'results'))) throw new FractozoneError('EMPTY_INPUT', `"${printable(folder)}" is not a batch output folder (no results/ inside)`, 'usage');
      const lock = acquireOutputLock(out, 'report', (m) => stderrLine(`report: ${m}`));
      let entries;
      try {
        entries = rebuildOutputs(out, (m) => stderrLine(`report: warning: ${m}`));
      } finally {
        lock.release();
      }
      stderrLine(`report: ${entries.length} images → ${join(out, 'report.html')}`);
      if (opts.json) process.stdout.write(JSON.stringify({ schema: 'fractozone.report-summary/1', out, images: entries.length, report: 'report.html' }, null, 2) + '\n');
    });
}
