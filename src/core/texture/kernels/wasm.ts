/**
 * Loading of the hand-written WebAssembly kernels (*.wat beside this file, assembled by
 * scripts/build-wasm.mjs into base64 strings in *Wasm.generated.ts). Modules are compiled
 * synchronously from the embedded bytes and cached, so the kernels work alike in Node, worker
 * threads and a browser Web Worker, with no file system, fetch or bundler plugin. Where
 * WebAssembly is missing or a module fails to compile, callers use their JavaScript loops,
 * which give identical output (tests compare the two).
 */

let enabled = true;
const modules = new Map<string, WebAssembly.Module | null>();

/** Turns the WebAssembly kernels off or on (tests compare them with the JavaScript loops). */
export function setWasmKernelsEnabled(on: boolean): void {
  enabled = on;
}

/** The compiled module for embedded bytes, or null when disabled or unavailable here. */
export function wasmModule(base64: string): WebAssembly.Module | null {
  if (!enabled) return null;
  let m = modules.get(base64);
  if (m === undefined) {
    try {
      m = typeof WebAssembly === 'object' ? new WebAssembly.Module(decodeBase64(base64)) : null;
    } catch {
      m = null;
    }
    modules.set(base64, m);
  }
  return m;
}

/** Grows `mem` to at least `bytes`; false when it cannot grow. */
export function ensureMemory(mem: WebAssembly.Memory, bytes: number): boolean {
  const have = mem.buffer.byteLength;
  if (have >= bytes) return true;
  try {
    mem.grow(Math.ceil((bytes - have) / 65536));
    return true;
  } catch {
    return false;
  }
}

/** `n` rounded up to a multiple of `a`. */
export function align(n: number, a: number): number {
  return Math.ceil(n / a) * a;
}

/** Base64 → bytes without Buffer or atob (the core runs in any JavaScript host). */
export function decodeBase64(s: string): Uint8Array<ArrayBuffer> {
  const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  const val = new Int16Array(128).fill(-1);
  for (let i = 0; i < 64; i++) val[alphabet.charCodeAt(i)] = i;
  const clean = s.replace(/=+$/, '');
  const out = new Uint8Array(Math.floor((clean.length * 3) / 4));
  let acc = 0;
  let nb = 0;
  let o = 0;
  for (let i = 0; i < clean.length; i++) {
    const c = clean.charCodeAt(i);
    const v = c < 128 ? val[c] : -1;
    if (v < 0) throw new Error(`invalid base64 character at ${i}`);
    acc = ((acc << 6) | v) & 0xffffff;
    nb += 6;
    if (nb >= 8) {
      nb -= 8;
      out[o++] = (acc >> nb) & 0xff;
    }
  }
  return out;
}
