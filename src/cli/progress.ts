/**
 * The progress line of `modvet check` on stderr: claims done of total, the claim running
 * (the earliest one still running), and the elapsed time, redrawn in place.
 *
 * Shown only when stderr is a terminal, not with --quiet or --json... (the caller decides),
 * and only once the run has lasted SHOW_AFTER_MS, so quick runs print nothing extra. The
 * line is erased before anything else is written and when the run ends.
 */
export const SHOW_AFTER_MS = 1000;
const REDRAW_MS = 200;

export interface ProgressSink {
  write(s: string): void;
  /** Terminal width in columns (80 when unknown). */
  columns?: number;
}

function clock(ms: number): string {
  const s = Math.floor(ms / 1000);
  return `${String(Math.floor(s / 60)).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}

export class Progress {
  private done = 0;
  private readonly running = new Map<number, string>();
  private readonly t0 = Date.now();
  private shown = false;
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly total: number,
    private readonly sink: ProgressSink,
  ) {
    this.timer = setInterval(() => this.draw(), REDRAW_MS);
    this.timer.unref();
  }

  started(index: number, name: string): void {
    this.running.set(index, name);
  }

  finished(index: number): void {
    this.running.delete(index);
    this.done++;
  }

  /** The line as it would be drawn (for tests). */
  line(now = Date.now()): string {
    const first = [...this.running.keys()].sort((a, b) => a - b)[0];
    const name = first === undefined ? '' : this.running.get(first)!;
    const width = Math.max(20, (this.sink.columns ?? 80) - 1);
    const head = `[${this.done}/${this.total}] ${clock(now - this.t0)} `;
    const room = width - head.length;
    const shown = name.length > room ? `${name.slice(0, Math.max(0, room - 3))}...` : name;
    return head + shown;
  }

  private draw(): void {
    if (!this.shown && Date.now() - this.t0 < SHOW_AFTER_MS) return;
    this.shown = true;
    this.sink.write(`\r\x1b[2K${this.line()}`);
  }

  /** Erases the line so that other output starts on a clean line; it comes back at the next redraw. */
  clear(): void {
    if (this.shown) this.sink.write('\r\x1b[2K');
  }

  stop(): void {
    if (this.timer !== null) clearInterval(this.timer);
    this.timer = null;
    this.clear();
  }
}
