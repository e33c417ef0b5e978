/**
 * Per-image settings for `batch`: from a manifest CSV (header
 * `file,specimen_id,notch,notch_root_radius_mm,strain_rate_per_s,pixel_size_um,bar_length_um,section_diameter_mm,material,model`,
 * `file` relative to the manifest's folder, unknown columns kept as metadata) or from a sidecar
 * `IMAGE.json` next to the image (`img.png.json`, else `img.json`; same keys). A manifest row wins
 * over a sidecar, both win over the command-line defaults.
 */
import { existsSync, readFileSync } from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { parseCsv } from '../../core/report/csv.js';

export const MANIFEST_COLUMNS = [
  'file',
  'specimen_id',
  'notch',
  'notch_root_radius_mm',
  'strain_rate_per_s',
  'pixel_size_um',
  'bar_length_um',
  'section_diameter_mm',
  'material',
  'model',
] as const;

const NUMERIC = new Set(['notch_root_radius_mm', 'strain_rate_per_s', 'pixel_size_um', 'bar_length_um', 'section_diameter_mm']);

/** Settings of one image. Lengths in µm, strain rate in 1/s. */
export interface ImageSettings {
  pixelSizeUm?: number;
  barLengthUm?: number;
  /** Net-section diameter, µm (manifest column section_diameter_mm). */
  sectionDiameterUm?: number;
  strainRatePerS?: number;
  /** Material reference `SHEET:NAME` (sheet path already resolved against the manifest folder). */
  material?: string;
  /** Pixel-classifier model file (`measure --model`), path already resolved against the manifest folder. */
  model?: string;
  /** specimen_id, notch, notch_root_radius_mm and any unknown column, verbatim. */
  metadata: Record<string, string>;
  /** Where the settings came from (for messages). */
  source: string;
}

export interface Manifest {
  path: string;
  /** absolute image path → settings */
  rows: Map<string, ImageSettings>;
}

/** `where` names the place, e.g. `manifest.csv line 4, column strain_rate_per_s`. */
function positiveNumber(text: string, where: string): number {
  const t = text.trim();
  const v = Number(t);
  if (t === '' || !Number.isFinite(v)) throw new FractozoneError('BAD_MANIFEST', `${where}: "${text}" is not a number`);
  if (v <= 0) throw new FractozoneError('BAD_MANIFEST', `${where}: ${t} must be greater than 0`);
  return v;
}

/** A material value `FILE:NAME` with a relative FILE is taken relative to `baseDir`. */
function resolveMaterialRef(v: string, baseDir: string): string {
  const i = v.lastIndexOf(':');
  if (i <= 0) return v;
  const file = v.slice(0, i);
  if (/^[A-Za-z]$/.test(file)) return v; // a Windows drive letter, not a sheet
  return `${resolve(baseDir, file)}:${v.slice(i + 1)}`;
}

function settingsFrom(values: Record<string, string>, where: (col: string) => string, baseDir: string, source: string): ImageSettings {
  const s: ImageSettings = { metadata: {}, source };
  for (const [col, raw] of Object.entries(values)) {
    if (col === 'file') continue;
    const v = raw.trim();
    if (v === '') continue;
    if (NUMERIC.has(col)) {
      const x = positiveNumber(raw, where(col));
      if (col === 'strain_rate_per_s') s.strainRatePerS = x;
      else if (col === 'pixel_size_um') s.pixelSizeUm = x;
      else if (col === 'bar_length_um') s.barLengthUm = x;
      else if (col === 'section_diameter_mm') s.sectionDiameterUm = x * 1000;
      else s.metadata[col] = v;
    } else if (col === 'material') s.material = resolveMaterialRef(v, baseDir);
    else if (col === 'model') s.model = resolve(baseDir, v);
    else s.metadata[col] = v;
  }
  return s;
}

/**
 * Reads a manifest CSV.
 * @param path manifest file
 * @throws FractozoneError BAD_MANIFEST naming the line and column of the first bad value
 */
