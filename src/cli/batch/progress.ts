/**
 * Batch progress on stderr: a redrawn bar with count, rate and ETA on a terminal; plain lines
 * every few seconds otherwise (logs, CI).
 */
import { printable } from '../../core/text/printable.js';

export interface ProgressCounts {
  done: number;
  total: number;
  ok: number;
  noBand: number;
  failed: number;
  skipped: number;
}

function dur(s: number): string {
  if (!Number.isFinite(s)) return '?';
  if (s < 60) return `${Math.round(s)} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
  return `${Math.floor(s / 3600)} h ${Math.round((s % 3600) / 60)} min`;
}

export class Progress {
  private readonly t0 = Date.now();
  private last = 0;
  private drawn = false;
  constructor(
    private readonly stream: NodeJS.WriteStream | { write(s: string): unknown; isTTY?: boolean },
    private readonly enabled: boolean,
    private readonly intervalMs = 5000,
  ) {}

  update(c: ProgressCounts, force = false): void {
    if (!this.enabled) return;
    const now = Date.now();
    const tty = Boolean(this.stream.isTTY);
    if (!force && now - this.last < (tty ? 100 : this.intervalMs)) return;
    this.last = now;
    const processed = c.done - c.skipped;
    const el = (now - this.t0) / 1000;
    const rate = el > 0 ? processed / el : 0;
    const eta = rate > 0 ? (c.total - c.done) / rate : NaN;
    const text = printable(`${c.done}/${c.total} images · ${rate.toFixed(2)} images/s · ETA ${c.done === c.total ? '0 s' : dur(eta)} · ok ${c.ok}, no band ${c.noBand}, failed ${c.failed}, skipped ${c.skipped}`);
    if (tty) {
      const width = 24;
      const fill = c.total ? Math.round((c.done / c.total) * width) : width;
      this.stream.write(`\r\x1b[2K[${'#'.repeat(fill)}${'.'.repeat(width - fill)}] ${text}`);
      this.drawn = true;
    } else this.stream.write(`batch: ${text}\n`);
  }

  end(): void {
    if (this.drawn) this.stream.write('\n');
    this.drawn = false;
  }
}
