/**
 * WebAssembly version of one output row of the local variance / standard deviation
 * (boxMoments.wat), used by boxMomentsKernel.ts where available; identical output to the
 * JavaScript rows (tests compare them).
 *
 * Memory layout (byte offsets): interleaved column sums (Σx, Σx²) (f64 pairs × width), the
 * entering and the leaving source row and the output row (f32 × width each). The image itself stays outside: per
 * output row the two source rows are copied in and the output row out, so the memory is a few
 * rows wide whatever the image size (no 48 MB copy of a 12-MP raster, no large wasm memory kept).
 */
import { BOXMOMENTS_WASM_BASE64 } from './boxMomentsWasm.generated.js';
import { align, ensureMemory, wasmModule } from './wasm.js';

type VarRow = (
  col: number,
  pin: number,
  pout: number,
  out: number,
  W: number,
  r: number,
  inv: number,
  sq: number,
) => void;

/** Views and offsets for one image width. */
export interface BoxWasmCall {
  readonly varRow: VarRow;
  readonly colOff: number;
  /** Interleaved column sums: [2x] = Σx, [2x + 1] = Σx² of column x. */
  readonly cols: Float64Array;
  readonly inOff: number;
  readonly outOff: number;
  readonly leaveOff: number;
  readonly rowIn: Float32Array;
  readonly rowLeave: Float32Array;
  readonly rowOut: Float32Array;
}

let instance: WebAssembly.Instance | null = null;

/** True when the WebAssembly row kernel can be used here. */
export function boxWasmAvailable(): boolean {
  return wasmModule(BOXMOMENTS_WASM_BASE64) !== null;
}

/**
 * Memory laid out for rows of `width`, the column sums `colS`, `colQ` copied in (interleaved);
 * null when WebAssembly is unavailable.
 */
export function prepareBoxWasm(colS: Float64Array, colQ: Float64Array): BoxWasmCall | null {
  const mod = wasmModule(BOXMOMENTS_WASM_BASE64);
  if (!mod) return null;
  const width = colS.length;
  const colOff = 0;
  const inOff = align(colOff + 16 * width, 64);
  const leaveOff = align(inOff + 4 * width, 64);
  const outOff = align(leaveOff + 4 * width, 64);
  const need = outOff + 4 * width;
  try {
    if (!instance) instance = new WebAssembly.Instance(mod, {});
    const mem = instance.exports.memory as WebAssembly.Memory;
    if (!ensureMemory(mem, need)) return null;
    const buf = mem.buffer;
    const cols = new Float64Array(buf, colOff, 2 * width);
    for (let x = 0; x < width; x++) {
      cols[2 * x] = colS[x];
      cols[2 * x + 1] = colQ[x];
    }
    return {
      varRow: instance.exports.varRow as VarRow,
      colOff,
      cols,
      inOff,
      leaveOff,
      outOff,
      rowIn: new Float32Array(buf, inOff, width),
      rowLeave: new Float32Array(buf, leaveOff, width),
      rowOut: new Float32Array(buf, outOff, width),
    };
  } catch {
    instance = null;
    return null;
  }
}
