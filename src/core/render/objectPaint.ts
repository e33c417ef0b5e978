/**
 * Painting the steel rule and the paper label into the background plane (before the depth-of-field
 * blur; they lie on the background). Each casts a thin shadow on the side away from the light, as wide
 * as its thickness ÷ tan(light elevation) (rule 0.5 mm, label 0.1 mm thick — common sizes, from memory).
 * Text is sampled from the project's 5×7 bitmap font in the object's own rotated frame, 3 × 3 samples
 * per pixel.
 */
import { glyphBitmap, GLYPH_ADVANCE, GLYPH_HEIGHT, GLYPH_WIDTH } from '../draw/font.js';
import type { Rng } from '../random.js';
import { gradientNoise, makeNoiseTable } from './noise.js';
import type { LabelLayout, ObjectsLayout, RuleLayout, Vec } from './objects.js';
import type { ResolvedRenderOptions } from './options.js';
import { vignette } from './shading.js';

const INK = 0.1;
const LINE_ADVANCE = 9;

/** Ink fraction (0..1) of a text block at font coordinates (fu, fv) (font pixels from the block's top-left). */
function textInk(lines: readonly string[], fu: number, fv: number): number {
  if (fu < 0 || fv < 0) return 0;
  const line = Math.floor(fv / LINE_ADVANCE);
  if (line >= lines.length) return 0;
  const row = Math.floor(fv - line * LINE_ADVANCE);
  if (row >= GLYPH_HEIGHT) return 0;
  const chars = Array.from(lines[line]);
  const k = Math.floor(fu / GLYPH_ADVANCE);
  if (k >= chars.length) return 0;
  const col = Math.floor(fu - k * GLYPH_ADVANCE);
  if (col >= GLYPH_WIDTH) return 0;
  return glyphBitmap(chars[k])[row * GLYPH_WIDTH + col];
}

/** Light direction on the screen (unit, pointing toward the light) and the shadow length factor 1/tan(el). */
function lightOnScreen(o: ResolvedRenderOptions): { l: Vec; cot: number } {
  const az = (o.light.azimuthDeg * Math.PI) / 180;
  const el = (o.light.elevationDeg * Math.PI) / 180;
  return { l: { x: Math.cos(az), y: -Math.sin(az) }, cot: Math.cos(el) / Math.sin(el) };
}

function paintRule(bg: Float32Array, o: ResolvedRenderOptions, r: RuleLayout, rng: Rng): void {
  const W = o.widthPx;
  const H = o.heightPx;
  const rule = o.rule!;
  const t = makeNoiseTable(rng);
  const vg = vignette(o);
  const { l, cot } = lightOnScreen(o);
  // the rule's edge shadow falls on the background when the light comes from the rule's side
  const toward = l.x * r.n.x + l.y * r.n.y;
  const shadowPx = toward > 0 ? (toward * 500 * cot) / r.pxUm : 0;
  const markW = Math.max(1, 90 / r.pxUm);
  const bevel = Math.max(1, 60 / r.pxUm);
  const lenUm = [650, 1000, 1400, 1800];
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const px = x - r.e0.x;
      const py = y - r.e0.y;
      const d = px * r.n.x + py * r.n.y; // px into the rule
      const i = y * W + x;
      if (d < -shadowPx - 2) continue;
      if (d < 0.5 && shadowPx > 0) {
        const f = Math.max(0, Math.min(1, (-d + 0.5) / Math.max(1, shadowPx)));
        bg[i] *= 1 - 0.45 * (1 - f * f);
      }
      if (d <= -0.5) continue;
      const cov = d >= 0.5 ? 1 : d + 0.5;
      const a = px * r.t.x + py * r.t.y;
      let v = rule.level * (1 + 0.05 * gradientNoise(t, a / 400, d / 6) + 0.03 * gradientNoise(t, a / 90 + 50, d / 3));
      if (d < bevel) v *= 1 + 0.25 * Math.max(0, -toward);
      // graduations: k-th mark at offset + k·spacing, longer at every 2nd, 10th and 20th
      const kf = (a - r.offsetPx) / r.gradPx;
      const k = Math.round(kf);
      const da = (kf - k) * r.gradPx;
      const lvl = k % 20 === 0 ? 3 : k % 10 === 0 ? 2 : k % 2 === 0 ? 1 : 0;
      const len = lenUm[lvl] / r.pxUm;
      const ca = Math.max(0, Math.min(da + 0.5, markW / 2) - Math.max(da - 0.5, -markW / 2));
      const cd = Math.max(0, Math.min(d + 0.5, len) - Math.max(d - 0.5, 0));
      const ink = Math.min(1, ca) * Math.min(1, cd);
      v = v * (1 - ink) + INK * ink;
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      bg[i] = cov * v * (1 - vg.strength * d2) + (1 - cov) * bg[i];
    }
  }
}

