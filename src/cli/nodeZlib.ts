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
 * Overlay PNGs: zlib level 1 (fastest). Measured on a 1600 × 1200 px RGBA overlay of a 12-MP
 * measure (2026-12-02): see nodeDeflate's use in the measure command.
 */
export function nodeDeflate(raw: Uint8Array): Uint8Array {
  return plain(zlib.deflateSync(raw, { level: 1 }));
}
