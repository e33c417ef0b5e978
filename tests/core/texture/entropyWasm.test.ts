import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { localEntropy } from '../../../src/core/texture/index.js';
import { entropyWasmAvailable } from '../../../src/core/texture/kernels/entropyWasm.js';
import { decodeBase64, setWasmKernelsEnabled } from '../../../src/core/texture/kernels/wasm.js';
import { seeded } from './fixtures.js';

/** Smooth field plus noise: long runs of equal bins (counts up and down by many) and busy parts. */
function textured(W: number, H: number, seed: number): Uint8Array {
  const noise = seeded(W * H, seed, 256);
  const v = new Uint8Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      const smooth = 128 + 100 * Math.sin(x * 0.05) * Math.cos(y * 0.03);
      v[i] = x < W / 3 ? Math.round(smooth) & 0xfc : Math.min(255, Math.round(smooth * 0.5 + noise[i] * 0.5));
    }
  }
  return v;
}

function run(v: Uint8Array, W: number, H: number, w: number, bins: number, wasm: boolean): Float32Array {
  setWasmKernelsEnabled(wasm);
  return localEntropy(v, W, H, w, { bins }).data;
}

describe('entropy kernel in WebAssembly', () => {
  afterEach(() => setWasmKernelsEnabled(true));

  it('is available in Node (the speed figures in the README depend on it)', () => {
    expect(entropyWasmAvailable()).toBe(true);
  });

  it('gives output identical to the JavaScript loop (sizes, windows, bins, odd row counts)', () => {
    for (const [W, H, w, bins, seed] of [
      [64, 48, 15, 256, 1],
      [301, 77, 15, 256, 2],
      [300, 76, 3, 16, 3],
      [129, 130, 31, 64, 4],
      [40, 17, 15, 256, 5], // 2r + 1 = 15 < H = 17: a single interior row pair
      [16, 16, 15, 256, 6], // one interior column
      [700, 500, 25, 32, 7],
    ] as const) {
      const v = textured(W, H, seed);
      const js = run(v, W, H, w, bins, false);
      const wa = run(v, W, H, w, bins, true);
      let same = js.length === wa.length;
      for (let i = 0; same && i < js.length; i++) same = Object.is(js[i], wa[i]);
      expect(same, `${W}×${H} w=${w} bins=${bins}`).toBe(true);
      // and it is a real entropy image, not zeros
      expect(Math.max(...wa.subarray(0, W * 4))).toBeGreaterThan(0.5);
    }
  });

  it('reuses its memory across calls of different sizes without stale state', () => {
    const big = textured(900, 700, 11);
    const small = textured(120, 90, 12);
    const a1 = run(small, 120, 90, 15, 256, true);
    run(big, 900, 700, 15, 256, true);
    const a2 = run(small, 120, 90, 15, 256, true);
    const js = run(small, 120, 90, 15, 256, false);
    expect(Array.from(a2)).toEqual(Array.from(js));
    expect(Array.from(a1)).toEqual(Array.from(js));
  });

  it('decodes base64 like Buffer does', () => {
    const bytes = seeded(1001, 9, 256);
    for (const n of [0, 1, 2, 3, 1000, 1001]) {
      const b64 = Buffer.from(bytes.subarray(0, n)).toString('base64');
      expect(Array.from(decodeBase64(b64))).toEqual(Array.from(bytes.subarray(0, n)));
    }
    expect(() => decodeBase64('AB$C')).toThrow(/invalid base64/);
  });

  it('the embedded module is up to date with entropy.wat (scripts/build-wasm.mjs --check)', () => {
    const script = fileURLToPath(new URL('../../../scripts/build-wasm.mjs', import.meta.url));
    const r = spawnSync(process.execPath, [script, '--check'], { encoding: 'utf8' });
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
  });
});
