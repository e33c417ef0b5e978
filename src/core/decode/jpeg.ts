/**
 * JPEG adapter (ITU-T T.81 | ISO/IEC 10918-1) on top of `jpeg-js`: 8-bit baseline and progressive
 * Huffman JPEG, 1 (gray) or 3 (YCbCr/RGB) components.
 *
 * Before jpeg-js runs, the marker structure is walked (SOI … SOFn … SOS, entropy-coded data … EOI):
 * this gives width/height for the pixel budget without decoding, and detects truncation: a file
 * whose EOI marker is missing, or whose last segment runs past the end, is refused with
 * TRUNCATED_IMAGE (jpeg-js alone would return a partly gray image without saying so). jpeg-js runs
 * with `tolerantDecoding: false`, so damaged entropy data it notices becomes CORRUPT_IMAGE. A flipped
 * bit inside otherwise well-formed entropy data cannot be detected in JPEG (no checksum).
 */
import * as jpegNs from 'jpeg-js';
import { checkSize, fail, guard } from './fail.js';
import { samplesToRaster } from './luma.js';
import type { DecodedImage, ImageHeader } from './types.js';

type JpegDecodeFn = (
  data: Uint8Array,
  opts: { useTArray: true; formatAsRGBA: boolean; tolerantDecoding: boolean; maxResolutionInMP: number; maxMemoryUsageInMB: number },
) => { width: number; height: number; data: Uint8Array };

// jpeg-js is CommonJS: Node's ESM loader puts module.exports on `default`, bundlers may not.
const jpegDecode: JpegDecodeFn = ((jpegNs as unknown as { default?: { decode: JpegDecodeFn } }).default ?? (jpegNs as unknown as { decode: JpegDecodeFn })).decode;

interface JpegStructure {
  width: number;
  height: number;
  precision: number;
  components: number;
  sof: number;
}

const SOF_NAMES: Record<number, string> = {
  0xc0: 'baseline',
  0xc1: 'extended sequential',
  0xc2: 'progressive',
  0xc3: 'lossless',
  0xc5: 'differential sequential',
  0xc6: 'differential progressive',
  0xc7: 'differential lossless',
  0xc9: 'arithmetic sequential',
  0xca: 'arithmetic progressive',
  0xcb: 'arithmetic lossless',
  0xcd: 'differential arithmetic sequential',
  0xce: 'differential arithmetic progressive',
  0xcf: 'differential arithmetic lossless',
};

/**
 * Walk the markers. With `full` false stop at the first SOFn (header read); with `full` true walk to
 * EOI, skipping entropy-coded data, and refuse a file that ends before EOI.
 */
function readStructure(bytes: Uint8Array, full: boolean, maxPixels: number): JpegStructure {
  const n = bytes.length;
  let off = 2;
  let sof: JpegStructure | null = null;
  let sawScan = false;
  for (;;) {
    // find the next marker (0xFF, optional 0xFF fill bytes, a code)
    if (off >= n) break;
    if (bytes[off] !== 0xff) fail('CORRUPT_IMAGE', `the JPEG file has damaged marker structure at byte ${off}`);
    while (off < n && bytes[off] === 0xff) off++;
    if (off >= n) break;
    const code = bytes[off++];
    if (code === 0xd9) {
      if (!sof) fail('CORRUPT_IMAGE', 'the JPEG file ends (EOI) before any frame header');
      if (!sawScan) fail('CORRUPT_IMAGE', 'the JPEG file holds no image scan');
      return sof;
    }
    if (code === 0xd8 || (code >= 0xd0 && code <= 0xd7) || code === 0x01) continue; // no length
    if (off + 2 > n) break;
    const len = (bytes[off] << 8) | bytes[off + 1];
    if (len < 2) fail('CORRUPT_IMAGE', 'the JPEG file has a segment with an impossible length');
    if (off + len > n) break;
    if (code in SOF_NAMES) {
      if (len < 8) fail('CORRUPT_IMAGE', 'the JPEG frame header is too short');
      if (sof) fail('CORRUPT_IMAGE', 'the JPEG file has two frame headers');
      sof = {
        precision: bytes[off + 2],
        height: (bytes[off + 3] << 8) | bytes[off + 4],
        width: (bytes[off + 5] << 8) | bytes[off + 6],
        components: bytes[off + 7],
        sof: code,
      };
      checkSize('JPEG', sof.width, sof.height, maxPixels);
      if (!full) return sof;
    }
    off += len;
    if (code === 0xda) {
      if (!sof) fail('CORRUPT_IMAGE', 'the JPEG scan comes before its frame header');
      sawScan = true;
      // entropy-coded data: runs until a 0xFF that is not stuffing (0xFF00) nor a restart marker
      while (off < n) {
        if (bytes[off] === 0xff && off + 1 < n) {
          const c = bytes[off + 1];
          if (c === 0x00 || (c >= 0xd0 && c <= 0xd7)) {
            off += 2;
            continue;
          }
          if (c === 0xff) {
            off++;
            continue;
          }
          break;
        }
        off++;
      }
    }
  }
  if (!full && sof) return sof;
  return fail('TRUNCATED_IMAGE', 'the JPEG file is cut short (its end-of-image marker is missing)');
}

