/** Batch machinery of the CLI: discovery, manifest, worker pool, outputs, resume, shards, merge. */
export { runBatch, type BatchOptions, type BatchSummary } from './run.js';
export { mergeOutputs, type MergeSummary } from './merge.js';
export { rebuildOutputs, loadEntries } from './outputs.js';
export { discoverImages, globToRegExp, IMAGE_EXTENSIONS } from './discover.js';
export { readManifest, readSidecar, MANIFEST_COLUMNS } from './manifest.js';
export { assignSafeNames, sanitiseStem } from './names.js';
export { parseShard, inShard, type Shard } from './shard.js';
export type { ImageProcessor, ProcessInput, ProcessOutput } from './processor.js';
