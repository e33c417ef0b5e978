/** Format detection from the first bytes (magic numbers), no decoding. */
import type { ImageFormat } from './types.js';

/**
 * Identify the image format from its signature.
 *
 * @param bytes - the file contents (only the first 8 bytes are looked at)
 * @returns 'png' (89 50 4E 47 0D 0A 1A 0A, PNG spec 2nd ed. §5.2), 'jpeg' (FF D8 FF, T.81 SOI
 *   followed by a marker), 'tiff' ("II*\0" / "MM\0*", TIFF 6.0 §2; BigTIFF "II+\0" / "MM\0+" too,
 *   so that it can be refused by name), or null for anything else
 */
export function sniffFormat(bytes: Uint8Array): ImageFormat | null {
  const b = bytes;
  if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47 && b[4] === 0x0d && b[5] === 0x0a && b[6] === 0x1a && b[7] === 0x0a) {
    return 'png';
  }
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'jpeg';
  if (b.length >= 4) {
    if (b[0] === 0x49 && b[1] === 0x49 && (b[2] === 0x2a || b[2] === 0x2b) && b[3] === 0x00) return 'tiff';
    if (b[0] === 0x4d && b[1] === 0x4d && b[2] === 0x00 && (b[3] === 0x2a || b[3] === 0x2b)) return 'tiff';
  }
  return null;
}

/** Internal: a plain name for a few common non-image signatures, for the error message. */
export function describeNonImage(bytes: Uint8Array): string {
  const head = String.fromCharCode(...bytes.subarray(0, 8));
  if (head.startsWith('PK\u0003\u0004')) return 'a ZIP archive';
  if (head.startsWith('%PDF')) return 'a PDF document';
  if (head.startsWith('GIF8')) return 'a GIF image (not supported; save as PNG or TIFF)';
  if (head.startsWith('BM')) return 'possibly a BMP image (not supported; save as PNG or TIFF)';
  if (head.startsWith('RIFF')) return 'a RIFF file (e.g. WebP, not supported)';
  let printable = 0;
  const n = Math.min(bytes.length, 512);
  for (let i = 0; i < n; i++) {
    const c = bytes[i];
    if (c === 9 || c === 10 || c === 13 || (c >= 32 && c < 127) || c >= 128) printable++;
  }
  if (n > 0 && printable === n) return 'text';
  return 'not a PNG, JPEG or TIFF file';
}
