/**
 * Strip planning for the OpenCV-based box features. A 12-megapixel Float32 raster is 48 MB; the
 * OpenCV (WebAssembly) heap is shared with every other stage, so the box features work on
 * horizontal strips of at most {@link STRIP_PIXELS} pixels plus a halo of rows above and below.
 * Output rows are taken only from the strip core, where the filter never reaches the strip edge,
 * so the result is identical to filtering the whole image at once (image edges still use the
 * filter's own border rule, because the first/last strip starts/ends at the image edge).
 */

/** Largest number of pixels (core + halo) handed to OpenCV in one piece. */
export const STRIP_PIXELS = 1 << 22;

/** Rows [y0, y1) are kept; rows [h0, h1) (core plus halo) are filtered. */
export interface Strip {
  readonly y0: number;
  readonly y1: number;
  readonly h0: number;
  readonly h1: number;
}

/** Splits `height` rows into strips whose halo covers `halo` rows on each side of the core. */
export function planStrips(width: number, height: number, halo: number, maxPixels = STRIP_PIXELS): Strip[] {
  const core = Math.max(64, 2 * halo + 1, Math.floor(maxPixels / width) - 2 * halo);
  const strips: Strip[] = [];
  for (let y0 = 0; y0 < height; y0 += core) {
    const y1 = Math.min(height, y0 + core);
    strips.push({ y0, y1, h0: Math.max(0, y0 - halo), h1: Math.min(height, y1 + halo) });
  }
  return strips;
}
