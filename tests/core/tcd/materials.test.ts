import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { FractozoneError } from '../../../src/core/errors.js';
import { parseMaterialSheet, resolveCriticalDistance, selectMaterial, splitMaterialRef } from '../../../src/core/tcd/index.js';

const sheet = readFileSync(fileURLToPath(new URL('../../fixtures/tcd/materials.json', import.meta.url)), 'utf8');

function withMat(patch: (m: Record<string, any>) => void): string {
  const doc = JSON.parse(sheet);
  patch(doc.materials[0]);
  return JSON.stringify(doc);
}

describe('parseMaterialSheet (JSON fractozone.materials/1)', () => {
  it('reads values in engine units with sources', () => {
    const mats = parseMaterialSheet(sheet, 'm.json');
    const zx = selectMaterial(mats, 'ZX-17 (invented)', 'm.json');
    expect(zx.invented).toBe(true);
    expect(zx.fractureToughness).toMatchObject({ value: 60, sd: 3, source: 'invented demo value' });
    expect(zx.dynamic?.L).toMatchObject({ law: 'power', A: 1400, B: -0.04 });
    const qb = selectMaterial(mats, 'QB-4 (invented)', 'm.json');
    expect(qb.fractureToughness.value).toBeCloseTo(50 * 1.0988434941, 8); // ASTM E399 factor
    expect(qb.inherentStrength.value).toBeCloseTo(130 * 6.894757293168361, 9);
    expect(qb.fractureToughness.interval![0]).toBeCloseTo(45 * 1.0988434941, 8);
  });
  it.each([
    [(m: any) => (m.fractureToughness.value = -60), 'm.json: material "ZX-17 (invented)" fractureToughness.value: must be positive, got -60'],
    [(m: any) => (m.fractureToughness.value = 0), 'fractureToughness.value: must be positive, got 0'],
    [(m: any) => (m.inherentStrength.value = 'NaN'), 'inherentStrength.value: must be a number, got "NaN"'],
    [(m: any) => delete m.inherentStrength.unit, 'material "ZX-17 (invented)" inherentStrength.unit: is missing'],
    [(m: any) => (m.inherentStrength.unit = 'bar'), 'inherentStrength.unit: unknown unit "bar"'],
    [(m: any) => delete m.fractureToughness.source, 'fractureToughness.source: is missing; every value needs its source'],
    [(m: any) => delete m.inherentStrength, 'material "ZX-17 (invented)" inherentStrength: is missing'],
    [(m: any) => (m.fractureToughness.sd = -1), 'fractureToughness.sd: must be non-negative'],
    [(m: any) => (m.dynamic.L.law = 'cubic'), 'dynamic.L.law: must be "power" or "table"'],
    [(m: any) => (m.dynamic.L.rateUnit = '1/min'), 'dynamic.L.rateUnit: unknown unit "1/min"'],
    [(m: any) => delete m.dynamic.sigma0.source, 'dynamic.sigma0.source: is missing'],
    [(m: any) => (m.dynamic.sigma0.points = [[1, 900], [0.1, 950]]), 'strain rates must increase strictly'],
  ])('refuses invalid field %#', (patch, msg) => {
    expect(() => parseMaterialSheet(withMat(patch), 'm.json')).toThrow(msg);
  });
  it('refuses wrong schema, bad JSON, empty text, unknown names', () => {
    expect(() => parseMaterialSheet('{"schema":"x","materials":[]}', 'm.json')).toThrow(/schema/);
    expect(() => parseMaterialSheet('{"schema":', 'm.json')).toThrow(/not valid JSON/);
    expect(() => parseMaterialSheet('  ', 'm.json')).toThrow(/empty/);
    expect(() => selectMaterial(parseMaterialSheet(sheet, 'm.json'), 'steel', 'm.json')).toThrow(/no material named "steel".*ZX-17/);
    try {
      parseMaterialSheet('{"schema":', 'm.json');
    } catch (e) {
      expect((e as FractozoneError).code).toBe('BAD_MATERIAL');
      expect((e as FractozoneError).kind).toBe('usage');
    }
  });
});

