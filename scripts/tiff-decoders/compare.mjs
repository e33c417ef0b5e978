#!/usr/bin/env node
// Measures TIFF decoders for the decision recorded in DEVELOPERS.md ("TIFF decoder"): fractozone's
// own adapter (src/core/decode/tiff.ts) against maintained npm decoders, on
//   1. correctness: every TIFF fixture of tests/fixtures/decode (PIL / tifffile / ImageMagick
//      files, references in expected.json) decoded to gray and compared at the sample points;
//   2. robustness: N damaged TIFFs from the fuzz mutator (scripts/fuzz/mutate.mjs, seeded), each
//      decoded in a child process per candidate with a 10 s watchdog: hangs, crashes (anything
//      thrown that is not a clean refusal is counted, not fatal), peak RSS;
//   3. speed: a rendered 12-MP (4000×3000) 16-bit TIFF, uncompressed and (with tifffile) LZW and
//      Deflate, best of 3, to a gray raster.
//
// The candidates are not project dependencies; install them beside the script first:
//   npm install --no-save --prefix /tmp/tiffcand geotiff@3.0.5 tiff@7.1.3
//   npm run build && node scripts/tiff-decoders/compare.mjs --modules /tmp/tiffcand/node_modules [--fuzz 2000]
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { mutate, rng } from '../fuzz/mutate.mjs';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const W = [0.2126, 0.7152, 0.0722];

function arg(name, dflt) {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : dflt;
}

/** Loads the candidates: name → async (bytes) => {width, height, gray: Float32Array}. */
export async function candidates(modulesDir) {
  const ours = await import(pathToFileURL(join(ROOT, 'dist/core/decode/index.js')).href);
  const out = {
    ours: async (b) => {
      const d = ours.decodeImage(b);
      return { width: d.widthPx, height: d.heightPx, gray: d.raster.data };
    },
  };
  if (!modulesDir) return out;
  const req = createRequire(join(modulesDir, 'x.js'));
  const geotiff = await import(pathToFileURL(req.resolve('geotiff')).href);
  geotiff.setLogger?.({ log() {}, info() {}, warn() {}, error() {}, debug() {}, time() {}, timeEnd() {} });
  out['geotiff@3.0.5'] = async (b) => {
    const t = await geotiff.fromArrayBuffer(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength));
    const img = await t.getImage(0);
    const fd = img.fileDirectory;
    const get = (k) => (typeof fd.getValue === 'function' ? fd.getValue(k) : fd[k]);
    const width = img.getWidth();
    const height = img.getHeight();
    const spp = img.getSamplesPerPixel();
    const bps = img.getBitsPerSample();
    const photometric = get('PhotometricInterpretation');
    const sampleFormat = (get('SampleFormat') ?? [1])[0];
    const r = await img.readRasters({ interleave: true });
    return { width, height, gray: toGray(r, width, height, spp, bps, photometric, sampleFormat, get('ColorMap')) };
  };
  const tiff = await import(pathToFileURL(req.resolve('tiff')).href);
  out['tiff@7.1.3'] = async (b) => {
    const ifd = tiff.decode(b)[0];
    const spp = ifd.samplesPerPixel;
    return { width: ifd.width, height: ifd.height, gray: toGray(ifd.data, ifd.width, ifd.height, spp, ifd.bitsPerSample, ifd.type, ifd.sampleFormat ?? 1, ifd.palette ? null : null) };
  };
  return out;
}

function toGray(data, width, height, spp, bps, photometric, sampleFormat, colorMap) {
  const n = width * height;
  const g = new Float32Array(n);
  let maxV = sampleFormat === 3 ? 1 : 2 ** bps - 1;
  if (sampleFormat === 3) {
    let lo = Infinity;
    let hi = -Infinity;
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const o = i * spp;
      y[i] = spp >= 3 ? W[0] * data[o] + W[1] * data[o + 1] + W[2] * data[o + 2] : data[o];
      if (Number.isFinite(y[i])) (lo = Math.min(lo, y[i])), (hi = Math.max(hi, y[i]));
    }
    maxV = hi > lo ? hi - lo : 1;
    for (let i = 0; i < n; i++) g[i] = (y[i] - lo) / maxV;
    return g;
  }
  if (photometric === 3 && colorMap) {
    const m = 2 ** bps;
    for (let i = 0; i < n; i++) {
      const k = data[i];
      g[i] = (W[0] * colorMap[k] + W[1] * colorMap[m + k] + W[2] * colorMap[2 * m + k]) / 65535;
    }
    return g;
  }
  for (let i = 0; i < n; i++) {
    const o = i * spp;
    g[i] = spp >= 3 && photometric === 2 ? (W[0] * data[o] + W[1] * data[o + 1] + W[2] * data[o + 2]) / maxV : data[o] / maxV;
    if (photometric === 0) g[i] = 1 - g[i];
  }
  return g;
}

