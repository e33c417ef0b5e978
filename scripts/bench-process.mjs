#!/usr/bin/env node
// Whole-process benchmark (issue 16): `fractozone measure IMG --pixel-size 2um --out DIR` against the
// native reference `scripts/bench/native_reference.py` (Python + Debian's python3-opencv, one thread,
// comparable work: decode, local variance, Sobel, Otsu, morphology, contour, circle/ellipse fit,
// 360 rays, 1600-px overlay PNG, result JSON), each timed as a whole process — start-up, imports,
// decode, measure, files written, exit — on the same rendered 12-MP PNG (4000×3000 px, 2 µm/px,
// seed 5: the image of bench-pipeline.mjs). The two are interleaved (the order alternates each
// round) so that a change of load hits both; best and median of the runs each, and the ratio
// fractozone / native (target ≤ 1.0, stretch ≤ 0.75). Then the native reference once more with
// OpenCV's default thread count (information), and fractozone on a 48-MP render (8000×6000 px,
// 1 µm/px, same scene): wall time and peak RSS of the process (targets ≤ 2.5 s, ≤ 600 MB).
//
// Each line gives wall-clock time and the process's CPU time (user + system, from /usr/bin/time
// when installed): on a shared machine the wall clock grows with the load (printed), CPU much less.
//   npm run build && node scripts/bench-process.mjs [--runs 5] [--dir DIR] [--no-48]
// --dir keeps the rendered images in DIR and reuses them on the next run (rendering 12 + 48 MP
// takes ~30 s); without it they are rendered into a temporary folder that is removed afterwards.
// --baseline ROOT also times ROOT/dist/cli/main.js (another built checkout, e.g. main before a
// change) in the same interleaved rounds: before/after on the same load.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const opt = (name, dflt) => (args.includes(name) ? args[args.indexOf(name) + 1] : dflt);
const runs = Number(opt('--runs', '5')) || 5;
const keepDir = opt('--dir');
const with48 = !args.includes('--no-48');
const baseline = opt('--baseline');
const PY = '/usr/bin/python3';
const TIME = '/usr/bin/time';
const haveTime = existsSync(TIME);

const dir = keepDir ?? mkdtempSync(join(tmpdir(), 'fz-bench-process-'));
mkdirSync(dir, { recursive: true });
const load = () => loadavg().map((v) => v.toFixed(1)).join(' ');
const s = (ms) => (ms / 1000).toFixed(2);
const best = (v) => Math.min(...v);
const median = (v) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];

/** Renders the seed-5 scene at w×h px (same specimen in µm at any size) unless the file exists. */
async function scene(w, h) {
  const file = join(dir, `scene-seed5-${w}x${h}.png`);
  if (existsSync(file)) return file;
  const { renderFractograph } = await import(new URL('../dist/core/render/index.js', import.meta.url));
  const { encodeGrayRaster } = await import(new URL('../dist/core/encode/index.js', import.meta.url));
  const t0 = performance.now();
  const { raster } = renderFractograph({ seed: 5, widthPx: w, heightPx: h, umPerPx: (2 * 4000) / w });
  writeFileSync(file, encodeGrayRaster(raster, { format: 'png' }));
  console.log(`rendered ${w}×${h} px in ${s(performance.now() - t0)} s → ${file}`);
  return file;
}

/**
 * Runs one command as a whole process; wall clock from here (spawn to exit), CPU seconds and peak
 * RSS from /usr/bin/time when installed. Throws on a non-zero exit.
 */
function timed(cmd, argv) {
  const tf = join(dir, 'time.txt');
  const [c, a] = haveTime ? [TIME, ['-f', '%U %S %M', '-o', tf, cmd, ...argv]] : [cmd, argv];
  const t0 = performance.now();
  const r = spawnSync(c, a, { encoding: 'utf8', maxBuffer: 64 << 20 });
  const wallMs = performance.now() - t0;
  if (r.status !== 0) throw new Error(`${cmd} ${argv.join(' ')} exited ${r.status}: ${(r.stderr || '').trim().split('\n').slice(-3).join(' | ')}`);
  if (!haveTime) return { wallMs, cpuMs: NaN, rssMb: NaN, stdout: r.stdout };
  const [u, sy, kb] = readFileSync(tf, 'utf8').trim().split('\n').pop().split(/\s+/).map(Number);
  return { wallMs, cpuMs: (u + sy) * 1000, rssMb: kb / 1024, stdout: r.stdout };
}

const fz = (img, umPerPx, out, at = root) => timed(process.execPath, [join(at, 'dist/cli/main.js'), 'measure', img, '--pixel-size', `${umPerPx}um`, '--out', out, '--json']);
const py = (img, umPerPx, out, threads = 1) => timed(PY, [join(root, 'scripts/bench/native_reference.py'), img, '--pixel-size-um', String(umPerPx), '--out', out, '--threads', String(threads)]);
const line = (name, v) =>
  `  ${name.padEnd(30)} best ${s(best(v.map((x) => x.wallMs)))} s, median ${s(median(v.map((x) => x.wallMs)))} s` +
  (haveTime ? `  (CPU best ${s(best(v.map((x) => x.cpuMs)))} s, median ${s(median(v.map((x) => x.cpuMs)))} s; peak RSS ${Math.max(...v.map((x) => x.rssMb)).toFixed(0)} MB)` : '');

