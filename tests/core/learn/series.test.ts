/**
 * Teach by example on rendered series (our renderer, src/core/render): a few thin label arcs
 * (≤ 1 % of the pixels, drawn from the truth of the first image, src/core/learn/strokes.ts) teach a
 * model; the other images of the series — other seeds, other band widths — are measured with it
 * and each must lie within 3 % of its truth (the truth mean over the whole circumference; bound
 * from the issue) without a flag — or, on the notch-flank family, within 3 % with the
 * LOW_MODEL_CONFIDENCE flag allowed (see SERIES).
 * The series are of scene families where the fixed rules are weakest: a tinted band of the same mean
 * brightness as the core, a notch flank with a holder, a shadow and a tinted band (the fixed
 * rules give 3–4 × the width there), and the SEM look. Test images kept small (1000 × 760 px).
 */
import { describe, expect, it } from 'vitest';
import { decodeImage } from '../../../src/core/decode/index.js';
import { encodeGrayRaster } from '../../../src/core/encode/index.js';
import { serialiseModel } from '../../../src/core/learn/model.js';
import { loadModel } from '../../../src/core/learn/predict.js';
import { strokeLabels } from '../../../src/core/learn/strokes.js';
import { teachModel } from '../../../src/core/learn/train.js';
import { analyseDecoded, defaultParams } from '../../../src/core/pipeline/index.js';
import { renderFractograph, type RenderOptions, type RenderTruth } from '../../../src/core/render/index.js';
import { findScene } from '../../../src/core/render/scenes.js';

/** Image k of a series: the scene with seed 100·seed + k and a band of 340 + 40·k µm. */
function member(scene: string, k: number): { truth: RenderTruth; decoded: ReturnType<typeof decodeImage> } {
  const base = findScene(scene)?.options as RenderOptions;
  const o: RenderOptions = { ...base, seed: (base.seed ?? 1) * 100 + k, rim: { ...(base.rim as object), widthUm: 340 + 40 * k } };
  const r = renderFractograph(o);
  return { truth: r.truth, decoded: decodeImage(encodeGrayRaster(r.raster, { format: 'png', bitDepth: 8 })) };
}

function labelsOf(t: RenderTruth): ReturnType<typeof strokeLabels> {
  return strokeLabels({ width: t.widthPx, height: t.heightPx, center: t.centre, outerRadiusPx: t.outerRadiusPxByAngle, boundaryRadiusPx: t.boundaryRadiusPxByAngle });
}

/**
 * The series and what each image of it must give: within 3 % of the truth without a flag
 * ('accurate'); or within 3 %, LOW_MODEL_CONFIDENCE allowed, where the width is right but the
 * model's own probabilities beside a flank stay unsure ('within').
 */
type Bound = 'accurate' | 'within';
const SERIES: [string, Bound][] = [
  ['tint-blue', 'accurate'],
  // notch flank: images 1/2 −0.6 / −0.8 % but both flagged (outer-edge confidence 0.69–0.70: P(outside)
  // ≈ ½ just outside the flank's root; DEVELOPERS.md "Pixel classifier"), so 'within', not 'accurate'
  ['flank-holder-tint', 'within'],
  // U flank: images 1/2 −2.8 / −2.5 % with the edge search's sure notch root kept over the model's
  // ellipse (learn/edgeCandidates.ts `sureEdge`); still flagged by the outer edge (0.71), so 'within'
  ['flank-holder-tint-b', 'within'],
  // SEM look: images 1/2 +1.0 / +0.7 %, boundary confidence 0.78 / 0.79 (DEVELOPERS.md "Pixel classifier")
  ['sem', 'accurate'],
];

describe.each(SERIES)('a model taught on one image of the %s series', (scene, bound) => {
  const first = member(scene, 0);
  const labels = labelsOf(first.truth);
  const teach = (): ReturnType<typeof teachModel>['model'] =>
    teachModel([{ decoded: first.decoded, labels, scale: { pixelSizeUm: first.truth.umPerPxX }, file: `${scene}-0.png`, sha256: 'a'.repeat(64), labelsSha256: 'b'.repeat(64) }]).model;
  const model = teach();

  it('is taught from thin arcs covering at most 1 % of the pixels, all three classes', () => {
    let n = 0;
    const per = [0, 0, 0, 0];
    for (const v of labels.data) {
      if (v) n++;
      per[v]++;
    }
    expect(n / labels.data.length).toBeLessThanOrEqual(0.01);
    expect(Math.min(per[1], per[2], per[3])).toBeGreaterThan(500);
    expect(model.training.oobAccuracy).toBeGreaterThan(0.95);
  });

  it('gives the same bytes when taught again from the same labels and seed', () => {
    expect(serialiseModel(teach())).toBe(serialiseModel(model));
  });

  it.each([1, 2, 3, 4, 5])('measures image %i of the series within 3 % of its truth', (k) => {
    const img = member(scene, k);
    const loaded = loadModel(model, 'c'.repeat(64));
    const p = defaultParams();
    p.scale.pixelSizeUm = img.truth.umPerPxX;
    p.bootstrap = 0;
    p.modelSha256 = loaded.sha256;
    const { result } = analyseDecoded(img.decoded, { file: `${scene}-${k}.png`, sha256: 'd'.repeat(64) }, p, undefined, { model: loaded });
    const truth = img.truth.band.meanWidthUm as number;
    const mean = result.band.widthUm?.mean ?? NaN;
    const flagged = result.warnings.some((w) => w.code === 'LOW_MODEL_CONFIDENCE');
    expect(Math.abs(mean / truth - 1)).toBeLessThanOrEqual(0.03);
    if (bound === 'accurate') expect(flagged).toBe(false);
    expect(result.model?.sha256).toBe(loaded.sha256);
    expect(result.params.modelSha256).toBe(loaded.sha256);
  });
});
