#!/usr/bin/env node
/**
 * Per-ray accuracy of the outer edge and of the band width on a rendered scene set: what the mean
 * width hides. scene-baseline.mjs compares the mean width and the mean radius with the truth; a
 * measured outline that sits 4 px outside the notch root on one side and 1 px inside on the other
 * keeps both means right while the width around the circumference (its minimum, spread, first
 * harmonic) is wrong. Here every measured ray is compared with the truth:
 *
 * - outer edge: the measured edge point (specimen centre + outer radius along the ray) against the
 *   truth's outer radius at that point's angle about the true centre (truth.outerRadiusPxByAngle,
 *   linear between whole degrees), in px;
 * - width: the measured width of the ray against truth.band.widthUmByAngle at the same angle (rays
 *   from the tool's centre and the true centre differ by the centre offset, well under a pixel on
 *   these scenes), in % of the true mean width.
 *
 * Prints per specimen: bias (mean signed error), median / 95th percentile / largest |error| and the
 * number of rays beyond 2 px; then the whole set. Run after `npm run build`:
 *   node scripts/outer-edge-check.mjs --dir DIR [--only REGEX]   (DIR from `fractozone render --scene-set DIR`)
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const CLI = join(ROOT, 'dist/cli/main.js');
const argv = process.argv.slice(2);
const opt = (name) => (argv.includes(name) ? argv[argv.indexOf(name) + 1] : null);
const dir = opt('--dir');
const only = opt('--only') ? new RegExp(opt('--only')) : null;
if (!dir || !existsSync(join(dir, 'scenes.json'))) {
  process.stderr.write('outer-edge-check: give --dir DIR, a folder written by `fractozone render --scene-set DIR`\n');
  process.exit(2);
}
if (!existsSync(CLI)) {
  process.stderr.write('outer-edge-check: the CLI is not built: run `npm run build` first\n');
  process.exit(2);
}

/** Linear interpolation in a 360-entry by-angle table (whole degrees, counter-clockwise). */
function atAngle(table, deg) {
  const n = table.length;
  const f = (((deg % 360) + 360) % 360) * (n / 360);
  const i0 = Math.floor(f) % n;
  const w = f - Math.floor(f);
  const a = table[i0];
  const b = table[(i0 + 1) % n];
  if (a === null || b === null) return w < 0.5 ? a : b;
  return a * (1 - w) + b * w;
}

function summary(errs) {
  const a = errs.map(Math.abs).sort((x, y) => x - y);
  const q = (f) => (a.length ? a[Math.min(a.length - 1, Math.floor(f * a.length))] : NaN);
  const bias = errs.reduce((s, v) => s + v, 0) / Math.max(1, errs.length);
  return { n: a.length, bias, p50: q(0.5), p95: q(0.95), max: a.length ? a[a.length - 1] : NaN, over2: a.filter((x) => x > 2).length };
}

const index = JSON.parse(readFileSync(join(dir, 'scenes.json'), 'utf8'));
const allOuter = [];
const allWidth = [];
const fmt = (v, d = 2) => (Number.isFinite(v) ? v.toFixed(d) : '–');
console.log('| scene | specimen | outer edge bias px | median | p95 | max | rays > 2 px | width p95 |error| % |');
console.log('|---|---|---|---|---|---|---|---|');
for (const s of index.scenes) {
  if (only && !only.test(s.name)) continue;
  const truth = JSON.parse(readFileSync(join(dir, s.truth), 'utf8'));
  const r = spawnSync(process.execPath, [CLI, 'measure', join(dir, s.file), '--pixel-size', `${s.umPerPx}um`, '--json'], { encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  if (r.status !== 0) {
    console.log(`| ${s.name} | – | measure failed: ${(r.stderr.trim().split('\n').pop() ?? '').replace(/\|/g, '/')} | | | | | |`);
    continue;
  }
  const res = JSON.parse(r.stdout);
  const measured = res.specimens ?? [{ id: '', specimen: res.specimen, band: res.band }];
  const truths = truth.specimens ?? [{ id: 'A', centre: truth.centre, outerRadiusPxByAngle: truth.outerRadiusPxByAngle, band: truth.band }];
  for (const m of measured) {
    const c = m.specimen.center;
    const t = truths.reduce((a, b) => (Math.hypot(b.centre.x - c.x, b.centre.y - c.y) < Math.hypot(a.centre.x - c.x, a.centre.y - c.y) ? b : a));
    const outerErr = [];
    const widthErr = [];
    const px = truth.umPerPxX;
    for (const p of m.band.profile ?? []) {
      if (p.outerRadiusUm === null) continue;
      const th = (p.angleDeg * Math.PI) / 180;
      const rp = p.outerRadiusUm / px;
      const X = c.x + rp * Math.cos(th) - t.centre.x;
      const Y = c.y - rp * Math.sin(th) - t.centre.y;
      const phi = (Math.atan2(-Y, X) * 180) / Math.PI;
      const rt = atAngle(t.outerRadiusPxByAngle, phi);
      if (rt !== null && Number.isFinite(rt)) outerErr.push(Math.hypot(X, Y) - rt);
      const wt = t.band?.widthUmByAngle ? atAngle(t.band.widthUmByAngle, p.angleDeg) : null;
      if (p.valid && p.widthUm !== null && wt !== null && Number.isFinite(wt)) widthErr.push((100 * (p.widthUm - wt)) / t.band.meanWidthUm);
    }
    const o = summary(outerErr);
    const w = summary(widthErr);
    allOuter.push(...outerErr);
    allWidth.push(...widthErr);
    console.log(`| ${s.name} | ${m.id || t.id} | ${fmt(o.bias)} | ${fmt(o.p50)} | ${fmt(o.p95)} | ${fmt(o.max)} | ${o.over2} | ${fmt(w.p95, 1)} |`);
  }
}
const o = summary(allOuter);
const w = summary(allWidth);
console.log(`\nall rays: outer edge |error| median ${fmt(o.p50)} px, p95 ${fmt(o.p95)} px, ${o.over2} of ${o.n} beyond 2 px; width |error| p95 ${fmt(w.p95, 1)} % of the true mean`);
