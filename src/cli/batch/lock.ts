/**
 * One writer per output folder. `batch`, `merge` (on its --out) and `report` hold
 * `OUT/.fractozone.lock` while they write; a second run on the same folder refuses at once with
 * OUTPUT_BUSY (exit 1) naming the run that holds it.
 *
 * The lock file (JSON: pid, host, start time, the process's kernel start time on Linux, the
 * command, a random token) is written to a temp file and hard-linked to its name, which fails
 * atomically when the name exists (POSIX link(2); also on NFS); file systems without hard links
 * fall back to exclusive create (`wx`). A lock is stale when its host is this host and its
 * process is gone (kill(pid, 0) → ESRCH) or the pid now belongs to a later process (different
 * start time in /proc/<pid>/stat). A stale lock is taken over with a note; two runs taking over
 * the same stale lock are serialised by a second exclusive file (`.fractozone.lock.takeover`). A
 * lock of another host is never judged stale: the message says which file to remove once that run
 * is known to have ended.
 */
import { closeSync, linkSync, openSync, readFileSync, readdirSync, rmdirSync, statSync, unlinkSync, writeFileSync, existsSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { FractozoneError } from '../../core/errors.js';
import { printable } from '../../core/text/printable.js';
import { makeFolder, tempNameFor, writeFailure } from '../io.js';

export const LOCK_NAME = '.fractozone.lock';
const LOCK_SCHEMA = 'fractozone.lock/1';
/** A takeover guard older than this is left from a run killed in the middle of a takeover. */
const GUARD_STALE_MS = 30_000;

export interface LockInfo {
  schema: typeof LOCK_SCHEMA;
  pid: number;
  host: string;
  /** ISO 8601 time the run started. */
  startedAt: string;
  /** Kernel start time of the process (Linux /proc/<pid>/stat field 22), to detect a reused pid. */
  procStart: string | null;
  command: string;
  token: string;
}

/** Start time of a process from /proc (Linux), or null where there is no /proc. */
function procStartOf(pid: number): string | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // fields after the command name (which may contain spaces and parentheses): state is field 3
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return fields[22 - 3] ?? null;
  } catch {
    return null;
  }
}

function parseLock(text: string): LockInfo | null {
  try {
    const o = JSON.parse(text) as Partial<LockInfo>;
    if (o.schema !== LOCK_SCHEMA || typeof o.pid !== 'number' || typeof o.host !== 'string' || typeof o.token !== 'string') return null;
    return {
      schema: LOCK_SCHEMA,
      pid: o.pid,
      host: o.host,
      startedAt: String(o.startedAt ?? ''),
      procStart: typeof o.procStart === 'string' ? o.procStart : null,
      command: String(o.command ?? 'fractozone'),
      token: o.token,
    };
  } catch {
    return null;
  }
}

type Held = { kind: 'gone' } | { kind: 'unreadable'; ageMs: number } | { kind: 'lock'; info: LockInfo };

function readHeld(path: string): Held {
  let text: string;
  let ageMs = 0;
  try {
    ageMs = Date.now() - statSync(path).mtimeMs;
    text = readFileSync(path, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return { kind: 'gone' };
    return { kind: 'unreadable', ageMs };
  }
  const info = parseLock(text);
  return info ? { kind: 'lock', info } : { kind: 'unreadable', ageMs };
}

/** True when the lock's process is known to be gone (same host only). */
export function isStale(info: LockInfo): boolean {
  if (info.host !== hostname()) return false;
  if (info.pid === process.pid) return false;
  try {
    process.kill(info.pid, 0);
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'ESRCH';
  }
  // the pid exists: stale only if it is a later process that got the same number
  const now = procStartOf(info.pid);
  return info.procStart !== null && now !== null && now !== info.procStart;
}

function describe(info: LockInfo): string {
  const where = info.host === hostname() ? 'on this host' : `on host "${printable(info.host)}"`;
  return `${printable(info.command)}, pid ${info.pid} ${where}, started ${printable(info.startedAt)}`;
}

/** @param writing - true when this run wants to write the folder (suggest another --out) */
function busyError(folder: string, path: string, held: Held, writing = true): FractozoneError {
  const what = writing ? 'output folder' : 'folder';
  if (held.kind !== 'lock') {
    return new FractozoneError('OUTPUT_BUSY', `${what} "${printable(folder)}" has a lock file that is not fractozone's or is being written ("${printable(path)}"); remove it if no run uses the folder`);
  }
  const info = held.info;
  const wait = writing ? 'wait for it to finish or give another --out' : 'wait for it to finish';
  const hint = info.host === hostname() ? wait : `if that run has ended, remove "${printable(path)}"`;
  return new FractozoneError('OUTPUT_BUSY', `${what} "${printable(folder)}" is in use by another fractozone run (${describe(info)}); ${hint}`);
}

/** A held lock; `release()` removes the file if it is still ours. */
export class OutputLock {
  private released = false;
  private readonly onExit = (): void => this.release();
  constructor(
    readonly folder: string,
    readonly path: string,
    readonly info: LockInfo,
    private readonly createdFolder: boolean,
  ) {
    process.once('exit', this.onExit);
  }

  release(): void {
    if (this.released) return;
    this.released = true;
    process.removeListener('exit', this.onExit);
    const held = readHeld(this.path);
    if (held.kind === 'lock' && held.info.token === this.info.token) {
      try {
        unlinkSync(this.path);
      } catch {
        /* gone already */
      }
    }
    if (this.createdFolder) {
      try {
        if (readdirSync(this.folder).length === 0) rmdirSync(this.folder);
      } catch {
        /* not empty or not ours to remove */
      }
    }
  }
}

function tryLink(tmp: string, path: string, text: string): boolean {
  try {
    linkSync(tmp, path);
    return true;
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'EEXIST') return false;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP' && code !== 'ENOSYS' && code !== 'EMLINK') throw writeFailure('create the lock file', path, e);
  }
  // no hard links on this file system: exclusive create (readers see an unreadable lock briefly)
  let fd: number;
  try {
    fd = openSync(path, 'wx');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw writeFailure('create the lock file', path, e);
  }
  try {
    writeFileSync(fd, text);
  } catch (e) {
    closeSync(fd);
    unlinkSync(path);
    throw writeFailure('write the lock file', path, e);
  }
  closeSync(fd);
  return true;
}

