/**
 * The notch flank around the fracture surface, seen end-on: the rest of the circumferential notch from
 * the notch root (radius R(α), the fracture surface's own edge) out to the bar radius R_bar.
 *
 * Profile in the axial section, u = r − R ≥ 0 (µm), z toward the viewer (µm, ≤ 0): the notch surface
 * leaves the root along the viewing direction, turns on a circular arc of the root radius ρ,
 *   z = −√(ρ² − (ρ − u)²),
 * until its inclination from the image plane has fallen to γ (u₁ = ρ(1 − sin γ)), then runs straight,
 *   z = z(u₁) − (u − u₁)·tan γ,
 * with γ = `inclineDeg` for a V notch (a cone seen end-on, radially foreshortened by cos γ) and γ = 0
 * for a U notch (a flat wall facing the viewer, ρ below the fracture plane). Turning marks: a helical
 * groove of pitch p (feed per revolution) along the slant length s, scallop-shaped (the tool nose
 * leaves arcs), plus fine roughness stretched along the circumference. Shaded like the fracture surface
 * (Lambert + ambient, the SEM tilt contrast when asked) with the flank albedo and a Blinn–Phong gloss
 * (exponent 30), and blurred with a σ growing with depth (depth of field).
 */
import type { Rng } from '../random.js';
import type { Canvas } from './canvas.js';
import type { PlacedSpecimen } from './layout.js';
import { gradientNoise, makeNoiseTable, type NoiseTable } from './noise.js';
import type { ResolvedRenderOptions } from './options.js';
import type { FlankOptions } from './sceneOptions.js';
import { sceneLight, vignette } from './shading.js';
import { edgeHeight } from './surface.js';

/** The flank planes: shaded value, coverage (1 inside the bar, anti-aliased at its edge) and depth σ. */
export interface FlankPlanes {
  readonly value: Float32Array;
  readonly cover: Float32Array;
  readonly sigma: Float32Array;
}

/** Profile constants of a flank. */
interface Profile {
  readonly rho: number;
  readonly u1: number;
  readonly z1: number;
  readonly s1: number;
  readonly tanG: number;
  readonly cosG: number;
}

function profileOf(f: FlankOptions): Profile {
  const g = f.kind === 'V' ? (f.inclineDeg * Math.PI) / 180 : 0;
  const rho = f.rootRadiusUm;
  return { rho, u1: rho * (1 - Math.sin(g)), z1: -rho * Math.cos(g), s1: rho * (Math.PI / 2 - g), tanG: Math.tan(g), cosG: Math.cos(g) };
}

/** Depth z(u) ≤ 0 (µm) and slant length s(u) (µm) of the profile at u ≥ 0. */
function depthAt(p: Profile, u: number): { z: number; s: number } {
  if (u < p.u1 && p.rho > 0) {
    const q = p.rho - u;
    return { z: -Math.sqrt(Math.max(0, p.rho * p.rho - q * q)), s: p.rho * Math.acos(Math.min(1, q / p.rho)) };
  }
  return { z: p.z1 - (u - p.u1) * p.tanG, s: p.s1 + (u - p.u1) / p.cosG };
}

/** Height of the flank (µm) at u, angle fraction a = α/2π and radius r, with marks and roughness. */
function flankHeight(f: FlankOptions, p: Profile, t: NoiseTable, markAmp: number, u: number, a: number, r: number): number {
  const { z, s } = depthAt(p, u);
  let h = z;
  if (markAmp > 0) {
    let q = s / f.markSpacingUm + a;
    q -= Math.floor(q);
    h += markAmp * (4 * (q - 0.5) * (q - 0.5) - 1 / 3);
  }
  if (f.roughnessUm > 0) h += f.roughnessUm * gradientNoise(t, r / (2 * f.markSpacingUm), (a * 2 * Math.PI * r) / (25 * f.markSpacingUm));
  return h;
}

/** Allocate flank planes for a W × H canvas (cover 0 = no flank). */
export function createFlankPlanes(n: number): FlankPlanes {
  return { value: new Float32Array(n), cover: new Float32Array(n), sigma: new Float32Array(n) };
}

/**
 * Height pass of one specimen's flank into `h` (µm), with cover and depth σ into `fp`.
 * Inside the root (covered by the fracture surface) the flank continues at the root's height.
 */
