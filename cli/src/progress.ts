// A single self-overwriting progress line on stderr, shown only to a person watching a long run.

export interface ProgressSink {
  readonly isTTY?: boolean;
  readonly columns?: number;
  write(text: string): unknown;
}

export interface Progress {
  /** Before item `index` (0-based) of `total` starts. */
  step(index: number, total: number, label: string): void;
  /** Erase the line, before anything else is printed. */
  done(): void;
}

/** Shown once the run has more than this many items (files, designs), or has taken longer than DELAY_MS. */
const MANY_ITEMS = 3;
const DELAY_MS = 1000;
/** At most one redraw per interval, so a fast run over many small files does not flood the terminal. */
const REDRAW_MS = 80;

export function createProgress(sink: ProgressSink, enabled: boolean, now: () => number = Date.now): Progress {
  if (!enabled || !sink.isTTY) return { step() {}, done() {} };
  const started = now();
  let lastDraw = -Infinity;
  let shown = false;
  return {
    step(index, total, label) {
      const t = now();
      if (total <= MANY_ITEMS && t - started < DELAY_MS) return;
      if (t - lastDraw < REDRAW_MS && index !== total - 1) return;
      lastDraw = t;
      const width = Math.max(20, (sink.columns || 80) - 1);
      let line = `[${index + 1}/${total}] ${label}`;
      if (line.length > width) line = line.slice(0, width - 1) + '…';
      sink.write(`\r\x1b[K${line}`);
      shown = true;
    },
    done() {
      if (shown) sink.write('\r\x1b[K');
      shown = false;
    },
  };
}
