/**
 * The single-image report: one self-contained HTML page (inline CSS and SVG, the overlay as a
 * data: URI, no script, no external resource) built from one result — the batch report's card for
 * the image (overlay, width histogram, polar profile, warnings, SHA-256) plus the inputs of the
 * measurement, the width statistics, the critical distance L with its interval, the width/reference
 * ratio with its interval and the verdict, and the caution. Deterministic (no timestamp).
 */
import type { MeasureResult } from '../pipeline/result.js';
import type { BatchEntry } from './csv.js';
import { card } from './html.js';
import { summarise, type Figure, type IntervalFigure, type ResultSummary } from './summary.js';
import { escapeXml as esc, fmt } from './svg.js';

export interface ImageReportInput {
  result: MeasureResult;
  /** `data:image/png;base64,…` of the overlay drawn from the result, or null. */
  overlayDataUrl: string | null;
  /** Further lines from the shell (e.g. why a material was not applied), shown under the warnings. */
  notes?: readonly string[];
}

const CSS = `
body{font-family:sans-serif;margin:24px auto;color:#222;max-width:1000px;padding:0 16px}
h1{font-size:21px;margin:0 0 4px;word-break:break-all}h2{font-size:16px;margin:22px 0 6px;border-bottom:1px solid #ccc;padding-bottom:3px}
h3{font-size:14px;margin:0 0 6px;word-break:break-all}
.caution{border:1px solid #c9a227;background:#fff8e0;padding:8px 12px;margin:12px 0;font-size:13px}
.verdict{border:1px solid #8aa4c8;background:#eef4fc;padding:8px 12px;margin:12px 0;font-size:14px}
.quality{padding:8px 12px;margin:12px 0;font-size:15px;border:2px solid}.quality-ok{border-color:#7cc08f;background:#eef8f0}.quality-check{border-color:#d9a441;background:#fff4dc}.quality-unreliable{border-color:#c0392b;background:#fde8e6}
.quality ul{margin:4px 0 0;padding-left:20px;font-size:13px}
.notes{border:1px solid #d9a441;background:#fff4e0;padding:6px 12px 6px 28px;font-size:13px}
table{border-collapse:collapse;font-size:13px;margin:6px 0}th,td{border:1px solid #ccc;padding:3px 8px;text-align:left;vertical-align:top}
th{background:#f3f3f3;font-weight:normal;white-space:nowrap}td.n{font-variant-numeric:tabular-nums}
.card{border:1px solid #ccc;padding:8px}.card img{width:100%;max-width:960px;display:block;margin-bottom:6px;border:1px solid #eee}
.card .plots{display:flex;gap:10px;flex-wrap:wrap}.card ul{color:#6b4700;font-size:13px}
.muted{color:#666;font-size:12px}code{font-size:11px;word-break:break-all}
`;

/** One result as the batch tables and cards see it (the CSV row of a single image comes from this too). */
export function imageEntry(r: MeasureResult): BatchEntry {
  return {
    file: r.input.file,
    safeName: 'image',
    sha256: r.input.sha256,
    status: r.band.detected ? 'ok' : 'no-band',
    metadata: {},
    strainRatePerS: r.params.strainRatePerS,
    material: r.criticalDistance?.inputs.material ?? null,
    overlay: null,
    result: r,
  };
}

const num = (v: number | null | undefined, unit = '', digits = 4): string =>
  typeof v === 'number' && Number.isFinite(v) ? `${fmt(v, digits)}${unit ? `\u00a0${unit}` : ''}` : '—';
const range = (v: readonly [number, number] | null | undefined, unit = '', digits = 4): string =>
  v ? `${fmt(v[0], digits)}–${fmt(v[1], digits)}${unit ? `\u00a0${unit}` : ''}` : '—';
const rows = (pairs: readonly [string, string][]): string => `<table>${pairs.map(([k, v]) => `<tr><th>${esc(k)}</th><td class="n">${v}</td></tr>`).join('')}</table>`;

/** How the texture window and the boundary came about. */
function measurementInputs(r: MeasureResult): [string, string][] {
  const p = r.params;
  const sectors = p.exclude.length ? p.exclude.map(([a, b]) => `${fmt(a, 4)}°–${fmt(b, 4)}°`).join(', ') : 'none';
  const outlineEdited = r.warnings.some((w) => w.code === 'OUTLINE_CORRECTED');
  return [
    ['image', `${esc(r.input.file)} <span class="muted">(${esc(r.input.format)}, ${r.input.widthPx}×${r.input.heightPx}\u00a0px, ${r.input.bitDepth}-bit)</span>`],
    ['pixel size', `${num(r.scale.umPerPx, 'µm/px', 5)} <span class="muted">(${esc(r.scale.detail)})</span>`],
    ['texture window', `${num(r.resolved.windowUm, 'µm')} = ${r.resolved.windowPx}\u00a0px ${p.windowUm === null ? '<span class="muted">(automatic: 1/25 of the specimen radius)</span>' : '<span class="muted">(typed)</span>'}`],
    ['roughness features', esc(r.resolved.features.join(', '))],
    ['rays', `${p.nRays}; excluded sectors: ${esc(sectors)}`],
    ['outliers', `|w − median| > ${fmt(p.outlierK, 3)}·1.4826·MAD flagged${p.dropOutliers ? ' and left out of the statistics' : ', kept in the statistics'}`],
    ['specimen outline', outlineEdited ? 'corrected by hand' : 'found automatically'],
    ['rim/core boundary', r.band.boundary?.source === 'manual' ? 'corrected by hand' : r.band.boundary ? 'found automatically' : 'none'],
  ];
}

