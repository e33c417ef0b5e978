/** A document with a real full-run result (our renderer and pipeline), for the app state tests. */
import { renderFractograph } from '../../src/core/render/index.js';
import { encodeGrayRaster } from '../../src/core/encode/index.js';
import { analyseImage, defaultParams, type MeasureResult } from '../../src/core/pipeline/index.js';
import { newDoc, newSeries, type Doc, type Series } from '../../src/app/state/document.js';
import { paramsOf, requestOf } from '../../src/app/state/results.js';

let cached: MeasureResult | null = null;

/** Full run of an invented 900×700 image at a typed 8.5 µm/px (default settings, 300 bootstrap draws). */
export async function baseResult(): Promise<MeasureResult> {
  if (cached) return cached;
  const { raster } = renderFractograph({ seed: 9, widthPx: 900, heightPx: 700, umPerPx: 8.5, noiseSigma: 0.01 });
  const bytes = encodeGrayRaster(raster, { format: 'png', bitDepth: 8 });
  const p = { ...defaultParams(), bootstrap: 300, scale: { useMetadata: true, pixelSizeUm: 8.5 } };
  cached = (await analyseImage(bytes, { file: 'invented-state.png', sha256: 'ab'.repeat(32) }, p)).result;
  return cached;
}

/** Series with 300 bootstrap draws (as the base run), and a measured document whose result is current. */
export async function measured(): Promise<{ doc: Doc; series: Series }> {
  const result = await baseResult();
  const series = newSeries();
  series.settings = { ...series.settings, bootstrap: 300 };
  const doc0 = newDoc('d', { name: 'invented-state.png', sha256: 'ab'.repeat(32), widthPx: 900, heightPx: 700, format: 'png', bitDepth: 8, metadataScale: null, metadataNote: null });
  const doc1: Doc = { ...doc0, scale: { source: 'typed', umPerPx: 8.5 }, base: { id: 1, result } };
  const key = requestOf(doc1, series)?.key ?? null;
  return { doc: { ...doc1, result, resultKey: key }, series };
}

export { paramsOf };
