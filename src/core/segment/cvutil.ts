/** Small OpenCV helpers shared by the segmentation stages (every Mat is freed by the caller or here). */
import { getCv, type Mat } from '../cv.js';
import { createMask, cropRect, pasteRect, type GrayRaster, type Mask } from '../image/raster.js';
import type { PixelBox, PointPx } from '../image/geometry.js';

/** Copy a GrayRaster into a new CV_32F Mat (caller deletes). */
export function rasterToMat(r: GrayRaster): Mat {
  const cv = getCv();
  const m = new cv.Mat(r.height, r.width, cv.CV_32F);
  m.data32F.set(r.data);
  return m;
}

/** Copy a Mask into a new CV_8U Mat with values 0/255 (caller deletes). */
export function maskToMat(mask: Mask): Mat {
  const cv = getCv();
  const m = new cv.Mat(mask.height, mask.width, cv.CV_8U);
  maskBytesTo255(mask.data, m.data);
  return m;
}

/*
 * The two conversions below run 4 bytes at a time on aligned Uint32 views (a 0/1 word times 255
 * is 0/255 in each byte; "byte ≠ 0" is bit 7 of ((b & 0x7f) + 0x7f) | b, no carry between bytes),
 * with the byte loop for the rest: the same bytes. 1200 × 900 mask, warm: 1.55 → 0.44 ms per call;
 * they are called dozens of times per 12-MP measure (≈ 90 ms each in the profile, issue 16).
 */
function maskBytesTo255(s: Uint8Array, d: Uint8Array): void {
  const n = s.length;
  let j = 0;
  if (((s.byteOffset | d.byteOffset) & 3) === 0) {
    const n4 = n >> 2;
    const s32 = new Uint32Array(s.buffer, s.byteOffset, n4);
    const d32 = new Uint32Array(d.buffer, d.byteOffset, n4);
    let i = 0;
    for (; i < n4; i++) {
      const w = s32[i];
      if (w & 0xfefefefe) break; // a byte other than 0/1: the byte loop from here
      d32[i] = Math.imul(w, 255);
    }
    j = 4 * i;
  }
  for (; j < n; j++) d[j] = s[j] ? 255 : 0;
}

function bytesToMask01(s: Uint8Array, d: Uint8Array): void {
  const n = d.length;
  let j = 0;
  if (((s.byteOffset | d.byteOffset) & 3) === 0) {
    const n4 = n >> 2;
    const s32 = new Uint32Array(s.buffer, s.byteOffset, n4);
    const d32 = new Uint32Array(d.buffer, d.byteOffset, n4);
    for (let i = 0; i < n4; i++) {
      const x = s32[i];
      d32[i] = ((((x & 0x7f7f7f7f) + 0x7f7f7f7f) | x) >>> 7) & 0x01010101;
    }
    j = 4 * n4;
  }
  for (; j < n; j++) d[j] = s[j] ? 1 : 0;
}

/** Read a CV_8U Mat (non-zero = inside) into a Mask. */
export function matToMask(m: Mat): Mask {
  const out = createMask(m.cols, m.rows);
  bytesToMask01(m.data as Uint8Array, out.data);
  return out;
}

/** Apply a morphological operation with an elliptical kernel of radius r px (in place on a CV_8U Mat). */
export function morph(m: Mat, op: 'open' | 'close' | 'erode' | 'dilate', r: number, shape: 'ellipse' | 'rect' = 'ellipse'): void {
  if (r < 1) return;
  const cv = getCv();
  const k = cv.getStructuringElement(shape === 'rect' ? cv.MORPH_RECT : cv.MORPH_ELLIPSE, new cv.Size(2 * r + 1, 2 * r + 1));
  try {
    if (op === 'erode') cv.erode(m, m, k);
    else if (op === 'dilate') cv.dilate(m, m, k);
    else cv.morphologyEx(m, m, op === 'open' ? cv.MORPH_OPEN : cv.MORPH_CLOSE, k);
  } finally {
    k.delete();
  }
}

/**
 * Isotropic erosion / dilation of a 0/255 CV_8U Mat in place by a disc of radius r px, through
 * the Euclidean distance transform (cv.distanceTransform, DIST_L2, 5×5 mask): much faster than
 * large elliptical kernels in opencv-wasm. Open / close compose the two.
 */
