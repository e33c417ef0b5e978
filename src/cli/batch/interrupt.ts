/**
 * SIGINT / SIGTERM during a batch: the first asks the run to stop gracefully (no new images, the
 * running ones finish or are stopped after a grace period, the summaries are rewritten from what
 * is done, exit 130); a second one aborts at once. While installed, the signals do not end the
 * process by themselves.
 */
export interface InterruptActions {
  /** First signal: stop gracefully. */
  graceful(signal: NodeJS.Signals): void;
  /** Second signal: abort now (must end the process). */
  immediate(signal: NodeJS.Signals): void;
}

export class InterruptWatch {
  private count = 0;
  private firstSignal: NodeJS.Signals | null = null;
  private readonly handler = (signal: NodeJS.Signals): void => {
    this.count++;
    if (this.count === 1) {
      this.firstSignal = signal;
      this.actions.graceful(signal);
    } else this.actions.immediate(signal);
  };

  constructor(private readonly actions: InterruptActions) {}

  /** The first signal received, or null. */
  get signal(): NodeJS.Signals | null {
    return this.firstSignal;
  }

  install(): this {
    process.on('SIGINT', this.handler);
    process.on('SIGTERM', this.handler);
    return this;
  }

  uninstall(): void {
    process.removeListener('SIGINT', this.handler);
    process.removeListener('SIGTERM', this.handler);
  }
}

/** Seconds the images in progress may take to finish after the first interrupt. */
export const INTERRUPT_GRACE_S = 5;

/** Exit code after an interrupt (128 + SIGINT, the shell convention). */
export const INTERRUPTED_EXIT_CODE = 130;
