/**
 * Teach by example: the pixel classifier's public API (what the command line and the app call).
 *
 * - Labels: a `LabelRaster` (0 unlabelled, 1 outside, 2 rim band, 3 core) painted by brushes or read
 *   from a grey image (`labelsFromDecoded`), checked with `checkLabels`; `strokeLabels` draws thin
 *   arcs from a known geometry (a corrected result, a rendered image's truth).
 * - Teach: `teachModel(images, options)` → the sealed model; `serialiseModel` / `parseModel` for the
 *   file `fractozone.model/1`; `loadModel(model, sha256)` unpacks it for use.
 * - Preview: `predictProbabilities(frame.work, µm per working px, loaded, featureCentre(frame))` →
 *   class probabilities at working resolution; `classMap` → 1/2/3 per working pixel. A caller that
 *   works on one image repeatedly keeps `prepareImage(decoded, scale)` (working copy, centre, feature
 *   tables, the class-map grid's features) and passes it to `teachModel` (`prepared`) and
 *   `predictProbabilities` (`grid`): only the labelled pixels' features and the forest are new.
 * - Measure: `analyseDecoded(decoded, input, { ...params, modelSha256: loaded.sha256 }, onProgress,
 *   { model: loaded })`; the result's `model` block holds the SHA-256 and the confidence.
 */
export { CLASS_NAMES, MAX_LABEL, UNLABELLED, checkLabels, countLabels, labelsFromDecoded, type ClassName, type ClassCounts, type LabelRaster } from './labels.js';
export { strokeLabels, type StrokeGeometry, type StrokeOptions } from './strokes.js';
export { teachModel, TEACH_DEFAULTS, type TeachImage, type TeachOptions, type Teaching } from './train.js';
export { MODEL_SCHEMA, parseModel, serialiseModel, type PixelModel, type ModelTraining, type ModelTrainingImage } from './model.js';
export { PIXEL_FEATURE_SET, featureCentre, pixelFeatureNames } from './features.js';
export { MAX_GRID_POINTS, classMap, gridFeatures, loadModel, predictProbabilities, type ClassProbabilities, type GridFeatures, type LoadedModel } from './predict.js';
export { prepareImage, windowsKey, type PreparedImage } from './prepared.js';
export { MIN_MODEL_CONFIDENCE, type ModelConfidence } from './segment.js';
