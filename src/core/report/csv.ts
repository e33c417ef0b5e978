/**
 * Batch entries (one per image) and their flat table form: the rows of `results.csv` and
 * `results.jsonl`. CSV text follows RFC 4180 (comma separator, CRLF line ends, fields with a comma,
 * quote, CR or LF are quoted and inner quotes doubled).
 *
 * References:
 * [1] Y. Shafranovich, "Common Format and MIME Type for Comma-Separated Values (CSV) Files",
 *     RFC 4180, IETF, 2005.
 */
import type { MeasureResult } from '../pipeline/result.js';

/** Status of one image in a batch. `no-band` is a successful measurement that found no rim band. */
export type EntryStatus = 'ok' | 'no-band' | 'error';

/** One image of a batch, as the reports see it. */
export interface BatchEntry {
  /** Path relative to the input root it was found under (forward slashes). */
  file: string;
  /** Sanitised unique output stem (`results/<safeName>.json`, `overlays/<safeName>.png`). */
  safeName: string;
  sha256: string;
  status: EntryStatus;
  error?: { code: string; message: string };
  /** Manifest / sidecar columns other than the known settings (specimen_id, notch, … kept verbatim). */
  metadata: Record<string, string>;
  /** Strain rate of the test, 1/s (from the manifest, sidecar or defaults), or null. */
  strainRatePerS: number | null;
  /** Material name used for the comparison, or null. */
  material: string | null;
  /** Overlay path relative to the output folder, or null. */
  overlay: string | null;
  /** The measurement (null for a failed image). */
  result: MeasureResult | null;
}

/**
 * Former name of the result type the reports read, kept (castable from parsed JSON) only while the
 * app and the batch runner move to {@link MeasureResult}; remove it when nothing imports it.
 * @deprecated use MeasureResult
 */
export type ResultView = MeasureResult & Record<string, unknown>;

/** A table cell: numbers stay numbers (JSON Lines), null is an empty CSV field. */
export type Cell = string | number | boolean | null;

/**
 * The fixed columns of `results.csv`, in order. Lengths in µm, rates in 1/s, units in the names.
 * `quality` is the result's verdict (ok, check, unreliable), `warning_codes` its warning codes
 * separated by `;` (core/warnings.ts). `width_ci95_*` and `circumferential_ci95_*` are the same
 * interval (the old name is kept); `measurement_ci95_*` is this specimen's measurement interval,
 * `u_*_um` its budget (standard uncertainties), `verdict_width_basis` the width interval the
 * verdict used, `L_interval_note` why L has no interval (empty when it has one).
 */
export const RESULT_COLUMNS = [
  'file',
  'sha256',
  'status',
  'quality',
  'warning_codes',
  'error_code',
  'error_message',
  'um_per_px',
  'scale_source',
  'width_mean_um',
  'width_median_um',
  'width_sd_um',
  'width_ci95_lo_um',
  'width_ci95_hi_um',
  'width_n_rays',
  'measurement_ci95_lo_um',
  'measurement_ci95_hi_um',
  'circumferential_ci95_lo_um',
  'circumferential_ci95_hi_um',
  'parameter_range_lo_um',
  'parameter_range_hi_um',
  'u_boundary_um',
  'u_outer_edge_um',
  'u_scale_um',
  'radius_um',
  'separability_fisher',
  'separability_overlap',
  'strain_rate_per_s',
  'material',
  'L_um',
  'L_lo95_um',
  'L_hi95_um',
  'reference',
  'ratio',
  'ratio_lo95',
  'ratio_hi95',
  'verdict',
  'n_specimens',
  'halves_width_mean_a_um',
  'halves_width_mean_b_um',
  'halves_difference_um',
  'halves_difference_pct',
  'verdict_width_basis',
  'L_interval_note',
  'specimen_id',
  'notch',
  'notch_root_radius_mm',
] as const;

/** A fixed column of `results.csv`. */
export type ResultColumn = (typeof RESULT_COLUMNS)[number];

/**
 * One row of `results.csv` / `results.jsonl`: every fixed column, then `meta_<key>` columns holding
 * the extra manifest / sidecar values verbatim.
 */
