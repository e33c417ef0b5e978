/**
 * The batch report: one self-contained HTML page (inline CSS and SVG, thumbnails as data: URIs,
 * no script, no external font or resource), deterministic for the same entries (no timestamp).
 */
import { CAUTION } from '../caution.js';
import type { BatchEntry } from './csv.js';
import { NO_NOTCH, type SeriesAnalysis } from './series.js';
import { specimenLines, summarise, type Figure } from './summary.js';
import { escapeText, escapeXml as esc, fmt, histogramSvg, polarProfileSvg, seriesPlotSvg } from './svg.js';

/**
 * The engineering caution (the one in core/caution.ts), under the name the app and tests import.
 * @deprecated import CAUTION from core/caution.ts
 */
export const CAUTION_TEXT = CAUTION;

export interface ReportInput {
  title?: string;
  /** Entries sorted as they should appear (one table row each). */
  entries: readonly BatchEntry[];
  series: SeriesAnalysis;
  /** safeName → `data:image/png;base64,…` overlay thumbnail. */
  thumbnails: Readonly<Record<string, string>>;
  /** Batch default parameters (per-image settings are shown in the table). */
  params: unknown;
  toolVersion: string;
}

const CSS = `
body{font-family:sans-serif;margin:24px;color:#222;max-width:1200px}
h1{font-size:22px;margin:0 0 4px}h2{font-size:17px;margin:28px 0 8px;border-bottom:1px solid #ccc;padding-bottom:3px}
h3{font-size:14px;margin:0 0 6px;word-break:break-all}
.caution{border:1px solid #c9a227;background:#fff8e0;padding:8px 12px;margin:12px 0;font-size:13px}
table{border-collapse:collapse;font-size:12px;margin:6px 0}th,td{border:1px solid #ccc;padding:3px 6px;text-align:left;vertical-align:top}
th{background:#f0f0f0}td.n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
.status-ok{color:#1c6b2a}.status-no-band{color:#8a6100}.status-error{color:#a01c1c;font-weight:bold}
.quality-ok{color:#1c6b2a}.quality-check{color:#8a6100;font-weight:bold}.quality-unreliable{color:#a01c1c;font-weight:bold}
.cards{display:flex;flex-wrap:wrap;gap:14px}.card{border:1px solid #ccc;padding:8px;width:560px;page-break-inside:avoid}
.card .plots{display:flex;gap:6px;align-items:flex-start;flex-wrap:wrap}.card img{width:320px;max-width:100%;display:block;margin-bottom:6px;border:1px solid #eee}
.muted{color:#666;font-size:12px}pre{background:#f6f6f6;padding:8px;font-size:11px;overflow:auto;max-height:360px}
code{font-size:11px}
`;

function n(v: number | null | undefined, unit = '', digits = 4): string {
  if (typeof v !== 'number' || !Number.isFinite(v)) return '—';
  return unit ? `${fmt(v, digits)}\u00a0${unit}` : fmt(v, digits);
}

function interval(v: readonly [number, number] | null | undefined, unit: string): string {
  if (!v || typeof v[0] !== 'number' || typeof v[1] !== 'number') return '—';
  return `${fmt(v[0], 4)}–${fmt(v[1], 4)}\u00a0${unit}`;
}

/** A summary figure as a table cell text (4 significant digits, unit). */
function cell(f: Figure | null | undefined): string {
  return n(f?.value, f?.unit ?? '');
}

