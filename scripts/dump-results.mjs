// Writes the result JSON (without the wall-clock `diagnostics`) of a fixed set of measurements, so
// that a refactoring can be checked to leave every number unchanged:
//   (a) the six bundled samples, with the settings of samples/manifest.csv (as `batch` applies them),
//   (b) every image of the rendered accuracy set of tests/core/pipeline/accuracy.test.ts (same
//       render options, encoding and parameters),
//   (c) the external fixtures tests/fixtures/external/* (scale from the detected bar, as
//       tests/core/pipeline/external.test.ts),
//   (d) a manual boundary (as `measure --boundary`) and two re-measures of one sample.
// Besides `<case>.result.json` it writes the CLI summary text (`<case>.summary.txt`), the CSV row
// (`<case>.row.json`), the SHA-256 of the overlay PNG (`<case>.overlay.sha256`) and one batch HTML
// report over all cases (`report.html`), so a change in a view shows up apart from a change in the
// numbers.
//
//   npm run build && node scripts/dump-results.mjs [OUT_DIR]     (default /tmp/results-now)
//   diff -r /tmp/baseline-results OUT_DIR
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';

const require = createRequire(import.meta.url);
const root = new URL('../', import.meta.url);
const dist = new URL('dist/', root);
const { setCv } = await import(new URL('core/cv.js', dist));
setCv(require('opencv-wasm').cv);
const { analyseImage, defaultParams, remeasure, encodeOverlayPng } = await import(new URL('core/pipeline/index.js', dist));
const { renderFractograph } = await import(new URL('core/render/index.js', dist));
const { encodeGrayRaster } = await import(new URL('core/encode/index.js', dist));
const { parseCsv, entryRow, RESULT_COLUMNS } = await import(new URL('core/report/csv.js', dist));
const { parseMaterialSheet, selectMaterial } = await import(new URL('core/tcd/materials.js', dist));
const { summaryText } = await import(new URL('cli/commands/measure.js', dist));
const { buildReportHtml } = await import(new URL('core/report/html.js', dist));
const { analyseSeries } = await import(new URL('core/report/series.js', dist));
const entries = [];

const out = process.argv[2] ?? '/tmp/results-now';
mkdirSync(out, { recursive: true });
const sha = (b) => createHash('sha256').update(b).digest('hex');

function write(name, result, overlay, meta = {}) {
  const r = structuredClone(result);
  delete r.diagnostics;
  writeFileSync(`${out}/${name}.result.json`, JSON.stringify(r, null, 2) + '\n');
  writeFileSync(`${out}/${name}.summary.txt`, summaryText(result));
  const entry = {
    file: result.input.file,
    safeName: name,
    sha256: result.input.sha256,
    status: result.band.detected ? 'ok' : 'no-band',
    metadata: meta,
    strainRatePerS: result.params.strainRatePerS,
    material: result.params.material?.material?.name ?? null,
    overlay: null,
    result,
  };
  entries.push(entry);
  const row = entryRow(entry);
  writeFileSync(`${out}/${name}.row.json`, JSON.stringify(RESULT_COLUMNS.map((c) => [c, row[c] ?? null])) + '\n');
  if (overlay) writeFileSync(`${out}/${name}.overlay.sha256`, sha(encodeOverlayPng(overlay)) + '\n');
  process.stderr.write(`${name}\n`);
}

// (a) samples, settings from the manifest as `batch` applies them (pixel size, bar length, strain rate, material)
const samples = fileURLToPath(new URL('samples/', root));
const sheet = parseMaterialSheet(readFileSync(`${samples}materials.json`, 'utf8'), 'materials.json');
const [head, ...rows] = parseCsv(readFileSync(`${samples}manifest.csv`, 'utf8'));
const col = (rec, name) => rec.fields[head.fields.indexOf(name)] ?? '';
let firstSample = null;
for (const rec of rows) {
  const file = col(rec, 'file');
  const bytes = new Uint8Array(readFileSync(`${samples}${file}`));
  const p = defaultParams();
  if (col(rec, 'pixel_size_um')) p.scale.pixelSizeUm = Number(col(rec, 'pixel_size_um'));
  if (col(rec, 'bar_length_um')) p.scale.barLengthUm = Number(col(rec, 'bar_length_um'));
  if (col(rec, 'strain_rate_per_s')) p.strainRatePerS = Number(col(rec, 'strain_rate_per_s'));
  const ref = col(rec, 'material');
  if (ref) p.material = { material: selectMaterial(sheet, ref.slice(ref.indexOf(':') + 1), 'materials.json') };
  const { result, overlay } = await analyseImage(bytes, { file, sha256: sha(bytes) }, p);
  const meta = { specimen_id: col(rec, 'specimen_id'), notch: col(rec, 'notch'), notch_root_radius_mm: col(rec, 'notch_root_radius_mm') };
  write(`sample-${file.replace(/\.[^.]+$/, '')}`, result, overlay, meta);
  firstSample ??= { result, bytes, file, p };
}

