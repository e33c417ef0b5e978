/** What every panel gets: the shown image, the series, and ways to act on them. */
import type { FeatureName } from '../../../core/index.js';
import type { Doc, MessageArea, Series } from '../../state/document.js';
import type { Change } from '../../state/actions/types.js';
import type { ExportKind } from '../../flows/save.js';

/** Runs an action on the shown image (its outcome goes to the image's or the series' history). */
export type Act = (area: MessageArea, f: (doc: Doc, series: Series) => Change) => void;

/** Flows bound to the shown image. */
export interface DocFlows {
  findBar(lengthUm: number | null): void;
  findBoundary(): void;
  showTexture(feature: FeatureName): void;
  hideTexture(): void;
  save(kind: ExportKind): void;
  openSession(file: File): void;
  openMaterialSheet(file: File): void;
}

export interface PanelProps {
  doc: Doc;
  series: Series;
  act: Act;
  flows: DocFlows;
}

/** A number for display: 4 significant digits, plain notation, "—" when missing. */
export function num(v: number | null | undefined, digits = 4): string {
  if (typeof v !== 'number' || !Number.isFinite(v)) return '—';
  return String(Number(v.toPrecision(digits)));
}
