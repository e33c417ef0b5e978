/**
 * The speed-ups that compute less but must give the same numbers: quantiles by selection against a
 * sorted copy, morphDisc on the set pixels' box against the distance transform of the whole image
 * (outside reference: opencv-wasm 4.3 cv.distanceTransform), and the bootstrap median by counting
 * drawn ranks against the median of the resampled values themselves.
 */
import { describe, expect, it } from 'vitest';
import { getCv } from '../../../src/core/cv.js';
import { morphDisc } from '../../../src/core/segment/cvutil.js';
import { quantiles } from '../../../src/core/segment/quantiles.js';
import { widthStatistics } from '../../../src/core/measure/statistics.js';
import { createRng } from '../../../src/core/random.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

/** morphDisc's rule on the whole image (the code before the box): distance transform, then threshold. */
function wholeImage(src: Uint8Array, w: number, h: number, op: 'erode' | 'dilate', r: number): Uint8Array {
  const cv = getCv();
  const m = new cv.Mat(h, w, cv.CV_8U);
  const s = new cv.Mat();
  const d = new cv.Mat();
  try {
    (m.data as Uint8Array).set(src);
    if (op === 'erode') m.copyTo(s);
    else cv.bitwise_not(m, s);
    cv.distanceTransform(s, d, cv.DIST_L2, 5);
    const dist = d.data32F as Float32Array;
    return Uint8Array.from(dist, (v) => (op === 'erode' ? (v > r ? 255 : 0) : v <= r ? 255 : 0));
  } finally {
    m.delete();
    s.delete();
    d.delete();
  }
}

function viaMorphDisc(src: Uint8Array, w: number, h: number, op: 'erode' | 'dilate', r: number): Uint8Array {
  const cv = getCv();
  const m = new cv.Mat(h, w, cv.CV_8U);
  try {
    (m.data as Uint8Array).set(src);
    morphDisc(m, op, r);
    return Uint8Array.from(m.data as Uint8Array);
  } finally {
    m.delete();
  }
}

describe('morphDisc on the box of the set pixels', () => {
  for (const [w, h, r, blobs] of [
    [60, 45, 3, 3],
    [80, 50, 7.5, 1],
    [40, 70, 12, 5],
    [30, 30, 25, 2], // the disc reaches past the frame
    [50, 40, 2, 0], // nothing set
  ] as const) {
    for (const op of ['erode', 'dilate'] as const) {
      it(`${op}s a ${w}×${h} mask with ${blobs} blobs (r = ${r}) as the whole-image transform does`, () => {
        const rnd = lcg(w * 7919 + h * 31 + blobs);
        const src = new Uint8Array(w * h);
        for (let n = 0; n < blobs; n++) {
          // some blobs cut by the frame, so the box touches it
          const cx = rnd() * w * 1.2 - 0.1 * w;
          const cy = rnd() * h * 1.2 - 0.1 * h;
          const rr = 2 + rnd() * 0.4 * Math.min(w, h);
          for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) if ((x - cx) ** 2 + (y - cy) ** 2 < rr * rr) src[y * w + x] = 255;
        }
        const got = viaMorphDisc(src, w, h, op, r);
        const want = wholeImage(src, w, h, op, r);
        expect(Array.from(got)).toEqual(Array.from(want));
        // the case is not trivial: the operation changed something (except on the empty mask)
        if (blobs > 0) expect(got.some((v, i) => v !== src[i])).toBe(true);
      });
    }
  }
});

