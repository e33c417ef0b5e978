// Pixel-classifier benchmark (`fractozone teach`, `measure --model`; src/core/learn): on one rendered
// 12-megapixel fractograph (4000×3000 px, 2 µm/px) with label strokes drawn from its truth, the time
// to teach a model (scale, working copy, features, forest; the decoding of image and labels on its
// own line), the time `--model` adds to a whole `measure` (median of the runs with and without),
// the class-probability preview of a 2-MP image (what the app shows), and the peak RSS. Targets:
// teaching ≤ 3 s, applying ≤ 1 s more than `measure`. Run after `npm run build`:
//   node scripts/bench-learn.mjs [--runs 3]
import { createRequire } from 'node:module';
import { createHash } from 'node:crypto';

const require = createRequire(import.meta.url);
const dist = new URL('../dist/', import.meta.url);
const { setCv } = await import(new URL('core/cv.js', dist));
setCv(require('opencv-wasm').cv);
const { renderFractograph } = await import(new URL('core/render/index.js', dist));
const { encodeGrayRaster, encodePng } = await import(new URL('core/encode/index.js', dist));
const { decodeImage } = await import(new URL('core/decode/index.js', dist));
const { analyseImage, defaultParams, WorkingFrame } = await import(new URL('core/pipeline/index.js', dist));
const { strokeLabels } = await import(new URL('core/learn/strokes.js', dist));
const { labelsFromDecoded } = await import(new URL('core/learn/labels.js', dist));
const { teachModel } = await import(new URL('core/learn/train.js', dist));
const { serialiseModel, parseModel } = await import(new URL('core/learn/model.js', dist));
const { loadModel, predictProbabilities } = await import(new URL('core/learn/predict.js', dist));
const { featureCentre } = await import(new URL('core/learn/features.js', dist));

const args = process.argv.slice(2);
const runs = Number(args[args.indexOf('--runs') + 1] || 3) || 3;
const median = (v) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
const best = (v) => Math.min(...v);
const s = (ms) => (ms / 1000).toFixed(2);

function scene(seed, w, h, umPerPx) {
  const { raster, truth: t } = renderFractograph({ seed, widthPx: w, heightPx: h, umPerPx });
  const bytes = encodeGrayRaster(raster, { format: 'png' });
  const lab = strokeLabels({ width: w, height: h, center: t.centre, outerRadiusPx: t.outerRadiusPxByAngle, boundaryRadiusPx: t.boundaryRadiusPxByAngle }, { widthPx: 4, marginPx: 8 });
  return { bytes, labelBytes: encodePng({ width: w, height: h, data: lab.data, layout: 'gray8' }), truth: t };
}

const big = scene(5, 4000, 3000, 2);
const other = scene(6, 4000, 3000, 2);
const sha = (b) => createHash('sha256').update(b).digest('hex');

// teach
const tDecode = [];
const tTeach = [];
let model;
for (let i = 0; i < runs; i++) {
  let t0 = performance.now();
  const decoded = decodeImage(big.bytes);
  const labels = labelsFromDecoded(decodeImage(big.labelBytes));
  tDecode.push(performance.now() - t0);
  t0 = performance.now();
  model = teachModel([{ decoded, labels, scale: { pixelSizeUm: 2 }, file: 'bench-12mp.png', sha256: sha(big.bytes), labelsSha256: sha(big.labelBytes) }]).model;
  tTeach.push(performance.now() - t0);
}
const text = serialiseModel(model);
const loaded = loadModel(parseModel(text), sha(new TextEncoder().encode(text)));

// measure with and without the model, on another image of the series
const params = defaultParams();
params.scale.pixelSizeUm = 2;
params.bootstrap = 2000;
const withModel = { ...structuredClone(params), modelSha256: loaded.sha256 };
const plain = [];
const applied = [];
let resPlain;
let resModel;
for (let i = 0; i < runs; i++) {
  let t0 = performance.now();
  resPlain = (await analyseImage(other.bytes, { file: 'b.png', sha256: 'x' }, params)).result;
  plain.push(performance.now() - t0);
  t0 = performance.now();
  resModel = (await analyseImage(other.bytes, { file: 'b.png', sha256: 'x' }, withModel, undefined, { model: loaded })).result;
  applied.push(performance.now() - t0);
}

// preview of a 2-MP image (1633 × 1225 px): the class probabilities on its working copy
const two = decodeImage(scene(7, 1633, 1225, 4.9).bytes);
const frame = new WorkingFrame(two.raster, []);
const tPrev = [];
for (let i = 0; i < runs; i++) {
  const t0 = performance.now();
  predictProbabilities(frame.work, 4.9 * frame.lengthScale, loaded, featureCentre(frame));
  tPrev.push(performance.now() - t0);
}

const truthMean = other.truth.band.meanWidthUm;
const err = (r) => ((100 * (r.band.widthUm.mean - truthMean)) / truthMean).toFixed(2);
const t = model.training;
console.log(`12-MP image (4000×3000 px, 2 µm/px), ${runs} runs; labelled working pixels outside ${t.labelledWorkingPixels.outside}, rim ${t.labelledWorkingPixels.rim}, core ${t.labelledWorkingPixels.core}; out-of-bag accuracy ${(t.oobAccuracy * 100).toFixed(1)} %; model file ${(text.length / 1024).toFixed(0)} KiB`);
console.log(`teach (scale, working copy, features, ${t.nTrees} trees)   best ${s(best(tTeach))} s, median ${s(median(tTeach))} s   (target ≤ 3 s)`);
console.log(`  decoding image + label image                   best ${s(best(tDecode))} s, median ${s(median(tDecode))} s`);
console.log(`measure without a model                          best ${s(best(plain))} s, median ${s(median(plain))} s   (width error ${err(resPlain)} %)`);
console.log(`measure --model                                  best ${s(best(applied))} s, median ${s(median(applied))} s   (width error ${err(resModel)} %, boundary confidence ${resModel.model.confidence.boundary})`);
console.log(`  added by the model                             ${s(median(applied) - median(plain))} s (medians), ${s(best(applied) - best(plain))} s (bests)   (target ≤ 1 s)`);
console.log(`class-probability preview, 2-MP image           best ${s(best(tPrev))} s, median ${s(median(tPrev))} s   (target ≤ 1 s, for the app)`);
console.log(`peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
