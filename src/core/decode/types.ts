/**
 * Types shared by the decoder adapters (PNG, JPEG, TIFF) and {@link decodeImage}.
 */
import type { GrayRaster } from '../image/raster.js';

/** Image container formats the engine decodes. */
export type ImageFormat = 'png' | 'jpeg' | 'tiff';

/**
 * A pixel size read from file metadata. `umPerPxX` is the pitch along image x (columns), `umPerPxY`
 * along y (rows), both in µm; they differ for non-square pixels.
 */
export interface MetadataScale {
  /** Pixel pitch along x, µm per pixel. */
  umPerPxX: number;
  /** Pixel pitch along y, µm per pixel. */
  umPerPxY: number;
  /** Which metadata field gave the figure. */
  source: 'tiff-resolution' | 'png-phys';
  /** Optional remark (e.g. "sub-micrometre pixel"). */
  note?: string;
}

/** What a header read reports, without decoding pixels. */
export interface ImageHeader {
  format: ImageFormat;
  widthPx: number;
  heightPx: number;
  /** Source bits per sample (1, 2, 4, 8, 12, 16, 32 ...). */
  bitDepth: number;
  /** Source samples per pixel incl. alpha; palette images report 3 (or 4 with a tRNS chunk). */
  channels: number;
}

/** A decoded image: the luminance raster plus what the file said about itself. */
export interface DecodedImage {
  format: ImageFormat;
  widthPx: number;
  heightPx: number;
  /** Source bits per sample (1, 2, 4, 8, 16). For palette PNGs: bits per index. */
  bitDepth: number;
  /**
   * Source samples per pixel incl. alpha: 1 gray, 2 gray+alpha, 3 RGB, 4 RGBA. Palette images are
   * expanded first and report 3 (opaque palette) or 4 (palette with a tRNS transparency chunk).
   */
  channels: number;
  /** 'gray', 'gray+alpha', 'rgb', 'rgba' or 'palette'. */
  colorType: string;
  /** Number of pages (TIFF image directories); 1 for PNG and JPEG. Only the first page is decoded. */
  pageCount: number;
  /** 'none', 'deflate', 'lzw', 'packbits' (PNG: 'deflate'), JPEG: 'baseline' or 'progressive'. */
  compression?: string;
  /** Luminance 0..1 (Float32), Rec. 709 weights on the encoded values; alpha ignored. */
  raster: GrayRaster;
  /** Pixel size from the file, or null when the file holds none or only a screen/printer default. */
  metadataScale: MetadataScale | null;
  /** Why the metadata gave no scale, or what was noticed (e.g. "72 dpi is a screen default"). */
  metadataNote?: string;
  /** 'float' for floating-point samples (TIFF); absent for unsigned integers. */
  sampleFormat?: 'float';
  /**
   * Floating-point images only: the smallest and largest stored value (luma for colour), which
   * were mapped to 0 and 1 (the file's own range; see decode/tiff/samples.ts).
   */
  floatRange?: { minValue: number; maxValue: number };
}

/** Options for {@link decodeImage}. */
export interface DecodeOptions {
  /** Largest accepted width × height, pixels. Default {@link DEFAULT_MAX_PIXELS}. */
  maxPixels?: number;
}

/** Default pixel budget: 100 megapixels (a 100 MP Float32 raster is 400 MB). */
export const DEFAULT_MAX_PIXELS = 100_000_000;
