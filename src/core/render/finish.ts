/**
 * Image-formation effects after compositing, per output plane (gray, or R, G, B): one-sided defocus,
 * lens blur, SEM scan-line noise, pixel noise (additive + signal-dependent, shared by the channels),
 * colour noise (independent per channel) and clipping to 0..1.
 */
import type { Rng } from '../random.js';
import { gaussianBlurInPlace, variableBlurInPlace } from './blur.js';
import type { ResolvedRenderOptions } from './options.js';
import type { DefocusOptions } from './sceneOptions.js';

/** Rec. 709 luma weights (ITU-R BT.709-6), the weights the decoder uses for colour images. */
export const REC709: readonly [number, number, number] = [0.2126, 0.7152, 0.0722];

/**
 * Per-pixel σ of a one-sided defocus: 0 up to the plane of focus, then growing linearly to
 * `maxSigmaPx` at the far side of the image along `directionDeg`.
 */
export function defocusSigma(W: number, H: number, d: DefocusOptions): Float32Array {
  const a = (d.directionDeg * Math.PI) / 180;
  const ux = Math.cos(a);
  const uy = -Math.sin(a); // screen y down
  // projections of the four corners give the span
  const ps = [0, (W - 1) * ux, (H - 1) * uy, (W - 1) * ux + (H - 1) * uy];
  const lo = Math.min(...ps);
  const span = Math.max(...ps) - lo || 1;
  const sig = new Float32Array(W * H);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const t = (x * ux + y * uy - lo) / span;
      const q = (t - d.focusAt) / (1 - d.focusAt);
      sig[y * W + x] = q > 0 ? d.maxSigmaPx * q : 0;
    }
  }
  return sig;
}

/** Random offset and gain per scan line (row), applied to every plane alike. */
function scanLines(planes: readonly Float32Array[], W: number, H: number, lineNoise: number, lineGain: number, rng: Rng): void {
  for (let y = 0; y < H; y++) {
    const off = lineNoise * rng.normal();
    const gain = 1 + lineGain * rng.normal();
    for (const p of planes) {
      for (let i = y * W, e = i + W; i < e; i++) p[i] = p[i] * gain + off;
    }
  }
}

/** Additive + signal-dependent Gaussian noise; in colour one draw per pixel, scaled by its luma. */
function pixelNoise(planes: readonly Float32Array[], o: ResolvedRenderOptions, rng: Rng): void {
  const s2 = o.noiseSigma * o.noiseSigma;
  const k2 = o.noiseSignal * o.noiseSignal;
  const out = planes[0];
  const n = out.length;
  if (planes.length === 1) {
    for (let i = 0; i < n; i++) {
      const v = out[i];
      out[i] = v + Math.sqrt(s2 + k2 * (v > 0 ? v : 0)) * rng.normal();
    }
    return;
  }
  const [r, g, b] = planes;
  for (let i = 0; i < n; i++) {
    const v = REC709[0] * r[i] + REC709[1] * g[i] + REC709[2] * b[i];
    const d = Math.sqrt(s2 + k2 * (v > 0 ? v : 0)) * rng.normal();
    r[i] += d;
    g[i] += d;
    b[i] += d;
  }
}

/** Streams the finishing effects draw from. */
export interface FinishStreams {
  readonly noise: Rng;
  readonly scanLines: () => Rng;
  readonly colourNoise: () => Rng;
}

/** Apply defocus, blur, scan lines, noise, colour noise and clipping to the planes, in place. */
export function finishPlanes(planes: readonly Float32Array[], W: number, H: number, o: ResolvedRenderOptions, streams: FinishStreams): void {
  if (o.defocus && o.defocus.maxSigmaPx > 0) {
    const sig = defocusSigma(W, H, o.defocus);
    for (const p of planes) variableBlurInPlace(p, W, H, sig, o.defocus.maxSigmaPx);
  }
  if (o.blurSigmaPx > 0) for (const p of planes) gaussianBlurInPlace(p, W, H, o.blurSigmaPx);
  if (o.sem && (o.sem.lineNoise > 0 || o.sem.lineGain > 0)) scanLines(planes, W, H, o.sem.lineNoise, o.sem.lineGain, streams.scanLines());
  if (o.noiseSigma > 0 || o.noiseSignal > 0) pixelNoise(planes, o, streams.noise);
  if (o.colour && o.colour.noiseSigma > 0 && planes.length === 3) {
    const rng = streams.colourNoise();
    const s = o.colour.noiseSigma;
    for (const p of planes) for (let i = 0; i < p.length; i++) p[i] += s * rng.normal();
  }
  for (const p of planes) {
    for (let i = 0; i < p.length; i++) {
      const v = p[i];
      p[i] = v < 0 ? 0 : v > 1 ? 1 : v;
    }
  }
}
