/**
 * Overlay thumbnails for the HTML report: the overlay PNG downscaled to at most 320 px wide by box
 * (area) averaging, re-encoded as an 8-bit RGB PNG. Made in the worker (in parallel) and stored as
 * OUT/thumbs/<safe>.png; the report embeds it as a data: URI.
 */
import { decode } from 'fast-png';
import { encodePng } from '../../core/encode/index.js';
import { nodeDeflate } from '../nodeZlib.js';

export const THUMB_WIDTH = 320;

/**
 * Box-filter downscale of interleaved 8/16-bit pixels to an RGB PNG at most `maxWidth` wide.
 * @param w, h size in px; `ch` channels (1 gray, 2 gray+alpha, 3 RGB, 4 RGBA; alpha ignored)
 * @param maxV the value of full intensity (255 for 8 bit, 65535 for 16 bit)
 */
export function thumbnailFromPixels(w: number, h: number, data: ArrayLike<number>, ch: number, maxV = 255, maxWidth = THUMB_WIDTH): Uint8Array {
  const scale = Math.min(1, maxWidth / w);
  const tw = Math.max(1, Math.round(w * scale));
  const th = Math.max(1, Math.round(h * scale));
  const out = new Uint8Array(tw * th * 3);
  for (let ty = 0; ty < th; ty++) {
    const y0 = Math.floor((ty * h) / th);
    const y1 = Math.max(y0 + 1, Math.floor(((ty + 1) * h) / th));
    for (let tx = 0; tx < tw; tx++) {
      const x0 = Math.floor((tx * w) / tw);
      const x1 = Math.max(x0 + 1, Math.floor(((tx + 1) * w) / tw));
      let r = 0;
      let g = 0;
      let b = 0;
      let n = 0;
      for (let y = y0; y < y1; y++) {
        for (let x = x0; x < x1; x++) {
          const o = (y * w + x) * ch;
          if (ch >= 3) {
            r += data[o];
            g += data[o + 1];
            b += data[o + 2];
          } else {
            r += data[o];
            g += data[o];
            b += data[o];
          }
          n++;
        }
      }
      const k = 255 / (maxV * n);
      const q = (ty * tw + tx) * 3;
      out[q] = Math.round(r * k);
      out[q + 1] = Math.round(g * k);
      out[q + 2] = Math.round(b * k);
    }
  }
  // Node's zlib (level 1): fflate in a fresh worker ran interpreted, ≈ 0.1 s per thumbnail
  return encodePng({ width: tw, height: th, data: out, layout: 'rgb8' }, { deflate: nodeDeflate });
}

/**
 * @param png overlay PNG bytes (gray, gray+alpha, RGB or RGBA; 8 or 16 bit; palette)
 * @param maxWidth thumbnail width in px (default 320)
 * @returns the thumbnail PNG, or null when the PNG cannot be read
 */
export function thumbnailPng(png: Uint8Array, maxWidth = THUMB_WIDTH): Uint8Array | null {
  let img;
  try {
    img = decode(png);
  } catch {
    return null;
  }
  const { width: w, height: h } = img;
  if (img.palette) {
    const pal = img.palette;
    const idx = img.data;
    const rgb = new Uint8Array(w * h * 3);
    for (let i = 0; i < w * h; i++) {
      const p = pal[idx[i]] ?? [0, 0, 0];
      rgb[i * 3] = p[0];
      rgb[i * 3 + 1] = p[1];
      rgb[i * 3 + 2] = p[2];
    }
    return thumbnailFromPixels(w, h, rgb, 3, 255, maxWidth);
  }
  if (img.depth < 8) return null; // 1/2/4-bit gray overlays are not produced by fractozone
  return thumbnailFromPixels(w, h, img.data as ArrayLike<number>, img.channels, img.depth === 16 ? 65535 : 255, maxWidth);
}

/** `data:image/png;base64,…` of a PNG. */
export function pngDataUri(png: Uint8Array): string {
  return `data:image/png;base64,${Buffer.from(png).toString('base64')}`;
}
