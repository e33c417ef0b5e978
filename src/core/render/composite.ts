/**
 * Compositing the shaded fracture surface over what lies beneath it: the plain mottled background, or
 * the layer of scene elements (holder, shadow, flank, objects; layers.ts), in gray or RGB.
 * The outline is anti-aliased with a 1 px linear ramp of the signed edge distance.
 */
import type { Canvas } from './canvas.js';
import { gradientNoise, type NoiseTable } from './noise.js';
import type { ResolvedRenderOptions } from './options.js';
import type { Tint } from './sceneOptions.js';
import { vignette } from './shading.js';

/** Per-zone gains making rim and core equally bright on average (1, 1 unless `equalMeanBrightness`). */
export interface ZoneGains {
  readonly rim: number;
  readonly core: number;
}

/** Gains over the fully covered specimen pixels (rim = blend ≥ 0.5). */
export function zoneGains(c: Canvas, o: ResolvedRenderOptions): ZoneGains {
  if (!(o.equalMeanBrightness && o.rim)) return { rim: 1, core: 1 };
  const { n, edge, blend, out } = c;
  let sR = 0;
  let nR = 0;
  let sC = 0;
  let nC = 0;
  for (let i = 0; i < n; i++) {
    if (edge[i] < 0.5) continue;
    if (blend[i] >= 0.5) {
      sR += out[i];
      nR++;
    } else {
      sC += out[i];
      nC++;
    }
  }
  if (!(nR > 0 && nC > 0)) return { rim: 1, core: 1 };
  const target = (sR + sC) / (nR + nC);
  return { rim: target / (sR / nR), core: target / (sC / nC) };
}

/** Plain background level: 0.82 bright, 0.07 dark. */
export function plainBackgroundLevel(o: ResolvedRenderOptions): number {
  return o.background === 'bright' ? 0.82 : 0.07;
}

/**
 * Composite over the plain mottled background (mottling wavelength 300 µm, amplitude
 * `backgroundNoise`), in place in `c.out` (gray).
 */
export function compositePlain(c: Canvas, o: ResolvedRenderOptions, tBg: NoiseTable, gains: ZoneGains): void {
  const { W, H, edge, blend, out } = c;
  const vg = vignette(o);
  const { iDiag2 } = vg;
  const hx = vg.cx;
  const hy = vg.cy;
  const vig = vg.strength;
  const gRim = gains.rim;
  const gCore = gains.core;
  const bgLevel = plainBackgroundLevel(o);
  const bgl = 1 / 300; // background mottling wavelength 300 µm
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = y * W + x;
      const e = edge[i];
      const cov = e <= -0.5 ? 0 : e >= 0.5 ? 1 : e + 0.5;
      const d2 = ((x - hx) * (x - hx) + (y - hy) * (y - hy)) * iDiag2;
      let bg = 0;
      if (cov < 1) {
        bg = (bgLevel + o.backgroundNoise * gradientNoise(tBg, x * o.umPerPx * bgl, y * o.umPerPxY * bgl) * 1.5) * (1 - vig * d2);
      }
      let s = 0;
      if (cov > 0) {
        const m = blend[i];
        s = out[i] * (gCore + m * (gRim - gCore));
      }
      out[i] = cov * s + (1 - cov) * bg;
    }
  }
}

/** Tints of the fracture surface per output channel (gray: one channel, no tint). */
export interface SurfaceTints {
  readonly rim: readonly number[];
  readonly core: readonly number[];
}

/** The surface tints for `channels` output channels. */
export function surfaceTints(o: ResolvedRenderOptions, channels: 1 | 3): SurfaceTints {
  if (channels === 1 || !o.colour) return { rim: [1, 1, 1].slice(0, channels), core: [1, 1, 1].slice(0, channels) };
  const t = (v: Tint): number[] => [v[0], v[1], v[2]];
  return { rim: t(o.colour.rimTint), core: t(o.colour.coreTint) };
}

/**
 * Composite the fracture surface (diffuse × zone tint + neutral specular) over the `under` planes
 * (one per channel); returns the output planes (the first one is `c.out` itself).
 */
export function compositeLayers(c: Canvas, under: readonly Float32Array[], gains: ZoneGains, tints: SurfaceTints): Float32Array[] {
  const { n, edge, blend, out, spec } = c;
  const planes = under.map((_, k) => (k === 0 ? out : new Float32Array(n)));
  for (let k = under.length - 1; k >= 0; k--) {
    const u = under[k];
    const p = planes[k];
    const tr = tints.rim[k];
    const tc = tints.core[k];
    for (let i = 0; i < n; i++) {
      const e = edge[i];
      const cov = e <= -0.5 ? 0 : e >= 0.5 ? 1 : e + 0.5;
      let s = 0;
      if (cov > 0) {
        const m = blend[i];
        s = out[i] * (gains.core + m * (gains.rim - gains.core)) * (tc + m * (tr - tc));
        if (spec) s += spec[i];
      }
      p[i] = cov * s + (1 - cov) * u[i];
    }
  }
  return planes;
}
