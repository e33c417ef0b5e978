/** Quantising a 0..1 gray raster to integer samples for the encoders. */
import type { GrayRaster } from '../image/raster.js';

/**
 * Quantise to 16 bits: round(v · 65535), clamped (round half up).
 * @returns one Uint16 sample per pixel
 */
export function toUint16(r: GrayRaster): Uint16Array {
  const out = new Uint16Array(r.data.length);
  const d = r.data;
  for (let i = 0; i < d.length; i++) {
    const v = d[i] * 65535 + 0.5;
    out[i] = v <= 0 ? 0 : v >= 65535 ? 65535 : v | 0;
  }
  return out;
}
