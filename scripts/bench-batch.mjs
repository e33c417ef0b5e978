#!/usr/bin/env node
/**
 * Batch throughput benchmark: renders N synthetic 4-megapixel fractographs (invented test data,
 * seeded renderer), then runs `fractozone batch` over them with 1 and with 2 worker threads and
 * reports images/s and the throughput ratio (target ≥ 1.8 on a machine with ≥ 2 free cores).
 *
 *   npm run build && node scripts/bench-batch.mjs              # 50 images (slow: minutes)
 *   node scripts/bench-batch.mjs --images 8 --keep            # fewer images, keep the temp folder
 *
 * Wall-clock figures depend on what else runs on the machine; the script prints the load average
 * and the CPU time of each run so that a contended machine can be recognised.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
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

function run(jobs) {
  const out = join(dir, `out-j${jobs}`);
  const la = loadavg()[0];
  const start = performance.now();
  const r = spawnSync(process.execPath, [join(root, 'dist/cli/main.js'), 'batch', inDir, '--out', out, '--jobs', String(jobs), '--json', '--no-progress'], { encoding: 'utf8' });
  const s = (performance.now() - start) / 1000;
  if (r.status !== 0) {
    console.error(r.stderr);
    throw new Error(`batch with --jobs ${jobs} exited ${r.status}`);
  }
  const summary = JSON.parse(r.stdout);
  // cpuS / wallS = cores the run actually got (close to `jobs` on a free machine)
  return { jobs, seconds: s, imagesPerS: N / s, ok: summary.ok, noBand: summary.noBand, loadBefore: la, cpuS: summary.timing.cpuS, coresUsed: summary.timing.cpuS / summary.timing.wallS };
}

const one = run(1);
const two = run(2);
const ratio = two.imagesPerS / one.imagesPerS;
const report = {
  images: N,
  megapixels: (W * H) / 1e6,
  cores: availableParallelism(),
  runs: [one, two].map((r) => ({ ...r, seconds: Number(r.seconds.toFixed(2)), imagesPerS: Number(r.imagesPerS.toFixed(4)), loadBefore: Number(r.loadBefore.toFixed(2)), coresUsed: Number(r.coresUsed.toFixed(2)) })),
  /** CPU seconds per image, 1 worker vs 2 workers: ≈ 1 means no parallel overhead per image. */
  cpuPerImageRatio: Number((two.cpuS / one.cpuS).toFixed(3)),
  throughputRatio: Number(ratio.toFixed(3)),
  target: 1.8,
  meetsTarget: ratio >= 1.8,
};
console.log(JSON.stringify(report, null, 2));
if (!keep) rmSync(dir, { recursive: true, force: true });
