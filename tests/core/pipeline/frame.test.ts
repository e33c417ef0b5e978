/**
 * The working frame (src/core/pipeline/frame.ts): reduction factor, the px mapping between the
 * full image and the working copy (area-averaging convention: working pixel i covers full
 * pixels i·s … (i + 1)·s − 1, centre (i + 0.5)·s − 0.5), and the scale marks painted out.
 */
import { describe, expect, it } from 'vitest';
import { createRaster } from '../../../src/core/image/raster.js';
import { WorkingFrame, WORKING_LONG_SIDE_PX } from '../../../src/core/pipeline/frame.js';

describe('WorkingFrame', () => {
  it('keeps images up to the working size as they are (factor 1, identity mapping)', () => {
    const r = createRaster(800, 600);
    const f = new WorkingFrame(r, []);
    expect(f.factor).toBe(1);
    expect(f.work).toBe(r);
    expect(f.toFull({ x: 12.25, y: 7 })).toEqual({ x: 12.25, y: 7 });
    expect(f.lengthToFull(10)).toBe(10);
  });

  it('reduces a 2400 × 1800 image by 2: pixel centres, lengths and areas map by the realised factors', () => {
    const f = new WorkingFrame(createRaster(2 * WORKING_LONG_SIDE_PX, 1800), []);
    expect(f.factor).toBe(2);
    expect([f.work.width, f.work.height]).toEqual([1200, 900]);
    // working pixel 0 covers full pixels 0 and 1: its centre is at 0.5
    expect(f.toFull({ x: 0, y: 0 })).toEqual({ x: 0.5, y: 0.5 });
    expect(f.toWork({ x: 0.5, y: 0.5 })).toEqual({ x: 0, y: 0 });
    const p = { x: 311.7, y: 42.1 };
    const back = f.toFull(f.toWork(p));
    expect(back.x).toBeCloseTo(p.x, 12);
    expect(back.y).toBeCloseTo(p.y, 12);
    expect(f.lengthToFull(3)).toBe(6);
    expect(f.areaToFull(3)).toBe(12);
  });

  it('non-integer reduction: the realised factors follow the rounded working size', () => {
    const f = new WorkingFrame(createRaster(1500, 1001), []);
    expect(f.factor).toBe(1.25);
    expect([f.work.width, f.work.height]).toEqual([1200, 801]);
    expect(f.sx).toBe(1500 / 1200);
    expect(f.sy).toBe(1001 / 801);
    expect(f.lengthScale).toBeCloseTo(Math.sqrt(f.sx * f.sy), 15);
  });

  it('paints the scale marks out in the working copy only, and maps them to working px', () => {
    const r = createRaster(400, 300, new Float32Array(400 * 300).fill(0.2));
    for (let y = 250; y < 260; y++) for (let x = 300; x < 380; x++) r.data[y * 400 + x] = 1;
    const box = { x: 296, y: 246, w: 88, h: 18 };
    const f = new WorkingFrame(r, [box]);
    expect(f.workMarks).toEqual([box]); // factor 1: same px
    expect(r.data[255 * 400 + 340]).toBe(1); // the full image keeps the bar
    expect(f.work.data[255 * 400 + 340]).toBeCloseTo(0.2, 5); // the working copy has the background level there
  });
});
