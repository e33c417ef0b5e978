/**
 * The files of an output folder and how the summary files are rebuilt from the per-image result
 * files (so a resumed run, a merge of shards and a single run give identical summary files):
 *
 *   OUT/results/<safe>.json   one per image (the pipeline result + a `batch` block, or an error record)
 *   OUT/overlays/<safe>.png   one per measured image
 *   OUT/thumbs/<safe>.png     its report thumbnail (≤ 320 px wide)
 *   OUT/batch.json            batch defaults (parameters, tool version)
 *   OUT/results.csv           one row per image (RFC 4180)
 *   OUT/results.jsonl         the same rows as JSON Lines
 *   OUT/report.html           the self-contained report
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { RESULT_COLUMNS, entryRow, metadataColumns, toCsv, toJsonLines, type BatchEntry, type EntryStatus, type ResultView } from '../../core/report/csv.js';
import { analyseSeries } from '../../core/report/series.js';
import { buildReportHtml } from '../../core/report/html.js';
import { TOOL_VERSION } from '../../core/version.js';
import { toJsonText, writeFileAtomic } from '../io.js';
import { pngDataUri, thumbnailPng } from './thumb.js';

export const ENTRY_SCHEMA = 'fractozone.batch-entry/1';
export const ERROR_SCHEMA = 'fractozone.batch-error/1';
export const BATCH_SCHEMA = 'fractozone.batch/1';

/** The `batch` block stored in every per-image result file. */
export interface BatchBlock {
  schema: typeof ENTRY_SCHEMA;
  file: string;
  safeName: string;
  sha256: string;
  status: EntryStatus;
  /** sha256 of the canonical JSON of {params, tool version}: the resume key with the image hash. */
  paramsSha256: string;
  metadata: Record<string, string>;
  strainRatePerS: number | null;
  material: string | null;
  overlay: string | null;
  /** Report thumbnail path relative to OUT, or null. */
  thumbnail: string | null;
  settingsSource: string;
}

export interface BatchFile {
  schema: typeof BATCH_SCHEMA;
  toolVersion: string;
  defaults: unknown;
}

export function resultPath(out: string, safe: string): string {
  return join(out, 'results', `${safe}.json`);
}
export function overlayPath(out: string, safe: string): string {
  return join(out, 'overlays', `${safe}.png`);
}
export function thumbPath(out: string, safe: string): string {
  return join(out, 'thumbs', `${safe}.png`);
}

/** Per-image record file names in OUT/results (no temp or hidden files), sorted. */
export function listResultFiles(out: string): string[] {
  const dir = join(out, 'results');
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((n) => n.endsWith('.json') && !n.startsWith('.'))
    .sort();
}

/** Reads one record file; null when it is not a batch record (or unreadable). */
export function readRecord(path: string): { batch: BatchBlock; record: Record<string, unknown> } | null {
  try {
    const record = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
    const batch = record.batch as BatchBlock | undefined;
    if (!batch || batch.schema !== ENTRY_SCHEMA || typeof batch.safeName !== 'string') return null;
    return { batch, record };
  } catch {
    return null;
  }
}

export function entryFromRecord(batch: BatchBlock, record: Record<string, unknown>): BatchEntry {
  const isError = batch.status === 'error';
  return {
    file: batch.file,
    safeName: batch.safeName,
    sha256: batch.sha256,
    status: batch.status,
    ...(isError ? { error: record.error as { code: string; message: string } } : {}),
    metadata: batch.metadata ?? {},
    strainRatePerS: batch.strainRatePerS ?? null,
    material: batch.material ?? null,
    overlay: batch.overlay ?? null,
    result: isError ? null : (record as ResultView),
  };
}

/** All entries of an output folder, sorted by relative path then safe name. */
export function loadEntries(out: string, warn: (m: string) => void = () => {}): BatchEntry[] {
  const entries: BatchEntry[] = [];
  for (const name of listResultFiles(out)) {
    const rec = readRecord(join(out, 'results', name));
    if (!rec) {
      warn(`skipping results/${name}: not a fractozone batch result`);
      continue;
    }
    entries.push(entryFromRecord(rec.batch, rec.record));
  }
  entries.sort((a, b) => (a.file < b.file ? -1 : a.file > b.file ? 1 : a.safeName < b.safeName ? -1 : a.safeName > b.safeName ? 1 : 0));
  return entries;
}

export function readBatchFile(out: string): BatchFile | null {
  const p = join(out, 'batch.json');
  if (!existsSync(p)) return null;
  try {
    return JSON.parse(readFileSync(p, 'utf8')) as BatchFile;
  } catch {
    return null;
  }
}

/**
 * Rebuilds results.csv, results.jsonl and report.html of `out` from its per-image files.
 * @returns the entries written
 */
export function rebuildOutputs(out: string, warn: (m: string) => void = () => {}): BatchEntry[] {
  if (!existsSync(out)) throw new FractozoneError('EMPTY_INPUT', `output folder "${out}" does not exist`, 'usage');
  const entries = loadEntries(out, warn);
  const columns = [...RESULT_COLUMNS, ...metadataColumns(entries)];
  const rows = entries.map(entryRow);
  writeFileAtomic(join(out, 'results.csv'), toCsv(columns, rows));
  writeFileAtomic(join(out, 'results.jsonl'), toJsonLines(columns, rows));
  const thumbnails: Record<string, string> = {};
  for (const e of entries) {
    const tp = thumbPath(out, e.safeName);
    if (e.overlay && existsSync(tp)) {
      thumbnails[e.safeName] = pngDataUri(new Uint8Array(readFileSync(tp)));
      continue;
    }
    if (!e.overlay) continue;
    const p = join(out, e.overlay);
    if (!existsSync(p)) {
      warn(`overlay ${e.overlay} is missing`);
      continue;
    }
    const png = thumbnailPng(new Uint8Array(readFileSync(p)));
    if (png) thumbnails[e.safeName] = pngDataUri(png);
  }
  const bf = readBatchFile(out);
  const html = buildReportHtml({
    entries,
    series: analyseSeries(entries),
    thumbnails,
    params: bf?.defaults ?? entries.find((e) => e.result?.params)?.result?.params ?? null,
    toolVersion: TOOL_VERSION,
  });
  writeFileAtomic(join(out, 'report.html'), html);
  return entries;
}

export function writeBatchFile(out: string, defaults: unknown): void {
  const bf: BatchFile = { schema: BATCH_SCHEMA, toolVersion: TOOL_VERSION, defaults };
  writeFileAtomic(join(out, 'batch.json'), toJsonText(bf));
}