describe('parseMaterialSheet (CSV)', () => {
  const csv = [
    '# invented demo materials',
    'name,property,value,unit,sd,source,invented',
    'ZX-17 (invented),fractureToughness,60,MPa*sqrt(m),3,"invented, demo",yes',
    'ZX-17 (invented),inherentStrength,900,MPa,,"invented, demo",yes',
  ].join('\n');
  it('reads rows with quoted sources', () => {
    const m = parseMaterialSheet(csv, 'm.csv')[0];
    expect(m.name).toBe('ZX-17 (invented)');
    expect(m.invented).toBe(true);
    expect(m.fractureToughness).toMatchObject({ value: 60, sd: 3, source: 'invented, demo' });
    expect(m.inherentStrength.sd).toBeUndefined();
  });
  it('names line, material and field in errors', () => {
    expect(() => parseMaterialSheet(csv.replace(',900,', ',abc,'), 'm.csv')).toThrow('m.csv: line 4 material "ZX-17 (invented)" inherentStrength.value: "abc" is not a number');
    expect(() => parseMaterialSheet(csv.replace(',900,MPa,', ',900,,'), 'm.csv')).toThrow('inherentStrength.unit: is missing');
    expect(() => parseMaterialSheet(csv.replace('"invented, demo",yes\nZX', '"",yes\nZX'), 'm.csv')).toThrow('fractureToughness.source: is missing');
    expect(() => parseMaterialSheet('name,value\n', 'm.csv')).toThrow(/lacks the column "property"/);
  });
});

describe('splitMaterialRef', () => {
  it('splits FILE:NAME at the last colon', () => {
    expect(splitMaterialRef('a/b.json:ZX-17 (invented)')).toEqual({ file: 'a/b.json', name: 'ZX-17 (invented)' });
    expect(() => splitMaterialRef('b.json')).toThrow(/FILE:NAME/);
  });
});

describe('resolveCriticalDistance', () => {
  const mats = parseMaterialSheet(sheet, 'm.json');
  const zx = mats[0];
  const qb = mats[1];
  it('static from a material: L, MC interval, distances, sources', () => {
    const r = resolveCriticalDistance({ material: zx, seed: 1 });
    expect(r.L_um).toBeCloseTo(1414.71, 2);
    expect(r.interval95_um![0]).toBeLessThan(r.L_um);
    expect(r.interval95_um![1]).toBeGreaterThan(r.L_um);
    expect(r.pointDistance_um).toBeCloseTo(r.L_um / 2, 12);
    expect(r.inputs.toughness.source).toBe('invented demo value');
    expect(r.warnings.map((w) => w.code)).toContain('INVENTED_MATERIAL');
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/invented/);
  });
  it('typed values override the material and have no interval without sd', () => {
    const r = resolveCriticalDistance({ material: zx, toughness: { value: 30 }, strength: { value: 900 } });
    expect(r.L_um).toBeCloseTo(1414.71 / 4, 2);
    expect(r.interval95_um).toBeNull();
    expect(r.inputs.toughness.source).toBe('command line');
  });
  it('strain rate with an L law: L = A·ε̇^B, σ_0 from its table', () => {
    const r = resolveCriticalDistance({ material: zx, strainRate: 1 });
    expect(r.basis).toBe('strain-rate law for L');
    expect(r.L_um).toBeCloseTo(1400, 9);
    expect(r.inputs.strength.value).toBeCloseTo(975, 9); // half-way in ln ε̇ between 900 and 1050
  });
  it('strain rate with only a σ_0 law: static K_c with σ_0(ε̇)', () => {
    const r = resolveCriticalDistance({ material: qb, strainRate: 1 });
    expect(r.basis).toBe('strain-rate law for σ_0');
    expect(r.inputs.strength.value).toBeCloseTo(900, 9);
  });
  it('refuses missing values and a strain rate without a law', () => {
    expect(() => resolveCriticalDistance({ toughness: { value: 60 } })).toThrow(/inherent strength is missing/);
    expect(() => resolveCriticalDistance({ toughness: { value: 60 }, strength: { value: 900 }, strainRate: 10 })).toThrow(/strain-rate law/);
    expect(() => resolveCriticalDistance({ material: zx, strainRate: 1e6 })).toThrow(/outside the table/);
  });
});
