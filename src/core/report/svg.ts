/**
 * Small self-contained SVG plots for the reports (no script, no external font: generic
 * `sans-serif`). Every axis label carries its unit.
 *
 * - {@link histogramSvg}: distribution of the band width over the rays (µm).
 * - {@link polarProfileSvg}: band width w(θ) around the circumference; project angle convention
 *   (0° = +x, counter-clockwise as seen on screen, so a point is drawn at (cos θ, −sin θ)).
 * - {@link seriesPlotSvg}: group mean width against strain rate on a log10 x axis, one colour per
 *   notch, 95 % error bars, the fitted power law and the material's L(ε̇).
 *
 * Tick choice: "nice numbers" 1-2-5 steps (P. S. Heckbert, "Nice numbers for graph labels",
 * Graphics Gems, Academic Press 1990).
 */
import type { SeriesAnalysis } from './series.js';

const FONT = 'font-family="sans-serif" font-size="11"';
export const SERIES_COLOURS = ['#1f5fa8', '#c4461b', '#2a8a3a', '#8a3fa0', '#a07a10', '#137a7a'];

/** Escapes text for XML/HTML content and attribute values. */
export function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Escapes text content (not attribute values): only &, < and > need it there. */
export function escapeText(s: string): string {
  return s.replace(/[&<>]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;' })[c]!);
}

/** Short number text: up to `digits` significant digits, no exponent for ordinary magnitudes. */
export function fmt(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return 'n/a';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e6) return String(Number(v.toPrecision(digits)));
  return v.toExponential(digits - 1);
}

function r2(v: number): string {
  return String(Math.round(v * 100) / 100);
}

/** Nice 1-2-5 ticks covering [lo, hi] (Heckbert 1990). */
export function niceTicks(lo: number, hi: number, target = 5): number[] {
  if (!(hi > lo)) {
    const d = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1;
    lo -= d;
    hi += d;
  }
  const raw = (hi - lo) / Math.max(1, target);
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  const step = (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) * p;
  const out: number[] = [];
  for (let k = Math.floor(lo / step + 1e-9); k * step <= hi + step * 1e-9; k++) {
    out.push(Number((k * step).toPrecision(12)));
  }
  if (out[0] > lo) out.unshift(Number((out[0] - step).toPrecision(12)));
  if (out[out.length - 1] < hi) out.push(Number((out[out.length - 1] + step).toPrecision(12)));
  return out;
}

function emptyPlot(width: number, height: number, text: string, title: string, cls: string): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plot ${cls} empty" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="${escapeXml(title)}"><rect x="0.5" y="0.5" width="${width - 1}" height="${height - 1}" fill="#fafafa" stroke="#ccc"/><text x="${width / 2}" y="${height / 2}" text-anchor="middle" ${FONT} fill="#666">${escapeXml(text)}</text></svg>`;
}

/**
 * Histogram of band widths.
 * @param widthsUm band widths of the valid rays, µm
 * @param opts size in px (default 300 × 180) and number of bins (default: Sturges' rule,
 *   ⌈log2 n⌉ + 1, H. A. Sturges, J. Am. Stat. Assoc. 21, 1926)
 * @returns an `<svg>` element as text
 */
