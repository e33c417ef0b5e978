/**
 * `fillHoles` (cvutil.ts) on the part of a mask that can hold holes: the bounding box of its set
 * pixels grown by 1 px (issue 16: a specimen fills about half of the working copy, and the flood
 * fill from the frame walked the empty rest too).
 */
import type { Mask } from '../image/raster.js';
import { createMask } from '../image/raster.js';
import { fillHoles, setBox } from './cvutil.js';

/**
 * Fills the holes of `mask` in place: the same result as `fillHoles(mask)`. Why: every pixel
 * outside the grown box is background joined to the image frame (straight away from the box),
 * and the box's 1-px ring inside the image is background too; so a background pixel in the box
 * reaches the frame of the whole mask exactly when it reaches the box's border in the crop (a path
 * out of the box passes its border pixels, which are then background joined to it). Where the box
 * meets the image frame, its border is the frame in both. tests/core/segment/holes.test.ts compares
 * the two on random masks.
 */
export function fillHolesInBox(mask: Mask): void {
  const { width: W, height: H, data } = mask;
  const box = setBox(data, W, H);
  if (!box) return; // no set pixel: no hole
  const x0 = Math.max(0, box.x0 - 1);
  const y0 = Math.max(0, box.y0 - 1);
  const cw = Math.min(W - 1, box.x1 + 1) - x0 + 1;
  const ch = Math.min(H - 1, box.y1 + 1) - y0 + 1;
  if (cw === W && ch === H) {
    fillHoles(mask);
    return;
  }
  const crop = createMask(cw, ch);
  for (let y = 0; y < ch; y++) crop.data.set(data.subarray((y0 + y) * W + x0, (y0 + y) * W + x0 + cw), y * cw);
  fillHoles(crop);
  for (let y = 0; y < ch; y++) data.set(crop.data.subarray(y * cw, (y + 1) * cw), (y0 + y) * W + x0);
}
