/**
 * The classification's loops written without branches (segment/rimCoreLoops.ts) against their plain
 * branching forms: the same values in the same order, so the same sums to the last bit.
 */
import { describe, expect, it } from 'vitest';
import { meanVar, splitClasses, splitSums } from '../../../src/core/segment/rimCoreLoops.js';

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** Values with ties, ±0 and (optionally) NaN. */
function values(n: number, seed: number, nan: boolean): Float32Array {
  const r = rng(seed);
  const v = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const u = r();
    v[i] = u < 0.05 ? -0 : u < 0.1 ? 0 : u < 0.2 ? 0.5 : nan && u < 0.22 ? NaN : (r() - 0.4) * 7;
  }
  return v;
}

describe('rim/core loops without branches', () => {
  it('splitSums equals the branching sums', () => {
    for (const [n, seed, t] of [[1000, 1, 0.5], [777, 2, 0], [50, 3, -1], [0, 4, 0], [2000, 5, 10]] as const) {
      const v = values(n, seed, seed % 2 === 1);
      let sa = 0;
      let na = 0;
      let sb = 0;
      for (let k = 0; k < v.length; k++) {
        if (v[k] > t) {
          sa += v[k];
          na++;
        } else sb += v[k];
      }
      const got = splitSums(v, t);
      expect(Object.is(got[0], sa) && got[1] === na && Object.is(got[2], sb)).toBe(true);
    }
  });

  it('meanVar equals the one-function form', () => {
    for (const [n, seed] of [[1000, 6], [3, 7], [1, 8], [4096, 9]] as const) {
      const v = values(n, seed, false);
      let s = 0;
      for (let i = 0; i < n; i++) s += v[i];
      const m = s / n;
      let q = 0;
      for (let i = 0; i < n; i++) q += (v[i] - m) * (v[i] - m);
      expect(meanVar(v)).toEqual([m, q / Math.max(1, n - 1)]);
    }
    expect(meanVar(new Float32Array(0))).toEqual([NaN, NaN]);
  });

  it('splitClasses on the specimen box equals the branching form over every pixel', async () => {
    const { setBox } = await import('../../../src/core/segment/cvutil.js');
    for (const seed of [10, 11, 12]) {
      const r = rng(seed);
      const W = 60;
      const H = 50;
      const n = W * H;
      const bit = (p: number): Uint8Array => Uint8Array.from({ length: n }, () => (r() < p ? 1 + Math.floor(r() * 3) : 0));
      // the specimen inside a box that does not reach every side (seed 12: the whole frame)
      const spec = bit(0.8).map((v, i) => (seed === 12 || (i % W > 7 && i % W < 51 && i / W > 4 && i / W < 40) ? v : 0));
      const interior = spec.map((s) => (s && r() < 0.8 ? 1 : 0));
      const core = bit(0.5);
      const coreIn = bit(0.3);
      const coreOut = bit(0.6);
      const comb = values(n, seed, true);
      let nIdx = 0;
      for (const v of interior) if (v) nIdx++;
      const cv: number[] = [];
      const rv: number[] = [];
      let nCore = 0;
      let nSpec = 0;
      for (let i = 0; i < n; i++) {
        if (!spec[i]) continue;
        nSpec++;
        if (core[i]) nCore++;
        if (!interior[i]) continue;
        if (coreIn[i]) cv.push(comb[i]);
        else if (!coreOut[i]) rv.push(comb[i]);
      }
      const cvBuf = new Float32Array(nIdx + 1);
      const rvBuf = new Float32Array(nIdx + 1);
      const [nCv, nRv, gCore, gSpec] = splitClasses(spec, core, interior, coreIn, coreOut, comb, cvBuf, rvBuf, W, setBox(spec, W, H)!);
      expect([nCv, nRv, gCore, gSpec]).toEqual([cv.length, rv.length, nCore, nSpec]);
      expect(Array.from(cvBuf.subarray(0, nCv))).toEqual(cv);
      expect(Array.from(rvBuf.subarray(0, nRv))).toEqual(rv);
    }
  });
});

