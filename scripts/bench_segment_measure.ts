/**
 * Rough timing of the segmentation / measurement stages on a 12-MP synthetic disc (invented test
 * image, see tests/helpers/discImages.ts). Run: npx tsx scripts/bench_segment_measure.ts
 */
import { loadCvNode } from '../src/cli/cvNode.js';
import { classifyRimCore, findSpecimen, refineBoundary, refineOuterEdge } from '../src/core/segment/index.js';
import { createBandMeasurer, measureFromPolygons } from '../src/core/measure/index.js';
import { downsample, localStd } from '../src/core/texture/index.js';
import { makeDiscImage } from '../tests/helpers/discImages.js';

loadCvNode();
const t = (): number => performance.now();
let t0 = t();
const img = makeDiscImage({ width: 4000, height: 3000, outerA: 1300, seed: 1 });
console.log(`synthetic 4000×3000 image: ${(t() - t0).toFixed(0)} ms`);
const W = 41;
t0 = t();
const small = downsample(img.raster, 4);
const feat = localStd(small, 11);
console.log(`features (4× downsampled localStd, for context): ${(t() - t0).toFixed(0)} ms`);
t0 = t();
const sp = findSpecimen(img.raster);
console.log(`findSpecimen: ${(t() - t0).toFixed(0)} ms (contour ${sp.contour.length} points)`);
const c = { x: sp.circle.cx, y: sp.circle.cy };
t0 = t();
const rc = classifyRimCore(sp, [feat], { windowPx: W, featureScale: img.raster.width / feat.width, center: c });
console.log(`classifyRimCore: ${(t() - t0).toFixed(0)} ms (detected ${rc.detected})`);
t0 = t();
const outer = refineOuterEdge(img.raster, sp.contour, c);
console.log(`refineOuterEdge: ${(t() - t0).toFixed(0)} ms`);
t0 = t();
const ref = refineBoundary(img.raster, sp.contour, rc.boundary!, c, { windowPx: W });
console.log(`refineBoundary: ${(t() - t0).toFixed(0)} ms`);
t0 = t();
const band = measureFromPolygons(sp.contour, ref.polygon, c, { umPerPx: 1, imageSize: { width: 4000, height: 3000 } });
console.log(`measureFromPolygons (full contour, incl. 2000-sample bootstrap): ${(t() - t0).toFixed(0)} ms`);
const m = createBandMeasurer(outer.polygon, c, { umPerPx: 1, bootstrap: 0 });
t0 = t();
for (let i = 0; i < 10; i++) m(ref.polygon);
console.log(`re-measure an edited boundary (prepared outer, no bootstrap): ${((t() - t0) / 10).toFixed(1)} ms`);
console.log(`mean width ${band.stats.mean.toFixed(2)} px, truth ${img.meanWidthPx.toFixed(2)} px`);
