/**
 * WebAssembly version of the entropy kernel's interior loop (entropy.wat), loaded synchronously
 * from the bytes embedded in entropyWasm.generated.ts, so it works alike in Node, worker threads
 * and a browser Web Worker. Where WebAssembly is unavailable (or fails to instantiate) the
 * caller falls back to the JavaScript loop; both give identical output (tests check this).
 *
 * Memory layout of one call (byte offsets): [0, 16) the two final S values; then the increment
 * table (f64), the two histograms (i32), two output rows (f32) and the bin image (u8). The bin
 * image is copied in once per call; output rows are copied out per row pair while still in cache.
 */
import { ENTROPY_WASM_BASE64 } from './entropyWasm.generated.js';
import { align, ensureMemory, wasmModule } from './wasm.js';

/** The exported interior loop; see entropy.wat for the parameters. */
type InteriorPair = (
  hA: number,
  hB: number,
  q: number,
  n: number,
  w: number,
  W: number,
  span: number,
  inc: number,
  out: number,
  SA: number,
  SB: number,
  tN: number,
  iN: number,
) => void;

/** One instance with its memory, laid out for an image size. */
export interface EntropyWasmCall {
  readonly interiorPair: InteriorPair;
  /** Final S of histograms A and B after {@link interiorPair}. */
  readonly sOut: Float64Array;
  readonly incOff: number;
  readonly hAOff: number;
  readonly hBOff: number;
  readonly hA: Int32Array;
  readonly hB: Int32Array;
  /** Two output rows (row y, then row y + 1, each `width` long). */
  readonly outOff: number;
  readonly outRows: Float32Array;
  /** Start of the bin image in memory. */
  readonly binsOff: number;
}

/** Memory above this size is not kept after a call (the instance is dropped, the module kept). */
const KEEP_BYTES = 32 << 20;

let instance: WebAssembly.Instance | null = null;

/** True when the WebAssembly kernel can be used here. */
export function entropyWasmAvailable(): boolean {
  return wasmModule(ENTROPY_WASM_BASE64) !== null;
}

/**
 * Prepares memory for the bin image `bins` (rows of `width`), the increment table `inc` and `nBins`
 * bins, copies the bin image and the increment table in, and returns the views; null when
 * WebAssembly is not available or the memory cannot be had.
 */
export function prepareEntropyWasm(
  bins: Uint8Array,
  width: number,
  inc: Float64Array,
  nBins: number,
): EntropyWasmCall | null {
  const mod = wasmModule(ENTROPY_WASM_BASE64);
  if (!mod) return null;
  const incOff = 16;
  const hAOff = align(incOff + inc.length * 8, 64);
  const hBOff = align(hAOff + nBins * 4, 64);
  const outOff = align(hBOff + nBins * 4, 64);
  const binsOff = align(outOff + 2 * width * 4, 64);
  const need = binsOff + bins.length;
  try {
    if (!instance) instance = new WebAssembly.Instance(mod, {});
    const mem = instance.exports.memory as WebAssembly.Memory;
    if (!ensureMemory(mem, need)) {
      instance = null;
      return null;
    }
    const buf = mem.buffer;
    new Uint8Array(buf, binsOff, bins.length).set(bins);
    new Float64Array(buf, incOff, inc.length).set(inc);
    return {
      interiorPair: instance.exports.interiorPair as InteriorPair,
      sOut: new Float64Array(buf, 0, 2),
      incOff,
      hAOff,
      hBOff,
      hA: new Int32Array(buf, hAOff, nBins),
      hB: new Int32Array(buf, hBOff, nBins),
      outOff,
      outRows: new Float32Array(buf, outOff, 2 * width),
      binsOff,
    };
  } catch {
    // memory could not grow (or instantiation failed): the JavaScript loop does the work
    instance = null;
    return null;
  }
}

/** Ends a call: a large memory is released (the compiled module stays cached). */
export function finishEntropyWasm(): void {
  if (!instance) return;
  const mem = instance.exports.memory as WebAssembly.Memory;
  if (mem.buffer.byteLength > KEEP_BYTES) instance = null;
}
