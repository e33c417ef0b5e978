/**
 * The named scene set (src/core/render/scenes.ts): what it covers and that every scene is valid. The
 * scenes are laid out (options resolved, objects checked against the specimen and the scale bar) but not
 * rendered here — `node scripts/scene-baseline.mjs` renders and measures them all.
 */
import { describe, expect, it } from 'vitest';
import { SCENE_SET, findScene, resolveRenderOptions } from '../../../src/core/render/index.js';
import { planUnderLayer } from '../../../src/core/render/layers.js';
import { layoutScene } from '../../../src/core/render/layout.js';

const resolved = SCENE_SET.map((s) => ({ s, o: resolveRenderOptions(s.options) }));

describe('scene set', () => {
  it('has unique, file-safe names and a one-line description each', () => {
    const names = SCENE_SET.map((s) => s.name);
    expect(new Set(names).size).toBe(names.length);
    for (const s of SCENE_SET) {
      expect(s.name).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
      expect(s.description.length).toBeGreaterThan(10);
      expect(s.description).not.toMatch(/\n/);
      expect(findScene(s.name)).toBe(s);
    }
    expect(findScene('no-such-scene')).toBeUndefined();
  });

  it('every scene resolves and lays out (objects clear of the specimen and the scale bar)', () => {
    for (const { s, o } of resolved) {
      const layout = layoutScene(o);
      expect(() => planUnderLayer(o, layout), s.name).not.toThrow();
      // the fracture surface of every specimen lies inside the image area
      for (const sp of layout.specimens) {
        const r = (o.specimen.diameterUm / 2) / Math.min(o.umPerPx, o.umPerPxY);
        expect(sp.g.cx - r, s.name).toBeGreaterThan(0);
        expect(sp.g.cx + r, s.name).toBeLessThan(o.widthPx);
        expect(sp.g.cy + r, s.name).toBeLessThan(layout.area.height);
      }
    }
  });

  it('holds each element alone and the combinations asked for, with variants', () => {
    const alone = (tag: string): number => SCENE_SET.filter((s) => s.elements.length <= 2 && s.elements.includes(tag)).length;
    for (const tag of ['flank', 'holder', 'shadow', 'sem', 'glints', 'tint', 'colour-noise', 'defocus', 'halves', 'rule', 'label', 'narrow']) expect(alone(tag), tag).toBeGreaterThanOrEqual(1);
    const has = (...tags: string[]): number => SCENE_SET.filter((s) => tags.every((t) => s.elements.includes(t))).length;
    expect(has('flank', 'holder', 'tint')).toBeGreaterThanOrEqual(2);
    expect(has('sem', 'noise')).toBeGreaterThanOrEqual(2);
    expect(has('halves', 'rule')).toBeGreaterThanOrEqual(2);
    expect(has('narrow', 'noise')).toBeGreaterThanOrEqual(2);
    expect(has('noise', 'jpeg')).toBeGreaterThanOrEqual(2);
    // V and U flanks, brighter and darker than the core
    const flanks = resolved.filter((r) => r.o.flank).map((r) => r.o.flank!);
    expect(flanks.some((f) => f.kind === 'V') && flanks.some((f) => f.kind === 'U')).toBe(true);
    expect(flanks.some((f) => f.albedo > 1.2) && flanks.some((f) => f.albedo < 0.85)).toBe(true);
    expect(Math.min(...flanks.map((f) => f.inclineDeg))).toBeLessThanOrEqual(30);
    expect(Math.max(...flanks.map((f) => f.inclineDeg))).toBeGreaterThanOrEqual(70);
    // shadows fall toward at least three different quadrants
    const quadrants = new Set(resolved.filter((r) => r.o.shadow).map((r) => Math.floor((((r.o.shadow!.azimuthDeg % 360) + 360) % 360) / 90)));
    expect(quadrants.size).toBeGreaterThanOrEqual(3);
  });

  it('stays small: most scenes are 1000 × 760 px, a few larger, none above 4 MP', () => {
    const small = SCENE_SET.filter((s) => s.options.widthPx === 1000 && s.options.heightPx === 760).length;
    expect(small / SCENE_SET.length).toBeGreaterThan(0.8);
    expect(SCENE_SET.some((s) => (s.options.widthPx ?? 0) > 1000)).toBe(true);
    for (const s of SCENE_SET) expect((s.options.widthPx ?? 0) * (s.options.heightPx ?? 0)).toBeLessThanOrEqual(4e6);
  });
});
