/**
 * `merge OUT1 OUT2 … --out ALL`: copies the per-image files of shard output folders into ALL and
 * rebuilds the summary files there, giving the same files a single run writes. The same image in
 * two folders is accepted when both records agree (same image hash and parameter hash); otherwise
 * the merge stops and names the conflict.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { writeFileAtomic } from '../io.js';
import { canonicalJson } from '../../core/pipeline/params.js';
import { printable } from '../../core/text/printable.js';
import { removeStaleTemps } from './jobs.js';
import { acquireOutputLock, assertNotBusy } from './lock.js';
import { listResultFiles, readBatchFile, readRecord, rebuildOutputs, writeBatchFile } from './outputs.js';

export interface MergeSummary {
  schema: 'fractozone.merge-summary/1';
  out: string;
  sources: number;
  images: number;
}

/**
 * Merges shard output folders into `outArg` (holding its lock; a source another live run is
 * writing is refused).
 * @throws FractozoneError EMPTY_INPUT / BAD_PARAMETER (bad folders, conflicting records),
 *   OUTPUT_BUSY, WRITE_FAILED
 */
export function mergeOutputs(sources: readonly string[], outArg: string, log: (m: string) => void): MergeSummary {
  const out = resolve(outArg);
  if (sources.length === 0) throw new FractozoneError('EMPTY_INPUT', 'give at least one batch output folder to merge', 'usage');
  const defaults = checkSources(sources, out, outArg, log);
  const lock = acquireOutputLock(out, 'merge', (m) => log(`merge: ${m}`));
  try {
    removeStaleTemps(out);
    const images = copyRecords(sources, out, log);
    writeBatchFile(out, defaults ?? null);
    rebuildOutputs(out, (m) => log(`merge: warning: ${m}`));
    return { schema: 'fractozone.merge-summary/1', out, sources: sources.length, images };
  } finally {
    lock.release();
  }
}

/** Checks the source folders; returns the batch defaults of the first one that has them. */
function checkSources(sources: readonly string[], out: string, outArg: string, log: (m: string) => void): unknown {
  let defaults: unknown = undefined;
  for (const s of sources) {
    const src = resolve(s);
    if (src === out) throw new FractozoneError('BAD_PARAMETER', `--out "${printable(outArg)}" is one of the folders being merged; choose a new folder`);
    if (existsSync(src)) assertNotBusy(src);
    if (!existsSync(join(src, 'results'))) throw new FractozoneError('EMPTY_INPUT', `"${printable(s)}" is not a batch output folder (no results/ inside)`, 'usage');
    const bf = readBatchFile(src);
    if (bf) {
      if (defaults === undefined) defaults = bf.defaults;
      else if (canonicalJson(defaults) !== canonicalJson(bf.defaults)) log(`merge: warning: "${s}" was run with different default parameters`);
    }
  }
  return defaults;
}

/** Copies every per-image record (with overlay and thumbnail) into `out`; returns the number of images. */
function copyRecords(sources: readonly string[], out: string, log: (m: string) => void): number {
  const seen = new Map<string, { src: string; sha: string; params: string }>();
  for (const s of sources) {
    const src = resolve(s);
    for (const name of listResultFiles(src)) {
      const p = join(src, 'results', name);
      const rec = readRecord(p);
      if (!rec) {
        log(`merge: warning: skipping ${s}/results/${name}: not a fractozone batch result`);
        continue;
      }
      const b = rec.batch;
      const prev = seen.get(b.safeName);
      if (prev) {
        if (prev.sha === b.sha256 && prev.params === b.paramsSha256) continue;
        throw new FractozoneError(
          'BAD_PARAMETER',
          `"${printable(b.file)}" is in both "${printable(prev.src)}" and "${printable(s)}" with different ${prev.sha !== b.sha256 ? 'image content' : 'parameters'}; merge folders of one series only`,
        );
      }
      seen.set(b.safeName, { src: s, sha: b.sha256, params: b.paramsSha256 });
      for (const rel of [b.overlay, b.thumbnail]) {
        if (!rel) continue;
        const op = join(src, rel);
        if (existsSync(op)) writeFileAtomic(join(out, rel), new Uint8Array(readFileSync(op)));
        else log(`merge: warning: ${s}/${rel} is missing`);
      }
      writeFileAtomic(join(out, 'results', name), readFileSync(p, 'utf8'));
    }
  }
  return seen.size;
}