export function morphDisc(m: Mat, op: 'open' | 'close' | 'erode' | 'dilate', r: number): void {
  if (r <= 0) return;
  if (op === 'open') {
    morphDisc(m, 'erode', r);
    morphDisc(m, 'dilate', r);
    return;
  }
  if (op === 'close') {
    morphDisc(m, 'dilate', r);
    morphDisc(m, 'erode', r);
    return;
  }
  // Only the bounding box of the set pixels, grown by 1 px (erode) or ⌊r⌋ + 1 px (dilate), can change
  // or decide a change: the 5×5 chamfer distance is a norm no smaller than max(|dx|, |dy|) (moves of
  // cost 1, 1.4 and 2.1969 for steps of 1, 1 and 2 px along the longer axis), the nearest background
  // pixel of a set pixel lies in the box's 1-px ring or nearer, and every pixel beyond ⌊r⌋ + 1 px of the
  // box is farther than r from the set. The same output as the whole image (checked on random masks
  // against the whole-image transform); the specimen masks fill ≈ ½ of the working copy.
  const W = m.cols;
  const H = m.rows;
  const o = m.data as Uint8Array;
  const box = setBox(o, W, H);
  if (!box) return; // nothing set: erosion and dilation leave it empty
  const g = op === 'erode' ? 1 : Math.floor(r) + 1;
  const x0 = Math.max(0, box.x0 - g);
  const y0 = Math.max(0, box.y0 - g);
  const x1 = Math.min(W - 1, box.x1 + g);
  const y1 = Math.min(H - 1, box.y1 + g);
  const w = x1 - x0 + 1;
  const whole = w === W && y1 - y0 + 1 === H;
  const cv = getCv();
  const part = whole ? m : m.roi(new cv.Rect(x0, y0, w, y1 - y0 + 1));
  const src = new cv.Mat();
  const dist = new cv.Mat();
  try {
    if (op === 'erode') part.copyTo(src);
    else cv.bitwise_not(part, src);
    cv.distanceTransform(src, dist, cv.DIST_L2, 5);
    const d = dist.data32F as Float32Array;
    const out = m.data as Uint8Array; // view taken after the last OpenCV call (the heap may grow)
    // erode: keep pixels farther than r from the outside; dilate: add pixels within r of the inside
    if (op === 'erode') farther(d, out, W, x0, y0, x1, y1, r);
    else within(d, out, W, x0, y0, x1, y1, r);
  } finally {
    src.delete();
    dist.delete();
    if (part !== m) part.delete();
  }
}

/**
 * {@link morphDisc}'s erosion: out = 255 where the distance (box x0…x1 × y0…y1, row-major in d)
 * exceeds r, else 0. Its own function (and {@link within}): a per-pixel loop inside a long
 * function runs unoptimised for long (DEVELOPERS.md, performance notes).
 */
function farther(d: Float32Array, out: Uint8Array, W: number, x0: number, y0: number, x1: number, y1: number, r: number): void {
  for (let y = y0, k = 0; y <= y1; y++) {
    const row = y * W;
    for (let x = x0; x <= x1; x++, k++) out[row + x] = d[k] > r ? 255 : 0;
  }
}

/** {@link morphDisc}'s dilation: out = 255 where the distance is at most r, else 0. */
function within(d: Float32Array, out: Uint8Array, W: number, x0: number, y0: number, x1: number, y1: number, r: number): void {
  for (let y = y0, k = 0; y <= y1; y++) {
    const row = y * W;
    for (let x = x0; x <= x1; x++, k++) out[row + x] = d[k] <= r ? 255 : 0;
  }
}

/** Inclusive bounding box of the non-zero pixels, or null. */
export function setBox(o: Uint8Array, W: number, H: number): PixelBox | null {
  let y0 = -1;
  let y1 = -1;
  let x0 = W;
  let x1 = -1;
  for (let y = 0; y < H; y++) {
    const row = y * W;
    const a = firstSet(o, row, row + W) - row;
    if (a >= W) continue;
    if (y0 < 0) y0 = y;
    y1 = y;
    if (a < x0) x0 = a;
    const e = lastSetAbove(o, row + x1, row + W - 1) - row;
    if (e > x1) x1 = e;
  }
  return y0 < 0 ? null : { x0, y0, x1: Math.max(x1, x0), y1 };
}