export type BatchRow = Record<ResultColumn, Cell> & { [meta: `meta_${string}`]: string };

const META_IN_FIXED = new Set(['specimen_id', 'notch', 'notch_root_radius_mm']);

/** The number, or null when it is missing or not finite (NaN is written as null in JSON). */
function finite(v: number | null | undefined): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

function pair(v: readonly [number, number] | null | undefined, i: 0 | 1): number | null {
  return v ? finite(v[i]) : null;
}

/** Metadata keys of the extra columns (`meta_<key>`), sorted, over all entries. */
export function metadataColumns(entries: readonly BatchEntry[]): string[] {
  const keys = new Set<string>();
  for (const e of entries) for (const k of Object.keys(e.metadata)) if (!META_IN_FIXED.has(k)) keys.add(k);
  return [...keys].sort().map((k) => `meta_${k}`);
}

/**
 * The table row of one entry: the fixed columns of {@link RESULT_COLUMNS} then one `meta_<key>`
 * column per extra metadata key.
 * @param entry one image of the batch
 * @returns column name → cell (lengths µm, rate 1/s, ratio dimensionless)
 */
export function entryRow(entry: BatchEntry): BatchRow {
  const r = entry.result;
  const w = r?.band.widthUm;
  const u = r?.band.uncertainty;
  const ok = entry.status === 'ok';
  const sep = r?.band.separability;
  const row: BatchRow = {
    file: entry.file,
    sha256: entry.sha256,
    status: entry.status,
    // a result read back from an older or partial file may lack these: empty, never "ok"
    quality: r?.quality?.verdict ?? null,
    warning_codes: r ? r.warnings.map((w) => w.code).join(';') : null,
    error_code: entry.error?.code ?? null,
    error_message: entry.error?.message ?? (entry.status === 'no-band' ? (r?.band.reason ?? null) : null),
    um_per_px: finite(r?.scale.umPerPx),
    scale_source: r?.scale.source ?? null,
    width_mean_um: ok ? finite(w?.mean) : null,
    width_median_um: ok ? finite(w?.median) : null,
    width_sd_um: ok ? finite(w?.sd) : null,
    width_ci95_lo_um: ok ? pair(w?.ci95, 0) : null,
    width_ci95_hi_um: ok ? pair(w?.ci95, 1) : null,
    width_n_rays: ok ? finite(w?.n) : null,
    measurement_ci95_lo_um: ok ? pair(u?.measurementCi95Um, 0) : null,
    measurement_ci95_hi_um: ok ? pair(u?.measurementCi95Um, 1) : null,
    circumferential_ci95_lo_um: ok ? pair(u?.circumferentialCi95Um ?? w?.ci95, 0) : null,
    circumferential_ci95_hi_um: ok ? pair(u?.circumferentialCi95Um ?? w?.ci95, 1) : null,
    parameter_range_lo_um: ok ? pair(u?.parameterRangeUm, 0) : null,
    parameter_range_hi_um: ok ? pair(u?.parameterRangeUm, 1) : null,
    u_boundary_um: ok ? finite(u?.budget.boundary.sdUm) : null,
    u_outer_edge_um: ok ? finite(u?.budget.outerEdge.sdUm) : null,
    u_scale_um: ok ? finite(u?.budget.scale.sdUm) : null,
    radius_um: finite(r?.specimen.radiusUm),
    separability_fisher: finite(sep?.fisher),
    separability_overlap: finite(sep?.overlap),
    strain_rate_per_s: entry.strainRatePerS,
    material: entry.material,
    L_um: finite(r?.criticalDistance?.L_um),
    L_lo95_um: pair(r?.criticalDistance?.interval95_um, 0),
    L_hi95_um: pair(r?.criticalDistance?.interval95_um, 1),
    reference: r?.comparison?.reference ?? null,
    ratio: finite(r?.comparison?.ratio),
    ratio_lo95: pair(r?.comparison?.ratioInterval95, 0),
    ratio_hi95: pair(r?.comparison?.ratioInterval95, 1),
    verdict: r?.comparison?.verdict ?? null,
    // several specimens in the frame: the row's width and radius are specimen A's (README "Both halves")
    n_specimens: r ? (r.specimens?.length ?? 1) : null,
    halves_width_mean_a_um: finite(r?.halves?.meanWidthsUm[0]),
    halves_width_mean_b_um: finite(r?.halves?.meanWidthsUm[1]),
    halves_difference_um: finite(r?.halves?.differenceUm),
    halves_difference_pct: finite(r?.halves?.relativeDifferencePct),
    verdict_width_basis: r?.comparison ? (r.comparison.basis?.width ?? 'circumferential') : null,
    L_interval_note: r?.criticalDistance?.intervalNote ?? null,
    specimen_id: entry.metadata.specimen_id ?? null,
    notch: entry.metadata.notch ?? null,
    notch_root_radius_mm: entry.metadata.notch_root_radius_mm ?? null,
  };
  for (const [k, v] of Object.entries(entry.metadata)) if (!META_IN_FIXED.has(k)) row[`meta_${k}`] = v;
  return row;
}