function paintLabel(bg: Float32Array, o: ResolvedRenderOptions, lb: LabelLayout, rng: Rng): void {
  const W = o.widthPx;
  const H = o.heightPx;
  const t = makeNoiseTable(rng);
  const vg = vignette(o);
  const { l, cot } = lightOnScreen(o);
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  const sh = (100 * cot) / pxUm; // shadow offset of a 0.1 mm thick label, px
  const sx = -l.x * sh;
  const sy = -l.y * sh;
  const ext = Math.hypot(lb.w, lb.h) / 2 + sh + 2;
  const pad = 4 * lb.fontPx;
  for (let y = Math.max(0, Math.floor(lb.c.y - ext)); y <= Math.min(H - 1, Math.ceil(lb.c.y + ext)); y++) {
    for (let x = Math.max(0, Math.floor(lb.c.x - ext)); x <= Math.min(W - 1, Math.ceil(lb.c.x + ext)); x++) {
      const i = y * W + x;
      const inside = (px: number, py: number): number => {
        const u = (px - lb.c.x) * lb.u.x + (py - lb.c.y) * lb.u.y;
        const v = (px - lb.c.x) * lb.v.x + (py - lb.c.y) * lb.v.y;
        const e = Math.min(lb.w / 2 - Math.abs(u), lb.h / 2 - Math.abs(v));
        return e >= 0.5 ? 1 : e <= -0.5 ? 0 : e + 0.5;
      };
      const shadow = inside(x - sx, y - sy);
      if (shadow > 0) bg[i] *= 1 - 0.35 * shadow;
      const cov = inside(x, y);
      if (cov <= 0) continue;
      let ink = 0;
      for (let sj = 0; sj < 3; sj++) {
        for (let si = 0; si < 3; si++) {
          const qx = x - 1 / 3 + si / 3 - lb.c.x;
          const qy = y - 1 / 3 + sj / 3 - lb.c.y;
          const u = qx * lb.u.x + qy * lb.u.y + lb.w / 2 - pad;
          const v = qx * lb.v.x + qy * lb.v.y + lb.h / 2 - pad;
          ink += textInk(lb.lines, u / lb.fontPx, v / lb.fontPx);
        }
      }
      ink /= 9;
      const paper = 0.9 * (1 + 0.025 * gradientNoise(t, (x * o.umPerPx) / 500, (y * o.umPerPxY) / 500));
      const v = paper * (1 - ink) + INK * ink;
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      bg[i] = cov * v * (1 - vg.strength * d2) + (1 - cov) * bg[i];
    }
  }
}

/** Paint the rule and the label (when laid out) into the background plane. */
export function paintObjects(bg: Float32Array, o: ResolvedRenderOptions, ob: ObjectsLayout, stream: (label: string) => Rng): void {
  if (ob.rule) paintRule(bg, o, ob.rule, stream('rule'));
  if (ob.label) paintLabel(bg, o, ob.label, stream('label'));
}
