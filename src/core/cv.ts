/**
 * Holder for the OpenCV (opencv-wasm 4.3, the opencv.js build) runtime, and the typed interface of
 * the part of it the project calls. Core never loads it itself (that needs a file system in Node,
 * a fetch in the browser): each shell loads it once and calls `setCv`.
 * Every `cv.Mat` allocated in core is freed with `.delete()` in a `finally`.
 *
 * The interface declares only what is used (add a member here before calling it), with the
 * signatures of the OpenCV 4.3 JavaScript bindings (docs.opencv.org/4.3.0, "OpenCV.js").
 */

/** A size in px (`cv.Size`). */
export interface Size {
  width: number;
  height: number;
}

/** A point (`cv.Point`). */
export interface Point {
  x: number;
  y: number;
}

/** An upright rectangle in px (`cv.Rect`). */
export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** A rotated rectangle (`cv.RotatedRect`), as returned by `fitEllipse`; angle in degrees. */
export interface RotatedRect {
  center: Point;
  size: Size;
  angle: number;
}

/** An OpenCV matrix (`cv.Mat`), rows × cols; the typed views share its memory. Free with `delete()`. */
export interface Mat {
  readonly rows: number;
  readonly cols: number;
  /** CV_8U data. */
  readonly data: Uint8Array;
  /** CV_32F data. */
  readonly data32F: Float32Array;
  /** CV_32S data. */
  readonly data32S: Int32Array;
  copyTo(dst: Mat): void;
  /** A view of the rectangle (shares the data; delete the view too). */
  roi(rect: Rect): Mat;
  intAt(row: number, col: number): number;
  doubleAt(row: number, col: number): number;
  delete(): void;
}

/** A vector of matrices (`cv.MatVector`), e.g. contours. Free with `delete()`. */
export interface MatVector {
  size(): number;
  /** The i-th matrix (a new handle: delete it too). */
  get(i: number): Mat;
  delete(): void;
}

/** The OpenCV functions, classes and constants the project uses. */
export interface OpenCv {
  Mat: { new (): Mat; new (rows: number, cols: number, type: number): Mat };
  MatVector: new () => MatVector;
  Size: new (width: number, height: number) => Size;
  Point: new (x: number, y: number) => Point;
  Rect: new (x: number, y: number, width: number, height: number) => Rect;
  matFromArray(rows: number, cols: number, type: number, data: ArrayLike<number>): Mat;

  // depths and types
  CV_8U: number;
  CV_32F: number;
  CV_32S: number;
  CV_32FC1: number;
  CV_32FC2: number;
  // borders, interpolation, morphology, thresholds, contours, distances, components
  BORDER_CONSTANT: number;
  BORDER_REFLECT_101: number;
  BORDER_REPLICATE: number;
  INTER_AREA: number;
  INTER_LINEAR: number;
  MORPH_RECT: number;
  MORPH_ELLIPSE: number;
  MORPH_OPEN: number;
  MORPH_CLOSE: number;
  THRESH_BINARY: number;
  RETR_EXTERNAL: number;
  CHAIN_APPROX_NONE: number;
  DIST_L2: number;
  CC_STAT_AREA: number;
  CC_STAT_LEFT: number;
  CC_STAT_TOP: number;
  CC_STAT_WIDTH: number;
  CC_STAT_HEIGHT: number;

  blur(src: Mat, dst: Mat, ksize: Size, anchor: Point, borderType: number): void;
  boxFilter(src: Mat, dst: Mat, ddepth: number, ksize: Size, anchor: Point, normalize: boolean, borderType: number): void;
  GaussianBlur(src: Mat, dst: Mat, ksize: Size, sigmaX: number, sigmaY: number, borderType: number): void;
  Sobel(src: Mat, dst: Mat, ddepth: number, dx: number, dy: number, ksize: number, scale: number, delta: number, borderType: number): void;
  resize(src: Mat, dst: Mat, dsize: Size, fx: number, fy: number, interpolation: number): void;
  subtract(src1: Mat, src2: Mat, dst: Mat): void;
  multiply(src1: Mat, src2: Mat, dst: Mat): void;
  bitwise_not(src: Mat, dst: Mat): void;
  threshold(src: Mat, dst: Mat, thresh: number, maxval: number, type: number): number;
  getStructuringElement(shape: number, ksize: Size): Mat;
  erode(src: Mat, dst: Mat, kernel: Mat): void;
  dilate(src: Mat, dst: Mat, kernel: Mat): void;
  morphologyEx(src: Mat, dst: Mat, op: number, kernel: Mat): void;
  distanceTransform(src: Mat, dst: Mat, distanceType: number, maskSize: number): void;
  /** Number of labels including the background 0. */
  connectedComponentsWithStats(image: Mat, labels: Mat, stats: Mat, centroids: Mat, connectivity: number, ltype: number): number;
  findContours(image: Mat, contours: MatVector, hierarchy: Mat, mode: number, method: number): void;
  fitEllipse(points: Mat): RotatedRect;
  /** Build summary text (present in full builds). */
  getBuildInformation?(): string;
}

let instance: OpenCv | undefined;

/** Hands the loaded runtime to core (called once by each shell). */
export function setCv(cv: OpenCv): void {
  instance = cv;
}

/** The runtime; throws when no shell has loaded it. */
export function getCv(): OpenCv {
  if (!instance) throw new Error('OpenCV runtime not loaded: call setCv() from the shell first');
  return instance;
}

/** True once a runtime was set. */
export function hasCv(): boolean {
  return instance !== undefined;
}
