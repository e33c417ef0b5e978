/**
 * Overlay thumbnails for the HTML report: the overlay PNG downscaled to at most 320 px wide by box
 * (area) averaging, re-encoded as an 8-bit RGB PNG, returned as a data: URI.
 */
import { decode, encode } from 'fast-png';

export const THUMB_WIDTH = 320;

/**
 * @param png overlay PNG bytes (gray, gray+alpha, RGB or RGBA; 8 or 16 bit; palette)
 * @param maxWidth thumbnail width in px (default 320)
 * @returns `data:image/png;base64,…`, or null when the PNG cannot be read
 */
export function thumbnailDataUri(png: Uint8Array, maxWidth = THUMB_WIDTH): string | null {
  let img;
  try {
    img = decode(png);
  } catch {
    return null;
  }
  const { width: w, height: h } = img;
  let ch = img.channels;
  let data = img.data as ArrayLike<number>;
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
    data = rgb;
    ch = 3;
  }
  const maxV = img.depth === 16 && !img.palette ? 65535 : img.depth < 8 && !img.palette ? 2 ** img.depth - 1 : 255;
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
  const bytes = encode({ width: tw, height: th, data: out, channels: 3, depth: 8 });
  return `data:image/png;base64,${Buffer.from(bytes).toString('base64')}`;
}
