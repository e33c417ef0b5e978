/**
 * Marks burned into the finished image (opaque, neutral in colour): the SEM data strip with its text,
 * and the scale bar with its label and plate.
 */
import { rectCoverage, textCoverage } from '../draw/coverage.js';
import { measureText } from '../draw/font.js';
import { paintGray } from '../draw/paint.js';
import { createRaster } from '../image/raster.js';
import type { SceneLayout } from './layout.js';
import type { ResolvedRenderOptions } from './options.js';
import { burnScaleBar } from './scalebar.js';

/** Strip background and text levels (0..1). */
const STRIP_LEVEL = 0.03;
const STRIP_TEXT = 0.93;

/** Burn the SEM data strip (when present) and the scale bar into every plane. */
export function burnMarks(planes: readonly Float32Array[], W: number, H: number, o: ResolvedRenderOptions, layout: SceneLayout): void {
  const rasters = planes.map((p) => createRaster(W, H, p));
  const s = layout.strip;
  if (s && o.sem) {
    const h = s.y1 - s.y0 + 1;
    const scale = Math.max(1, Math.round(h / 28));
    const text = o.sem.stripText;
    const ty = s.y0 + Math.max(0, Math.floor((h - measureText(text, scale).height) / 2));
    const tx = Math.max(2, Math.round(W * 0.02));
    for (const r of rasters) {
      paintGray(r, rectCoverage(W, H, s.x0, s.y0, s.x1, s.y1), { gray: STRIP_LEVEL });
      // a thin light line separates the image area from the strip, as on many instruments
      paintGray(r, rectCoverage(W, H, s.x0, s.y0, s.x1, s.y0), { gray: 0.5 });
      if (text !== '') paintGray(r, textCoverage(W, H, text, tx, ty, scale), { gray: STRIP_TEXT });
    }
  }
  if (layout.bar) for (const r of rasters) burnScaleBar(r, layout.bar.truth, layout.bar.labelScale);
}