// (b) the rendered accuracy set (tests/core/pipeline/accuracy.test.ts)
const BASE = { widthPx: 1000, heightPx: 760, umPerPx: 8.5, noiseSigma: 0, blurSigmaPx: 0, vignetting: 0 };
const CASES = [
  ['clean-round', { ...BASE, seed: 11 }],
  ['clean-round-wide', { ...BASE, seed: 12, rim: { widthUm: 700 } }],
  ['noisy', { ...BASE, seed: 13, noiseSigma: 0.04 }],
  ['blurred', { ...BASE, seed: 14, blurSigmaPx: 1.6 }],
  ['vignetting', { ...BASE, seed: 15, vignetting: 0.45 }],
  ['jpeg-q80', { ...BASE, seed: 16, noiseSigma: 0.02 }, 'jpeg'],
  ['tiff16', { ...BASE, seed: 17, noiseSigma: 0.01 }, 'tiff', 16],
  ['tilted', { ...BASE, seed: 18, specimen: { tiltDeg: 30, tiltAxisDeg: 20 } }],
  ['slanted-low-light', { ...BASE, seed: 19, rim: { slopeDeg: 35 }, light: { elevationDeg: 25 } }],
  ['equal-mean', { ...BASE, seed: 20, equalMeanBrightness: true, noiseSigma: 0.02 }],
  ['bright-background', { ...BASE, seed: 21, background: 'bright', noiseSigma: 0.02 }],
  ['no-rim', { ...BASE, seed: 31, rim: false, noiseSigma: 0.02 }],
  ['frame-cut', { ...BASE, seed: 32, specimen: { centrePx: { x: 250, y: 380 } } }],
];
for (const [name, opts, format = 'png', bitDepth = 8] of CASES) {
  const { raster, truth } = renderFractograph(opts);
  const bytes = encodeGrayRaster(raster, { format, bitDepth, jpegQuality: 80 });
  const p = defaultParams();
  p.scale.pixelSizeUm = truth.umPerPxX;
  p.bootstrap = 200;
  const { result, overlay } = await analyseImage(bytes, { file: `${name}.${format}`, sha256: 'test' }, p);
  write(`accuracy-${name}`, result, overlay);
}

// (c) the external fixtures (independent Python generator)
const ext = fileURLToPath(new URL('tests/fixtures/external/', root));
for (const t of readdirSync(ext).filter((f) => f.endsWith('.truth.json')).sort()) {
  const truth = JSON.parse(readFileSync(`${ext}${t}`, 'utf8'));
  const bytes = new Uint8Array(readFileSync(`${ext}${truth.file}`));
  const p = defaultParams();
  p.scale.barLengthUm = truth.scaleBar.lengthUm;
  p.bootstrap = 200;
  const { result, overlay } = await analyseImage(bytes, { file: truth.file, sha256: sha(bytes) }, p);
  write(`external-${t.replace('.truth.json', '')}`, result, overlay);
}

// (d) manual boundary and re-measures on the first sample
{
  const { result, bytes, file, p } = firstSample;
  const c = result.specimen.center;
  const edited = result.band.boundary.polygon.map((q) => {
    const dx = q.x - c.x;
    const dy = q.y - c.y;
    const d = Math.hypot(dx, dy) || 1;
    return { x: q.x + (3 * dx) / d, y: q.y + (3 * dy) / d };
  });
  const manual = await analyseImage(bytes, { file, sha256: sha(bytes) }, { ...p, boundaryPolygon: edited });
  write('manual-boundary', manual.result, manual.overlay);
  write('remeasure-boundary', remeasure(result, { boundaryPolygon: edited }), null);
  write('remeasure-options', remeasure(result, { exclude: [[80, 110]], dropOutliers: true, nRays: 180, reference: 'L/2' }), null);
}

writeFileSync(`${out}/report.html`, buildReportHtml({ entries, series: analyseSeries(entries), thumbnails: {}, params: defaultParams(), toolVersion: 'dump' }));