describe('hypot2 (the sector radii)', () => {
  it('equals Math.hypot bit for bit on pixel grids around fractional centres and on random values', async () => {
    const { hypot2 } = await import('../../../src/core/segment/rimCoreSectors.js');
    let bad = 0;
    for (const [cx, cy] of [[599.7, 449.2], [0, 0], [133.3333333333, 99.5], [400.25, 300.125]]) {
      for (let y = -300; y <= 300; y++) {
        for (let x = -420; x <= 420; x++) {
          const dx = x - cx;
          const dy = cy - y;
          if (!Object.is(hypot2(dx, dy), Math.hypot(dx, dy))) bad++;
        }
      }
    }
    const r = rng(77);
    for (let i = 0; i < 300000; i++) {
      const a = (r() - 0.5) * 10 ** (r() * 40 - 20);
      const b = (r() - 0.5) * 10 ** (r() * 40 - 20);
      if (!Object.is(hypot2(a, b), Math.hypot(a, b))) bad++;
      if (!Object.is(hypot2(a, 0), Math.hypot(a, 0)) || !Object.is(hypot2(-0, b), Math.hypot(-0, b))) bad++;
    }
    expect(hypot2(0, -0)).toBe(0);
    expect(bad).toBe(0);
  });
});

describe('sectorThresholds (sector arrays by a counting sort)', () => {
  it('equals the per-sector arrays filled one by one (the former form) on random combined features', async () => {
    const { sectorPositions, sectorThresholds } = await import('../../../src/core/segment/rimCoreSectors.js');
    const { otsuThreshold } = await import('../../../src/core/segment/cvutil.js');
    /** The former form: one array per sector, values pushed in interior order; Otsu and η per sector as in rimCoreSectors.ts. */
    function plain(comb: Float32Array, idx: Int32Array, pos: Float32Array, rad: Float32Array, split: { t: number; lo: number; hi: number }): number[] {
      const vals: number[][] = Array.from({ length: 12 }, () => []);
      const rads: number[][] = Array.from({ length: 12 }, () => []);
      for (let i = 0; i < pos.length; i++) {
        const s = Math.min(11, Math.floor(pos[i]));
        vals[s].push(comb[idx[i]]);
        rads[s].push(rad[i]);
      }
      return vals.map((v0, s) => {
        if (v0.length <= 50) return split.t;
        const v = Float32Array.from(v0);
        const r = Float32Array.from(rads[s]);
        const t = otsuThreshold(v, split.lo, split.hi);
        const [m, va] = meanVar(v);
        const eta = (tt: number): [number, number, number] => {
          const [sa, na, sb] = splitSums(v, tt);
          const nb = v.length - na;
          return [va > 0 && na && nb ? ((na / v.length) * (sa / na - m) ** 2 + (nb / v.length) * (sb / nb - m) ** 2) / va : 0, na, nb];
        };
        const [e, na, nb] = eta(t);
        const gain = e - eta(split.t)[0];
        let rA = 0;
        let rB = 0;
        let rMax = 0;
        for (let i = 0; i < v.length; i++) {
          if (v[i] > t) rA += r[i];
          else rB += r[i];
          if (r[i] > rMax) rMax = r[i];
        }
        const order = na && nb && rMax > 0 ? (rB / nb - rA / na) / rMax : 0;
        const above = na / v.length;
        return e >= 0.55 && above >= 0.08 && above <= 0.92 && order >= 0.06 && gain >= 0.035 ? t : split.t;
      });
    }
    for (const seed of [21, 22, 23]) {
      const r = rng(seed);
      const fw = 120;
      const fh = 90;
      const cx = 60.3;
      const cy = 44.8;
      const list: number[] = [];
      for (let y = 0; y < fh; y++) for (let x = 0; x < fw; x++) if (Math.hypot(x - cx, y - cy) < 40) list.push(y * fw + x);
      const idx = Int32Array.from(list);
      const comb = new Float32Array(fw * fh);
      // rough core inside radius 25, both classes shifted up on one side (so the sectors there take their own threshold)
      for (const i of idx) {
        const x = (i % fw) - cx;
        const y = Math.floor(i / fw) - cy;
        const core = Math.hypot(x, y) < 25;
        comb[i] = (core ? 1 : -1) + (x > 0 ? 1.5 : 0) + (r() - 0.5) * (seed === 23 ? 4 : 1.2);
      }
      const { pos, rad } = sectorPositions(idx, fw, { x: cx, y: cy });
      const split = { t: 0, lo: -3, hi: 3 };
      const got = Array.from(sectorThresholds(comb, idx, pos, rad, split));
      expect(got).toEqual(plain(comb, idx, pos, rad, split));
      if (seed !== 23) expect(got.filter((t) => t !== split.t).length).toBeGreaterThan(0);
    }
  });
});