async function correctness(cands) {
  const dir = join(ROOT, 'tests/fixtures/decode');
  const exp = JSON.parse(readFileSync(join(dir, 'expected.json'), 'utf8')).files;
  const res = {};
  for (const [name, dec] of Object.entries(cands)) {
    const r = { agree: 0, differ: [], refused: [] };
    for (const [file, e] of Object.entries(exp)) {
      if (e.format !== 'tiff') continue;
      const b = new Uint8Array(readFileSync(join(dir, file)));
      try {
        const d = await dec(b);
        if (e.refuse) {
          r.decodedWhatWeRefuse = [...(r.decodedWhatWeRefuse ?? []), file];
          continue;
        }
        // lossless: 1e-6; JPEG-in-TIFF: the JPEG fixtures' tolerance against libjpeg's fancy upsampling
        const tol = e.lossy ? 16 / 255 : 1e-6;
        const bad = e.samples.filter(([x, y, v]) => !(Math.abs(d.gray[y * d.width + x] - v) < tol));
        if (d.width !== e.widthPx || d.height !== e.heightPx || bad.length > 0) r.differ.push(`${file}: ${bad.length} of ${e.samples.length} samples differ`);
        else r.agree++;
      } catch (err) {
        if (e.refuse) r.agree++; // refused as we do (NaN samples, half floats)
        else r.refused.push(`${file}: ${String(err?.message ?? err).split('\n')[0].slice(0, 100)}`);
      }
    }
    res[name] = r;
  }
  return res;
}

/** Child mode: decode each listed file with one candidate, one JSON line per file. */
async function child(modulesDir, cand, listFile, from) {
  const cands = await candidates(modulesDir);
  const dec = cands[cand];
  const files = JSON.parse(readFileSync(listFile, 'utf8'));
  for (let i = from; i < files.length; i++) {
    const b = new Uint8Array(readFileSync(files[i]));
    const t0 = performance.now();
    let kind = 'ok';
    try {
      await dec(b);
    } catch (e) {
      kind = e && e.name === 'FractozoneError' ? 'refused' : 'threw';
    }
    process.stdout.write(`${JSON.stringify({ i, kind, ms: performance.now() - t0 })}\n`);
  }
  process.stdout.write(`${JSON.stringify({ done: true, rssMb: process.resourceUsage().maxRSS / 1024 })}\n`);
}

function runChild(modulesDir, cand, listFile, from) {
  return new Promise((res) => {
    const p = spawn(process.execPath, [fileURLToPath(import.meta.url), '--child', cand, '--list', listFile, '--from', String(from), ...(modulesDir ? ['--modules', modulesDir] : [])], { stdio: ['ignore', 'pipe', 'ignore'] });
    const lines = [];
    let buf = '';
    let last = Date.now();
    p.stdout.on('data', (d) => {
      buf += d;
      let k;
      while ((k = buf.indexOf('\n')) >= 0) {
        lines.push(JSON.parse(buf.slice(0, k)));
        buf = buf.slice(k + 1);
        last = Date.now();
      }
    });
    const watch = setInterval(() => {
      if (Date.now() - last > 10_000) p.kill('SIGKILL');
    }, 500);
    p.on('exit', (code, signal) => {
      clearInterval(watch);
      res({ lines, code, signal });
    });
  });
}

