/**
 * An image made ready once (learn/prepared.ts: working copy, centre, feature tables, the class-map
 * grid's features — what the app's engine keeps between strokes) gives the same model bytes and the
 * same class probabilities as teaching and predicting from scratch.
 */
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/decode/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { serialiseModel } from '../../../src/core/learn/model.js';
import { loadModel, predictProbabilities } from '../../../src/core/learn/predict.js';
import { prepareImage } from '../../../src/core/learn/prepared.js';
import { strokeLabels } from '../../../src/core/learn/strokes.js';
import { teachModel } from '../../../src/core/learn/train.js';
import { renderFractograph } from '../../../src/core/render/index.js';

describe('a prepared image', () => {
  const umPerPx = 14;
  const r = renderFractograph({ seed: 3, widthPx: 640, heightPx: 480, umPerPx });
  const decoded = decodeImage(encodeGrayRaster(r.raster, { format: 'png', bitDepth: 8 }));
  const t = r.truth;
  const labels = strokeLabels({ width: t.widthPx, height: t.heightPx, center: t.centre, outerRadiusPx: t.outerRadiusPxByAngle, boundaryRadiusPx: t.boundaryRadiusPxByAngle });
  const input = { decoded, labels, scale: { pixelSizeUm: umPerPx }, file: 'a.png', sha256: 'a'.repeat(64), labelsSha256: 'b'.repeat(64) };
  const ready = prepareImage(decoded, { pixelSizeUm: umPerPx });
  const plain = teachModel([input]).model;

  it('teaches the same model bytes, also when taught twice from it', () => {
    expect(serialiseModel(teachModel([{ ...input, prepared: ready }]).model)).toBe(serialiseModel(plain));
    expect(serialiseModel(teachModel([{ ...input, prepared: ready }]).model)).toBe(serialiseModel(plain));
  });

  it('gives the same class probabilities from the grid features computed once', () => {
    const loaded = loadModel(plain);
    const maxGrid = 20_000;
    const grid = ready.grid(plain.windowsUm, maxGrid);
    expect(ready.grid(plain.windowsUm, maxGrid)).toBe(grid); // kept, not made again
    const a = predictProbabilities(ready.frame.work, ready.umPerWorkPx, loaded, ready.centre, maxGrid);
    const b = predictProbabilities(ready.frame.work, ready.umPerWorkPx, loaded, ready.centre, maxGrid, grid);
    expect(b.stride).toBeGreaterThan(1);
    expect(b.evaluated).toBe(a.evaluated);
    expect(Buffer.from(b.outside.buffer).equals(Buffer.from(a.outside.buffer))).toBe(true);
    expect(Buffer.from(b.core.buffer).equals(Buffer.from(a.core.buffer))).toBe(true);
    // a grid made for another grid size is refused
    expect(() => predictProbabilities(ready.frame.work, ready.umPerWorkPx, loaded, ready.centre, maxGrid * 4, grid)).toThrow(/another image, grid or feature set/);
  });
});
