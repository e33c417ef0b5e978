/**
 * One error type for everything the engine refuses. `code` is stable (scripts may match on it);
 * `message` is one plain sentence for a person. Shells map `kind` to exit codes:
 * `input` / `processing` → 1, `usage` → 2.
 */
export type ErrorCode =
  | 'EMPTY_INPUT'
  | 'NOT_AN_IMAGE'
  | 'UNSUPPORTED_IMAGE'
  | 'CORRUPT_IMAGE'
  | 'TRUNCATED_IMAGE'
  | 'ZERO_SIZE_IMAGE'
  | 'IMAGE_TOO_LARGE'
  | 'BAD_SCALE'
  | 'BAD_PARAMETER'
  | 'BAD_MATERIAL'
  | 'BAD_CURVE'
  | 'BAD_MANIFEST'
  | 'BAD_BOUNDARY'
  /** a label image that does not fit its image or holds a value other than 0–3 (learn/labels.ts) */
  | 'BAD_LABELS'
  /** a pixel-classifier model file of another version, damaged, or made for another feature set (learn/model.ts) */
  | 'BAD_MODEL'
  | 'NO_SPECIMEN'
  | 'PROCESSING_FAILED'
  | 'IMAGE_TIMEOUT'
  /** an output file could not be written (disk full, no permission, read-only file system) */
  | 'WRITE_FAILED'
  /** the output folder is in use by another run (its lock file names the run) */
  | 'OUTPUT_BUSY';

export type ErrorKind = 'input' | 'usage' | 'processing';

const USAGE_CODES: ReadonlySet<ErrorCode> = new Set<ErrorCode>([
  'BAD_SCALE',
  'BAD_PARAMETER',
  'BAD_MATERIAL',
  'BAD_CURVE',
  'BAD_MANIFEST',
  'BAD_BOUNDARY',
  'BAD_LABELS',
  'BAD_MODEL',
]);

export class FractozoneError extends Error {
  readonly code: ErrorCode;
  readonly kind: ErrorKind;
  constructor(code: ErrorCode, message: string, kind?: ErrorKind) {
    super(message);
    this.name = 'FractozoneError';
    this.code = code;
    this.kind = kind ?? (USAGE_CODES.has(code) ? 'usage' : 'input');
  }
}

export function isFractozoneError(e: unknown): e is FractozoneError {
  return e instanceof FractozoneError || (typeof e === 'object' && e !== null && (e as { name?: unknown }).name === 'FractozoneError');
}

/** Throws a usage error (exit 2) when `ok` is false. */
export function require(ok: boolean, code: ErrorCode, message: string): asserts ok {
  if (!ok) throw new FractozoneError(code, message);
}
