/**
 * Progress lines of `veer propagate` on stderr: 0 % as soon as the request is accepted, then a line each
 * time another tenth of the span is done, a line at least every few seconds while the run advances
 * (slow cases would otherwise look stuck between tenths), and 100 % once at the end.
 */

/** Defaults of the progress printer. */
export const PROPAGATE_PROGRESS_DEFAULTS = Object.freeze({
  /** A line each time the fraction done crosses a multiple of this many percent. */
  stepPercent: 10,
  /** Also a line when this long has passed since the last one and the run has advanced, ms. */
  heartbeatMs: 2000,
});

/** Where progress lines go and the clock that paces the heartbeat. */
export interface PropagateProgressOptions {
  /** Where lines go (stderr in the command). */
  write: (line: string) => void;
  /** Clock in ms (performance.now in the command; injectable for tests). */
  now: () => number;
  /** @defaultValue PROPAGATE_PROGRESS_DEFAULTS.stepPercent */
  stepPercent?: number;
  /** @defaultValue PROPAGATE_PROGRESS_DEFAULTS.heartbeatMs */
  heartbeatMs?: number;
}

/** Prints the fraction of the span done as whole percent lines (see the file comment for when). */
export class PropagateProgress {
  private readonly stepPercent: number;
  private readonly heartbeatMs: number;
  private lastPercent = -1;
  private lastLineMs = 0;

  constructor(private readonly options: PropagateProgressOptions) {
    this.stepPercent = options.stepPercent ?? PROPAGATE_PROGRESS_DEFAULTS.stepPercent;
    this.heartbeatMs = options.heartbeatMs ?? PROPAGATE_PROGRESS_DEFAULTS.heartbeatMs;
  }

  /** Prints 0 % at once (call before any slow preparation such as building the ephemeris cache); later
   * calls, or calls after any line, print nothing. */
  start(): void {
    if (this.lastPercent < 0) this.print(0);
  }

  /** Takes the fraction of the span done, in [0, 1]; prints when a line is due. */
  update(fraction: number): void {
    const percent = Math.min(100, Math.max(0, Math.floor(fraction * 100)));
    if (percent <= this.lastPercent) return;
    const crossedStep = Math.floor(percent / this.stepPercent) > Math.floor(this.lastPercent / this.stepPercent);
    const quiet = this.options.now() - this.lastLineMs >= this.heartbeatMs;
    if (crossedStep || quiet || percent === 100) this.print(percent);
  }

  private print(percent: number): void {
    this.options.write(`veer propagate: ${String(percent).padStart(3)}%\n`);
    this.lastPercent = percent;
    this.lastLineMs = this.options.now();
  }
}
