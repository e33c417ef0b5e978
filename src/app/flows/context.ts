/** What the flows (open, measure, save, …) work with: the engine, the state, and the pictures. */
import type { Engine } from '../worker/client.js';
import { EngineError } from '../worker/client.js';
import type { AppState } from '../state/store.js';
import type { Update } from '../hooks/useStore.js';
import { inAppWords } from '../state/words.js';

export interface TextureView {
  canvas: HTMLCanvasElement;
  label: string;
}

export interface FlowContext {
  engine: Engine;
  get(): AppState;
  update: Update;
  setPreview(docId: string, canvas: HTMLCanvasElement): void;
  setTexture(docId: string, t: TextureView | null): void;
  /** Clears the progress line. */
  done(): void;
}

/** An engine error in the app's words. */
export function wordsOf(e: unknown, file?: string): string {
  if (e instanceof EngineError) return inAppWords(e.code, e.message, file);
  return inAppWords('PROCESSING_FAILED', e instanceof Error ? e.message : String(e), file);
}

/** A canvas holding RGBA pixels. */
export function rgbaCanvas(w: number, h: number, rgba: Uint8ClampedArray): HTMLCanvasElement {
  const c = document.createElement('canvas');
  c.width = w;
  c.height = h;
  const g = c.getContext('2d');
  if (g) g.putImageData(new ImageData(new Uint8ClampedArray(rgba.buffer as ArrayBuffer, rgba.byteOffset, rgba.length), w, h), 0, 0);
  return c;
}
