/**
 * The step fit's profile pooled over neighbouring rays (src/core/segment/rayPool.ts) and its effect
 * on the boundary refinement (segment/refine.ts) where rim and core differ little against the
 * spread of the arc variances.
 */
import { describe, expect, it } from 'vitest';
import { findSpecimen, refineBoundary } from '../../../src/core/segment/index.js';
import { POOL_WINDOWS, pooledProfile, poolHalfRays } from '../../../src/core/segment/rayPool.js';
import { makeDiscImage } from '../../helpers/discImages.js';
import { medianOf } from '../../../src/core/measure/statistics.js';

describe('pooledProfile', () => {
  const profiles = [
    Float64Array.from([0, 1, 2, 3]),
    Float64Array.from([0, 5, NaN, 3]),
    Float64Array.from([0, 3, 4, NaN]),
    Float64Array.from([0, 9, 8]),
  ];

  it('is the median of the neighbouring rays at each radius, circular, leaving out their gaps', () => {
    // ray 0 with one ray each side: rays 3, 0, 1
    const p = pooledProfile(profiles, 0, 1, 1, 3);
    expect(p[1]).toBe(5); // median of 9, 1, 5
    expect(p[2]).toBe(5); // median of 8, 2 (ray 1 has a gap)
    expect(p[3]).toBe(3); // ray 3 is shorter: median of 3, 3
    expect(p[0]).toBe(0); // k0 − 1 is filled too (the fit's sub-sample interpolation reads it)
  });

  it("keeps the ray's own gaps and leaves the indices outside the search unknown", () => {
    const p = pooledProfile(profiles, 1, 1, 2, 2);
    expect(Number.isNaN(p[2])).toBe(true); // ray 1 has no value at k = 2
    expect(p[1]).toBe(3); // k0 − 1: median of 1, 5, 3
    expect(Number.isNaN(p[3])).toBe(true);
  });

  it('with no neighbours it is the ray itself', () => {
    expect(pooledProfile(profiles, 2, 0, 1, 3)).toBe(profiles[2]);
  });
});

describe('poolHalfRays', () => {
  it('counts the rays within ± the given windows of arc length, at most 5° each side', () => {
    // window 11 px at radius 247 px, 360 rays: rays 4.31 px apart → ±11 px is ±3 rays (the SEM scene)
    expect(poolHalfRays(1, 11, 360, 247)).toBe(3);
    expect(poolHalfRays(1, 11, 120, 247)).toBe(1);
    expect(poolHalfRays(0, 11, 360, 247)).toBe(0);
    expect(poolHalfRays(3, 40, 360, 100)).toBe(5);
  });
});

describe('refineBoundary with a weak texture step in noise', () => {
  // white noise only: rim σ 0.03, core σ 0.03·√2 (core/rim variance 2 : 1, as on the SEM scene);
  // the boundary at 180 px, the outer edge at 240 px; the coarse boundary 3 px rimward of it
  const img = makeDiscImage({ rimStd: 0.03, coreStd: 0.03 * Math.SQRT2, seed: 31 });
  const sp = findSpecimen(img.raster);
  const c = { x: sp.circle.cx, y: sp.circle.cy };
  const coarse = Array.from({ length: 360 }, (_, i) => {
    const t = (i * Math.PI) / 180;
    return { x: c.x + 183 * Math.cos(t), y: c.y - 183 * Math.sin(t) };
  });
  const meanError = (poolWindows: number): number => {
    const r = refineBoundary(img.raster, sp.contour, coarse, c, { windowPx: 11, poolWindows });
    const e: number[] = [];
    r.radiiPx.forEach((rad, i) => {
      if (rad !== null) e.push(rad - img.boundaryRadiusAt(r.thetaDeg[i]));
    });
    return e.reduce((a, b) => a + b, 0) / e.length;
  };

  it('the pooled fit puts the boundary within 0.2 px of the truth on average; single rays fall into the core', () => {
    // measured on seeds 31–33: single rays −0.26/−0.26/−0.27 px, pooled +0.04/+0.06/−0.02 px
    const single = meanError(0);
    const pooled = meanError(POOL_WINDOWS);
    expect(Math.abs(pooled)).toBeLessThan(0.2);
    // the single-ray fit's coreward tail (the bias the pooling removes)
    expect(single).toBeLessThan(pooled - 0.15);
  });
});

describe('pooledProfile against the plain form (medianOf per radius)', () => {
  /** The former form: an array of the neighbours' known values per radius, its medianOf. */
  function plain(profiles: readonly Float64Array[], i: number, half: number, k0: number, k1: number): Float64Array {
    const n = profiles.length;
    const own = profiles[i];
    if (half <= 0) return own;
    const out = new Float64Array(own.length).fill(NaN);
    for (let k = Math.max(0, k0 - 1); k <= Math.min(own.length - 1, k1); k++) {
      if (Number.isNaN(own[k])) continue;
      const w: number[] = [];
      for (let j = -half; j <= half; j++) {
        const p = profiles[(((i + j) % n) + n) % n];
        if (k < p.length && !Number.isNaN(p[k])) w.push(p[k]);
      }
      out[k] = medianOf(w);
    }
    return out;
  }

  it('gives the same numbers, gaps, ties, ragged lengths and even counts included', () => {
    let s = 4242;
    const rnd = (): number => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return s / 2 ** 32;
    };
    const nRays = 40;
    const profiles = Array.from({ length: nRays }, () => {
      const len = 30 + Math.floor(rnd() * 20);
      return Float64Array.from({ length: len }, () => {
        const u = rnd();
        return u < 0.15 ? NaN : u < 0.3 ? -2.5 : Math.log(rnd() + 1e-10) * 3;
      });
    });
    for (let i = 0; i < nRays; i++) {
      for (const half of [0, 1, 2, 3, 5]) {
        const got = pooledProfile(profiles, i, half, 3, 45);
        const want = plain(profiles, i, half, 3, 45);
        expect(got.length).toBe(want.length);
        for (let k = 0; k < got.length; k++) expect(Object.is(got[k], want[k])).toBe(true);
      }
    }
  });
});