function summaryRow(e: BatchEntry): string {
  const s = e.result ? summarise(e.result) : null;
  const w = e.status === 'ok' && s?.band.detected ? s.band : null;
  const note = e.error ? `${e.error.code}: ${e.error.message}` : e.status === 'no-band' ? (s && !s.band.detected ? s.band.reason : 'no band found') : '';
  const cells = [
    `<td><a href="#img-${esc(e.safeName)}">${esc(e.file)}</a></td>`,
    `<td>${esc(e.metadata.specimen_id ?? '')}</td>`,
    `<td>${esc(e.metadata.notch ?? '')}</td>`,
    `<td class="status-${e.status}">${e.status}</td>`,
    `<td class="quality-${s?.quality.verdict ?? 'none'}"${s?.quality.reasons.length ? ` title="${esc(s.quality.reasons.map((w) => w.code).join(', '))}"` : ''}>${s?.quality.verdict ?? '—'}</td>`,
    `<td class="n">${cell(s?.scale.umPerPx)}${s ? ` <span class="muted">(${esc(s.scale.source)})</span>` : ''}</td>`,
    `<td class="n">${w ? cell(w.mean) : '—'}</td>`,
    `<td class="n">${w ? cell(w.median) : '—'}</td>`,
    `<td class="n">${w ? cell(w.sd) : '—'}</td>`,
    `<td class="n">${w && w.ci95.lo !== null && w.ci95.hi !== null ? interval([w.ci95.lo, w.ci95.hi], w.ci95.unit) : '—'}</td>`,
    `<td class="n">${w?.uncertainty && w.uncertainty.measurement.lo !== null && w.uncertainty.measurement.hi !== null ? interval([w.uncertainty.measurement.lo, w.uncertainty.measurement.hi], 'µm') : '—'}</td>`,
    `<td class="n">${w?.uncertainty?.parameterRange && w.uncertainty.parameterRange.lo !== null && w.uncertainty.parameterRange.hi !== null ? interval([w.uncertainty.parameterRange.lo, w.uncertainty.parameterRange.hi], 'µm') : '—'}</td>`,
    `<td class="n">${cell(s?.specimen.radius)}</td>`,
    `<td class="n">${cell(s?.separability?.fisher)}</td>`,
    `<td class="n">${n(e.strainRatePerS, '1/s')}</td>`,
    `<td class="n">${cell(s?.criticalDistance?.L)}</td>`,
    // the ratio with the 95 % interval its verdict was read from
    `<td class="n">${cell(s?.comparison?.ratio)}${s?.comparison && s.comparison.ratioInterval95.lo !== null && s.comparison.ratioInterval95.hi !== null ? ` <span class="muted">(${fmt(s.comparison.ratioInterval95.lo, 4)}–${fmt(s.comparison.ratioInterval95.hi, 4)})</span>` : ''}</td>`,
    `<td>${esc(s?.comparison?.verdict ?? '')}</td>`,
    `<td>${esc(note)}</td>`,
  ];
  return `<tr class="image-row">${cells.join('')}</tr>`;
}

/** One image's card: overlay, width histogram, polar profile, warnings, SHA-256 (also the body of the single-image report). */
export function card(e: BatchEntry, thumb: string | undefined): string {
  const r = e.result;
  const prof = r?.band.profile ?? [];
  const widths = prof.filter((p) => p.valid && typeof p.widthUm === 'number').map((p) => p.widthUm as number);
  const img = thumb ? `<img src="${thumb}" alt="overlay of ${esc(e.file)}">` : '<p class="muted">no overlay</p>';
  const body =
    e.status === 'error'
      ? `<p class="status-error">${esc(e.error?.code ?? 'ERROR')}: ${esc(e.error?.message ?? '')}</p>`
      : `<div class="plots">${histogramSvg(widths, { width: 260, height: 170 })}${polarProfileSvg(prof, { size: 200 })}</div>`;
  const s = r ? summarise(r) : null;
  const warn = (r?.warnings ?? []).map((w) => `<li>${esc(w.message)} <code>${esc(w.code)}</code></li>`).join('');
  const quality = s ? `<p class="quality-${s.quality.verdict}">quality: ${esc(s.quality.headline)}</p>` : '';
  const several = r ? specimenLines(r) : [];
  const specimens = several.length ? `<p class="specimens">${several.map(esc).join('<br>')}</p>` : '';
  return `<div class="card" id="img-${esc(e.safeName)}"><h3>${esc(e.file)}</h3>${quality}${specimens}${img}${body}${warn ? `<ul class="muted">${warn}</ul>` : ''}<div class="muted">sha256 <code>${esc(e.sha256)}</code></div></div>`;
}

/**
 * Builds the report page.
 * @param input entries, series analysis, thumbnails, default parameters, tool version
 * @returns the complete HTML document (UTF-8 text)
 */