const img12 = await scene(4000, 3000);
const py12 = spawnSync(PY, ['-c', 'import cv2, numpy'], { encoding: 'utf8' });
const haveNative = py12.status === 0;
console.log(`whole process on a rendered 12-MP PNG (4000×3000 px, 8-bit gray), ${runs} runs each, interleaved; load before ${load()}`);
const F = [];
const N = [];
const B = [];
for (let i = 0; i < runs; i++) {
  const order = [...(i % 2 === 0 ? ['fz', 'py'] : ['py', 'fz']), ...(baseline ? ['base'] : [])];
  if (baseline && i % 2 === 1) order.reverse();
  for (const who of order) {
    if (who === 'fz') F.push(fz(img12, 2, join(dir, 'out-fz')));
    else if (who === 'base') B.push(fz(img12, 2, join(dir, 'out-base'), baseline));
    else if (haveNative) N.push(py(img12, 2, join(dir, 'out-native')));
  }
}
const r12 = JSON.parse(F[F.length - 1].stdout);
console.log(line('fractozone measure', F));
console.log(`    stages (ms, last run): ${Object.entries(r12.diagnostics.timingsMs).map(([k, v]) => `${k} ${v}`).join(', ')}`);
const report = { date: new Date().toISOString().slice(0, 10), runs, fractozone12: summary(F) };
if (baseline) {
  console.log(line('baseline (--baseline)', B) + `  ← ${baseline}`);
  console.log(`    stages (ms, last run): ${Object.entries(JSON.parse(B[B.length - 1].stdout).diagnostics.timingsMs).map(([k, v]) => `${k} ${v}`).join(', ')}`);
  report.baseline12 = summary(B);
}
if (haveNative) {
  console.log(line('native reference, 1 thread', N));
  const nat = JSON.parse(N[N.length - 1].stdout.trim().split('\n').pop());
  console.log(`    stages (ms, last run): ${Object.entries(nat.timingsMs).map(([k, v]) => `${k} ${v}`).join(', ')}`);
  console.log(`    mean band width: fractozone ${r12.band.widthUm.mean} µm, native reference ${nat.meanUm?.toFixed(1)} µm`);
  const ratioBest = best(F.map((x) => x.wallMs)) / best(N.map((x) => x.wallMs));
  const ratioMedian = median(F.map((x) => x.wallMs)) / median(N.map((x) => x.wallMs));
  const ratioCpu = haveTime ? best(F.map((x) => x.cpuMs)) / best(N.map((x) => x.cpuMs)) : NaN;
  console.log(`  ratio fractozone / native: best ${ratioBest.toFixed(2)}, median ${ratioMedian.toFixed(2)}${haveTime ? `, CPU (bests) ${ratioCpu.toFixed(2)}` : ''}  (target ≤ 1.0, stretch ≤ 0.75) — ${ratioBest <= 1 ? 'met' : 'not met'}`);
  const T = [0, 1, 2].map(() => py(img12, 2, join(dir, 'out-native'), 0));
  console.log(line(`native, OpenCV default threads`, T) + ` — information, ${JSON.parse(T[0].stdout.trim().split('\n').pop()).threads} threads`);
  Object.assign(report, { native12: summary(N), nativeDefaultThreads12: summary(T), ratioBest, ratioMedian, ratioCpu });
} else {
  console.log(`  native reference skipped: ${PY} with cv2 and numpy not found (Debian: apt-get install python3-opencv)`);
}
// start-up alone: the program loaded, its help printed (no OpenCV), against a bare `node -e 0`
const H = [];
const HB = [];
const N0 = [];
for (let i = 0; i < 5; i++) {
  H.push(timed(process.execPath, [join(root, 'dist/cli/main.js'), '--help']));
  if (baseline) HB.push(timed(process.execPath, [join(baseline, 'dist/cli/main.js'), '--help']));
  N0.push(timed(process.execPath, ['-e', '0']));
}
console.log(line('start-up: fractozone --help', H));
if (baseline) console.log(line('start-up: baseline --help', HB));
console.log(line('start-up: node -e 0', N0));
report.startup = { help: summary(H), ...(baseline ? { baselineHelp: summary(HB) } : {}), bareNode: summary(N0) };
console.log(`  load after ${load()}`);

if (with48) {
  const img48 = await scene(8000, 6000);
  const M = [];
  const MB = [];
  for (let i = 0; i < 3; i++) {
    M.push(fz(img48, 1, join(dir, 'out-fz48')));
    if (baseline) MB.push(fz(img48, 1, join(dir, 'out-base48'), baseline));
  }
  const r48 = JSON.parse(M[M.length - 1].stdout);
  console.log(`48-MP PNG (8000×6000 px), 3 runs; load ${load()}`);
  console.log(line('fractozone measure', M) + '  (targets ≤ 2.5 s, ≤ 600 MB)');
  console.log(`    stages (ms, last run): ${Object.entries(r48.diagnostics.timingsMs).map(([k, v]) => `${k} ${v}`).join(', ')}`);
  report.fractozone48 = summary(M);
  if (baseline) {
    console.log(line('baseline (--baseline)', MB));
    report.baseline48 = summary(MB);
  }
}
console.log(JSON.stringify(report));
if (!keepDir) rmSync(dir, { recursive: true, force: true });

function summary(v) {
  const w = v.map((x) => x.wallMs);
  const c = v.map((x) => x.cpuMs);
  return { bestS: +s(best(w)), medianS: +s(median(w)), cpuBestS: +s(best(c)), peakRssMb: Math.round(Math.max(...v.map((x) => x.rssMb))) };
}
