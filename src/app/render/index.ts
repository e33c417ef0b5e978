/** Pure render helpers (shapes per Konva layer, view transforms). */
export * from './layers.js';