/** Material inputs as the critical distance used them. */
function materialInputs(r: MeasureResult): [string, string][] {
  const cd = r.criticalDistance;
  const p = r.params;
  if (!cd) return [['material', p.material ? 'given, but no critical distance could be computed' : 'none given: no comparison with L']];
  const q = (v: typeof cd.inputs.toughness, unit: string): string =>
    `${num(v.value, unit)}${v.sd !== null ? ` ± ${num(v.sd, unit)} (sd)` : v.interval95 ? ` (interval ${range(v.interval95, unit)})` : ''} <span class="muted">[${esc(v.source)}]</span>`;
  const law = p.material?.material?.dynamic?.L;
  const out: [string, string][] = [
    ['material', cd.inputs.material ? `${esc(cd.inputs.material)}${cd.inputs.invented ? ' <strong>(invented demo data)</strong>' : ''}` : 'typed values'],
    ['fracture toughness K_c', q(cd.inputs.toughness, 'MPa·√m')],
    ['inherent strength σ₀', q(cd.inputs.strength, 'MPa')],
    ['strain rate', num(cd.inputs.strainRate_per_s, '1/s')],
  ];
  if (law?.law === 'power') out.push(['rate law for L', `L = ${fmt(law.A, 5)}\u00a0µm · ε̇^${fmt(law.B, 4)} <span class="muted">[${esc(law.source)}]</span>`]);
  else if (law) out.push(['rate law for L', `table of ${law.points.length} points <span class="muted">[${esc(law.source)}]</span>`]);
  out.push(['compared with', `${esc(p.reference)}, tolerance ±${fmt(p.tolerancePct, 3)}\u00a0%`]);
  return out;
}

/** Why L has no interval, in one phrase. */
function noIntervalReason(cd: NonNullable<MeasureResult['criticalDistance']>): string {
  if (cd.intervalNote) return cd.intervalNote;
  if (cd.basis === 'strain-rate law for L') return 'none: the strain-rate law carries no scatter';
  return 'none: give the sd (or an interval) of K_c or σ₀';
}

const fig = (f: Figure | null | undefined, digits = 4): string => num(f?.value, f?.unit ?? '', digits);
const ivl = (f: IntervalFigure | null | undefined, digits = 4): string => (f && f.lo !== null && f.hi !== null ? range([f.lo, f.hi], f.unit, digits) : '—');

function uncertaintyRows(b: Extract<ResultSummary['band'], { detected: true }>): [string, string][] {
  const u = b.uncertainty;
  if (!u) return [];
  return [
    [`${u.measurement.label} (this specimen)`, `${ivl(u.measurement)} <span class="muted">(${esc(u.budget)})</span>`],
    [`${u.circumferential.label} (w(θ) as a random process)`, ivl(u.circumferential)],
    ['parameter range (method choices)', u.parameterRange ? `${ivl(u.parameterRange)} <span class="muted">(${esc(u.rangeNote)})</span>` : esc(u.rangeNote)],
  ];
}

function widthRows(r: MeasureResult, s: ResultSummary): [string, string][] {
  const b = s.band;
  if (!b.detected) return [['band', `not found: ${esc(b.reason)}`]];
  const sep = s.separability;
  return [
    ['rays measured', `${b.n} of ${r.band.nRays} (effective ${fmt(b.nEff, 3)}); ${b.outliers ? `${b.outliers.count} outliers${b.outliers.dropped ? ', left out' : ''}` : 'no outliers'}`],
    [b.mean.label, `<strong>${fig(b.mean)}</strong>, ${esc(b.ci95.label)} ${ivl(b.ci95)}`],
    ...uncertaintyRows(b),
    [b.median.label, `${fig(b.median)}, ${esc(b.medianCi95.label)} ${ivl(b.medianCi95)}`],
    [b.sd.label, fig(b.sd)],
    [`${b.min.label} / ${b.p05.label} / ${b.p95.label} / ${b.max.label}`, `${fig(b.min)} / ${fig(b.p05)} / ${fig(b.p95)} / ${fig(b.max)}`],
    ['width along the normal', b.normalMean ? fig(b.normalMean) : '—'],
    ['area-equivalent width', b.areaEquivalent ? fig(b.areaEquivalent) : '—'],
    [s.specimen.radius.label, fig(s.specimen.radius)],
    ['separability', sep ? `${sep.fisher.label} ${fig(sep.fisher, 3)}, ${sep.overlap.label} ${fig(sep.overlap, 3)}` : '—'],
  ];
}

