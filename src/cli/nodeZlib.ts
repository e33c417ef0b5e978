/**
 * Node's zlib for core (see src/core/zlib.ts): PNG image data inflated natively in every Node
 * process of the CLI (commands and batch workers), and the fast deflate of the overlay PNGs.
 */
import * as zlib from 'node:zlib';
import { crc32 as jsCrc32 } from '../core/encode/png.js';
import { setZlib } from '../core/zlib.js';

/** A plain Uint8Array over a Buffer's bytes (one array class in core's hot loops). */
const plain = (b: Buffer): Uint8Array => new Uint8Array(b.buffer, b.byteOffset, b.byteLength);

/** Hands Node's zlib to core once per process. */
export function installNodeZlib(): void {
  setZlib({
    // one output chunk of the expected size: no chunk list and no concatenated copy
    inflate: (data, maxLength) => plain(zlib.inflateSync(data, { maxOutputLength: Math.max(1, maxLength), chunkSize: Math.max(64, Math.min(maxLength + 1, 1 << 30)) })),
    // zlib.crc32 is in Node ≥ 20.15; before, core's own table-driven CRC
    crc32: typeof zlib.crc32 === 'function' ? (data) => zlib.crc32(data) : (data) => jsCrc32(data),
  });
}

/**
 * Overlay PNGs and batch thumbnails: zlib level 1 (fastest), 1-MB output chunks. Measured on the
 * 1600 × 1200 px RGBA overlay of a 12-MP measure (2026-12-02, best of 5 under a load average of 4–8):
 * fast-png (fflate level 3) 400 ms, 1.71 MB; level 1 80–120 ms, 1.89 MB (1-MB chunks ≈ 25 % less than
 * the 16-KB default); the PNG filters Up or Sub, or the RLE / Huffman-only strategies, were no faster.
 */
export function nodeDeflate(raw: Uint8Array): Uint8Array {
  return plain(zlib.deflateSync(raw, { level: 1, chunkSize: 1 << 20 }));
}
