/**
 * Exports and the session file (browser side; the text builders are pure functions).
 * Result JSON is byte-for-byte the CLI's format (`JSON.stringify(result, null, 2)` + newline).
 */
import { RESULT_COLUMNS, entryRow, toCsv, type BatchEntry, type ResultView } from '../core/report/csv.js';
import { histogramSvg, polarProfileSvg, escapeXml } from '../core/report/svg.js';
import { CAUTION_TEXT } from '../core/report/html.js';
import type { Doc } from './state/document.js';
import { TOOL_NAME, TOOL_VERSION } from '../core/version.js';

export const SESSION_SCHEMA = 'fractozone.session/1';

/** Result JSON text exactly as the CLI writes it (2-space indent, trailing newline). */
export function resultJsonText(result: Record<string, unknown>): string {
  return JSON.stringify(result, null, 2) + '\n';
}

function entryOf(doc: Doc): BatchEntry {
  const r = doc.result as ResultView | null;
  return {
    file: doc.name,
    safeName: doc.name.replace(/[^A-Za-z0-9._-]+/g, '_'),
    sha256: doc.sha256,
    status: r?.band?.detected === false ? ('no-band' as BatchEntry['status']) : ('ok' as BatchEntry['status']),
    metadata: {},
    strainRatePerS: doc.material.strainRatePerS,
    material: doc.material.name || null,
    overlay: null,
    result: r,
  } as BatchEntry;
}

/** One CSV header + row, the same columns as the batch results.csv. */
export function resultCsvText(doc: Doc): string {
  return toCsv(RESULT_COLUMNS, [entryRow(entryOf(doc))]);
}

/** Session file: everything needed to reopen the work on the same image (checked by hash). */
export function sessionText(doc: Doc): string {
  const session = {
    schema: SESSION_SCHEMA,
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    image: { file: doc.name, sha256: doc.sha256, widthPx: doc.widthPx, heightPx: doc.heightPx },
    scale: doc.scale,
    settings: doc.settings,
    material: doc.material,
    outline: doc.outline,
    outlineEdited: doc.outlineEdited,
    outerPolygon: doc.outerPolygon,
    boundary: doc.boundary,
    boundaryEdited: doc.boundaryEdited,
    exclude: doc.exclude,
  };
  return JSON.stringify(session, null, 2) + '\n';
}

export type SessionPatch = Pick<Doc, 'scale' | 'settings' | 'material' | 'outline' | 'outlineEdited' | 'outerPolygon' | 'boundary' | 'boundaryEdited' | 'exclude'>;

/** Parses a session file for `doc`; throws a plain-sentence Error when it does not fit. */
export function parseSession(text: string, doc: Doc): SessionPatch {
  let s: Record<string, unknown>;
  try {
    s = JSON.parse(text) as Record<string, unknown>;
  } catch {
    throw new Error('The session file is not valid JSON.');
  }
  if (s.schema !== SESSION_SCHEMA) throw new Error(`The file is not a ${SESSION_SCHEMA} session.`);
  const img = (s.image ?? {}) as Record<string, unknown>;
  if (img.sha256 !== doc.sha256) throw new Error(`The session belongs to another image (${String(img.file)}); open that image first.`);
  const poly = (v: unknown) => (Array.isArray(v) ? v.map((p) => ({ x: Number((p as PointLike).x), y: Number((p as PointLike).y) })) : null);
  return {
    scale: (s.scale as Doc['scale']) ?? doc.scale,
    settings: { ...doc.settings, ...((s.settings as object) ?? {}) },
    material: { ...doc.material, ...((s.material as object) ?? {}) },
    outline: (s.outline as Doc['outline']) ?? null,
    outlineEdited: Boolean(s.outlineEdited),
    outerPolygon: poly(s.outerPolygon),
    boundary: poly(s.boundary),
    boundaryEdited: Boolean(s.boundaryEdited),
    exclude: Array.isArray(s.exclude) ? (s.exclude as [number, number][]) : [],
  };
}
interface PointLike {
  x: unknown;
  y: unknown;
}

const n = (v: unknown, d = 1): string => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(d) : '—');

/** A self-contained one-image HTML report (overlay PNG embedded as a data URL, plots as SVG). */
export function reportHtml(doc: Doc, overlayPngDataUrl: string | null): string {
  const r = (doc.result ?? {}) as ResultView & Record<string, unknown>;
  const w = (r.band?.widthUm ?? {}) as Record<string, unknown>;
  const prof = r.band?.profile ?? [];
  const widths = prof.filter((p) => p.valid && p.widthUm !== null).map((p) => p.widthUm as number);
  const ci = w.ci95 as [number, number] | undefined;
  const cmp = r.comparison;
  const L = r.criticalDistance;
  const rows: [string, string][] = [
    ['Image', escapeXml(doc.name)],
    ['SHA-256', `<code>${doc.sha256}</code>`],
    ['Scale', `${n(r.scale?.umPerPx, 4)} µm/px (${escapeXml(String(r.scale?.source ?? '—'))})`],
    ['Rays measured (n)', String(w.n ?? '—')],
    ['Mean width', `${n(w.mean)} µm`],
    ['Median width', `${n(w.median)} µm`],
    ['SD', `${n(w.sd)} µm`],
    ['95 % CI of the mean', ci ? `${n(ci[0])} … ${n(ci[1])} µm` : '—'],
    ['p05 / p95', `${n(w.p05)} / ${n(w.p95)} µm`],
  ];
  if (L?.L_um !== undefined) rows.push(['Critical distance L', `${n(L.L_um)} µm`]);
  if (cmp?.ratio !== undefined) rows.push(['Width / reference', `${n(cmp.ratio, 3)} (${escapeXml(String(cmp.verdict ?? ''))})`]);
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeXml(doc.name)} — band width report</title>
<style>body{font-family:sans-serif;margin:24px;color:#222;max-width:1000px}table{border-collapse:collapse}td,th{border:1px solid #ccc;padding:3px 8px;text-align:left}
.caution{border:1px solid #c9a227;background:#fff8e0;padding:8px 12px;margin:12px 0}.plots{display:flex;gap:12px;flex-wrap:wrap}img{max-width:480px;border:1px solid #ddd}</style></head>
<body><h1>Band width report — ${escapeXml(doc.name)}</h1>
<p class="caution">${escapeXml(CAUTION_TEXT)}</p>
<table>${rows.map(([k, v]) => `<tr><th>${k}</th><td>${v}</td></tr>`).join('')}</table>
<div class="plots">${overlayPngDataUrl ? `<img alt="overlay" src="${overlayPngDataUrl}">` : ''}${histogramSvg(widths)}${polarProfileSvg(prof)}</div>
<h2>Result (${escapeXml(String(r.schema ?? ''))})</h2><pre>${escapeXml(resultJsonText(r))}</pre>
<p>${escapeXml(TOOL_NAME)} ${escapeXml(TOOL_VERSION)}</p></body></html>
`;
}

/** Starts a download of `text` (or a data URL) in the browser; nothing leaves the machine. */
export function download(name: string, content: string | Blob, type = 'application/octet-stream'): void {
  const blob = typeof content === 'string' ? new Blob([content], { type }) : content;
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
