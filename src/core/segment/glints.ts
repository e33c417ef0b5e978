/**
 * Specular glints: small bright specks (light reflected by facets of a slanted, smooth rim) read as
 * strong roughness and pull the smooth band into the rough class. They are found as a white top-hat
 * (the pixel minus a grey opening with a 9 × 9 disc) far above its spread over the specimen, and
 * replaced by the opening (the surrounding surface without the speck). Where there are (almost) no
 * such specks the image is returned as it is, so an image without glints is measured exactly as
 * before.
 */
import { createRaster, type GrayRaster, type Mask } from '../image/raster.js';
import { quantiles, morph, rasterToMat } from './cvutil.js';

/** Radius of the opening, working px (specks narrower than 9 px are removed). */
const OPEN_RADIUS = 4;
/**
 * A speck stands out of the opening by more than max(GLINT_MIN_STEP, median + GLINT_SIGMAS robust σ)
 * of the top-hat over the specimen (our choice, measured on rendered scenes: rims with glints
 * 0.4–1.5 % of the specimen above it, noisy, SEM, JPEG and plain scenes and the bundled samples 0).
 */
const GLINT_MIN_STEP = 0.15;
const GLINT_SIGMAS = 8;
/** Share of the specimen above which the specks are suppressed (below it nothing changes). */
const GLINT_MIN_FRACTION = 0.001;

/** Within NEAR_RADIUS working px of a speck, fainter specks (above max(GLINT_NEAR_MIN_STEP, median + GLINT_NEAR_SIGMAS σ)) go too. */
const NEAR_RADIUS = 6;
const GLINT_NEAR_MIN_STEP = 0.05;
const GLINT_NEAR_SIGMAS = 3;

/** Pixels within a (2r + 1)² box of a marked pixel (separable running maximum). */
function nearSpecks(m: Uint8Array, w: number, h: number, r: number): Uint8Array {
  const tmp = new Uint8Array(m.length);
  for (let y = 0; y < h; y++) {
    let last = -1e9;
    for (let x = 0; x < w + r; x++) {
      if (x < w && m[y * w + x]) last = x;
      const xo = x - r;
      if (xo >= 0 && x - last <= 2 * r) tmp[y * w + xo] = 1;
    }
  }
  const out = new Uint8Array(m.length);
  for (let x = 0; x < w; x++) {
    let last = -1e9;
    for (let y = 0; y < h + r; y++) {
      if (y < h && tmp[y * w + x]) last = y;
      const yo = y - r;
      if (yo >= 0 && y - last <= 2 * r) out[yo * w + x] = 1;
    }
  }
  return out;
}

/** Result of {@link suppressGlints}. */
export interface GlintSuppression {
  /** The raster with the specks replaced (the input itself when none were). */
  raster: GrayRaster;
  /** Share of the specimen's pixels replaced (0 when none). */
  fraction: number;
}

/** Marks the specks (top-hat above t inside the mask), one pixel wider; returns the count inside the mask. */
function markSpecks(v: Float32Array, o: Float32Array, mask: Uint8Array, t: number, w: number, h: number, out: Uint8Array): number {
  let n = 0;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      if (!mask[i] || v[i] - o[i] <= t) continue;
      for (let dy = -1; dy <= 1; dy++) {
        const yy = y + dy;
        if (yy < 0 || yy >= h) continue;
        for (let dx = -1; dx <= 1; dx++) {
          const xx = x + dx;
          if (xx >= 0 && xx < w) out[yy * w + xx] = 1;
        }
      }
    }
  }
  for (let i = 0; i < out.length; i++) if (out[i] && mask[i]) n++;
  return n;
}

/**
 * Replaces glints on the specimen by the grey opening of the image.
 *
 * @param r - working copy, gray 0..1
 * @param mask - the specimen mask at the same size
 */
export function suppressGlints(r: GrayRaster, mask: Mask): GlintSuppression {
  const m = rasterToMat(r);
  try {
    morph(m, 'open', OPEN_RADIUS);
    const o = m.data32F as Float32Array;
    const v = r.data;
    let nMask = 0;
    for (let i = 0; i < mask.data.length; i++) if (mask.data[i]) nMask++;
    if (nMask < 100) return { raster: r, fraction: 0 };
    const th = new Float32Array(nMask);
    for (let i = 0, k = 0; i < v.length; i++) if (mask.data[i]) th[k++] = v[i] - o[i];
    const [med, q25, q75] = quantiles(th, [0.5, 0.25, 0.75]);
    const t = Math.max(GLINT_MIN_STEP, med + (GLINT_SIGMAS * (q75 - q25)) / 1.349);
    const specks = new Uint8Array(v.length);
    const n = markSpecks(v, o, mask.data, t, r.width, r.height, specks);
    const fraction = n / nMask;
    if (fraction < GLINT_MIN_FRACTION) return { raster: r, fraction: 0 };
    // around the specks found, the fainter ones too (a glinting crescent has many below the first threshold)
    const near = nearSpecks(specks, r.width, r.height, NEAR_RADIUS);
    const tNear = Math.max(GLINT_NEAR_MIN_STEP, med + (GLINT_NEAR_SIGMAS * (q75 - q25)) / 1.349);
    const out = Float32Array.from(v);
    for (let i = 0; i < out.length; i++) if (specks[i] || (near[i] && mask.data[i] && v[i] - o[i] > tNear)) out[i] = o[i];
    return { raster: createRaster(r.width, r.height, out), fraction };
  } finally {
    m.delete();
  }
}