describe('quantiles by selection', () => {
  it('give the values at the same ranks as a sorted copy, ±0 included and NaN left out', () => {
    const rnd = lcg(11);
    for (let t = 0; t < 200; t++) {
      const n = 1 + Math.floor(rnd() * 3000);
      const v = new Float32Array(n);
      for (let i = 0; i < n; i++) v[i] = t % 3 === 0 ? (rnd() < 0.5 ? -0 : 0) : t % 3 === 1 ? Math.floor(rnd() * 4) - 2 : rnd() < 0.05 ? NaN : rnd() * 10 - 5;
      const qs = [0.5, 0.75, 0.25, 0.005, 0.995, 0, 1];
      const sorted = Float64Array.from(Array.from(v).filter(Number.isFinite)).sort();
      const want = qs.map((q) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(q * (sorted.length - 1))))]);
      const got = quantiles(v, qs);
      got.forEach((g, i) => expect(Object.is(g, want[i]), `case ${t}, q ${qs[i]}: ${g} vs ${want[i]}`).toBe(true));
    }
  });
});

describe('bootstrap median by counting ranks', () => {
  it('gives the interval of the resampled values themselves (odd and even sizes, ties)', () => {
    const rnd = lcg(5);
    for (const n of [1, 2, 7, 40, 361]) {
      const values = Array.from({ length: n }, () => (n === 40 ? Math.floor(rnd() * 4) : 300 + 50 * rnd()));
      const B = 300;
      const got = widthStatistics(values, { seed: 9, bootstrap: B }).ci95Median;
      if (n < 2) {
        expect(got).toBeNull();
        continue;
      }
      // reference: resample the sorted values with the same generator and take each resample's median
      const sorted = Float64Array.from(values).sort();
      const rng = createRng(9);
      const meds = new Float64Array(B);
      for (let b = 0; b < B; b++) {
        const s = Float64Array.from({ length: n }, () => sorted[Math.floor(rng.nextFloat() * n)]).sort();
        meds[b] = n % 2 ? s[(n - 1) / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
      }
      meds.sort();
      // simple-statistics quantileSorted at 2.5 % and 97.5 %
      const qs = (p: number): number => {
        const idx = meds.length * p;
        return idx % 1 !== 0 ? meds[Math.ceil(idx) - 1] : 0.5 * (meds[idx - 1] + meds[idx]);
      };
      expect(got).toEqual([qs(0.025), qs(0.975)]);
    }
  });

  it('correlated profiles: blocks of round(τ) consecutive rays, the same interval as resampling the values block by block', () => {
    const rnd = lcg(11);
    for (const n of [90, 360, 361]) {
      // a smooth profile (two lobes) plus a little noise: neighbouring rays strongly correlated
      const values = Array.from({ length: n }, (_, i) => 400 + 20 * Math.sin((4 * Math.PI * i) / n) + 2 * rnd());
      const B = 300;
      const st = widthStatistics(values, { seed: 4, bootstrap: B });
      const block = Math.round(st.tau);
      expect(block).toBeGreaterThan(1);
      // reference: draw whole blocks of the values (circular), sort each resample, take its median
      const rng = createRng(4);
      const meds = new Float64Array(B);
      for (let b = 0; b < B; b++) {
        const x: number[] = [];
        while (x.length < n) {
          const start = Math.floor(rng.nextFloat() * n);
          for (let k = 0; k < block && x.length < n; k++) x.push(values[(start + k) % n]);
        }
        x.sort((a, c) => a - c);
        meds[b] = n % 2 ? x[(n - 1) / 2] : 0.5 * (x[n / 2 - 1] + x[n / 2]);
      }
      meds.sort();
      const qs = (p: number): number => {
        const idx = meds.length * p;
        return idx % 1 !== 0 ? meds[Math.ceil(idx) - 1] : 0.5 * (meds[idx - 1] + meds[idx]);
      };
      expect(st.ci95Median).toEqual([qs(0.025), qs(0.975)]);
      // and the interval is of the size of the mean's (effective sample size), not the 5–10 times
      // narrower one of independent draws
      const wMed = st.ci95Median![1] - st.ci95Median![0];
      const wMean = st.ci95Mean[1] - st.ci95Mean[0];
      expect(wMed / wMean).toBeGreaterThan(0.3);
      expect(wMed / wMean).toBeLessThan(2);
    }
  });
});
