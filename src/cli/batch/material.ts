/** Material references `SHEET:NAME` → MaterialParams (sheet read once per file, cached). */
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { parseMaterialSheet, selectMaterial, splitMaterialRef, type Material } from '../../core/tcd/materials.js';
import type { MaterialParams } from '../../core/pipeline/types.js';

/** The pipeline's material parameters from a validated sheet material. */
export function materialParams(m: Material): MaterialParams {
  return { material: m };
}

/** Display name of the material in a parameter object, or null. */
export function materialName(p: MaterialParams | null | undefined): string | null {
  return p?.material?.name ?? null;
}

export class MaterialResolver {
  private readonly sheets = new Map<string, Material[]>();

  /**
   * @param ref `SHEET:NAME` (SHEET already absolute or relative to the working folder)
   * @throws FractozoneError BAD_MATERIAL / BAD_PARAMETER
   */
  resolve(ref: string): MaterialParams {
    const { file, name } = splitMaterialRef(ref);
    let mats = this.sheets.get(file);
    if (!mats) {
      let text: string;
      try {
        text = readFileSync(file, 'utf8');
      } catch {
        throw new FractozoneError('BAD_MATERIAL', `cannot read material sheet "${file}"`);
      }
      mats = parseMaterialSheet(text, basename(file));
      this.sheets.set(file, mats);
    }
    return materialParams(selectMaterial(mats, name.replace(/^"(.*)"$/, '$1'), basename(file)));
  }
}