export function readManifest(path: string): Manifest {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    throw new FractozoneError('BAD_MANIFEST', `cannot read manifest "${path}"`);
  }
  const name = basename(path);
  let recs;
  try {
    recs = parseCsv(text);
  } catch (e) {
    throw new FractozoneError('BAD_MANIFEST', `${name} ${(e as Error).message}`);
  }
  if (recs.length === 0) throw new FractozoneError('BAD_MANIFEST', `${name} is empty: it needs a header line with a "file" column`);
  const header = recs[0].fields.map((h) => h.trim());
  const fileCol = header.indexOf('file');
  if (fileCol < 0) throw new FractozoneError('BAD_MANIFEST', `${name} line 1: the header has no "file" column`);
  const dup = header.find((h, i) => h !== '' && header.indexOf(h) !== i);
  if (dup) throw new FractozoneError('BAD_MANIFEST', `${name} line 1: column "${dup}" appears twice`);
  const baseDir = dirname(resolve(path));
  const rows = new Map<string, ImageSettings>();
  for (const rec of recs.slice(1)) {
    const where = `${name} line ${rec.line}`;
    if (rec.fields.length > header.length && rec.fields.slice(header.length).some((f) => f.trim() !== '')) {
      throw new FractozoneError('BAD_MANIFEST', `${where}: ${rec.fields.length} fields but the header has ${header.length}`);
    }
    const values: Record<string, string> = {};
    header.forEach((h, i) => {
      if (h !== '') values[h] = rec.fields[i] ?? '';
    });
    const file = (values.file ?? '').trim();
    if (file === '') throw new FractozoneError('BAD_MANIFEST', `${where}, column file: the file name is empty`);
    const abs = resolve(baseDir, file);
    if (rows.has(abs)) throw new FractozoneError('BAD_MANIFEST', `${where}, column file: "${file}" is listed twice`);
    rows.set(abs, settingsFrom(values, (col) => `${where}, column ${col}`, baseDir, where));
  }
  return { path: resolve(path), rows };
}

/**
 * Reads the sidecar JSON of an image, if there is one (`img.png.json`, else `img.json`).
 * @returns the settings, or null when there is no sidecar
 * @throws FractozoneError BAD_MANIFEST when the sidecar is not a JSON object or holds a bad value
 */
export function readSidecar(imageAbs: string): ImageSettings | null {
  const candidates = [`${imageAbs}.json`, join(dirname(imageAbs), `${basename(imageAbs, extname(imageAbs))}.json`)];
  const p = candidates.find((c) => existsSync(c));
  if (!p) return null;
  const name = basename(p);
  let data: unknown;
  try {
    data = JSON.parse(readFileSync(p, 'utf8'));
  } catch (e) {
    throw new FractozoneError('BAD_MANIFEST', `sidecar ${name} is not valid JSON: ${(e as Error).message}`);
  }
  if (typeof data !== 'object' || data === null || Array.isArray(data)) {
    throw new FractozoneError('BAD_MANIFEST', `sidecar ${name} must hold a JSON object with keys like strain_rate_per_s, pixel_size_um`);
  }
  const values: Record<string, string> = {};
  for (const [k, v] of Object.entries(data as Record<string, unknown>)) {
    if (v === null || v === undefined) continue;
    if (typeof v === 'object') throw new FractozoneError('BAD_MANIFEST', `sidecar ${name}, key ${k}: expected a number or text`);
    values[k] = String(v);
  }
  return settingsFrom(values, (col) => `sidecar ${name}, key ${col}`, dirname(p), `sidecar ${name}`);
}

/** Manifest row over sidecar: metadata merged, manifest values win. */
export function mergeSettings(sidecar: ImageSettings | null, row: ImageSettings | undefined): ImageSettings {
  if (!sidecar && !row) return { metadata: {}, source: 'defaults' };
  if (!sidecar) return row!;
  if (!row) return sidecar;
  return {
    ...sidecar,
    ...Object.fromEntries(Object.entries(row).filter(([, v]) => v !== undefined)),
    metadata: { ...sidecar.metadata, ...row.metadata },
    source: `${row.source} + ${sidecar.source}`,
  };
}
