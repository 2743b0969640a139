/**
 * Progress on stderr: a redrawn bar with rate and time left on a terminal, a plain line every
 * few seconds otherwise (log files, batch schedulers).
 */

export interface ProgressSink {
  /**
   * Rows taken over from an interrupted run (`--resume`): counted as done but not as computed, so
   * the rate and the time left come from the rows this process computes. Call before the first update.
   */
  replayed?(rows: number): void;
  update(doneRows: number): void;
  finish(doneRows: number): void;
}

export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '--:--';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const sec = s % 60;
  const mm = String(m).padStart(2, '0');
  const ss = String(sec).padStart(2, '0');
  return h > 0 ? `${h}:${mm}:${ss}` : `${mm}:${ss}`;
}

const fmtInt = (n: number): string => Math.round(n).toLocaleString('en-US');

export interface ProgressOptions {
  readonly totalRows: number;
  /** rows already done before this process started (resume) */
  readonly startRows: number;
  readonly stream: NodeJS.WriteStream;
  /** seconds between plain lines when the stream is not a terminal */
  readonly lineIntervalS?: number;
}

export function createProgress(opts: ProgressOptions): ProgressSink {
  const isTty = opts.stream.isTTY === true;
  let t0 = performance.now();
  let startRows = opts.startRows;
  const interval = (opts.lineIntervalS ?? 5) * 1000;
  let lastDraw = 0;
  const describe = (done: number): { pct: number; rate: number; eta: number } => {
    const elapsed = (performance.now() - t0) / 1000;
    const fresh = done - startRows;
    const rate = elapsed > 0 ? fresh / elapsed : 0;
    const remaining = opts.totalRows - done;
    return { pct: opts.totalRows > 0 ? (100 * done) / opts.totalRows : 100, rate, eta: rate > 0 ? remaining / rate : Infinity };
  };
  const draw = (done: number, final: boolean): void => {
    const { pct, rate, eta } = describe(done);
    if (isTty) {
      const width = 28;
      const filled = Math.round((width * pct) / 100);
      const bar = '#'.repeat(filled) + '-'.repeat(width - filled);
      const kept = startRows > 0 ? ` (${fmtInt(startRows)} resumed)` : '';
      opts.stream.write(
        `\r[${bar}] ${pct.toFixed(1).padStart(5)}% ${fmtInt(done)}/${fmtInt(opts.totalRows)} rows${kept}  ${fmtInt(rate)} columns/s  left ${formatDuration(eta)}${final ? '\n' : ''}`,
      );
    } else {
      const kept = startRows > 0 ? `, ${fmtInt(startRows)} resumed` : '';
      opts.stream.write(
        `progress: ${fmtInt(done)}/${fmtInt(opts.totalRows)} rows (${pct.toFixed(1)}%${kept}), ${fmtInt(rate)} columns/s, time left ${formatDuration(eta)}\n`,
      );
    }
  };
  return {
    replayed(rows: number): void {
      startRows = opts.startRows + rows;
      t0 = performance.now();
    },
    update(done: number): void {
      const now = performance.now();
      if (now - lastDraw < (isTty ? 100 : interval)) return;
      lastDraw = now;
      draw(done, false);
    },
    finish(done: number): void {
      draw(done, true);
    },
  };
}
