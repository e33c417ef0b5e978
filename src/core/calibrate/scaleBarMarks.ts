/**
 * What surrounds a detected scale bar (see scaleBar.ts): its text label (small components of the
 * bar's polarity next to it) and the contrasting plate behind bar and label.
 */
import type { BoxPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import type { ScaleBar } from './scaleBar.js';
import { median, ST_AREA, ST_H, ST_LEFT, ST_TOP, ST_W, type Candidate, type Ctx } from './scaleBarSearch.js';

/** Union box (full-resolution px) of small components of the bar's polarity close to the bar. */
export function findLabel(ctx: Ctx, c: Candidate, labels: Int32Array, stats: Int32Array, n: number): BoxPx | undefined {
  const { f } = ctx;
  const horiz = c.orientation === 'horizontal';
  const len = horiz ? c.bw : c.bh;
  const m = Math.max(4 * c.tW + 4, Math.round(0.3 * len));
  const rx0 = c.left - m;
  const ry0 = c.top - m;
  const rx1 = c.left + c.bw + m;
  const ry1 = c.top + c.bh + m;
  const glyphs: { l: number; t: number; r: number; b: number }[] = [];
  for (let id = 1; id < n; id++) {
    if (id === c.id) continue;
    const l = stats[id * 5 + ST_LEFT];
    const t = stats[id * 5 + ST_TOP];
    const bw = stats[id * 5 + ST_W];
    const bh = stats[id * 5 + ST_H];
    const area = stats[id * 5 + ST_AREA];
    if (l < rx0 || t < ry0 || l + bw > rx1 || t + bh > ry1) continue;
    if (area < 3 || Math.max(bw, bh) > 0.4 * len || Math.max(bw, bh) < 2 || bw > 3 * bh) continue;
    glyphs.push({ l, t, r: l + bw, b: t + bh });
  }
  if (glyphs.length < 2) return undefined;
  // keep one text line: glyphs of similar height whose centres line up (horizontal text)
  const hs = glyphs.map((g) => g.b - g.t);
  const hMed = median(hs);
  const cMed = median(glyphs.map((g) => (g.t + g.b) / 2));
  const line = glyphs.filter((g) => {
    const gh = g.b - g.t;
    return gh >= 0.5 * hMed && gh <= 2 * hMed && Math.abs((g.t + g.b) / 2 - cMed) <= 0.6 * hMed;
  });
  if (line.length < 2 || line.length > 60) return undefined;
  const x0 = Math.min(...line.map((g) => g.l));
  const y0 = Math.min(...line.map((g) => g.t));
  const x1 = Math.max(...line.map((g) => g.r));
  const y1 = Math.max(...line.map((g) => g.b));
  void labels;
  return { x: x0 * f, y: y0 * f, w: (x1 - x0) * f, h: (y1 - y0) * f };
}

/**
 * Grow a box from the bar while its border rows/columns are mostly at the surrounding level; it is a
 * plate when the growth stops on every side at a contrast edge inside the image.
 */
export function findPlate(r: GrayRaster, bar: ScaleBar, outLevel: number, inLevel: number, label?: BoxPx): BoxPx | undefined {
  const { width: W, height: H, data: d } = r;
  const c = Math.abs(inLevel - outLevel);
  const tol = Math.max(0.04, 0.2 * c);
  let x0 = Math.floor(Math.min(bar.x0, bar.x1) - bar.thicknessPx);
  let x1 = Math.ceil(Math.max(bar.x0, bar.x1) + bar.thicknessPx);
  let y0 = Math.floor(Math.min(bar.y0, bar.y1) - bar.thicknessPx);
  let y1 = Math.ceil(Math.max(bar.y0, bar.y1) + bar.thicknessPx);
  if (label) {
    x0 = Math.min(x0, label.x);
    y0 = Math.min(y0, label.y);
    x1 = Math.max(x1, label.x + label.w);
    y1 = Math.max(y1, label.y + label.h);
  }
  x0 = Math.max(0, x0);
  y0 = Math.max(0, y0);
  x1 = Math.min(W - 1, x1);
  y1 = Math.min(H - 1, y1);
  const fracAt = (horizLine: boolean, k: number, a: number, b: number): number => {
    let ok = 0;
    let n = 0;
    const st = Math.max(1, Math.floor((b - a + 1) / 200));
    for (let t = a; t <= b; t += st) {
      const v = horizLine ? d[k * W + t] : d[t * W + k];
      if (Math.abs(v - outLevel) <= tol) ok++;
      n++;
    }
    return n ? ok / n : 0;
  };
  const stopped = [false, false, false, false]; // left, right, top, bottom: stopped at an edge inside the image
  const maxArea = 0.1 * W * H;
  for (let iter = 0; iter < W + H; iter++) {
    let grew = false;
    if (x0 > 0 && !stopped[0]) {
      if (fracAt(false, x0 - 1, y0, y1) >= 0.7) (x0--, (grew = true));
      else stopped[0] = true;
    }
    if (x1 < W - 1 && !stopped[1]) {
      if (fracAt(false, x1 + 1, y0, y1) >= 0.7) (x1++, (grew = true));
      else stopped[1] = true;
    }
    if (y0 > 0 && !stopped[2]) {
      if (fracAt(true, y0 - 1, x0, x1) >= 0.7) (y0--, (grew = true));
      else stopped[2] = true;
    }
    if (y1 < H - 1 && !stopped[3]) {
      if (fracAt(true, y1 + 1, x0, x1) >= 0.7) (y1++, (grew = true));
      else stopped[3] = true;
    }
    if (!grew || (x1 - x0 + 1) * (y1 - y0 + 1) > maxArea) break;
  }
  if ((x1 - x0 + 1) * (y1 - y0 + 1) > maxArea) return undefined;
  // a plate ends at a contrast edge inside the image on at least three sides
  if (stopped.filter(Boolean).length < 3) return undefined;
  // and the ring just outside it is mostly not at the plate level
  let diff = 0;
  let total = 0;
  const ring = 3;
  for (let y = Math.max(0, y0 - ring); y <= Math.min(H - 1, y1 + ring); y++) {
    for (let x = Math.max(0, x0 - ring); x <= Math.min(W - 1, x1 + ring); x++) {
      if (x >= x0 && x <= x1 && y >= y0 && y <= y1) continue;
      total++;
      if (Math.abs(d[y * W + x] - outLevel) > tol) diff++;
    }
  }
  if (total === 0 || diff < 0.7 * total) return undefined;
  return { x: x0, y: y0, w: x1 - x0 + 1, h: y1 - y0 + 1 };
}