async function robustness(modulesDir, names, n) {
  const work = mkdtempSync(join(tmpdir(), 'fz-tiffcmp-'));
  const dir = join(ROOT, 'tests/fixtures/decode');
  const seeds = readdirSync(dir).filter((f) => f.endsWith('.tif')).map((f) => new Uint8Array(readFileSync(join(dir, f))));
  const r = rng(4242);
  const files = [];
  for (let i = 0; i < n; i++) {
    const { bytes } = mutate(r.pick(seeds), r, r.pick(seeds));
    const p = join(work, `${i}.tif`);
    writeFileSync(p, bytes);
    files.push(p);
  }
  const listFile = join(work, 'list.json');
  writeFileSync(listFile, JSON.stringify(files));
  const res = {};
  for (const cand of names) {
    const s = { ok: 0, refused: 0, threw: 0, hangs: [], crashes: [], slowestMs: 0, peakRssMb: 0 };
    let from = 0;
    while (from < files.length) {
      const { lines, signal, code } = await runChild(modulesDir, cand, listFile, from);
      let next = from;
      for (const l of lines) {
        if (l.done) {
          s.peakRssMb = Math.max(s.peakRssMb, Math.round(l.rssMb));
          next = files.length;
          continue;
        }
        s[l.kind]++;
        s.slowestMs = Math.max(s.slowestMs, Math.round(l.ms));
        next = l.i + 1;
      }
      if (next < files.length) {
        (signal === 'SIGKILL' ? s.hangs : s.crashes).push(`${next}.tif${signal ? '' : ` (exit ${code})`}`);
        next++;
      }
      from = next;
    }
    res[cand] = s;
  }
  return { dir: work, res };
}

async function speed(cands) {
  const work = mkdtempSync(join(tmpdir(), 'fz-tiffspeed-'));
  const raw = join(work, 'big16.tif');
  const r = spawnSync(process.execPath, [join(ROOT, 'dist/cli/main.js'), 'render', '--out', raw, '--size', '4000x3000', '--pixel-size', '2um', '--bit-depth', '16'], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  const files = { none: raw };
  // Deflate + horizontal predictor by tifffile, LZW by ImageMagick (tifffile needs imagecodecs for LZW)
  const py = spawnSync('/usr/bin/python3', ['-c', `import tifffile;a=tifffile.imread('${raw}');tifffile.imwrite('${work}/deflate.tif',a,compression='zlib',predictor=True)`], { encoding: 'utf8' });
  if (py.status === 0) files['deflate+predictor'] = join(work, 'deflate.tif');
  const im = spawnSync('convert', [raw, '-compress', 'LZW', join(work, 'lzw.tif')], { encoding: 'utf8' });
  if (im.status === 0) files.lzw = join(work, 'lzw.tif');
  const res = {};
  for (const [name, dec] of Object.entries(cands)) {
    res[name] = {};
    for (const [kind, f] of Object.entries(files)) {
      const b = new Uint8Array(readFileSync(f));
      let best = Infinity;
      try {
        for (let k = 0; k < 3; k++) {
          const t0 = performance.now();
          await dec(b);
          best = Math.min(best, performance.now() - t0);
        }
        res[name][kind] = `${(best / 1000).toFixed(2)} s`;
      } catch (e) {
        res[name][kind] = `failed: ${String(e?.message ?? e).slice(0, 60)}`;
      }
    }
  }
  return res;
}

async function main() {
  const modulesDir = arg('--modules', null);
  if (process.argv.includes('--child')) return child(modulesDir, arg('--child'), arg('--list'), Number(arg('--from', '0')));
  const cands = await candidates(modulesDir);
  const out = { correctness: await correctness(cands) };
  process.stderr.write(`${JSON.stringify(out.correctness, null, 1)}\n`);
  if (arg('--fuzz', '2000') === '0') return process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
  const rob = await robustness(modulesDir, Object.keys(cands), Number(arg('--fuzz', '2000')));
  out.robustness = rob.res;
  process.stderr.write(`${JSON.stringify(rob.res, null, 1)}\n(damaged files in ${rob.dir})\n`);
  if (!process.argv.includes('--no-speed')) out.speed = await speed(cands);
  process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
}

main().catch((e) => {
  process.stderr.write(`${e.stack ?? e}\n`);
  process.exitCode = 1;
});