/** Index of the first non-zero o[i], from ≤ i < to, or `to`. */
function firstSet(o: Uint8Array, from: number, to: number): number {
  let i = from;
  while (i < to && o[i] === 0) i++;
  return i;
}

/** Index of the last non-zero o[i], lo < i ≤ hi, or lo. */
function lastSetAbove(o: Uint8Array, lo: number, hi: number): number {
  let i = hi;
  while (i > lo && o[i] === 0) i--;
  return i;
}

/**
 * Binary erosion or dilation by a (2r+1)×(2r+1) square, separably — the same result as
 * cv.erode / cv.dilate with a MORPH_RECT kernel and OpenCV's default border (pixels outside the
 * image are ignored), in O(1) per pixel: a pixel of the dilation is set when the last set pixel
 * at or before x + r lies at or after x − r (rows, then columns); erosion is the complement of
 * the dilation of the complement.
 *
 * @param src - non-zero = inside, row-major, width × height
 * @param r - half side, px
 * @returns 0/1 per pixel
 */
export function rectMorph(src: ArrayLike<number>, width: number, height: number, r: number, op: 'erode' | 'dilate'): Uint8Array {
  const W = width;
  const H = height;
  const n = W * H;
  const inv = op === 'erode' ? 1 : 0;
  const a = new Uint8Array(n);
  for (let i = 0; i < n; i++) a[i] = (src[i] ? 1 : 0) ^ inv;
  const tmp = new Uint8Array(n);
  for (let y = 0; y < H; y++) {
    const row = y * W;
    let last = -1 - 2 * r - W;
    for (let j = 0; j < Math.min(r, W); j++) if (a[row + j]) last = j;
    for (let x = 0; x < W; x++) {
      const j = x + r;
      if (j < W && a[row + j]) last = j;
      tmp[row + x] = last >= x - r ? 1 : 0;
    }
  }
  const lastY = new Int32Array(W).fill(-1 - 2 * r - H);
  for (let y = 0; y < Math.min(r, H); y++) for (let x = 0; x < W; x++) if (tmp[y * W + x]) lastY[x] = y;
  const out = new Uint8Array(n);
  for (let y = 0; y < H; y++) {
    const j = y + r;
    if (j < H) {
      const rowJ = j * W;
      for (let x = 0; x < W; x++) if (tmp[rowJ + x]) lastY[x] = j;
    }
    const row = y * W;
    const lim = y - r;
    for (let x = 0; x < W; x++) out[row + x] = (lastY[x] >= lim ? 1 : 0) ^ inv;
  }
  return out;
}

/**
 * Fill holes of a mask in place: background not 4-connected to the frame becomes inside.
 * Scan-line flood fill of the background from the frame (each stack entry is a whole run of a row),
 * on the set pixels' bounding box grown by 1 px (clipped to the frame) only: every pixel outside the
 * box is background connected to the frame, so only the box can hold holes; the box's own frame is
 * background outside the bounding box (a 4-connected ring, connected to the image frame) or lies on
 * the image frame, and a background path from inside the box to the image frame first reaches the
 * box's frame, so flooding the box from its frame finds exactly the background the whole image's
 * flood finds there (tested against a plain whole-image flood fill). The specimen and core masks fill
 * a third to a half of the working copy, the rest was flooded for nothing.
 */
export function fillHoles(mask: Mask): void {
  const { width: W, height: H, data } = mask;
  const b = setBox(data, W, H);
  if (!b) return; // no set pixel: all background reaches the frame
  const x0 = Math.max(0, b.x0 - 1);
  const y0 = Math.max(0, b.y0 - 1);
  const x1 = Math.min(W - 1, b.x1 + 1);
  const y1 = Math.min(H - 1, b.y1 + 1);
  const w = x1 - x0 + 1;
  const h = y1 - y0 + 1;
  if (w === W && h === H) {
    fillHolesWhole(data, W, H);
    return;
  }
  const sub = cropRect(data, W, x0, y0, w, h, new Uint8Array(w * h));
  fillHolesWhole(sub, w, h);
  pasteRect(sub, w, h, data, W, x0, y0);
}

