import { describe, expect, it } from 'vitest';
import { measureBand, measureFromPolygons, createBandMeasurer, isExcluded } from '../../../src/core/measure/index.js';
import type { PointPx as Point } from '../../../src/core/image/geometry.js';

function circle(cx: number, cy: number, r: number, n = 2000): Point[] {
  return Array.from({ length: n }, (_, i) => {
    const t = (2 * Math.PI * i) / n;
    return { x: cx + r * Math.cos(t), y: cy - r * Math.sin(t) };
  });
}
function ellipse(cx: number, cy: number, a: number, b: number, n = 4000): Point[] {
  return Array.from({ length: n }, (_, i) => {
    const t = (2 * Math.PI * i) / n;
    return { x: cx + a * Math.cos(t), y: cy - b * Math.sin(t) };
  });
}
// radius of an axis-aligned ellipse along angle θ (hand formula: r = ab/√((b cosθ)² + (a sinθ)²))
const rEll = (a: number, b: number, th: number) => (a * b) / Math.hypot(b * Math.cos(th), a * Math.sin(th));

describe('measureBand geometry', () => {
  it('concentric circles give a constant width (chord error of the polygon only)', () => {
    const c = { x: 500, y: 400 };
    const p = measureBand({ outer: circle(500, 400, 300), boundary: circle(500, 400, 240), center: c, umPerPx: 2 });
    expect(p.nValid).toBe(360);
    // polygon chord sagitta with 2000 vertices: r(1−cos(π/2000)) ≈ 3.7e-4 px
    for (const r of p.rays) expect(r.widthUm!).toBeCloseTo(120, 2);
    expect(p.stats.mean).toBeCloseTo(120, 2);
    expect(p.stats.sd).toBeLessThan(0.01);
    expect(p.normalWidth.meanUm).toBeCloseTo(120, 1);
    expect(p.areaWidthUm!).toBeCloseTo(120, 1);
    expect(p.areaWidthComplete).toBe(true);
  });

  it('ellipse in ellipse matches the hand formula along every ray', () => {
    const c = { x: 600, y: 450 };
    const p = measureBand({ outer: ellipse(600, 450, 400, 300), boundary: ellipse(600, 450, 330, 250), center: c, umPerPx: 1, nRays: 72 });
    for (const r of p.rays) {
      const th = (r.thetaDeg * Math.PI) / 180;
      expect(r.widthPx!).toBeCloseTo(rEll(400, 300, th) - rEll(330, 250, th), 2);
    }
    // at 0° the width is 400 − 330 = 70, at 90° it is 300 − 250 = 50
    expect(p.rays[0].widthPx!).toBeCloseTo(70, 2);
    expect(p.rays[18].widthPx!).toBeCloseTo(50, 2);
  });

  it('angle convention: 90° points up on screen (−y)', () => {
    // outer circle shifted up: the band is wider at 90° than at 270°
    const outer = circle(500, 390, 300);
    const p = measureBand({ outer, boundary: circle(500, 400, 200), center: { x: 500, y: 400 }, umPerPx: 1, nRays: 4 });
    expect(p.rays[1].thetaDeg).toBe(90);
    expect(p.rays[1].widthPx!).toBeCloseTo(110, 1);
    expect(p.rays[3].widthPx!).toBeCloseTo(90, 1);
  });

  it('exclusion sectors, with wrap-around', () => {
    expect(isExcluded(355, [[350, 10]])).toBe(true);
    expect(isExcluded(5, [[350, 10]])).toBe(true);
    expect(isExcluded(20, [[350, 10]])).toBe(false);
    expect(isExcluded(95, [[80, 110]])).toBe(true);
    const p = measureBand({
      outer: circle(500, 400, 300), boundary: circle(500, 400, 250), center: { x: 500, y: 400 }, umPerPx: 1,
      exclude: [[80, 110], [350, 10]],
    });
    const ex = p.rays.filter((r) => r.reason === 'excluded').map((r) => r.thetaDeg);
    expect(ex.length).toBe(31 + 21);
    expect(ex).toContain(0);
    expect(ex).toContain(350);
    expect(ex).toContain(10);
    expect(ex).not.toContain(11);
    expect(p.nValid).toBe(360 - 52);
    expect(p.areaWidthComplete).toBe(false);
  });

  it('flags an outlier bump but keeps it unless dropOutliers', () => {
    // boundary with a narrow inward spike around 180°: width jumps there
    const b = circle(500, 400, 250, 3600).map((q, i) => (Math.abs(i - 1800) <= 15 ? { x: 500 + (q.x - 500) * 0.6, y: 400 + (q.y - 400) * 0.6 } : q));
    // give the rest a little waviness so the MAD is non-zero
    const b2 = b.map((q, i) => {
      const f = 1 + 0.004 * Math.sin((2 * Math.PI * 7 * i) / 3600);
      return { x: 500 + (q.x - 500) * f, y: 400 + (q.y - 400) * f };
    });
    const m = createBandMeasurer(circle(500, 400, 300), { x: 500, y: 400 }, { umPerPx: 1 });
    const keep = m(b2);
    const flagged = keep.rays.filter((r) => r.outlier);
    expect(flagged.length).toBeGreaterThanOrEqual(2);
    expect(flagged.every((r) => Math.abs(r.thetaDeg - 180) <= 2)).toBe(true);
    expect(flagged.every((r) => r.valid && r.reason === 'outlier')).toBe(true);
    const drop = measureFromPolygons(circle(500, 400, 300), b2, { x: 500, y: 400 }, { umPerPx: 1, dropOutliers: true });
    expect(drop.stats.n).toBe(keep.stats.n - flagged.length);
    expect(drop.stats.mean).toBeLessThan(keep.stats.mean);
  });

  it('rays whose outer end reaches the image frame are invalid', () => {
    // circle of radius 300 centred at (320, 400) in a 1000×800 image: cut by the left frame (x = 0)
    const outer = circle(320, 400, 300, 4000).map((q) => ({ x: Math.max(q.x, 0), y: q.y }));
    const p = measureBand({ outer, boundary: circle(320, 400, 250), center: { x: 320, y: 400 }, umPerPx: 1, imageSize: { width: 1000, height: 800 } });
    const atFrame = p.rays.filter((r) => r.reason === 'outer-edge-at-frame');
    // the frame cuts the circle where cos θ < −320/300... never: 300 < 320 → nothing cut
    expect(atFrame.length).toBe(0);
    const outer2 = circle(250, 400, 300, 4000).map((q) => ({ x: Math.max(q.x, 0), y: q.y }));
    const p2 = measureBand({ outer: outer2, boundary: circle(250, 400, 200), center: { x: 250, y: 400 }, umPerPx: 1, imageSize: { width: 1000, height: 800 } });
    const cut = p2.rays.filter((r) => r.reason === 'outer-edge-at-frame').map((r) => r.thetaDeg);
    // hand: the cut covers θ with 250 + 300cosθ ≤ 1.5 → |θ − 180°| ≤ acos(248.5/300) = 34.1°
    expect(cut.length).toBeGreaterThanOrEqual(67);
    expect(cut.length).toBeLessThanOrEqual(69);
    expect(cut.every((t) => Math.abs(t - 180) <= 35)).toBe(true);
    expect(p2.areaWidthComplete).toBe(false);
  });

  it('minWidthPx marks narrow rays as band-absent', () => {
    // boundary touching the outer circle on the right half: width 2 px there, 50 px elsewhere
    const b = circle(500, 400, 250, 3600).map((q) => (q.x > 500 ? { x: 500 + (q.x - 500) * (298 / 250), y: 400 + (q.y - 400) * (298 / 250) } : q));
    const p = measureBand({ outer: circle(500, 400, 300), boundary: b, center: { x: 500, y: 400 }, umPerPx: 1, minWidthPx: 10, nRays: 8 });
    expect(p.rays[0].reason).toBe('band-absent');
    expect(p.rays[4].valid).toBe(true);
    expect(p.rays[4].widthPx!).toBeCloseTo(50, 1);
  });

  it('non-square pixels scale the width per ray direction', () => {
    const p = measureBand({ outer: circle(500, 400, 300), boundary: circle(500, 400, 250), center: { x: 500, y: 400 }, umPerPx: { x: 2, y: 3 }, nRays: 4 });
    expect(p.rays[0].widthUm!).toBeCloseTo(100, 2); // 50 px along x · 2 µm
    expect(p.rays[1].widthUm!).toBeCloseTo(150, 2); // 50 px along y · 3 µm
  });

  it('missing boundary → no-boundary; bad input → FractozoneError', () => {
    const p = measureBand({ outer: circle(500, 400, 300), boundary: null, center: { x: 500, y: 400 }, umPerPx: 1 });
    expect(p.rays.every((r) => r.reason === 'no-boundary' && !r.valid)).toBe(true);
    expect(p.stats.n).toBe(0);
    expect(() => measureBand({ outer: circle(5, 5, 3), boundary: null, center: { x: 5, y: 5 }, umPerPx: 0 })).toThrow(/pixel size/);
    expect(() => measureBand({ outer: [{ x: 0, y: 0 }], boundary: null, center: { x: 5, y: 5 }, umPerPx: 1 })).toThrow(/at least 3/);
    expect(() => measureBand({ outer: circle(5, 5, 3), boundary: null, center: { x: 5, y: 5 }, umPerPx: 1, nRays: 2 })).toThrow(/rays/);
  });

  it('outermost crossing is used when the boundary folds', () => {
    // star-like boundary r = 200 + 60 cos(5θ) crossed once per ray from the centre; with a fold
    // we use a boundary that zig-zags: check that the reported radius is the max hit
    const boundary = circle(500, 400, 200, 720).map((q, i) => {
      const f = 1 + 0.3 * Math.cos((2 * Math.PI * 5 * i) / 720);
      return { x: 500 + (q.x - 500) * f, y: 400 + (q.y - 400) * f };
    });
    const p = measureBand({ outer: circle(500, 400, 300), boundary, center: { x: 500, y: 400 }, umPerPx: 1, nRays: 8 });
    expect(p.rays[0].boundaryRadiusPx!).toBeCloseTo(260, 1);
  });
});
