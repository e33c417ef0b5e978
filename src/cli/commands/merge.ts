/** `fractozone merge`: combine shard output folders into one. */
import type { Command } from 'commander';
import { mergeOutputs } from '../batch/merge.js';
import { stderrLine } from '../io.js';

export function register(program: Command): void {
  program
    .command('merge')
    .description('Merge batch output folders (e.g. the shards of one series) into one folder with the same files a single run writes.')
    .argument('<folders...>', 'batch output folders')
    .requiredOption('--out <folder>', 'merged output folder (new, or an earlier merge of the same series)')
    .option('--json', 'print the summary as JSON on stdout')
    .action((folders: string[], opts: { out: string; json?: boolean }) => {
      const s = mergeOutputs(folders, opts.out, stderrLine);
      const line = `merge: ${s.images} images from ${s.sources} folders → ${s.out}`;
      stderrLine(line);
      if (opts.json) process.stdout.write(JSON.stringify(s, null, 2) + '\n');
    });
}