function flankHeights(c: Canvas, s: PlacedSpecimen, o: ResolvedRenderOptions, f: FlankOptions, t: NoiseTable, h: Float32Array, fp: FlankPlanes): void {
  const { W, H } = c;
  const g = s.g;
  const p = profileOf(f);
  const rBar = g.R0 * f.diameterRatio;
  const zMax = Math.max(1e-9, -depthAt(p, rBar - g.R0).z);
  const pxUm = Math.sqrt(o.umPerPx * o.umPerPxY);
  // turning marks fade out where their projected spacing drops below about 2 px (they would alias)
  const projPx = (f.markSpacingUm * (f.kind === 'V' ? p.cosG : 1)) / pxUm;
  const markAmp = f.markDepthUm * Math.max(0, Math.min(1, (projPx - 2) / 1.5));
  const lutScale = 7200 / (2 * Math.PI);
  for (let y = 0; y < H; y++) {
    const dy = y - g.cy;
    for (let x = s.x0; x < s.x1; x++) {
      const i = y * W + x;
      const dx = x - g.cx;
      const X = g.A * dx + g.B * dy;
      const Y = g.C * dx + g.D * dy;
      const r = Math.sqrt(X * X + Y * Y);
      const dpx = Math.sqrt(dx * dx + dy * dy);
      const k = dpx > 1e-9 ? r / dpx : pxUm;
      const cov = (rBar - r) / k + 0.5;
      if (cov <= -2.5) continue; // the profile continues 3 px beyond the bar edge, so its gradient there is the flank's
      let al = Math.atan2(Y, X);
      if (al < 0) al += 2 * Math.PI;
      let fi = al * lutScale;
      if (fi >= 7200) fi -= 7200;
      const li = fi | 0;
      const lt = fi - li;
      const R = g.outerLut[li] + lt * (g.outerLut[li + 1] - g.outerLut[li]);
      const u = r > R ? r - R : 0;
      h[i] = edgeHeight(o, g, li, lt) + flankHeight(f, p, t, markAmp, u, al / (2 * Math.PI), r);
      fp.cover[i] = cov >= 1 ? 1 : cov > 0 ? cov : 0;
      fp.sigma[i] = (f.defocusPx * Math.min(zMax, -depthAt(p, u).z)) / zMax;
    }
  }
}

/** Shade the flank heights of one specimen's columns into `fp.value`. */
function shadeFlank(c: Canvas, s: PlacedSpecimen, o: ResolvedRenderOptions, f: FlankOptions, h: Float32Array, fp: FlankPlanes): void {
  const { W, H } = c;
  const L = sceneLight(o);
  const vg = vignette(o);
  const se = o.sem ? o.sem.tiltContrast : 0;
  const base = 0.42 * f.albedo;
  const isx = 1 / (2 * o.umPerPx);
  const isy = 1 / (2 * o.umPerPxY);
  for (let y = 0; y < H; y++) {
    const yu = y > 0 ? -W : 0;
    const yd = y < H - 1 ? W : 0;
    for (let x = s.x0; x < s.x1; x++) {
      const i = y * W + x;
      if (fp.cover[i] <= 0 && fp.sigma[i] <= 0) continue;
      const xl = x > s.x0 ? -1 : 0;
      const xr = x < s.x1 - 1 ? 1 : 0;
      const gx = (h[i + xr] - h[i + xl]) * isx * (2 / (xr - xl || 2));
      const gy = (h[i + yd] - h[i + yu]) * isy * (2 / ((yd - yu) / W || 2));
      const inv = 1 / Math.sqrt(gx * gx + gy * gy + 1);
      let nl = (-gx * L.lx - gy * L.ly + L.lz) * inv;
      if (nl < 0) nl = 0;
      const lambert = L.amb + L.diff * nl;
      const shade = se > 0 ? (1 - se) * lambert + se * Math.min(4, 1 / inv) : lambert;
      const nh = (-gx * L.hx - gy * L.hy + L.hz) * inv;
      const spec = nh > 0 ? f.gloss * Math.pow(nh, 30) : 0;
      const d2 = ((x - vg.cx) * (x - vg.cx) + (y - vg.cy) * (y - vg.cy)) * vg.iDiag2;
      fp.value[i] = (base * shade + spec) * (1 - vg.strength * d2);
    }
  }
}

/** Render the flank of one specimen into the flank planes. */
export function flankPass(c: Canvas, s: PlacedSpecimen, o: ResolvedRenderOptions, fp: FlankPlanes, rng: Rng): void {
  const f = o.flank;
  if (!f) return;
  const h = new Float32Array(c.n);
  flankHeights(c, s, o, f, makeNoiseTable(rng), h, fp);
  shadeFlank(c, s, o, f, h, fp);
}
