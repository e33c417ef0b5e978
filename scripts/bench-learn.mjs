// Pixel-classifier benchmark (`fractozone teach`, `measure --model`; src/core/learn): on one rendered
// 12-megapixel fractograph (4000×3000 px, 2 µm/px) with label strokes drawn from its truth, the time
// to teach a model (scale, working copy, features, forest; the decoding of image and labels on its
// own line), the time `--model` adds to a whole `measure` (median of the runs with and without),
// the class-map preview of a 2-MP image (what the app shows: class probabilities and the class map
// on its working copy), and the peak RSS. Targets:
// teaching ≤ 3 s, applying ≤ 1 s more than `measure`, the preview ≤ 1 s. Each line gives wall-clock time and the process's
// CPU time (user + system, all its threads) over the same run: on a shared machine the wall clock
// grows with the load (printed), the CPU time much less. Run after `npm run build`:
//   node scripts/bench-learn.mjs [--runs 3]
import { createRequire } from 'node:module';
import { createHash } from 'node:crypto';
import { loadavg } from 'node:os';

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
const { classMap, loadModel, predictProbabilities } = await import(new URL('core/learn/predict.js', dist));
const { featureCentre } = await import(new URL('core/learn/features.js', dist));
const { prepareImage } = await import(new URL('core/learn/prepared.js', dist));

const args = process.argv.slice(2);
const runs = Number(args[args.indexOf('--runs') + 1] || 3) || 3;
const median = (v) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];
const best = (v) => Math.min(...v);
const s = (ms) => (ms / 1000).toFixed(2);
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
/** Runs f, pushing its wall-clock and CPU time (ms) onto wall and cpu; returns f's value. */
async function timed(wall, cpu, f) {
  const t0 = performance.now();
  const c0 = cpuMs();
  const r = await f();
  wall.push(performance.now() - t0);
  cpu.push(cpuMs() - c0);
  return r;
}
const load = () => loadavg().map((v) => v.toFixed(1)).join(' ');

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
const loadBefore = load();
const tDecode = [];
const cDecode = [];
const tTeach = [];
const cTeach = [];
let model;
for (let i = 0; i < runs; i++) {
  const { decoded, labels } = await timed(tDecode, cDecode, () => ({ decoded: decodeImage(big.bytes), labels: labelsFromDecoded(decodeImage(big.labelBytes)) }));
  model = (await timed(tTeach, cTeach, () => teachModel([{ decoded, labels, scale: { pixelSizeUm: 2 }, file: 'bench-12mp.png', sha256: sha(big.bytes), labelsSha256: sha(big.labelBytes) }]))).model;
}
const text = serialiseModel(model);
const loaded = loadModel(parseModel(text), sha(new TextEncoder().encode(text)));

// measure with and without the model, on another image of the series
const params = defaultParams();
params.scale.pixelSizeUm = 2;
params.bootstrap = 2000;
const withModel = { ...structuredClone(params), modelSha256: loaded.sha256 };
const plain = [];
const cPlain = [];
const applied = [];
const cApplied = [];
let resPlain;
let resModel;
for (let i = 0; i < runs; i++) {
  resPlain = (await timed(plain, cPlain, () => analyseImage(other.bytes, { file: 'b.png', sha256: 'x' }, params))).result;
  resModel = (await timed(applied, cApplied, () => analyseImage(other.bytes, { file: 'b.png', sha256: 'x' }, withModel, undefined, { model: loaded }))).result;
}

// preview of a 2-MP image (1633 × 1225 px): the class probabilities on its working copy and the
// class map the app draws from them
const two = decodeImage(scene(7, 1633, 1225, 4.9).bytes);
const frame = new WorkingFrame(two.raster, []);
const centre = featureCentre(frame);
const tPrev = [];
const cPrev = [];
let prob;
for (let i = 0; i < runs; i++) {
  prob = await timed(tPrev, cPrev, () => {
    const p = predictProbabilities(frame.work, 4.9 * frame.lengthScale, loaded, centre);
    classMap(p);
    return p;
  });
}

// the same preview as the app's teach mode makes it after the first stroke: the image made ready
// once (learn/prepared.ts: working copy, centre, the features of the app's coarser preview grid,
// MAX_GRID_POINTS / 4), then per stroke only the forest on that grid
const { MAX_GRID_POINTS } = await import(new URL('core/learn/predict.js', dist));
const previewGrid = Math.round(MAX_GRID_POINTS / 4);
const tReady = [];
const cReady = [];
const ready = await timed(tReady, cReady, () => {
  const r = prepareImage(two, { pixelSizeUm: 4.9 });
  r.grid(loaded.model.windowsUm, previewGrid);
  return r;
});
const tKept = [];
const cKept = [];
for (let i = 0; i < runs; i++) {
  await timed(tKept, cKept, () => classMap(predictProbabilities(ready.frame.work, ready.umPerWorkPx, loaded, ready.centre, previewGrid, ready.grid(loaded.model.windowsUm, previewGrid))));
}

const truthMean = other.truth.band.meanWidthUm;
const err = (r) => ((100 * (r.band.widthUm.mean - truthMean)) / truthMean).toFixed(2);
const t = model.training;
const line = (label, wall, cpu, tail = '') => console.log(`${label.padEnd(48)} best ${s(best(wall))} s, median ${s(median(wall))} s; CPU best ${s(best(cpu))} s${tail}`);
console.log(`12-MP image (4000×3000 px, 2 µm/px), ${runs} runs; load average before ${loadBefore}, after ${load()}; labelled working pixels outside ${t.labelledWorkingPixels.outside}, rim ${t.labelledWorkingPixels.rim}, core ${t.labelledWorkingPixels.core}; out-of-bag accuracy ${(t.oobAccuracy * 100).toFixed(1)} %; model file ${(text.length / 1024).toFixed(0)} KiB`);
line(`teach (scale, working copy, features, ${t.nTrees} trees)`, tTeach, cTeach, '   (target ≤ 3 s)');
line('  decoding image + label image', tDecode, cDecode);
line('measure without a model', plain, cPlain, `   (width error ${err(resPlain)} %)`);
line('measure --model', applied, cApplied, `   (width error ${err(resModel)} %, boundary confidence ${resModel.model.confidence.boundary})`);
console.log(`${'  added by the model'.padEnd(48)} ${s(median(applied) - median(plain))} s (medians), ${s(best(applied) - best(plain))} s (bests); CPU ${s(best(cApplied) - best(cPlain))} s (bests)   (target ≤ 1 s)`);
line('class-map preview, 2-MP image', tPrev, cPrev, `   (target ≤ 1 s, for the app; forest at ${prob.evaluated} of the grid's points, stride ${prob.stride} px)`);
line('  app: making the 2-MP image ready (once)', tReady, cReady);
line('  app: class map per stroke, grid features kept', tKept, cKept, `   (the forest on the app's preview grid; teaching from the strokes comes on top)`);
console.log(`peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