function comparisonRows(r: MeasureResult, s: ResultSummary): [string, string][] {
  const cd = r.criticalDistance;
  const cs = s.criticalDistance;
  if (!cd || !cs) return [];
  const label = cd.basis === 'static' ? 'L = (1/π)(K_c/σ₀)²' : cd.basis === 'strain-rate law for L' ? 'L from the strain-rate law' : 'L = (1/π)(K_c/σ₀(ε̇))²';
  const out: [string, string][] = [
    [label, `<strong>${fig(cs.L)}</strong>`],
    ['95 % interval of L', cs.interval95 ? ivl(cs.interval95) : noIntervalReason(cd)],
  ];
  const c = s.comparison;
  if (!c || !r.comparison) return [...out, ['comparison', 'none: no band width to compare']];
  out.push(
    [c.ratio.label, `<strong>${fig(c.ratio)}</strong>, ${esc(c.ratioInterval95.label)} ${ivl(c.ratioInterval95)}`],
    ['verdict', `<strong>${esc(c.verdict)}</strong> <span class="muted">(${esc(r.comparison.note)})</span>`],
    ['intervals used', esc(c.basisNote)],
    ['implied toughness', c.impliedToughness ? `${fig(c.impliedToughness)}${c.impliedToughnessInterval95 ? `, 95\u00a0% interval ${ivl(c.impliedToughnessInterval95)}` : ''}` : '—'],
  );
  return out;
}

/** One sentence at the top: the width and, when there is one, the verdict. */
function headline(s: ResultSummary): string {
  const b = s.band;
  if (!b.detected) return `No smooth rim band was measured: ${esc(b.reason)}.`;
  // this specimen's measurement interval first (the verdict uses it), then the circumferential one
  const u = b.uncertainty;
  const measured = u && u.measurement.lo !== null ? `95\u00a0% measurement interval ${ivl(u.measurement)}; ` : '';
  const width = `Mean band width <strong>${fig(b.mean)}</strong> (${measured}95\u00a0% circumferential interval ${ivl(b.ci95)}, n\u00a0=\u00a0${b.n} rays).`;
  const c = s.comparison;
  if (!c) return width;
  return `${width} Width / ${esc(c.reference)} = <strong>${fig(c.ratio)}</strong> (95\u00a0% ${ivl(c.ratioInterval95)}): verdict <strong data-verdict="${esc(c.verdict)}">${esc(c.verdict)}</strong>.`;
}

/** The quality verdict, read first: its headline and the warnings that set it. */
function qualityBox(s: ResultSummary): string {
  const q = s.quality;
  const reasons = q.reasons.map((w) => `<li>${esc(w.message)} <code>${esc(w.code)}</code></li>`).join('');
  return `<div class="quality quality-${q.verdict}" data-quality="${q.verdict}"><strong>Quality: ${esc(q.headline)}</strong>${reasons ? `<ul>${reasons}</ul>` : ''}</div>`;
}

/**
 * Builds the single-image report.
 *
 * @param input - the result, the overlay picture drawn from it, and notes from the shell
 * @returns the complete HTML document (UTF-8 text)
 */
export function buildImageReportHtml(input: ImageReportInput): string {
  const r = input.result;
  const s = summarise(r);
  const notes = input.notes ?? [];
  const title = `Band width — ${r.input.file}`;
  const cmp = comparisonRows(r, s);
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title><style>${CSS}</style></head>
<body>
<h1>${esc(title)}</h1>
<div class="muted">${esc(r.tool.name)} ${esc(r.tool.version)} · result schema ${esc(r.schema)}</div>
<div class="caution"><strong>Caution.</strong> ${esc(r.caution)}</div>
${qualityBox(s)}
<p class="verdict">${headline(s)}</p>
${notes.length ? `<ul class="notes">${notes.map((s) => `<li>${esc(s)}</li>`).join('')}</ul>` : ''}
<h2>Image, overlay and width profile</h2>
${card(imageEntry(r), input.overlayDataUrl ?? undefined)}
<h2>Inputs</h2>
${rows(measurementInputs(r))}
${rows(materialInputs(r))}
<h2>Band width</h2>
${rows(widthRows(r, s))}
${cmp.length ? `<h2>Critical distance</h2>\n${rows(cmp)}` : ''}
<p class="muted">Report written by ${esc(r.tool.name)} ${esc(r.tool.version)} from the result of this image; the result file (${esc(r.schema)}) holds every number and parameter.</p>
</body></html>
`;
}
