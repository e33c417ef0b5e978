/**
 * Holder for the OpenCV (opencv-wasm) runtime. Core never loads it itself (that needs a file
 * system in Node, a fetch in the browser): each shell loads it once and calls `setCv`.
 * Every `cv.Mat` allocated in core is freed with `.delete()` in a `finally`.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type CV = any;

let instance: CV | undefined;

export function setCv(cv: CV): void {
  instance = cv;
}

export function getCv(): CV {
  if (!instance) throw new Error('OpenCV runtime not loaded: call setCv() from the shell first');
  return instance;
}

export function hasCv(): boolean {
  return instance !== undefined;
}
