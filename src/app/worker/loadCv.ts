/**
 * Loads opencv-wasm inside the module Web Worker.
 *
 * The package's opencv.js is a UMD script written for Node (it reads opencv.wasm with fs). In the
 * worker we (1) take the script text as a Vite `?raw` import, (2) take the wasm as a separate asset
 * URL (`?url`, served as application/wasm), (3) fetch the wasm with progress, and (4) evaluate the
 * script in a function scope where `module`/`exports`/`define` are undefined and `Module` is our
 * own object carrying `instantiateWasm`. The wasm is compiled
 * asynchronously and instantiated synchronously (the build needs its exports at once). The runtime is
 * ready at `onRuntimeInitialized`; the caller then hands it to core with `setCv(cv)`.
 */
import cvSource from 'opencv-wasm/opencv.js?raw';
import wasmUrl from 'opencv-wasm/opencv.wasm?url';
import type { OpenCv } from '../../core/index.js';

export type ProgressFn = (stage: string, fraction: number) => void;

async function fetchWithProgress(url: string, onProgress: ProgressFn): Promise<ArrayBuffer> {
  const res = await fetch(url, { credentials: 'same-origin' });
  if (!res.ok) throw new Error(`could not load the OpenCV runtime (${res.status})`);
  const total = Number(res.headers.get('content-length') ?? 0);
  if (!res.body || !total) return res.arrayBuffer();
  const reader = res.body.getReader();
  const buf = new Uint8Array(total);
  let got = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    if (got + value.length > buf.length) {
      // Server sent more than announced: fall back to a growing copy.
      const bigger = new Uint8Array(Math.max(buf.length * 2, got + value.length));
      bigger.set(buf.subarray(0, got));
      return concatRest(bigger, got, value, reader);
    }
    buf.set(value, got);
    got += value.length;
    onProgress('loading OpenCV', got / total);
  }
  return buf.slice(0, got).buffer;
}

async function concatRest(
  buf: Uint8Array,
  got: number,
  first: Uint8Array,
  reader: ReadableStreamDefaultReader<Uint8Array>,
): Promise<ArrayBuffer> {
  let b = buf;
  let n = got;
  let chunk: Uint8Array | undefined = first;
  while (chunk) {
    if (n + chunk.length > b.length) {
      const c = new Uint8Array(Math.max(b.length * 2, n + chunk.length));
      c.set(b.subarray(0, n));
      b = c;
    }
    b.set(chunk, n);
    n += chunk.length;
    const r = await reader.read();
    chunk = r.done ? undefined : r.value;
  }
  return b.slice(0, n).buffer;
}

/**
 * The Emscripten module object we hand to opencv.js; once initialised it is the OpenCV runtime
 * (its functions are added by opencv.js; core's cv.ts describes the ones the project calls).
 */
interface CvModule {
  print(): void;
  printErr(s: unknown): void;
  locateFile(): string;
  instantiateWasm(info: WebAssembly.Imports, receive: (i: WebAssembly.Instance, m: WebAssembly.Module) => void): WebAssembly.Exports;
  onAbort(what: unknown): void;
  onRuntimeInitialized?: () => void;
  /** Emscripten makes the module thenable; removed before it is resolved. */
  then?: unknown;
}
type CvRuntime = CvModule;

/** Members core calls that an initialised runtime must have (checked once, at the JavaScript boundary). */
const REQUIRED = ['Mat', 'MatVector', 'Size', 'Point', 'matFromArray', 'fitEllipse', 'findContours', 'boxFilter', 'GaussianBlur', 'resize', 'threshold', 'connectedComponentsWithStats'];

/** True when the initialised module has what core's OpenCv interface describes. */
function isOpenCv(m: object): m is OpenCv {
  return REQUIRED.every((k) => typeof Reflect.get(m, k) === 'function');
}

/** The initialised runtime as core's typed OpenCv, or an error naming what is missing. */
export function asOpenCv(m: object): OpenCv {
  if (!isOpenCv(m)) throw new Error(`the OpenCV runtime lacks ${REQUIRED.filter((k) => typeof Reflect.get(m, k) !== 'function').join(', ')}`);
  return m;
}

/** Loads and initialises OpenCV; resolves with the runtime object (wrapped, because it is thenable). */
export async function loadCvInWorker(onProgress: ProgressFn = () => undefined): Promise<{ cv: CvRuntime }> {
  const wasm = await fetchWithProgress(wasmUrl, onProgress);
  onProgress('compiling OpenCV', 1);
  const compiled = await WebAssembly.compile(wasm);
  return new Promise((resolve, reject) => {
    const mod: CvModule = {
      print: () => undefined,
      printErr: (s: unknown) => console.warn('[opencv]', s),
      locateFile: () => wasmUrl,
      // This build (asm2wasm era) binds its exports synchronously, so instantiation must be
      // synchronous: compile asynchronously first (below), then instantiate the compiled module here.
      instantiateWasm(info: WebAssembly.Imports, receive: (i: WebAssembly.Instance, m: WebAssembly.Module) => void) {
        const instance = new WebAssembly.Instance(compiled, info);
        receive(instance, compiled);
        return instance.exports;
      },
      onAbort: (what: unknown) => reject(new Error(`OpenCV runtime aborted: ${String(what)}`)),
    };
    mod.onRuntimeInitialized = () => {
      delete mod.then; // the Emscripten module is thenable; never resolve a promise with it directly
      resolve({ cv: mod });
    };
    const patched = cvSource.replace('let Module = {};', 'let Module = __fzModule;');
    if (patched === cvSource) {
      reject(new Error('unexpected opencv.js layout (Module declaration not found)'));
      return;
    }
    const root: { cv?: unknown } = {};
    try {
      // The UMD wrapper sees: no module/exports/define, an importScripts stub → "Web worker" branch,
      // which stores the factory on `root.cv`; calling it initialises the runtime with our Module.
      const fn = new Function('__fzModule', 'module', 'exports', 'define', 'importScripts', patched);
      fn.call(root, mod, undefined, undefined, undefined, () => undefined);
      const factory = root.cv;
      if (typeof factory !== 'function') throw new Error('opencv.js did not expose its factory');
      factory();
    } catch (e) {
      reject(e instanceof Error ? e : new Error(String(e)));
    }
  });
}