/** Internal: cheap header read (markers up to the frame header). */
export function readJpegHeader(bytes: Uint8Array): ImageHeader {
  const s = readStructure(bytes, false, Number.POSITIVE_INFINITY);
  return { format: 'jpeg', widthPx: s.width, heightPx: s.height, bitDepth: s.precision, channels: s.components };
}

/** Internal: full JPEG decode (call through decodeImage). */
export function decodeJpegImage(bytes: Uint8Array, maxPixels: number): DecodedImage {
  const s = readStructure(bytes, true, maxPixels);
  if (s.sof !== 0xc0 && s.sof !== 0xc1 && s.sof !== 0xc2) {
    fail('UNSUPPORTED_IMAGE', `${SOF_NAMES[s.sof]} JPEG is not supported (only baseline and progressive Huffman JPEG)`);
  }
  if (s.precision !== 8) fail('UNSUPPORTED_IMAGE', `${s.precision}-bit JPEG is not supported (only 8-bit)`);
  if (s.components !== 1 && s.components !== 3) {
    fail('UNSUPPORTED_IMAGE', `a JPEG with ${s.components} colour components (e.g. CMYK) is not supported; save it as RGB or gray`);
  }
  const pixels = s.width * s.height;
  const img = guard('JPEG', () =>
    jpegDecode(bytes, {
      useTArray: true,
      formatAsRGBA: false,
      tolerantDecoding: false,
      // jpeg-js's own guards, set from our budget: 16 bytes per pixel covers its coefficient
      // buffers (≈ 2 bytes per sample per component) plus the 3-byte output
      maxResolutionInMP: Math.max(1, Math.ceil(maxPixels / 1e6)),
      maxMemoryUsageInMB: Math.max(512, Math.ceil((pixels * 16) / 1048576)),
    }),
  );
  if (img.width !== s.width || img.height !== s.height || img.data.length < pixels * 3) {
    fail('CORRUPT_IMAGE', 'the JPEG decoder disagrees with the frame header');
  }
  // formatAsRGBA false → 3 bytes per pixel; a gray JPEG comes out as Y, Y, Y: take the first.
  const raster = samplesToRaster(img.data, s.width, s.height, 3, s.components === 3, 255);
  return {
    format: 'jpeg',
    widthPx: s.width,
    heightPx: s.height,
    bitDepth: 8,
    channels: s.components,
    colorType: s.components === 3 ? 'rgb' : 'gray',
    pageCount: 1,
    compression: s.sof === 0xc2 ? 'progressive' : s.sof === 0xc1 ? 'extended' : 'baseline',
    raster,
    metadataScale: null,
    metadataNote: 'JPEG files carry no pixel size the tool reads',
  };
}
