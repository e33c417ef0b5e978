/**
 * Statistics of the annulus beside a ring on the polar grid (rings.ts step 4): roughness, intensity,
 * radial share of fine-texture gradient energy, concentricity of detrended sector profiles, share
 * inside the silhouette.
 */
import type { Mask } from '../image/raster.js';
import type { PolarCues, PolarShape } from './polar.js';
import { polarAt, polarRay } from './polar.js';

/** Statistics of an annulus beside a ring. */
export interface AnnulusStats {
  roughness: number;
  intensity: number;
  /** Radial share of the fine-texture gradient energy (0..1). */
  radialShare: number;
  /** Share of the detrended radial intensity profile common to 12 sectors (0..1). */
  concentricity: number;
  /** Fraction of samples inside the silhouette of the part. */
  inSilhouette: number;
  /** Radial extent of the annulus, px. */
  widthPx: number;
}

export function annulus(p: PolarCues, path: Int32Array, from: number, to: number, silhouette: Mask | null, shape: PolarShape): AnnulusStats {
  const { nTheta, nR, dr } = p;
  let nIn = 0;
  let rough = 0;
  let inten = 0;
  let gr = 0;
  let g = 0;
  let sil = 0;
  const SECT = 12;
  const len = Math.abs(to - from) + 1;
  const prof = new Float64Array(SECT * len);
  const cnt = new Float64Array(SECT * len);
  for (let t = 0; t < nTheta; t++) {
    const sct = Math.floor((t * SECT) / nTheta);
    // the ray's cosines once, not per sample (issue 16: ≈ 2 M trigonometric calls per measure)
    const ray = silhouette ? polarRay(shape, (2 * Math.PI * t) / nTheta) : null;
    for (let d = 0; d < len; d++) {
      const j = path[t] + (to >= from ? from + d : from - d);
      if (j < 0 || j >= nR) continue;
      const k = t * nR + j;
      if (!p.inside[k]) continue;
      nIn++;
      rough += p.roughness[k];
      inten += p.intensity[k];
      gr += p.gradRadial2[k];
      g += p.grad2[k];
      prof[sct * len + d] += p.intensity[k];
      cnt[sct * len + d] += 1;
      if (silhouette && ray) {
        const pt = polarAt(shape, ray, j * dr);
        const x = Math.round(pt.x);
        const y = Math.round(pt.y);
        if (x >= 0 && y >= 0 && x < silhouette.width && y < silhouette.height && silhouette.data[y * silhouette.width + x]) sil++;
      }
    }
  }
  // concentricity: detrended sector profiles, share of their variance common to all sectors
  let common = 0;
  let total = 0;
  const mean = new Float64Array(len);
  const sectors: Float64Array[] = [];
  for (let s = 0; s < SECT; s++) {
    const v = new Float64Array(len);
    let ok = true;
    for (let d = 0; d < len; d++) {
      if (cnt[s * len + d] === 0) ok = false;
      v[d] = prof[s * len + d] / Math.max(1, cnt[s * len + d]);
    }
    if (!ok || len < 4) continue;
    detrend(v);
    sectors.push(v);
  }
  if (sectors.length >= 4) {
    for (const v of sectors) for (let d = 0; d < len; d++) mean[d] += v[d] / sectors.length;
    for (const v of sectors) for (let d = 0; d < len; d++) total += v[d] * v[d];
    total /= sectors.length;
    for (let d = 0; d < len; d++) common += mean[d] * mean[d];
  }
  return {
    roughness: nIn ? rough / nIn : NaN,
    intensity: nIn ? inten / nIn : NaN,
    radialShare: g > 0 ? gr / g : NaN,
    concentricity: total > 0 ? common / total : 0,
    inSilhouette: silhouette && nIn ? sil / nIn : NaN,
    widthPx: len * p.dr,
  };
}

function detrend(v: Float64Array): void {
  const n = v.length;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sx += i;
    sy += v[i];
    sxx += i * i;
    sxy += i * v[i];
  }
  const den = n * sxx - sx * sx;
  const b = den ? (n * sxy - sx * sy) / den : 0;
  const a = (sy - b * sx) / n;
  for (let i = 0; i < n; i++) v[i] -= a + b * i;
}

