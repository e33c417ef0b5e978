import type { RgbaImage } from '../draw/index.js';
import { encodePng } from '../encode/index.js';

/**
 * Encode an overlay picture as an 8-bit RGBA PNG.
 * @param deflate - a zlib compressor from the shell (the CLI: Node's zlib at level 1); without it fast-png's
 */
export function encodeOverlayPng(img: RgbaImage, deflate?: (raw: Uint8Array) => Uint8Array): Uint8Array {
  return encodePng({ width: img.width, height: img.height, data: img.data, layout: 'rgba8' }, { deflate });
}
