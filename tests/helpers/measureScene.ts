/**
 * Measuring a rendered scene of the set (src/core/render/scenes.ts) or a fixture image in tests:
 * the automatic pipeline with the true pixel size and a short bootstrap (the median's interval is
 * not what these tests look at).
 */
import { encodeRender, findScene, renderFractograph, type RenderOptions } from '../../src/core/render/index.js';
import { analyseImage, defaultParams, type MeasureResult } from '../../src/core/pipeline/index.js';

/** The result of the automatic measurement of `bytes` with the given pixel size (µm). */
export async function measureBytes(bytes: Uint8Array, file: string, umPerPx: number): Promise<MeasureResult> {
  const p = defaultParams();
  p.scale.pixelSizeUm = umPerPx;
  p.bootstrap = 200;
  return (await analyseImage(bytes, { file, sha256: 'test' }, p)).result;
}

/** A named scene rendered (its options changed by `edit`, when given), encoded as the set does, and measured. */
export async function measureScene(name: string, edit?: (o: RenderOptions) => RenderOptions): Promise<{ r: MeasureResult; truthUm: number }> {
  const c = findScene(name)!;
  const out = renderFractograph(edit ? edit(c.options) : c.options);
  const bytes = encodeRender(out, { format: c.format, bitDepth: c.bitDepth ?? 8, jpegQuality: c.jpegQuality ?? 92 });
  return { r: await measureBytes(bytes, `${name}.${c.format}`, out.truth.umPerPxX), truthUm: out.truth.band.meanWidthUm! };
}
