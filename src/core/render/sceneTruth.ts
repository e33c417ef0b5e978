/** What the truth file says about the scene around the fracture surface (only when elements are present). */
import type { BoxPx } from './scalebar.js';

/** A steel rule or a specimen label in the frame. */
export interface ObjectTruth {
  readonly kind: 'rule' | 'label';
  /** corners of the object's visible part, px (clockwise on screen) */
  readonly polygonPx: readonly { readonly x: number; readonly y: number }[];
  /** rotation of the object, degrees (counter-clockwise on screen) */
  readonly angleDeg: number;
  /** rule: distance between neighbouring graduation marks, px, and what it stands for, µm */
  readonly graduationPx?: number;
  readonly graduationUm?: number;
  /** label: the printed text */
  readonly text?: string;
}

/** The notch flank around each specimen. */
export interface FlankTruth {
  readonly kind: 'V' | 'U';
  /** bar (gross) diameter, µm; the truth outline stays the notch root (net diameter) */
  readonly barDiameterUm: number;
  /** bar outline radius in px along the x axis of the image (for a circle: the radius) */
  readonly barRadiusPx: number;
}

/** The scene: which elements the image shows and where. */
export interface SceneTruth {
  /** names of the scene elements present (e.g. "flank", "holder:putty", "shadow", "halves") */
  readonly elements: readonly string[];
  /** the part of the frame that shows the scene (the SEM data strip lies below it), px, inclusive */
  readonly imageAreaPx: BoxPx;
  /** true when the image is RGB */
  readonly colour: boolean;
  readonly flank: FlankTruth | null;
  /** the SEM data strip, px (null when none) */
  readonly dataStripPx: BoxPx | null;
  readonly objects: readonly ObjectTruth[];
  readonly note: string;
}
