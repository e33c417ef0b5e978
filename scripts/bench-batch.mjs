#!/usr/bin/env node
/**
 * Batch throughput benchmark: renders N synthetic 4-megapixel fractographs (invented test data,
 * seeded renderer), then runs `fractozone batch` over them with 1 and with 2 worker threads and
 * reports images/s and the throughput ratio (target ≥ 1.8 on a machine with ≥ 2 free cores).
 * Then images per second per core against the native reference (scripts/bench/native_reference.py,
 * Python + OpenCV, one thread, one process over the same images): images / CPU seconds of each
 * whole process tree (user + system, from /usr/bin/time), target fractozone ≥ 1.25 × native.
 *
 *   npm run build && node scripts/bench-batch.mjs              # 50 images (slow: minutes)
 *   node scripts/bench-batch.mjs --images 8 --keep            # fewer images, keep the temp folder
 *
 * Wall-clock figures depend on what else runs on the machine; the script prints the load average
 * and the CPU time of each run so that a contended machine can be recognised.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { encodeGrayRaster } from '../dist/core/encode/index.js';
import { renderFractograph } from '../dist/core/render/index.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const opt = (name, dflt) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : dflt;
};
const N = Number(opt('--images', '50'));
const keep = args.includes('--keep');
const W = 2310;
const H = 1732; // 4.0 MP

const dir = mkdtempSync(join(tmpdir(), 'fz-bench-batch-'));
const inDir = join(dir, 'in');
mkdirSync(inDir);
const t0 = performance.now();
for (let i = 0; i < N; i++) {
  const { raster, truth } = renderFractograph({
    seed: 1000 + i,
    widthPx: W,
    heightPx: H,
    umPerPx: 3.5,
    specimen: { diameterUm: 5000 },
    rim: { widthUm: 300 + (i % 5) * 40, harmonics: [{ order: 1, amplitudePct: 5, phaseDeg: (i * 37) % 360 }], transitionUm: 30 },
    blurSigmaPx: 0.9,
    noiseSigma: 0.012,
  });
  const png = encodeGrayRaster(raster, { format: 'png', bitDepth: 8, umPerPx: truth.umPerPxX, umPerPxY: truth.umPerPxY, description: 'fractozone benchmark image - invented test data' });
  writeFileSync(join(inDir, `bench-${String(i).padStart(3, '0')}.png`), png);
}
console.error(`rendered ${N} images of ${W}×${H} px in ${((performance.now() - t0) / 1000).toFixed(1)} s → ${inDir}`);

const TIME = '/usr/bin/time';
const haveTime = existsSync(TIME);
/** Spawns a whole process; with /usr/bin/time also the CPU seconds of its process tree. */
function timedSpawn(cmd, argv) {
  const tf = join(dir, 'time.txt');
  const [c, a] = haveTime ? [TIME, ['-f', '%U %S', '-o', tf, cmd, ...argv]] : [cmd, argv];
  const start = performance.now();
  const r = spawnSync(c, a, { encoding: 'utf8', maxBuffer: 64 << 20 });
  const s = (performance.now() - start) / 1000;
  if (r.status !== 0) {
    console.error(r.stderr);
    throw new Error(`${cmd} ${argv.slice(0, 3).join(' ')} … exited ${r.status}`);
  }
  const treeCpuS = haveTime ? readFileSync(tf, 'utf8').trim().split('\n').pop().split(/\s+/).map(Number).reduce((x, y) => x + y, 0) : NaN;
  return { r, s, treeCpuS };
}

function run(jobs) {
  const out = join(dir, `out-j${jobs}`);
  const la = loadavg()[0];
  const { r, s, treeCpuS } = timedSpawn(process.execPath, [join(root, 'dist/cli/main.js'), 'batch', inDir, '--out', out, '--jobs', String(jobs), '--json', '--no-progress']);
  const summary = JSON.parse(r.stdout);
  // cpuS / wallS = cores the run actually got (close to `jobs` on a free machine)
  return { jobs, seconds: s, imagesPerS: N / s, ok: summary.ok, noBand: summary.noBand, loadBefore: la, cpuS: summary.timing.cpuS, coresUsed: summary.timing.cpuS / summary.timing.wallS, treeCpuS };
}

const one = run(1);
const two = run(2);
const ratio = two.imagesPerS / one.imagesPerS;
const report = {
  images: N,
  megapixels: (W * H) / 1e6,
  cores: availableParallelism(),
  runs: [one, two].map((r) => ({ ...r, treeCpuS: Number(r.treeCpuS.toFixed(2)), seconds: Number(r.seconds.toFixed(2)), imagesPerS: Number(r.imagesPerS.toFixed(4)), loadBefore: Number(r.loadBefore.toFixed(2)), coresUsed: Number(r.coresUsed.toFixed(2)) })),
  /** CPU seconds per image, 1 worker vs 2 workers: ≈ 1 means no parallel overhead per image. */
  cpuPerImageRatio: Number((two.cpuS / one.cpuS).toFixed(3)),
  throughputRatio: Number(ratio.toFixed(3)),
  target: 1.8,
  meetsTarget: ratio >= 1.8,
};
// per core against the native reference: one Python process, one thread, over the same images
const py = spawnSync('/usr/bin/python3', ['-c', 'import cv2, numpy'], { encoding: 'utf8' });
if (py.status === 0 && haveTime) {
  const la = loadavg()[0];
  const nat = timedSpawn('/usr/bin/python3', [join(root, 'scripts/bench/native_reference.py'), '--batch', inDir, '--pixel-size-um', '3.5', '--out', join(dir, 'out-native'), '--threads', '1']);
  const fzPerCore = N / one.treeCpuS;
  const natPerCore = N / nat.treeCpuS;
  report.perCore = {
    note: 'images per CPU second of the whole process tree (user + system): fractozone batch --jobs 1 vs the native reference, one thread',
    fractozone: Number(fzPerCore.toFixed(4)),
    fractozoneCpuS: Number(one.treeCpuS.toFixed(2)),
    native: Number(natPerCore.toFixed(4)),
    nativeCpuS: Number(nat.treeCpuS.toFixed(2)),
    nativeWallS: Number(nat.s.toFixed(2)),
    nativeLoadBefore: Number(la.toFixed(2)),
    ratio: Number((fzPerCore / natPerCore).toFixed(3)),
    target: 1.25,
    meetsTarget: fzPerCore / natPerCore >= 1.25,
  };
} else {
  report.perCore = { skipped: haveTime ? '/usr/bin/python3 with cv2 and numpy not found' : '/usr/bin/time not found' };
}
console.log(JSON.stringify(report, null, 2));
if (!keep) rmSync(dir, { recursive: true, force: true });