export function buildReportHtml(input: ReportInput): string {
  const { entries, series } = input;
  const title = input.title ?? 'fractozone batch report';
  const counts = { ok: 0, 'no-band': 0, error: 0 } as Record<string, number>;
  for (const e of entries) counts[e.status]++;
  const fitRows = series.notches
    .map(
      (ns) =>
        `<tr><td>${esc(ns.notch)}</td><td class="n">${ns.fit ? n(ns.fit.A_um, 'µm') : '—'}</td><td class="n">${ns.fit ? n(ns.fit.B) : '—'}</td><td class="n">${ns.fit ? n(ns.fit.r2) : '—'}</td><td class="n">${ns.fit ? ns.fit.n : ns.groups.reduce((s, g) => s + g.n, 0)}</td><td>${esc(ns.fitNote ?? '')}</td></tr>`,
    )
    .join('');
  const groupRows = series.notches
    .flatMap((ns) =>
      ns.groups.map((g) => {
        const v = Object.entries(g.verdicts)
          .sort(([a], [b]) => (a < b ? -1 : 1))
          .map(([k, c]) => `${esc(k)}: ${c}`)
          .join(', ');
        const sv = g.seriesVerdict;
        const svCell = sv ? `<span title="${esc(sv.note)}">${esc(sv.verdict)}</span>` : '—';
        return `<tr class="group-row"><td>${esc(g.notch)}</td><td class="n">${n(g.strainRatePerS, '1/s')}</td><td class="n">${g.n}</td><td class="n">${n(g.meanWidthUm, 'µm')}</td><td class="n">${g.ci95Um ? interval(g.ci95Um, 'µm') : '—'}${g.ciBasis && g.ciBasis !== 'series' ? ` <span class="muted">(${esc(g.ciBasis)})</span>` : ''}</td><td class="n">${n(g.sdUm, 'µm')}</td><td class="n">${n(g.L_um, 'µm')}</td><td class="n">${n(g.ratio)}</td><td>${svCell}</td><td>${v || '—'}</td></tr>`;
      }),
    )
    .join('');
  const excluded = series.excluded.length
    ? `<p class="muted">Not in the series: ${series.excluded.map((x) => `${esc(x.file)} (${esc(x.reason)})`).join('; ')}.</p>`
    : '';
  const hashes = entries.map((e) => `<tr><td>${esc(e.file)}</td><td><code>${esc(e.sha256)}</code></td></tr>`).join('');
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title><style>${CSS}</style></head>
<body>
<h1>${esc(title)}</h1>
<div class="muted">fractozone ${esc(input.toolVersion)} · ${entries.length} images: ${counts.ok} ok, ${counts['no-band']} no band, ${counts.error} failed</div>
<div class="caution"><strong>Caution.</strong> ${escapeText(CAUTION)}</div>
<h2>Summary</h2>
<table id="summary"><thead><tr><th>image</th><th>specimen</th><th>notch</th><th>status</th><th>quality</th><th>pixel size</th><th>mean width</th><th>median width</th><th>SD of width</th><th>95 % circumferential interval</th><th>95 % measurement interval</th><th>parameter range</th><th>specimen radius</th><th>separability (Fisher ratio)</th><th>strain rate</th><th>L</th><th>width / reference</th><th>verdict</th><th>note</th></tr></thead>
<tbody>${entries.map(summaryRow).join('\n')}</tbody></table>
<h2>Series: band width against strain rate</h2>
${seriesPlotSvg(series)}
<p class="muted">Points: mean of the per-image mean widths per notch and strain rate; bars: 95 % interval (Student t over images, or the image's own interval for a single image). Dashed: power law w = A·ε̇^B fitted on log10 w against log10 ε̇. Black: the material's critical distance L(ε̇) from the results.</p>
<table id="fits"><thead><tr><th>notch</th><th>A (width at 1 1/s)</th><th>B (exponent)</th><th>R²</th><th>images</th><th>note</th></tr></thead><tbody>${fitRows || '<tr><td colspan="6">no series</td></tr>'}</tbody></table>
<h3>Agreement per notch and strain rate</h3>
<table id="groups"><thead><tr><th>notch</th><th>strain rate</th><th>images</th><th>mean width</th><th>95 % CI (series)</th><th>between-specimen SD</th><th>L</th><th>mean width / reference</th><th>series verdict</th><th>verdicts</th></tr></thead><tbody>${groupRows || '<tr><td colspan="10">no group</td></tr>'}</tbody></table>
${excluded}
<p class="muted">Images without a notch value are grouped as “${esc(NO_NOTCH)}”.</p>
<h2>Images</h2>
<div class="cards">${entries.map((e) => card(e, input.thumbnails[e.safeName])).join('\n')}</div>
<h2>Parameters</h2>
<p class="muted">Batch defaults; per-image settings from the manifest or sidecar files are in each result file.</p>
<pre>${esc(JSON.stringify(input.params, null, 2))}</pre>
<h2>Input files</h2>
<table id="hashes"><thead><tr><th>file</th><th>sha256</th></tr></thead><tbody>${hashes}</tbody></table>
<p class="muted">Report written by fractozone ${esc(input.toolVersion)}.</p>
</body></html>
`;
}
