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
import { RESULT_SCHEMA, type MeasureResult } from '../../core/pipeline/index.js';
import { RESULT_COLUMNS, entryRow, metadataColumns, toCsv, toJsonLines, type BatchEntry, type EntryStatus } from '../../core/report/csv.js';
import { printable } from '../../core/text/printable.js';
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

/** A per-image file of a measured image: the pipeline result plus the batch block. */
export type ResultRecord = MeasureResult & { batch: BatchBlock };

/** A per-image file of an image that failed. */
export interface ErrorRecord {
  schema: typeof ERROR_SCHEMA;
  input: { file: string; sha256: string };
  error: { code: string; message: string };
  batch: BatchBlock;
}

export type BatchRecord = ResultRecord | ErrorRecord;

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

/** A JSON object's field (for validating parsed JSON). */
function field(o: unknown, k: string): unknown {
  return typeof o === 'object' && o !== null && !Array.isArray(o) ? (o as { [key: string]: unknown })[k] : undefined;
}
const isObj = (v: unknown): v is object => typeof v === 'object' && v !== null && !Array.isArray(v);
const isStr = (v: unknown): v is string => typeof v === 'string';
const strOrNull = (v: unknown): v is string | null => v === null || typeof v === 'string';
const STATUSES: readonly unknown[] = ['ok', 'no-band', 'error'];

/** The batch block of a parsed record file, or null when it is not a valid one. */
function validateBatchBlock(v: unknown): BatchBlock | null {
  if (field(v, 'schema') !== ENTRY_SCHEMA || !isStr(field(v, 'safeName')) || !isStr(field(v, 'file')) || !isStr(field(v, 'sha256'))) return null;
  if (!STATUSES.includes(field(v, 'status')) || !isStr(field(v, 'paramsSha256'))) return null;
  const rate = field(v, 'strainRatePerS');
  if (!(rate === null || rate === undefined || typeof rate === 'number')) return null;
  const meta = field(v, 'metadata') ?? {};
  if (!isObj(meta) || !Object.values(meta).every(isStr)) return null;
  for (const k of ['material', 'overlay', 'thumbnail']) if (!(field(v, k) === undefined || strOrNull(field(v, k)))) return null;
  return {
    schema: ENTRY_SCHEMA,
    file: field(v, 'file') as string,
    safeName: field(v, 'safeName') as string,
    sha256: field(v, 'sha256') as string,
    status: field(v, 'status') as EntryStatus,
    paramsSha256: field(v, 'paramsSha256') as string,
    metadata: { ...(meta as { [k: string]: string }) },
    strainRatePerS: (rate as number | null | undefined) ?? null,
    material: (field(v, 'material') as string | null | undefined) ?? null,
    overlay: (field(v, 'overlay') as string | null | undefined) ?? null,
    thumbnail: (field(v, 'thumbnail') as string | null | undefined) ?? null,
    settingsSource: String(field(v, 'settingsSource') ?? 'defaults'),
  };
}

/**
 * A parsed record file validated into its type: the batch block in full; a result by its schema
 * and main blocks (the files are written by fractozone itself; this guards against a foreign,
 * edited or truncated file), an error record by its code and message.
 */
export function validateRecord(v: unknown): BatchRecord | null {
  const batch = validateBatchBlock(field(v, 'batch'));
  if (!batch) return null;
  if (batch.status === 'error') {
    const error = field(v, 'error');
    if (field(v, 'schema') !== ERROR_SCHEMA || !isStr(field(error, 'code')) || !isStr(field(error, 'message'))) return null;
    const e = error as { code: string; message: string };
    return { schema: ERROR_SCHEMA, input: { file: batch.file, sha256: batch.sha256 }, error: { code: e.code, message: e.message }, batch };
  }
  if (field(v, 'schema') !== RESULT_SCHEMA || !isObj(field(v, 'band')) || !isObj(field(v, 'scale')) || !isObj(field(v, 'params'))) return null;
  return { ...(v as MeasureResult), batch };
}

/** Reads one record file; null when it is not a batch record (or unreadable). */
export function readRecord(path: string): { batch: BatchBlock; record: BatchRecord } | null {
  let parsed: unknown;
  try {
    parsed = JSON.parse(readFileSync(path, 'utf8'));
  } catch {
    return null;
  }
  const record = validateRecord(parsed);
  return record ? { batch: record.batch, record } : null;
}

export function entryFromRecord(record: BatchRecord): BatchEntry {
  const batch = record.batch;
  return {
    file: batch.file,
    safeName: batch.safeName,
    sha256: batch.sha256,
    status: batch.status,
    ...(record.schema === ERROR_SCHEMA ? { error: record.error } : {}),
    metadata: batch.metadata,
    strainRatePerS: batch.strainRatePerS,
    material: batch.material,
    overlay: batch.overlay,
    // BatchEntry['result'] is MeasureResult in the typed report module; the cast only bridges the
    // older all-optional view and is a no-op once core/report/csv.ts types it as MeasureResult
    result: record.schema === ERROR_SCHEMA ? null : (record as BatchEntry['result']),
  };
}

/** All entries of an output folder, sorted by relative path then safe name. */
export function loadEntries(out: string, warn: (m: string) => void = () => {}): BatchEntry[] {
  const entries: BatchEntry[] = [];
  for (const name of listResultFiles(out)) {
    const rec = readRecord(join(out, 'results', name));
    if (!rec) {
      warn(`skipping results/${printable(name)}: not a fractozone batch result`);
      continue;
    }
    entries.push(entryFromRecord(rec.record));
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
      warn(`overlay ${printable(e.overlay)} is missing`);
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