export function histogramSvg(widthsUm: readonly number[], opts: { width?: number; height?: number; bins?: number } = {}): string {
  const W = opts.width ?? 300;
  const H = opts.height ?? 180;
  const xs = widthsUm.filter((v) => Number.isFinite(v));
  if (xs.length === 0) return emptyPlot(W, H, 'no band width measured', 'width histogram', 'histogram');
  let lo = Math.min(...xs);
  let hi = Math.max(...xs);
  if (hi === lo) {
    lo -= Math.max(1e-9, Math.abs(lo) * 0.05);
    hi += Math.max(1e-9, Math.abs(hi) * 0.05);
  }
  const nb = opts.bins ?? Math.max(1, Math.ceil(Math.log2(xs.length)) + 1);
  const counts = new Array<number>(nb).fill(0);
  for (const v of xs) counts[Math.min(nb - 1, Math.floor(((v - lo) / (hi - lo)) * nb))]++;
  const cmax = Math.max(...counts);
  const m = { l: 42, r: 10, t: 10, b: 34 };
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const X = (v: number): number => m.l + ((v - lo) / (hi - lo)) * pw;
  const Y = (c: number): number => m.t + ph - (c / cmax) * ph;
  const parts: string[] = [];
  for (let i = 0; i < nb; i++) {
    const x0 = X(lo + ((hi - lo) * i) / nb);
    const x1 = X(lo + ((hi - lo) * (i + 1)) / nb);
    parts.push(`<rect x="${r2(x0)}" y="${r2(Y(counts[i]))}" width="${r2(Math.max(0.5, x1 - x0 - 1))}" height="${r2(m.t + ph - Y(counts[i]))}" fill="#5b8fd0"><title>${fmt(lo + ((hi - lo) * i) / nb)}–${fmt(lo + ((hi - lo) * (i + 1)) / nb)} µm: ${counts[i]} rays</title></rect>`);
  }
  const ticks = niceTicks(lo, hi, 4).filter((t) => t >= lo - 1e-9 && t <= hi + 1e-9);
  for (const t of ticks) {
    parts.push(`<line x1="${r2(X(t))}" y1="${m.t + ph}" x2="${r2(X(t))}" y2="${m.t + ph + 4}" stroke="#333"/><text x="${r2(X(t))}" y="${m.t + ph + 15}" text-anchor="middle" ${FONT}>${fmt(t)}</text>`);
  }
  const yt = niceTicks(0, cmax, 3).filter((t) => t <= cmax && Number.isInteger(t));
  for (const t of yt) {
    parts.push(`<line x1="${m.l - 4}" y1="${r2(Y(t))}" x2="${m.l}" y2="${r2(Y(t))}" stroke="#333"/><text x="${m.l - 6}" y="${r2(Y(t) + 4)}" text-anchor="end" ${FONT}>${t}</text>`);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plot histogram" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="band width histogram">
<rect x="0" y="0" width="${W}" height="${H}" fill="#fff"/>
${parts.join('\n')}
<line x1="${m.l}" y1="${m.t + ph}" x2="${m.l + pw}" y2="${m.t + ph}" stroke="#333"/><line x1="${m.l}" y1="${m.t}" x2="${m.l}" y2="${m.t + ph}" stroke="#333"/>
<text x="${m.l + pw / 2}" y="${H - 4}" text-anchor="middle" ${FONT}>band width (µm)</text>
<text transform="translate(11 ${m.t + ph / 2}) rotate(-90)" text-anchor="middle" ${FONT}>rays</text>
</svg>`;
}

/**
 * Polar plot of the band width around the circumference.
 * @param profile rays: angle in degrees (project convention), width in µm or null, validity
 * @param opts size in px (default 220)
 * @returns an `<svg>` element as text; invalid rays are drawn as grey ticks on the rim
 */
export function polarProfileSvg(
  profile: readonly { angleDeg: number; widthUm: number | null; valid: boolean }[],
  opts: { size?: number } = {},
): string {
  const S = opts.size ?? 220;
  const valid = profile.filter((p) => p.valid && p.widthUm !== null && Number.isFinite(p.widthUm));
  if (valid.length === 0) return emptyPlot(S, S, 'no band width measured', 'polar width profile', 'polar');
  const wmax = Math.max(...valid.map((p) => p.widthUm as number));
  const ticks = niceTicks(0, wmax, 3).filter((t) => t > 0);
  const rmaxVal = ticks[ticks.length - 1] ?? wmax;
  const c = S / 2;
  const R = S / 2 - 24;
  const pt = (deg: number, w: number): [number, number] => {
    const a = (deg * Math.PI) / 180;
    const rr = (w / rmaxVal) * R;
    return [c + rr * Math.cos(a), c - rr * Math.sin(a)];
  };
  const parts: string[] = [];
  for (const t of ticks) {
    const [lx, ly] = pt(-45, t);
    parts.push(`<circle cx="${c}" cy="${c}" r="${r2((t / rmaxVal) * R)}" fill="none" stroke="#ddd"/><text x="${r2(lx + 2)}" y="${r2(ly + 9)}" ${FONT} font-size="9" fill="#777">${fmt(t)} µm</text>`);
  }
  for (const deg of [0, 90, 180, 270]) {
    const [x, y] = pt(deg, rmaxVal * 1.08);
    parts.push(`<line x1="${c}" y1="${c}" x2="${r2(x)}" y2="${r2(y)}" stroke="#ddd"/><text x="${r2(x)}" y="${r2(y + 4)}" text-anchor="middle" ${FONT} font-size="9" fill="#555">${deg}°</text>`);
  }
  // Polyline through consecutive valid rays; a gap (invalid ray) breaks the line.
  const sorted = [...profile].sort((a, b) => a.angleDeg - b.angleDeg);
  let seg: string[] = [];
  const segs: string[][] = [];
  for (const p of sorted) {
    if (p.valid && p.widthUm !== null && Number.isFinite(p.widthUm)) {
      const [x, y] = pt(p.angleDeg, p.widthUm);
      seg.push(`${r2(x)},${r2(y)}`);
    } else {
      if (seg.length) segs.push(seg);
      seg = [];
      const [x0, y0] = pt(p.angleDeg, rmaxVal * 0.97);
      const [x1, y1] = pt(p.angleDeg, rmaxVal);
      parts.push(`<line x1="${r2(x0)}" y1="${r2(y0)}" x2="${r2(x1)}" y2="${r2(y1)}" stroke="#aaa"/>`);
    }
  }
  if (seg.length) segs.push(seg);
  // close the loop when the first and last rays are both valid and there is no gap
  if (segs.length === 1 && valid.length === sorted.length && segs[0].length > 2) segs[0].push(segs[0][0]);
  else if (segs.length > 1) {
    const first = sorted[0];
    const last = sorted[sorted.length - 1];
    if (first.valid && last.valid) segs[0] = [...segs.pop()!, ...segs[0]];
  }
  for (const s of segs) {
    if (s.length === 1) parts.push(`<circle cx="${s[0].split(',')[0]}" cy="${s[0].split(',')[1]}" r="1.5" fill="#c4461b"/>`);
    else parts.push(`<polyline points="${s.join(' ')}" fill="none" stroke="#c4461b" stroke-width="1.5"/>`);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plot polar" width="${S}" height="${S}" viewBox="0 0 ${S} ${S}" role="img" aria-label="band width around the circumference">
<rect x="0" y="0" width="${S}" height="${S}" fill="#fff"/>
${parts.join('\n')}
</svg>`;
}

/** Decade ticks (and 2, 5 within a decade when the span is short) for a log10 axis. */
function logTicks(lo: number, hi: number): number[] {
  const a = Math.floor(Math.log10(lo));
  const b = Math.ceil(Math.log10(hi));
  const out: number[] = [];
  const sub = b - a <= 2 ? [1, 2, 5] : [1];
  for (let e = a; e <= b; e++) for (const s of sub) out.push(Number((s * 10 ** e).toPrecision(12)));
  return out.filter((t) => t >= lo * 0.999 && t <= hi * 1.001);
}

/** Height of the series plot when it has nothing to show, px. */
const EMPTY_SERIES_HEIGHT = 40;

/**
 * Series plot: mean band width (µm) against strain rate (1/s, log10 axis), one colour and marker
 * per notch, 95 % error bars, dashed fitted power law w = A·ε̇^B per notch and the material's
 * L(ε̇) as a black line with square markers.
 * @param series the output of `analyseSeries`
 * @param opts size in px (default 780 × 400; {@link EMPTY_SERIES_HEIGHT} high when there is nothing to plot)
 * @returns an `<svg>` element as text
 */
export function seriesPlotSvg(series: SeriesAnalysis, opts: { width?: number; height?: number } = {}): string {
  const W = opts.width ?? 780;
  const H = opts.height ?? 400;
  const groups = series.notches.flatMap((n) => n.groups);
  if (groups.length === 0 && series.lCurve.length === 0) {
    // one line, not a blank plot of the full size (a batch without strain rates is common)
    return emptyPlot(W, EMPTY_SERIES_HEIGHT, 'no image with both a strain rate and a band width', 'series plot', 'series');
  }
  const rates = [...groups.map((g) => g.strainRatePerS), ...series.lCurve.map((p) => p.strainRatePerS)];
  const ys = [
    ...groups.flatMap((g) => [g.meanWidthUm, ...(g.ci95Um ?? [])]),
    ...series.lCurve.map((p) => p.L_um),
  ].filter((v) => Number.isFinite(v));
  let xlo = Math.min(...rates);
  let xhi = Math.max(...rates);
  const lxlo0 = Math.log10(xlo);
  const lxhi0 = Math.log10(xhi);
  const padx = Math.max(0.25, (lxhi0 - lxlo0) * 0.08);
  xlo = 10 ** (lxlo0 - padx);
  xhi = 10 ** (lxhi0 + padx);
  // widths and L are positive: the axis starts at 0 (error bars below 0 are clipped)
  const yt = niceTicks(0, Math.max(...ys), 5).filter((t) => t >= 0);
  const ylo = yt[0];
  const yhi = yt[yt.length - 1];
  const m = { l: 58, r: 250, t: 14, b: 44 };
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const X = (v: number): number => m.l + ((Math.log10(v) - Math.log10(xlo)) / (Math.log10(xhi) - Math.log10(xlo))) * pw;
  const Y = (v: number): number => m.t + ph - ((v - ylo) / (yhi - ylo)) * ph;
  const clampY = (v: number): number => Math.min(m.t + ph, Math.max(m.t, Y(v)));
  const parts: string[] = [];
  for (const t of yt) {
    parts.push(`<line x1="${m.l}" y1="${r2(Y(t))}" x2="${m.l + pw}" y2="${r2(Y(t))}" stroke="#eee"/><text x="${m.l - 6}" y="${r2(Y(t) + 4)}" text-anchor="end" ${FONT}>${fmt(t)}</text>`);
  }
  for (const t of logTicks(xlo, xhi)) {
    parts.push(`<line x1="${r2(X(t))}" y1="${m.t}" x2="${r2(X(t))}" y2="${m.t + ph}" stroke="#eee"/><text x="${r2(X(t))}" y="${m.t + ph + 15}" text-anchor="middle" ${FONT}>${fmt(t)}</text>`);
  }
  const legend: string[] = [];
  series.notches.forEach((ns, i) => {
    const col = SERIES_COLOURS[i % SERIES_COLOURS.length];
    if (ns.fit) {
      const f = ns.fit;
      const pts: string[] = [];
      for (let k = 0; k <= 40; k++) {
        const lx = Math.log10(xlo) + ((Math.log10(xhi) - Math.log10(xlo)) * k) / 40;
        const w = f.A_um * 10 ** (f.B * lx);
        if (Number.isFinite(w)) pts.push(`${r2(X(10 ** lx))},${r2(clampY(w))}`);
      }
      parts.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${col}" stroke-width="1.2" stroke-dasharray="5 3"/>`);
    }
    // notches side by side at the same strain rate (a small horizontal dodge, px)
    const dodge = (i - (series.notches.length - 1) / 2) * 7;
    for (const g of ns.groups) {
      const x = X(g.strainRatePerS) + dodge;
      if (g.ci95Um) {
        const [a, b] = g.ci95Um;
        parts.push(`<line x1="${r2(x)}" y1="${r2(clampY(a))}" x2="${r2(x)}" y2="${r2(clampY(b))}" stroke="${col}"/><line x1="${r2(x - 4)}" y1="${r2(clampY(a))}" x2="${r2(x + 4)}" y2="${r2(clampY(a))}" stroke="${col}"/><line x1="${r2(x - 4)}" y1="${r2(clampY(b))}" x2="${r2(x + 4)}" y2="${r2(clampY(b))}" stroke="${col}"/>`);
      }
      parts.push(`<circle class="series-point" cx="${r2(x)}" cy="${r2(Y(g.meanWidthUm))}" r="4" fill="${col}"><title>${escapeXml(ns.notch)}, ${fmt(g.strainRatePerS)} 1/s: ${fmt(g.meanWidthUm)} µm (n = ${g.n})</title></circle>`);
    }
    const ly = m.t + 8 + i * 30;
    legend.push(`<circle cx="${m.l + pw + 18}" cy="${ly}" r="4" fill="${col}"/><text x="${m.l + pw + 28}" y="${ly + 4}" ${FONT}>${escapeXml(ns.notch)}</text>`);
    legend.push(
      `<text x="${m.l + pw + 28}" y="${ly + 17}" ${FONT} font-size="9" fill="#555">${ns.fit ? `w = ${fmt(ns.fit.A_um)} µm·ε̇^${fmt(ns.fit.B)}, R² = ${fmt(ns.fit.r2)}` : 'no fit (one strain rate)'}</text>`,
    );
  });
  if (series.lCurve.length) {
    const pts = series.lCurve.map((p) => `${r2(X(p.strainRatePerS))},${r2(Y(p.L_um))}`);
    if (pts.length > 1) parts.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="#000" stroke-width="1.5"/>`);
    for (const p of series.lCurve) {
      parts.push(`<rect class="l-point" x="${r2(X(p.strainRatePerS) - 3)}" y="${r2(Y(p.L_um) - 3)}" width="6" height="6" fill="#000"><title>L(${fmt(p.strainRatePerS)} 1/s) = ${fmt(p.L_um)} µm</title></rect>`);
    }
    const ly = m.t + 8 + series.notches.length * 30;
    legend.push(`<rect x="${m.l + pw + 15}" y="${ly - 3}" width="6" height="6" fill="#000"/><text x="${m.l + pw + 28}" y="${ly + 4}" ${FONT}>material L(ε̇)</text>`);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plot series" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" role="img" aria-label="band width against strain rate">
<rect x="0" y="0" width="${W}" height="${H}" fill="#fff"/>
${parts.join('\n')}
<rect x="${m.l}" y="${m.t}" width="${pw}" height="${ph}" fill="none" stroke="#333"/>
<text x="${m.l + pw / 2}" y="${H - 8}" text-anchor="middle" ${FONT}>strain rate ε̇ (1/s, log scale)</text>
<text transform="translate(14 ${m.t + ph / 2}) rotate(-90)" text-anchor="middle" ${FONT}>mean band width, L (µm)</text>
${legend.join('\n')}
</svg>`;
}
