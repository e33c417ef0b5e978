/**
 * Pixel assembly: strips or tiles (TIFF 6.0 sections 3 and 15) decoded one at a time into an
 * interleaved buffer of whole image rows, multi-byte samples in little-endian order whatever the
 * file's byte order; the differencing predictors undone per row — horizontal (predictor 2, TIFF
 * 6.0 section 14) and floating point (predictor 3, Adobe TIFF Technical Note 3, 2005: byte
 * differencing, then the byte planes of each row put back together, most significant plane
 * first); separate planes (planar configuration 2) interleaved at the end.
 */
import { fail } from '../fail.js';
import { decodeChunk } from './codecs.js';
import { chunkRowBytes, type TiffLayout } from './layout.js';

/** Byte order to little-endian, for 16/32/64-bit samples. */
function toLittleEndian(buf: Uint8Array, n: number, bytesPerSample: number): void {
  for (let i = 0; i + bytesPerSample <= n; i += bytesPerSample) {
    for (let a = i, z = i + bytesPerSample - 1; a < z; a++, z--) {
      const t = buf[a];
      buf[a] = buf[z];
      buf[z] = t;
    }
  }
}

/** Predictor 2 on one row (8 or 16 bits, little-endian). */
function undoHorizontal(row: Uint8Array, samples: number, bitDepth: number): void {
  if (bitDepth === 8) {
    for (let j = samples; j < row.length; j++) row[j] = (row[j] + row[j - samples]) & 255;
    return;
  }
  const step = samples * 2;
  for (let j = step; j + 1 < row.length; j += 2) {
    const v = (row[j] | (row[j + 1] << 8)) + (row[j - step] | (row[j - step + 1] << 8));
    row[j] = v & 255;
    row[j + 1] = (v >> 8) & 255;
  }
}

/** Predictor 3 on one row: bytes accumulated with stride `samples`, then planes → little-endian samples. */
function undoFloatingPoint(row: Uint8Array, samples: number, bytesPerSample: number, tmp: Uint8Array): void {
  for (let j = samples; j < row.length; j++) row[j] = (row[j] + row[j - samples]) & 255;
  tmp.set(row);
  const words = row.length / bytesPerSample;
  for (let k = 0; k < words; k++) {
    for (let b = 0; b < bytesPerSample; b++) row[k * bytesPerSample + b] = tmp[(bytesPerSample - b - 1) * words + k];
  }
}

function postProcess(chunk: Uint8Array, rows: number, rowBytes: number, samples: number, L: TiffLayout): void {
  const bytesPerSample = L.bitDepth / 8;
  if (L.predictor === 3) {
    const tmp = new Uint8Array(rowBytes);
    for (let y = 0; y < rows; y++) undoFloatingPoint(chunk.subarray(y * rowBytes, (y + 1) * rowBytes), samples, bytesPerSample, tmp);
    return; // the planes are in significance order: the result is little-endian already
  }
  if (bytesPerSample > 1 && !L.le) toLittleEndian(chunk, rows * rowBytes, bytesPerSample);
  if (L.predictor === 2) for (let y = 0; y < rows; y++) undoHorizontal(chunk.subarray(y * rowBytes, (y + 1) * rowBytes), samples, L.bitDepth);
}

/** One plane (or all samples, interleaved) as whole rows. */
function assemblePlane(bytes: Uint8Array, L: TiffLayout, plane: number, samples: number): Uint8Array {
  const rowBytes = Math.ceil((L.width * samples * L.bitDepth) / 8);
  const out = new Uint8Array(rowBytes * L.height);
  const cRow = chunkRowBytes(L, samples);
  const chunk = new Uint8Array(cRow * L.tileH);
  const bytesPerPixel = (samples * L.bitDepth) / 8;
  const first = plane * L.across * L.down;
  for (let ty = 0; ty < L.down; ty++) {
    const rows = L.tiled ? L.tileH : Math.min(L.tileH, L.height - ty * L.tileH);
    for (let tx = 0; tx < L.across; tx++) {
      const i = first + ty * L.across + tx;
      chunk.fill(0);
      const need = rows * cRow;
      const jpeg = L.jpeg ? { ...L.jpeg, height: rows } : null;
      const got = decodeChunk(bytes, L.offsets[i], L.counts[i], L.cmpr, chunk, jpeg);
      if (got < need) fail(L.cmpr === 1 ? 'TRUNCATED_IMAGE' : 'CORRUPT_IMAGE', `a TIFF ${L.tiled ? 'tile' : 'strip'} holds less data than its size needs`);
      postProcess(chunk, rows, cRow, samples, L);
      if (!L.tiled) {
        out.set(chunk.subarray(0, need), ty * L.tileH * rowBytes);
        continue;
      }
      const x0 = tx * L.tileW;
      const copyBytes = Math.min(L.tileW, L.width - x0) * bytesPerPixel;
      const yEnd = Math.min(L.tileH, L.height - ty * L.tileH);
      for (let y = 0; y < yEnd; y++) out.set(chunk.subarray(y * cRow, y * cRow + copyBytes), (ty * L.tileH + y) * rowBytes + x0 * bytesPerPixel);
    }
  }
  return out;
}

/**
 * The first page's samples, interleaved, rows of ceil(width × spp × bits / 8) bytes.
 * @throws FractozoneError CORRUPT_IMAGE / TRUNCATED_IMAGE for damaged strips or tiles
 */
export function assemblePixels(input: Uint8Array, L: TiffLayout): Uint8Array {
  // utif2's inflate reads `src.buffer` from the given offset: hand it a buffer of its own
  const bytes = input.byteOffset === 0 && input.byteLength === input.buffer.byteLength ? input : input.slice();
  if (L.planar !== 2) return assemblePlane(bytes, L, 0, L.spp);
  const bps = L.bitDepth / 8;
  const planes = Array.from({ length: L.spp }, (_, p) => assemblePlane(bytes, L, p, 1));
  const out = new Uint8Array(L.width * L.height * L.spp * bps);
  const n = L.width * L.height;
  for (let p = 0; p < L.spp; p++) {
    const src = planes[p];
    for (let i = 0; i < n; i++) for (let b = 0; b < bps; b++) out[(i * L.spp + p) * bps + b] = src[i * bps + b];
  }
  return out;
}
