/** `fractozone batch`: measure every image of folders / patterns with a worker pool. */
import type { Command } from 'commander';
import { FractozoneError } from '../../core/errors.js';
import { addMeasureOptions, paramsFromOptions, type MeasureCliOptions } from '../measureOptions.js';
import { INTERRUPTED_EXIT_CODE } from '../batch/interrupt.js';
import { runBatch } from '../batch/run.js';
import { parseShard } from '../batch/shard.js';
import { stderrLine } from '../io.js';

interface BatchCliOptions extends MeasureCliOptions {
  out: string;
  manifest?: string;
  jobs?: string;
  resume?: boolean;
  shard?: string;
  workerMemory?: string;
  imageTimeout?: string;
  json?: boolean;
  progress?: boolean;
}

function intOption(v: string | undefined, what: string, min: number): number | undefined {
  if (v === undefined) return undefined;
  const n = Number(v);
  if (!Number.isInteger(n) || n < min) throw new FractozoneError('BAD_PARAMETER', `${what} "${v}" must be an integer ≥ ${min}`);
  return n;
}

export function register(program: Command): void {
  const cmd = program
    .command('batch')
    .description(
      'Measure every image in folders (recursive: png, jpg, jpeg, tif, tiff), glob patterns (* ? **) or files. Writes OUT/results/*.json, OUT/overlays/*.png, OUT/results.csv, OUT/results.jsonl and OUT/report.html. Exit 0 when no image failed (no band found counts as success), 1 when any image failed, 2 for usage errors.',
    )
    .argument('[inputs...]', 'folders, glob patterns (quote them) or image files')
    .requiredOption('--out <folder>', 'output folder (must not be, or contain, an input folder)')
    .option('--manifest <file.csv>', 'per-image settings: file,specimen_id,notch,notch_root_radius_mm,strain_rate_per_s,pixel_size_um,bar_length_um,material,model (file relative to the manifest); alone it also lists the images')
    .option('--jobs <n>', 'worker processes, each using one core (default: one per core)')
    .option('--resume', 'skip images whose result exists for the same image content and parameters')
    .option('--shard <i/n>', 'process only shard i of n (image k of the sorted list goes to shard (k mod n) + 1)')
    .option('--worker-memory <MB>', 'heap limit of each worker process in MB (a worker that exceeds it fails its image and is replaced)')
    .option('--image-timeout <s>', 'longest time one image may take, seconds (the worker is stopped, the image fails with IMAGE_TIMEOUT, a new worker goes on; default: no limit)')
    .option('--json', 'print the summary as JSON on stdout (progress and messages on stderr)')
    .option('--no-progress', 'no progress output on stderr');
  addMeasureOptions(cmd);
  cmd.action(async (inputs: string[], opts: BatchCliOptions) => {
    const defaults = paramsFromOptions(opts);
    const summary = await runBatch({
      inputs,
      out: opts.out,
      manifest: opts.manifest,
      jobs: intOption(opts.jobs, '--jobs', 1),
      resume: Boolean(opts.resume),
      shard: opts.shard ? parseShard(opts.shard) : null,
      defaults,
      defaultMaterial: opts.material,
      defaultModel: opts.model,
      workerMemoryMb: intOption(opts.workerMemory, '--worker-memory', 16),
      imageTimeoutS: intOption(opts.imageTimeout, '--image-timeout', 1),
      progress: opts.progress !== false,
      log: stderrLine,
    });
    const line = `batch: ${summary.total} images: ${summary.ok} ok, ${summary.noBand} no band, ${summary.failed} failed, ${summary.skipped} skipped (already done) → ${summary.out}`;
    stderrLine(line);
    if (opts.json) process.stdout.write(JSON.stringify(summary, null, 2) + '\n');
    if (summary.interrupted) {
      const done = summary.ok + summary.noBand + summary.failed + summary.skipped;
      stderrLine(`interrupted: ${done} of ${summary.total} done; run again with --resume`);
      process.exitCode = INTERRUPTED_EXIT_CODE;
    } else if (summary.failed > 0) process.exitCode = 1;
  });
}
