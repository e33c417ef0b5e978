/**
 * Automatic scale-bar detection.
 *
 * A scale bar is a long, thin, uniform, high-contrast, axis-aligned rectangle, usually in a margin or
 * corner, often on a plate and with a text label. Detection runs in two stages:
 *
 * 1. **Search at reduced resolution.** The image is reduced by an integer factor f (so that about
 *    `workPixels` remain) with *max* pooling (keeps thin light bars at full contrast) and *min* pooling
 *    (keeps thin dark bars). Each pooled image is binarised by local contrast (pixel minus its box mean
 *    over a window ≥ 4× the largest bar thickness, against a threshold tied to the image's 1–99 %
 *    intensity range), and connected components (OpenCV `connectedComponentsWithStats`) that are long,
 *    thin and of near-constant thickness along their length become candidates.
 * 2. **Refinement at full resolution**, only around each candidate: the across-bar profile (per-row
 *    median over many columns, which ignores label text) gives the two long edges by their 50 % crossings,
 *    hence thickness and midline; per-column edge positions give straightness; interior and surrounding
 *    strips give uniformity and contrast on both sides; the along-bar profile on the midline rows gives
 *    each end as the 50 % crossing between the bar level and the surrounding level (linear interpolation
 *    between pixel centres), hence `lengthPx` edge to edge.
 *
 * End caps / ticks (|———|): the caps are part of the bar on its midline, so the measured length runs
 * between the *outer* edges of the caps — the usual convention for capped bars. Caps do not disturb
 * thickness or straightness because those use the central 60 % of the length only (ends excluded).
 *
 * Rejected: features whose end reaches the image frame (the length cannot be measured), features with
 * contrast on one side only (a specimen edge, the border of a data strip), ragged edges or non-uniform
 * interior (ridges, cracks, texture). A confidence in 0..1 is the product of contrast, two-sidedness,
 * straightness, uniformity, surroundings, end sharpness, position and label factors (the table
 * `CONFIDENCE_FACTORS` in scaleBarRefine.ts); below `minConfidence` (default
 * {@link DEFAULT_MIN_CONFIDENCE}) the detector returns `null` — it never guesses.
 *
 * Files: this one (options, the search loop), scaleBarSearch.ts (pooling, binarisation,
 * candidates), scaleBarRefine.ts (full-resolution edges, ends, confidence), scaleBarMarks.ts
 * (label and plate).
 *
 * The 50 % crossing is the standard edge locator for a blurred step (the half-maximum point of the edge
 * spread function); see e.g. ISO 12233 (edge-based resolution measurement) for edge profiles, and
 * Gonzalez & Woods, *Digital Image Processing*, ch. 10 (thresholding, edges).
 */
import { FractozoneError } from '../errors.js';
import type { BoxPx } from '../image/geometry.js';
import type { GrayRaster } from '../image/raster.js';
import { refineCandidate } from './scaleBarRefine.js';
import { binariseAndLabel, candidates, pool, ranges, type Ctx } from './scaleBarSearch.js';


/** A detected scale bar. Coordinates are image coordinates (pixel centres at integer x, y). */
export interface ScaleBar {
  /** Midline end points, px: the centres of the first and last bar pixels (sub-pixel). */
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  /** Edge-to-edge length along the bar, px (= x1 − x0 + 1 for a horizontal bar). */
  lengthPx: number;
  /** Edge-to-edge thickness across the bar, px. */
  thicknessPx: number;
  orientation: 'horizontal' | 'vertical';
  /** 'light' = bar brighter than its surroundings. */
  polarity: 'light' | 'dark';
  /** 0..1; bars below the detector's threshold are not returned. */
  confidence: number;
  /** Contrasting plate behind bar and label, when one is found. */
  plate?: BoxPx;
  /** Union box of text-like marks next to the bar, when found. */
  labelBox?: BoxPx;
}

/** Options of {@link detectScaleBar}. */
export interface ScaleBarOptions {
  /** Confidence below which `null` is returned (default 0.5). */
  minConfidence?: number;
  /** Thinnest bar searched, px (default 2). */
  minThicknessPx?: number;
  /** Thickest bar searched, px (default 40). */
  maxThicknessPx?: number;
  /** Shortest bar as a fraction of the image extent along the bar (default 0.03). */
  minLengthFraction?: number;
  /** Pixel budget of the reduced search image (default 1.2e6). */
  workPixels?: number;
}

/** Default confidence threshold: candidates scoring below it are not reported. */
export const DEFAULT_MIN_CONFIDENCE = 0.5;


/**
 * Find the scale bar burned into an image, or return `null` when there is none (never a guess).
 * @param raster gray image, values 0..1.
 * @param options search limits; thickness and length in px of the full-resolution image.
 * @returns the best bar with confidence ≥ `minConfidence`, else `null`.
 * @throws FractozoneError BAD_PARAMETER for inconsistent options.
 */
export function detectScaleBar(raster: GrayRaster, options: ScaleBarOptions = {}): ScaleBar | null {
  const minConfidence = options.minConfidence ?? DEFAULT_MIN_CONFIDENCE;
  const minT = options.minThicknessPx ?? 2;
  const maxT = options.maxThicknessPx ?? 40;
  const minLenFrac = options.minLengthFraction ?? 0.03;
  const workPixels = options.workPixels ?? 1.2e6;
  if (!(minT > 0) || !(maxT >= minT) || !(minLenFrac > 0 && minLenFrac < 1) || !(workPixels >= 1e4) || !(minConfidence >= 0 && minConfidence <= 1)) {
    throw new FractozoneError('BAD_PARAMETER', 'scale-bar search options are inconsistent (need 0 < min thickness ≤ max thickness, 0 < length fraction < 1)');
  }
  const { width: W, height: H } = raster;
  if (W < 24 || H < 24) return null;

  const f = Math.max(1, Math.ceil(Math.sqrt((W * H) / workPixels)));
  const { maxImg, minImg, w, h } = pool(raster, f, Math.max(1, Math.min(f, Math.floor(minT))));
  // threshold tied to the 1–99 % range; a plain image holding only a bar has a tiny range, so the
  // absolute floor (0.05) then applies; nothing to find when the extremes are that close
  const { range, spread } = ranges(maxImg, minImg);
  if (spread < 0.05) return null;
  const delta = Math.max(0.05, 0.3 * range);
  const maxTW = Math.ceil(maxT / f);
  let win = 2 * maxTW + 1;
  win = Math.max(15, win | 1);

  const ctx: Ctx = { raster, f, w, h, minT, maxT, minLenFrac, maxTW };
  let best: ScaleBar | null = null;
  for (const polarity of ['light', 'dark'] as const) {
    const img = polarity === 'light' ? maxImg : minImg;
    const { labels, stats, n } = binariseAndLabel(img, w, h, win, delta, polarity);
    const cands = candidates(ctx, labels, stats, n);
    for (const c of cands) {
      const bar = refineCandidate(ctx, c, polarity, labels, stats, n);
      if (bar && (!best || bar.confidence > best.confidence)) best = bar;
    }
  }
  return best && best.confidence >= minConfidence ? best : null;
}
