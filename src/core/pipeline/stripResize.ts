/**
 * The working copy of a large image made in strips: the same raster as `downsample` (OpenCV
 * `resize`, `INTER_AREA`; texture/resample.ts) without copying the whole full-resolution image into
 * OpenCV's WebAssembly memory at once. That memory never shrinks: a 48-MP image took 192 MB of it
 * for the one copy, for the rest of the process (peak RSS of a 48-MP `measure` 656 → see README).
 *
 * Why it is the same raster: INTER_AREA with a non-integer factor gives output row j the input rows
 * it covers, [j·H/h, (j+1)·H/h), with weights from the ratio H/h alone (OpenCV
 * `computeResizeAreaTab`). With H/h = p/q in lowest terms, every q output rows cover exactly p input
 * rows starting on a whole row, so a strip of k·p input rows reduced to k·q rows has the same
 * ratio, the same cell boundaries and the same weights, summed in the same order. Same for
 * columns. Checked on the sizes of common camera sensors and random sizes (tests/core/pipeline/
 * stripResize.test.ts compares strips and the whole call value by value); where neither direction
 * has such a period (q more than a quarter of the output) the whole image goes in one call.
 */
import { getCv } from '../cv.js';
import { createRaster, type GrayRaster } from '../image/raster.js';
import { downsample } from '../texture/resample.js';
import { checkRaster } from '../texture/validate.js';

/** Input pixels per strip (4 M: 16 MB of float32 in OpenCV's memory). */
const STRIP_PIXELS = 4_000_000;

const gcd = (a: number, b: number): number => {
  while (b) [a, b] = [b, a % b];
  return a;
};

/** `cv.resize(src, INTER_AREA)` of a w×h float raster to ow×oh, as a new Float32Array. */
function resizeArea(data: Float32Array, w: number, h: number, ow: number, oh: number): Float32Array {
  const cv = getCv();
  const src = new cv.Mat(h, w, cv.CV_32F);
  const dst = new cv.Mat();
  try {
    (src.data32F as Float32Array).set(data);
    cv.resize(src, dst, new cv.Size(ow, oh), 0, 0, cv.INTER_AREA);
    return new Float32Array(dst.data32F as Float32Array);
  } finally {
    src.delete();
    dst.delete();
  }
}

/** How {@link downsampleInStrips} reduces a W×H image: strips of rows or columns, or one call. */
export function stripPlan(W: number, H: number, factor: number, stripPixels = STRIP_PIXELS): 'rows' | 'columns' | 'whole' {
  if (!(factor > 1) || W * H <= 2 * stripPixels) return 'whole';
  const w = Math.max(1, Math.round(W / factor));
  const h = Math.max(1, Math.round(H / factor));
  if (4 * (h / gcd(H, h)) <= h) return 'rows';
  if (4 * (w / gcd(W, w)) <= w) return 'columns';
  return 'whole';
}

/**
 * `downsample(r, factor)` (same size rule, same values), in strips of rows or columns when the
 * image has more than two strips' worth of pixels and the ratio allows it ({@link stripPlan}).
 * @param stripPixels - input pixels per strip (tests use small values)
 */
export function downsampleInStrips(r: GrayRaster, factor: number, stripPixels = STRIP_PIXELS): GrayRaster {
  const W = r.width;
  const H = r.height;
  const plan = stripPlan(W, H, factor, stripPixels);
  if (plan === 'whole') return downsample(r, factor);
  checkRaster(r);
  const w = Math.max(1, Math.round(W / factor));
  const h = Math.max(1, Math.round(H / factor));
  const out = new Float32Array(w * h);
  if (plan === 'rows') {
    const py = H / gcd(H, h);
    const qy = h / gcd(H, h);
    const k = Math.max(1, Math.floor(stripPixels / (py * W)));
    for (let j0 = 0; j0 < h; j0 += qy * k) {
      const j1 = Math.min(h, j0 + qy * k);
      const y0 = (j0 / qy) * py;
      const y1 = (j1 / qy) * py;
      out.set(resizeArea(r.data.subarray(y0 * W, y1 * W), W, y1 - y0, w, j1 - j0), j0 * w);
    }
    return createRaster(w, h, out);
  }
  const px = W / gcd(W, w);
  const qx = w / gcd(W, w);
  const k = Math.max(1, Math.floor(stripPixels / (px * H)));
  for (let i0 = 0; i0 < w; i0 += qx * k) {
    const i1 = Math.min(w, i0 + qx * k);
    const x0 = (i0 / qx) * px;
    const sw = (i1 / qx) * px - x0;
    const ow = i1 - i0;
    const strip = new Float32Array(sw * H);
    for (let y = 0; y < H; y++) strip.set(r.data.subarray(y * W + x0, y * W + x0 + sw), y * sw);
    const part = resizeArea(strip, sw, H, ow, h);
    for (let y = 0; y < h; y++) out.set(part.subarray(y * ow, (y + 1) * ow), y * w + i0);
  }
  return createRaster(w, h, out);
}
