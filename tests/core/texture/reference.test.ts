/**
 * Our texture features against outside libraries. The references are produced by
 * scripts/fixtures/make_texture_fixtures.py with Debian's python3-skimage / python3-scipy /
 * python3-opencv (versions in tests/fixtures/texture/manifest.json).
 */
import { describe, expect, it } from 'vitest';
import {
  downsample,
  gradientEnergy,
  gradientEnergyPointwise,
  highPassEnergy,
  localEntropy,
  localStd,
  localVariance,
} from '../../../src/core/texture/index.js';
import { inputRaster, loadF32, loadU8, maxAbsDiff, maxOf } from './fixtures.js';

const img = loadU8('input_u8.bin');
const x = inputRaster();

describe('localEntropy vs scikit-image filters.rank.entropy', () => {
  for (const w of [3, 7, 15]) {
    it(`matches skimage rank.entropy, footprint ones((${w},${w})), 256 bins, to 1e-5 bit`, () => {
      // Reference: skimage.filters.rank.entropy (bits, log base 2; counts only in-image pixels)
      const ref = loadF32(`entropy_w${w}.bin`);
      const ours = localEntropy(img.data, img.width, img.height, w);
      expect(maxAbsDiff(ours.data, ref.data)).toBeLessThanOrEqual(1e-5);
      expect(maxOf(ref.data)).toBeGreaterThan(2); // the fixture is not trivially flat
    });
  }

  it('matches skimage rank.entropy of img >> 3 with 32 bins on 8-bit input, to 1e-5 bit', () => {
    // Reference: skimage.filters.rank.entropy(img >> 3, ones((7,7))); our 32 bins = floor(v·32/256) = v >> 3
    const ref = loadF32('entropy_levels32_w7.bin');
    const ours = localEntropy(img.data, img.width, img.height, 7, { bins: 32 });
    expect(maxAbsDiff(ours.data, ref.data)).toBeLessThanOrEqual(1e-5);
  });
});

describe('localVariance / localStd vs SciPy ndimage.uniform_filter (mode="mirror")', () => {
  for (const w of [3, 7, 15]) {
    it(`variance w=${w} within 1e-6 of the data range² (range 1)`, () => {
      // Reference: scipy.ndimage.uniform_filter(x², w, mode='mirror') − uniform_filter(x, w, mode='mirror')²
      const ref = loadF32(`variance_w${w}.bin`);
      expect(maxAbsDiff(localVariance(x, w).data, ref.data)).toBeLessThanOrEqual(1e-6);
      const sd = localStd(x, w).data;
      const refSd = Array.from(ref.data, (v) => Math.sqrt(v));
      // sqrt amplifies absolute error near 0: |√a − √b| ≤ √|a − b| ≤ 1e-3
      expect(maxAbsDiff(sd, refSd)).toBeLessThanOrEqual(1e-3);
    });
  }
});

describe('gradient energy vs SciPy ndimage.sobel (mode="mirror")', () => {
  it('pointwise gx² + gy² within 1e-5 relative to its maximum', () => {
    // Reference: scipy.ndimage.sobel(x, axis=1/0, mode='mirror'), same unnormalised 3×3 kernel as OpenCV
    const ref = loadF32('sobel_energy.bin');
    const ours = gradientEnergyPointwise(x);
    expect(maxAbsDiff(ours.data, ref.data) / maxOf(ref.data)).toBeLessThanOrEqual(1e-5);
  });
  it('box-averaged (w=7) within 1e-5 relative to its maximum', () => {
    // Reference: scipy.ndimage.uniform_filter(sobel energy, 7, mode='mirror')
    const ref = loadF32('sobel_energy_w7.bin');
    expect(maxAbsDiff(gradientEnergy(x, 7).data, ref.data) / maxOf(ref.data)).toBeLessThanOrEqual(1e-5);
  });
});

describe('high-pass energy vs SciPy', () => {
  it('w=7 within 1e-6 of the data range²', () => {
    // Reference: uniform_filter((x − uniform_filter(x, 7))², 7), mode='mirror'
    const ref = loadF32('highpass_w7.bin');
    expect(maxAbsDiff(highPassEnergy(x, 7).data, ref.data)).toBeLessThanOrEqual(1e-6);
  });
});

describe('downsample vs OpenCV (python3-opencv) cv2.resize INTER_AREA', () => {
  for (const f of [2, 3]) {
    it(`factor ${f} matches to 1e-6`, () => {
      const ref = loadF32(`area_f${f}.bin`);
      const ours = downsample(x, f);
      expect([ours.width, ours.height]).toEqual([ref.width, ref.height]);
      expect(maxAbsDiff(ours.data, ref.data)).toBeLessThanOrEqual(1e-6);
    });
  }
});