/**
 * Removes a stale lock under the takeover guard, only if it is still the same lock.
 * @returns false when another run is taking over at this moment
 */
function takeOver(path: string, stale: LockInfo, note: (m: string) => void): boolean {
  const guard = `${path}.takeover`;
  try {
    closeSync(openSync(guard, 'wx'));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw writeFailure('create', guard, e);
    let age = 0;
    try {
      age = Date.now() - statSync(guard).mtimeMs;
    } catch {
      return true; // released meanwhile: try again
    }
    if (age < GUARD_STALE_MS) return false;
    try {
      unlinkSync(guard);
    } catch {
      /* someone else removed it */
    }
    return true;
  }
  try {
    const again = readHeld(path);
    if (again.kind === 'lock' && again.info.token === stale.token) {
      unlinkSync(path);
      note(`note: took over the lock of an earlier run that is no longer running (${describe(stale)})`);
    }
  } finally {
    try {
      unlinkSync(guard);
    } catch {
      /* gone */
    }
  }
  return true;
}

/**
 * Takes the lock of an output folder (creating the folder).
 * @param command - what holds it ("batch", "merge", "report"), shown to a second run
 * @param note - receives a line when a stale lock is taken over
 * @throws FractozoneError OUTPUT_BUSY (another live run holds it), WRITE_FAILED (cannot create it)
 */
export function acquireOutputLock(folder: string, command: string, note: (m: string) => void): OutputLock {
  const createdFolder = !existsSync(folder);
  makeFolder(folder);
  const path = join(folder, LOCK_NAME);
  const info: LockInfo = {
    schema: LOCK_SCHEMA,
    pid: process.pid,
    host: hostname(),
    startedAt: new Date().toISOString(),
    procStart: procStartOf(process.pid),
    command,
    token: randomBytes(12).toString('hex'),
  };
  const text = JSON.stringify(info) + '\n';
  const tmp = tempNameFor(path);
  try {
    writeFileSync(tmp, text);
  } catch (e) {
    try {
      unlinkSync(tmp);
    } catch {
      /* never made */
    }
    throw writeFailure('write the lock file', tmp, e);
  }
  try {
    for (let attempt = 0; attempt < 8; attempt++) {
      if (tryLink(tmp, path, text)) return new OutputLock(folder, path, info, createdFolder);
      const held = readHeld(path);
      if (held.kind === 'gone') continue;
      if (held.kind === 'unreadable' || !isStale(held.info)) throw busyError(folder, path, held);
      if (!takeOver(path, held.info, note)) throw busyError(folder, path, held);
    }
    throw busyError(folder, path, readHeld(path));
  } finally {
    try {
      unlinkSync(tmp);
    } catch {
      /* gone */
    }
  }
}

/**
 * Refuses a folder another live run is writing (for folders that are only read, e.g. the shards
 * given to `merge`). A stale lock is ignored.
 * @throws FractozoneError OUTPUT_BUSY
 */
export function assertNotBusy(folder: string): void {
  const path = join(folder, LOCK_NAME);
  const held = readHeld(path);
  if (held.kind === 'gone') return;
  if (held.kind === 'lock' && isStale(held.info)) return;
  throw busyError(folder, path, held, false);
}