/** The scan-line flood fill of {@link fillHoles} on a whole W × H array. */
function fillHolesWhole(data: Uint8Array, W: number, H: number): void {
  const seen = new Uint8Array(W * H);
  let stack = new Int32Array(1 << 14);
  let sp = 0;
  const push = (i: number): void => {
    if (sp === stack.length) {
      const grown = new Int32Array(stack.length * 2);
      grown.set(stack);
      stack = grown;
    }
    stack[sp++] = i;
  };
  for (let x = 0; x < W; x++) {
    push(x);
    push((H - 1) * W + x);
  }
  for (let y = 0; y < H; y++) {
    push(y * W);
    push(y * W + W - 1);
  }
  while (sp > 0) {
    const i = stack[--sp];
    if (data[i] || seen[i]) continue;
    const y = (i / W) | 0;
    const row = y * W;
    let l = i;
    while (l > row && !data[l - 1] && !seen[l - 1]) l--;
    let r = i;
    while (r < row + W - 1 && !data[r + 1] && !seen[r + 1]) r++;
    for (let k = l; k <= r; k++) seen[k] = 1;
    // one seed per run of open background in the rows above and below
    for (let nr = y - 1; nr <= y + 1; nr += 2) {
      if (nr < 0 || nr >= H) continue;
      const off = (nr - y) * W;
      let inRun = false;
      for (let k = l; k <= r; k++) {
        const j = k + off;
        const open = !data[j] && !seen[j];
        if (open && !inRun) push(j);
        inRun = open;
      }
    }
  }
  fillUnseen(data, seen);
}

/** data[i] = 1 where neither set nor reached. */
function fillUnseen(data: Uint8Array, seen: Uint8Array): void {
  for (let i = 0; i < data.length; i++) if (!data[i] && !seen[i]) data[i] = 1;
}

/** Outer contour (largest external contour, every boundary pixel) of a mask, px. */
export function outerContour(mask: Mask): PointPx[] {
  const cv = getCv();
  const m = maskToMat(mask);
  const contours = new cv.MatVector();
  const hier = new cv.Mat();
  try {
    cv.findContours(m, contours, hier, cv.RETR_EXTERNAL, cv.CHAIN_APPROX_NONE);
    let best = -1;
    let bestA = -1;
    for (let i = 0; i < contours.size(); i++) {
      const c = contours.get(i);
      const a = c.rows;
      if (a > bestA) {
        bestA = a;
        best = i;
      }
      c.delete();
    }
    if (best < 0) return [];
    const c = contours.get(best);
    const d = c.data32S as Int32Array;
    const pts: PointPx[] = [];
    for (let i = 0; i < c.rows; i++) pts.push({ x: d[2 * i], y: d[2 * i + 1] });
    c.delete();
    return pts;
  } finally {
    m.delete();
    contours.delete();
    hier.delete();
  }
}

/** Otsu threshold of values (Otsu, IEEE Trans. SMC 9 (1979) 62) on a 256-bin histogram over [lo, hi]. */
export function otsuThreshold(values: ArrayLike<number>, lo: number, hi: number, bins = 256): number {
  const h = new Float64Array(bins);
  const span = hi - lo || 1;
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    let b = Math.floor(((v - lo) / span) * bins);
    b = b < 0 ? 0 : b >= bins ? bins - 1 : b;
    h[b]++;
    n++;
  }
  let sumAll = 0;
  for (let b = 0; b < bins; b++) sumAll += b * h[b];
  let w0 = 0;
  let s0 = 0;
  let best = 0;
  let bestT = bins / 2;
  for (let b = 0; b < bins - 1; b++) {
    w0 += h[b];
    s0 += b * h[b];
    const w1 = n - w0;
    if (w0 === 0 || w1 === 0) continue;
    const m0 = s0 / w0;
    const m1 = (sumAll - s0) / w1;
    const between = w0 * w1 * (m0 - m1) * (m0 - m1);
    if (between > best) {
      best = between;
      bestT = b + 1;
    }
  }
  return lo + (bestT / bins) * span;
}
