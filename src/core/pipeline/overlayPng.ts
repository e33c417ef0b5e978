import type { RgbaImage } from '../draw/index.js';
import { encodePng } from '../encode/index.js';

/** Encode an overlay picture as an 8-bit RGBA PNG. */
export function encodeOverlayPng(img: RgbaImage): Uint8Array {
  return encodePng({ width: img.width, height: img.height, data: img.data, layout: 'rgba8' });
}
