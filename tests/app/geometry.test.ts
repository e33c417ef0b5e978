import { describe, expect, it } from 'vitest';
import { angleDeg, brushBoundary, insertVertex, removeVertex } from '../../src/app/state/geometry.js';
import { ellipsePolygon, outlineFromPolygon } from '../../src/app/state/params.js';

describe('boundary geometry', () => {
  it('angle convention: 0° = +x, 90° = up on screen (−y)', () => {
    const c = { x: 0, y: 0 };
    expect(angleDeg(c, { x: 1, y: 0 })).toBeCloseTo(0, 12);
    expect(angleDeg(c, { x: 0, y: -1 })).toBeCloseTo(90, 12);
    expect(angleDeg(c, { x: -1, y: 0 })).toBeCloseTo(180, 12);
    expect(angleDeg(c, { x: 0, y: 1 })).toBeCloseTo(270, 12);
  });

  it('inserts a point into the nearest edge and removes it again', () => {
    const sq = [
      { x: 0, y: 0 },
      { x: 10, y: 0 },
      { x: 10, y: 10 },
      { x: 0, y: 10 },
    ];
    const { poly, index } = insertVertex(sq, { x: 10.5, y: 5 });
    expect(index).toBe(2);
    expect(poly).toHaveLength(5);
    expect(removeVertex(poly, index)).toEqual(sq);
    expect(removeVertex(removeVertex(sq, 0), 0)).toHaveLength(3);
  });

  it('brush "add rim" pulls the boundary in to the near edge of the disk; "core" pushes it out', () => {
    const c = { x: 0, y: 0 };
    const ring = ellipsePolygon({ cx: 0, cy: 0, rx: 50, ry: 50, angleDeg: 0 }, 36);
    const added = brushBoundary(ring, c, { x: 50, y: 0 }, 10, 'add');
    expect(Math.hypot(added[0].x, added[0].y)).toBeCloseTo(40, 9);
    expect(added[18]).toEqual(ring[18]);
    const removed = brushBoundary(ring, c, { x: 50, y: 0 }, 10, 'remove');
    expect(Math.hypot(removed[0].x, removed[0].y)).toBeCloseTo(60, 9);
  });

  it('outline from an ellipse polygon gives back centre and radii', () => {
    const o = outlineFromPolygon(ellipsePolygon({ cx: 30, cy: 40, rx: 20, ry: 10, angleDeg: 30 }, 720))!;
    expect(o.cx).toBeCloseTo(30, 6);
    expect(o.cy).toBeCloseTo(40, 6);
    expect(o.rx).toBeCloseTo(20, 3);
    expect(o.ry).toBeCloseTo(10, 3);
    expect(o.angleDeg).toBeCloseTo(30, 3);
  });
});

import { transformOutline } from '../../src/app/state/params.js';

describe('outline handles', () => {
  it('moving the centre translates the detected polygon; stretching a scales along the axis', () => {
    const base = { cx: 50, cy: 50, rx: 20, ry: 20, angleDeg: 0 };
    const poly = [
      { x: 70, y: 50 },
      { x: 50, y: 30 },
      { x: 30, y: 50 },
      { x: 50, y: 71 },
    ];
    const moved = transformOutline(poly, base, { ...base, cx: 55, cy: 48 });
    expect(moved[3].x).toBeCloseTo(55, 12);
    expect(moved[3].y).toBeCloseTo(69, 12);
    const stretched = transformOutline(poly, base, { ...base, rx: 30 });
    expect(stretched[0].x).toBeCloseTo(80, 12);
    expect(stretched[1].y).toBeCloseTo(30, 12); // the minor axis (up on screen) is unchanged
    // rotating by 90° (counter-clockwise on screen) takes +x to up (−y)
    const rotated = transformOutline(poly, base, { ...base, angleDeg: 90 });
    expect(rotated[0].x).toBeCloseTo(50, 12);
    expect(rotated[0].y).toBeCloseTo(30, 12);
  });
});
