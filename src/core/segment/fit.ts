/** Circle and ellipse fits to contour points. */
import { getCv } from '../cv.js';
import type { PointPx } from '../image/geometry.js';

/** Fitted circle, px. rmsResidualPx = RMS of the geometric distances |‖p − c‖ − R|. */
export interface CircleFit {
  cx: number;
  cy: number;
  radiusPx: number;
  rmsResidualPx: number;
}

/** Fitted ellipse, px; angleDeg = direction of the major axis, project convention (CCW on screen), in [0, 180). */
export interface EllipseFit {
  cx: number;
  cy: number;
  semiMajorPx: number;
  semiMinorPx: number;
  angleDeg: number;
  /** RMS of the radial residuals ‖p − c‖ − r_ellipse(φ) (φ the polar angle of p; close to the geometric distance for mild eccentricity). */
  rmsResidualPx: number;
}

function solve3(a: number[][], b: number[]): number[] | null {
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < 3; c++) {
    let piv = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(m[r][c]) > Math.abs(m[piv][c])) piv = r;
    if (Math.abs(m[piv][c]) < 1e-300) return null;
    [m[c], m[piv]] = [m[piv], m[c]];
    for (let r = 0; r < 3; r++) {
      if (r === c) continue;
      const f = m[r][c] / m[c][c];
      for (let k = c; k < 4; k++) m[r][k] -= f * m[c][k];
    }
  }
  return [m[0][3] / m[0][0], m[1][3] / m[1][1], m[2][3] / m[2][2]];
}

/**
 * Least-squares circle: the algebraic fit of Kåsa (IEEE Trans. Instrum. Meas. IM-25 (1976) 8),
 * x² + y² + Dx + Ey + F = 0 (points centred first for conditioning), then Gauss–Newton
 * iterations on the geometric distances (Chernov, Circular and Linear Regression, CRC 2010, §4).
 *
 * @param pts - contour points, px (at least 3, not collinear)
 * @returns centre, radius and RMS geometric residual in px, or null when degenerate
 */
export function fitCircle(pts: readonly PointPx[]): CircleFit | null {
  const n = pts.length;
  if (n < 3) return null;
  let mx = 0;
  let my = 0;
  for (const p of pts) {
    mx += p.x;
    my += p.y;
  }
  mx /= n;
  my /= n;
  let sxx = 0, sxy = 0, syy = 0, sx = 0, sy = 0, sxz = 0, syz = 0, sz = 0;
  for (const p of pts) {
    const x = p.x - mx;
    const y = p.y - my;
    const z = x * x + y * y;
    sxx += x * x; sxy += x * y; syy += y * y; sx += x; sy += y;
    sxz += x * z; syz += y * z; sz += z;
  }
  const sol = solve3([[sxx, sxy, sx], [sxy, syy, sy], [sx, sy, n]], [-sxz, -syz, -sz]);
  if (!sol) return null;
  let cx = -sol[0] / 2;
  let cy = -sol[1] / 2;
  let r = Math.sqrt(Math.max(0, cx * cx + cy * cy - sol[2]));
  if (!Number.isFinite(r) || r === 0) return null;
  // Gauss–Newton on d_i = ‖p_i − c‖ − r
  for (let it = 0; it < 20; it++) {
    let a11 = 0, a12 = 0, a13 = 0, a22 = 0, a23 = 0, a33 = 0, b1 = 0, b2 = 0, b3 = 0;
    for (const p of pts) {
      const dx = p.x - mx - cx;
      const dy = p.y - my - cy;
      const rho = Math.hypot(dx, dy) || 1e-12;
      const d = rho - r;
      const j1 = -dx / rho;
      const j2 = -dy / rho;
      const j3 = -1;
      a11 += j1 * j1; a12 += j1 * j2; a13 += j1 * j3; a22 += j2 * j2; a23 += j2 * j3; a33 += j3 * j3;
      b1 -= j1 * d; b2 -= j2 * d; b3 -= j3 * d;
    }
    const step = solve3([[a11, a12, a13], [a12, a22, a23], [a13, a23, a33]], [b1, b2, b3]);
    if (!step) break;
    cx += step[0];
    cy += step[1];
    r += step[2];
    if (Math.hypot(step[0], step[1], step[2]) < 1e-9) break;
  }
  let ss = 0;
  for (const p of pts) {
    const d = Math.hypot(p.x - mx - cx, p.y - my - cy) - r;
    ss += d * d;
  }
  return { cx: cx + mx, cy: cy + my, radiusPx: r, rmsResidualPx: Math.sqrt(ss / n) };
}

/**
 * Least-squares ellipse by OpenCV `cv.fitEllipse` (Fitzgibbon-type algebraic fit: Fitzgibbon,
 * Pilu & Fisher, IEEE TPAMI 21 (1999) 476). OpenCV's angle (clockwise on screen, of the `width`
 * axis) is converted to the project convention (counter-clockwise on screen, of the major axis).
 *
 * @param pts - contour points, px (at least 5)
 * @returns the ellipse in px and degrees, or null when degenerate
 */
export function fitEllipseToPoints(pts: readonly PointPx[]): EllipseFit | null {
  if (pts.length < 5) return null;
  const cv = getCv();
  const flat = new Float32Array(pts.length * 2);
  pts.forEach((p, i) => {
    flat[2 * i] = p.x;
    flat[2 * i + 1] = p.y;
  });
  const m = cv.matFromArray(pts.length, 1, cv.CV_32FC2, Array.from(flat));
  try {
    const rr = cv.fitEllipse(m);
    const w = rr.size.width / 2;
    const h = rr.size.height / 2;
    if (!(w > 0 && h > 0) || !Number.isFinite(w + h)) return null;
    const semiMajorPx = Math.max(w, h);
    const semiMinorPx = Math.min(w, h);
    // direction of the major axis in image coordinates (clockwise-on-screen degrees)
    const imgAngle = w >= h ? rr.angle : rr.angle + 90;
    let angleDeg = -imgAngle % 180;
    if (angleDeg < 0) angleDeg += 180;
    const cx = rr.center.x;
    const cy = rr.center.y;
    const th = (angleDeg * Math.PI) / 180;
    const ux = Math.cos(th);
    const uy = -Math.sin(th); // major-axis unit vector in image coordinates
    let ss = 0;
    for (const p of pts) {
      const dx = p.x - cx;
      const dy = p.y - cy;
      const u = dx * ux + dy * uy;
      const v = -dx * uy + dy * ux;
      const rho = Math.hypot(u, v);
      const phi = Math.atan2(v, u);
      const re = (semiMajorPx * semiMinorPx) / Math.hypot(semiMinorPx * Math.cos(phi), semiMajorPx * Math.sin(phi));
      ss += (rho - re) * (rho - re);
    }
    return { cx, cy, semiMajorPx, semiMinorPx, angleDeg, rmsResidualPx: Math.sqrt(ss / pts.length) };
  } finally {
    m.delete();
  }
}
