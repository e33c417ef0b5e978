#!/usr/bin/env node
// CPU (and wall) time of each piece of stages 3–6b in one fresh process on the 12-MP bench image
// (bench-process.mjs's render): scan lines, glints, texture, classification, refinement, measurement,
// parameter-range variations — what the pipeline's own timings lump together as "texture+boundary"
// and "measure+uncertainty". Numbers are "CPU ms/wall ms", cold (first call in the process), as in
// `fractozone measure`. Run after `npm run build`:
//   node scripts/bench-band-stages.mjs IMAGE.png [--pixel-size-um 2]
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
const require = createRequire(import.meta.url);
const dist = new URL('../dist/', import.meta.url).href;
const args = process.argv.slice(2);
const image = args[0] && !args[0].startsWith('--') ? args[0] : null;
if (!image) {
  console.error('usage: node scripts/bench-band-stages.mjs IMAGE.png [--pixel-size-um 2] (e.g. the 12-MP render bench-process.mjs --dir DIR keeps)');
  process.exit(2);
}
const pixelUm = Number(args.includes('--pixel-size-um') ? args[args.indexOf('--pixel-size-um') + 1] : 2);
const { setCv } = await import(dist + 'core/cv.js');
setCv(require('opencv-wasm').cv);
const { installNodeZlib } = await import(dist + 'cli/nodeZlib.js');
installNodeZlib();
const { decodeImage } = await import(dist + 'core/decode/index.js');
const { defaultParams } = await import(dist + 'core/pipeline/index.js');
const { validateParams } = await import(dist + 'core/pipeline/params.js');
const { WorkingFrame } = await import(dist + 'core/pipeline/frame.js');
const { calibrate } = await import(dist + 'core/pipeline/stages/calibrate.js');
const { locateSpecimen } = await import(dist + 'core/pipeline/stages/locateSpecimen.js');
const { textureWindow, computeTexture, specimenBox, REGION_MARGIN_PX } = await import(dist + 'core/pipeline/stages/texture.js');
const { classifyTexture } = await import(dist + 'core/pipeline/stages/classify.js');
const { refineRimBoundary } = await import(dist + 'core/pipeline/stages/refineBoundary.js');
const { suppressGlints } = await import(dist + 'core/segment/index.js');
const { removeScanLines } = await import(dist + 'core/segment/scanLines.js');
const { methodVariations } = await import(dist + 'core/pipeline/stages/uncertainty.js');
const { storedGeometry } = await import(dist + 'core/pipeline/stages/assemble.js');
const { measureWidths, minWidthPxFor } = await import(dist + 'core/pipeline/stages/measure.js');
const cpu = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1000; };
const T = {}; let t = cpu(); let w = performance.now();
const lap = (k) => { const n = cpu(); const nw = performance.now(); T[k] = `${(n - t).toFixed(0)}/${(nw - w).toFixed(0)}`; t = n; w = nw; };
const bytes = readFileSync(image);
const decoded = decodeImage(bytes); lap('decode');
const p = validateParams(structuredClone({ ...defaultParams(), scale: { ...defaultParams().scale, pixelSizeUm: pixelUm } }));
const calibration = calibrate({ decoded, scale: p.scale });
const frame = new WorkingFrame(decoded.raster, calibration.marks);
const loc = locateSpecimen({ frame, scale: calibration.scale, nRays: p.nRays }); lap('scale+specimen');
const window = textureWindow({ frame, scale: calibration.scale, location: loc, windowUm: null, features: p.features });
const lines = removeScanLines(frame.work); lap('scanlines');
const glints = suppressGlints(lines.raster, loc.specimen.mask); lap('glints');
const texture = computeTexture({ frame, window, features: p.features, source: glints.raster, region: specimenBox(loc, REGION_MARGIN_PX) }); lap('texture');
const classification = classifyTexture({ location: loc, texture }); lap('classify');
const boundary = refineRimBoundary({ frame, location: loc, classification, window, nRays: p.nRays, source: glints.raster, missing: glints.mask }); lap('refine');
const umPerPx = { x: calibration.scale.umPerPxX, y: calibration.scale.umPerPxY };
const geometry = storedGeometry(loc, boundary, calibration.marks);
const measured = measureWidths({ geometry, umPerPx, imageSize: frame.fullSize, minWidthPx: minWidthPxFor(boundary.source, window.windowPxFull), params: p }); lap('measure');
methodVariations({ frame, scale: calibration.scale, location: loc, window, texture, classification, marks: calibration.marks, params: p }, measured.profile?.stats.mean ?? NaN); lap('variations');
const { loadavg } = await import('node:os');
console.log(`${image}: working copy ${frame.work.width}×${frame.work.height}, window ${window.windowPxWork} px; load ${loadavg().map((v) => v.toFixed(1)).join(' ')}`);
for (const [k, v] of Object.entries(T)) console.log(`  ${k.padEnd(15)} ${v} ms (CPU/wall)`);
