import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readManifest } from '../../src/cli/batch/manifest.js';
import { paramsFromOptions } from '../../src/cli/measureOptions.js';
import { FractozoneError } from '../../src/core/errors.js';
import { defaultParams, validateParams } from '../../src/core/pipeline/params.js';
import { fullRunReason } from '../../src/core/pipeline/recompute.js';
import { makeResult } from '../helpers/result.js';

describe('section diameter: --section-diameter, manifest column section_diameter_mm, validation', () => {
  it('the CLI option takes a length with its unit and stores µm', () => {
    expect(paramsFromOptions({ sectionDiameter: '5mm' }).sectionDiameterUm).toBeCloseTo(5000, 9);
    expect(paramsFromOptions({ sectionDiameter: '4200um' }).sectionDiameterUm).toBeCloseTo(4200, 9);
    expect(paramsFromOptions({}).sectionDiameterUm).toBeUndefined();
  });

  it('a non-positive diameter is a bad parameter', () => {
    const p = defaultParams();
    p.sectionDiameterUm = -3;
    expect(() => validateParams(p)).toThrow(FractozoneError);
  });

  it('the manifest column is in mm and becomes µm; a bad value names line and column', () => {
    const dir = mkdtempSync(join(tmpdir(), 'fz-sd-'));
    const m = join(dir, 'manifest.csv');
    writeFileSync(m, 'file,section_diameter_mm\na.png,5.2\n');
    const rows = [...readManifest(m).rows.values()];
    expect(rows[0].sectionDiameterUm).toBeCloseTo(5200, 9);
    writeFileSync(m, 'file,section_diameter_mm\na.png,abc\n');
    expect(() => readManifest(m)).toThrow(/line 2, column section_diameter_mm/);
  });

  it('changing the section diameter needs a full run (it changes which edge is the outline)', () => {
    const base = makeResult();
    const p = structuredClone(base.params);
    p.sectionDiameterUm = 5000;
    expect(fullRunReason(base, p)).toMatch(/section diameter/);
  });
});
