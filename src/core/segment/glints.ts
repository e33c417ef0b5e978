/**
 * Specular glints: small bright specks (light reflected by facets of a slanted, smooth rim) read as
 * strong roughness and pull the smooth band into the rough class. They are found as a white top-hat
 * (the pixel minus a grey opening with a 7 × 7 square) far above its spread over the specimen, and
 * replaced by the opening (the surrounding surface without the speck). Where there are (almost) no
 * such specks the image is returned as it is, so an image without glints is measured exactly as
 * before. The replaced pixels are also returned as a mask: on a densely sparkling rim the opening
 * still carries the specks' remains (blocks of clustered specks, faint ones between them), so the
 * boundary refinement leaves those pixels out instead of reading them as texture (segment/refine.ts
 * `missing`).
 */
import { createRaster, type GrayRaster, type Mask } from '../image/raster.js';
import { quantiles, rectMorph, setBox } from './cvutil.js';

/** Radius of the opening, working px (specks narrower than 7 px are removed). */
const OPEN_RADIUS = 3;
/**
 * A speck stands out of the opening by more than max(GLINT_MIN_STEP, median + GLINT_SIGMAS robust σ)
 * of the top-hat over the specimen (our choice, measured on rendered scenes: rims with glints
 * 0.4–1.5 % of the specimen above it, noisy, SEM, JPEG and plain scenes and the bundled samples 0).
 */
const GLINT_MIN_STEP = 0.15;
const GLINT_SIGMAS = 8;
/** Share of the specimen above which the specks are suppressed (below it nothing changes). */
const GLINT_MIN_FRACTION = 0.001;

/**
 * Within NEAR_RADIUS working px of a speck, fainter specks (above max(GLINT_NEAR_MIN_STEP, median +
 * GLINT_NEAR_SIGMAS σ)) go too. 1.5 σ, not 3 (measured on the scene set's four glint scenes with the
 * masked refinement: mean width error glints-b −4.7 % → −1.4 %, large-combo −8.8 % → −2.6 %; 2 σ gave
 * −1.8 % and −3.0 %): the glints' fainter halos read as core texture otherwise.
 */
const NEAR_RADIUS = 6;
const GLINT_NEAR_MIN_STEP = 0.05;
const GLINT_NEAR_SIGMAS = 1.5;
/** The mask of replaced pixels is grown by this many px (bilinear samples next to a replaced pixel carry part of it). */
const MASK_GROW = 1;

/**
 * Running minimum over 2r + 1 samples of one line (van Herk / Gil–Werman: three comparisons per
 * sample), samples outside the line ignored (as OpenCV's erode/dilate borders). The maximum is the
 * minimum of the negated values (runs on −x).
 */
function runMinLine(src: Float32Array, dst: Float32Array, start: number, stride: number, n: number, r: number, p: Float32Array, g: Float32Array, h: Float32Array): void {
  const k = 2 * r + 1;
  const len = n + 2 * r;
  for (let i = 0; i < r; i++) p[i] = Infinity;
  for (let i = 0; i < n; i++) p[i + r] = src[start + i * stride];
  for (let i = n + r; i < len; i++) p[i] = Infinity;
  for (let b = 0; b < len; b += k) {
    const e = b + k < len ? b + k : len;
    let m = p[b];
    g[b] = m;
    for (let i = b + 1; i < e; i++) {
      if (p[i] < m) m = p[i];
      g[i] = m;
    }
    m = p[e - 1];
    h[e - 1] = m;
    for (let i = e - 2; i >= b; i--) {
      if (p[i] < m) m = p[i];
      h[i] = m;
    }
  }
  for (let i = 0; i < n; i++) {
    const a = h[i];
    const c = g[i + k - 1];
    dst[start + i * stride] = a < c ? a : c;
  }
}

/** Grey erosion with a (2r + 1)² square, separable (rows, then columns). */
function erodeRect(src: Float32Array, w: number, hgt: number, r: number): Float32Array {
  const tmp = new Float32Array(src.length);
  const out = new Float32Array(src.length);
  const L = Math.max(w, hgt) + 4 * r + 1;
  const p = new Float32Array(L);
  const g = new Float32Array(L);
  const h = new Float32Array(L);
  for (let y = 0; y < hgt; y++) runMinLine(src, tmp, y * w, 1, w, r, p, g, h);
  erodeColumns(tmp, out, w, hgt, r);
  return out;
}

/** dst[dOff + x] = min(a[aOff + x], b[bOff + x]) for x < w. */
function minRowInto(dst: Float32Array, dOff: number, a: Float32Array, aOff: number, b: Float32Array, bOff: number, w: number): void {
  for (let x = 0; x < w; x++) {
    const u = a[aOff + x];
    const v = b[bOff + x];
    dst[dOff + x] = u < v ? u : v;
  }
}

/**
 * The same running minimum down the columns, done a whole row at a time (the van Herk prefix and
 * suffix minima kept per row), so every access is contiguous.
 */