function csvField(c: Cell): string {
  if (c === null) return '';
  const s = typeof c === 'string' ? c : String(c);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * RFC 4180 CSV text [1]: header line then one line per row, CRLF line ends, trailing CRLF.
 * Numbers are written as JavaScript prints them (shortest round-trip form), so they read back
 * exactly equal to the JSON values.
 * @param columns column names (header)
 * @param rows rows keyed by column name; a missing key is an empty field
 */
export function toCsv(columns: readonly string[], rows: readonly Record<string, Cell>[]): string {
  const lines = [columns.map(csvField).join(',')];
  for (const row of rows) lines.push(columns.map((c) => csvField(row[c] ?? null)).join(','));
  return lines.join('\r\n') + '\r\n';
}

/**
 * JSON Lines text: one compact JSON object per row (same keys and values as the CSV, numbers typed).
 * @param columns key order
 * @param rows rows keyed by column name
 */
export function toJsonLines(columns: readonly string[], rows: readonly Record<string, Cell>[]): string {
  return rows
    .map((row) => {
      const o: Record<string, Cell> = {};
      for (const c of columns) o[c] = row[c] ?? null;
      return JSON.stringify(o) + '\n';
    })
    .join('');
}

/** One parsed CSV record with the physical line number (1-based) it starts on. */
export interface CsvRecord {
  line: number;
  fields: string[];
}

/**
 * Parses RFC 4180 CSV text [1] (quoted fields may hold commas, doubled quotes and line breaks;
 * CRLF or LF line ends; a UTF-8 byte-order mark is dropped; blank lines are skipped).
 * @param text the file content
 * @returns the records with their starting line numbers
 * @throws Error with the line number when a quoted field is not closed
 */
export function parseCsv(text: string): CsvRecord[] {
  const s = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const out: CsvRecord[] = [];
  let fields: string[] = [];
  let field = '';
  let line = 1;
  let startLine = 1;
  let i = 0;
  let quoted = false;
  let any = false;
  const endRecord = (): void => {
    fields.push(field);
    if (any || fields.length > 1 || field !== '') out.push({ line: startLine, fields });
    fields = [];
    field = '';
    any = false;
  };
  while (i < s.length) {
    const ch = s[i];
    if (quoted) {
      if (ch === '"') {
        if (s[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        continue;
      }
      if (ch === '\n') line++;
      field += ch;
      i++;
      continue;
    }
    if (ch === '"' && field === '') {
      quoted = true;
      any = true;
      i++;
      continue;
    }
    if (ch === ',') {
      fields.push(field);
      field = '';
      any = true;
      i++;
      continue;
    }
    if (ch === '\r' || ch === '\n') {
      endRecord();
      if (ch === '\r' && s[i + 1] === '\n') i++;
      i++;
      line++;
      startLine = line;
      continue;
    }
    field += ch;
    i++;
  }
  if (quoted) throw new Error(`line ${startLine}: a quoted field is not closed`);
  if (field !== '' || fields.length > 0 || any) endRecord();
  return out;
}