function erodeColumns(src: Float32Array, out: Float32Array, w: number, hgt: number, r: number): void {
  const k = 2 * r + 1;
  const len = hgt + 2 * r;
  const inf = new Float32Array(w).fill(Infinity);
  const G = new Float32Array(len * w);
  const H = new Float32Array(len * w);
  const rowOf = (i: number): [Float32Array, number] => (i < r || i >= hgt + r ? [inf, 0] : [src, (i - r) * w]);
  for (let b = 0; b < len; b += k) {
    const e = b + k < len ? b + k : len;
    let [a, ao] = rowOf(b);
    G.set(a.subarray(ao, ao + w), b * w);
    for (let i = b + 1; i < e; i++) {
      [a, ao] = rowOf(i);
      minRowInto(G, i * w, G, (i - 1) * w, a, ao, w);
    }
    [a, ao] = rowOf(e - 1);
    H.set(a.subarray(ao, ao + w), (e - 1) * w);
    for (let i = e - 2; i >= b; i--) {
      [a, ao] = rowOf(i);
      minRowInto(H, i * w, H, (i + 1) * w, a, ao, w);
    }
  }
  for (let y = 0; y < hgt; y++) minRowInto(out, y * w, H, y * w, G, (y + k - 1) * w, w);
}

/** x ↦ −x in place. */
function negate(a: Float32Array): Float32Array {
  for (let i = 0; i < a.length; i++) a[i] = -a[i];
  return a;
}

/** Grey opening with a (2r + 1)² square (equal to OpenCV's MORPH_OPEN with MORPH_RECT; tested against it). */
export function openRect(r: GrayRaster, radius: number): Float32Array {
  // dilation = −erosion(−x)
  const eroded = negate(erodeRect(r.data, r.width, r.height, radius));
  return negate(erodeRect(eroded, r.width, r.height, radius));
}

/**
 * {@link openRect} where {@link suppressGlints} reads it: on the specimen's bounding box grown by one
 * px (the specks are marked one px wider), elsewhere 0. The opening at a pixel is a minimum and
 * maximum over the pixels within 2·radius, so the box is opened with 2·radius px more around it
 * (or up to the frame) and the values read are those of the whole image's opening; on the 12-MP
 * bench (specimen ≈ ½ of the working copy) it halves the stage's ≈ 0.1 s (CPU profile).
 */
function openNearMask(r: GrayRaster, mask: Mask, radius: number): Float32Array {
  const W = r.width;
  const H = r.height;
  const b = setBox(mask.data, W, H);
  if (!b) return new Float32Array(W * H);
  const g = 1 + 2 * radius;
  const x0 = Math.max(0, b.x0 - g);
  const y0 = Math.max(0, b.y0 - g);
  const x1 = Math.min(W - 1, b.x1 + g);
  const y1 = Math.min(H - 1, b.y1 + g);
  const w = x1 - x0 + 1;
  const h = y1 - y0 + 1;
  if (w === W && h === H) return openRect(r, radius);
  const crop = new Float32Array(w * h);
  for (let y = 0; y < h; y++) crop.set(r.data.subarray((y0 + y) * W + x0, (y0 + y) * W + x0 + w), y * w);
  const oc = openRect(createRaster(w, h, crop), radius);
  const out = new Float32Array(W * H);
  for (let y = 0; y < h; y++) out.set(oc.subarray(y * w, (y + 1) * w), (y0 + y) * W + x0);
  return out;
}

/** Result of {@link suppressGlints}. */
export interface GlintSuppression {
  /** The raster with the specks replaced (the input itself when none were). */
  raster: GrayRaster;
  /** Share of the specimen's pixels replaced (0 when none). */
  fraction: number;
  /**
   * The replaced pixels grown by {@link MASK_GROW} px, inside the specimen (1), at the raster's size:
   * their texture is unknown. Null when nothing was replaced.
   */
  mask: Uint8Array | null;
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
  {
    const o = openNearMask(r, mask, OPEN_RADIUS);
    const v = r.data;
    let nMask = 0;
    for (let i = 0; i < mask.data.length; i++) if (mask.data[i]) nMask++;
    if (nMask < 100) return { raster: r, fraction: 0, mask: null };
    const th = new Float32Array(nMask);
    for (let i = 0, k = 0; i < v.length; i++) if (mask.data[i]) th[k++] = v[i] - o[i];
    const [med, q25, q75] = quantiles(th, [0.5, 0.25, 0.75]);
    const t = Math.max(GLINT_MIN_STEP, med + (GLINT_SIGMAS * (q75 - q25)) / 1.349);
    const specks = new Uint8Array(v.length);
    const n = markSpecks(v, o, mask.data, t, r.width, r.height, specks);
    const fraction = n / nMask;
    if (fraction < GLINT_MIN_FRACTION) return { raster: r, fraction: 0, mask: null };
    // around the specks found, the fainter ones too (a glinting crescent has many below the first threshold)
    const near = rectMorph(specks, r.width, r.height, NEAR_RADIUS, 'dilate');
    const tNear = Math.max(GLINT_NEAR_MIN_STEP, med + (GLINT_NEAR_SIGMAS * (q75 - q25)) / 1.349);
    const out = Float32Array.from(v);
    const replaced = new Uint8Array(v.length);
    for (let i = 0; i < out.length; i++) {
      if (specks[i] || (near[i] && mask.data[i] && v[i] - o[i] > tNear)) {
        out[i] = o[i];
        replaced[i] = 1;
      }
    }
    const grown = rectMorph(replaced, r.width, r.height, MASK_GROW, 'dilate');
    for (let i = 0; i < grown.length; i++) if (!mask.data[i]) grown[i] = 0;
    return { raster: createRaster(r.width, r.height, out), fraction, mask: grown };
  }
}
