import { afterEach, describe, expect, it, vi } from 'vitest';
import { createProgress } from '../../src/run/progress.js';

/** A non-terminal stream that keeps what is written. */
function sink(): { stream: NodeJS.WriteStream; lines: string[] } {
  const lines: string[] = [];
  const stream = { isTTY: false, write: (s: string) => lines.push(s) } as unknown as NodeJS.WriteStream;
  return { stream, lines };
}

afterEach(() => {
  vi.useRealTimers();
});

describe('progress after --resume', () => {
  it('counts resumed rows as done but takes rate and time left from the rows computed now', () => {
    vi.useFakeTimers({ toFake: ['performance'] });
    const { stream, lines } = sink();
    const p = createProgress({ totalRows: 1000, startRows: 0, stream, lineIntervalS: 0 });
    vi.advanceTimersByTime(5000); // replaying the committed segments takes time too: not counted
    p.replayed!(800);
    vi.advanceTimersByTime(2000);
    p.finish(900);
    // 100 fresh rows in 2 s: 50 columns/s; 100 rows left: 2 s
    expect(lines).toEqual(['progress: 900/1,000 rows (90.0%, 800 resumed), 50 columns/s, time left 00:02\n']);
  });

  it('a fresh run reads as before', () => {
    vi.useFakeTimers({ toFake: ['performance'] });
    const { stream, lines } = sink();
    const p = createProgress({ totalRows: 1000, startRows: 0, stream, lineIntervalS: 0 });
    p.replayed!(0);
    vi.advanceTimersByTime(4000);
    p.finish(400);
    expect(lines).toEqual(['progress: 400/1,000 rows (40.0%), 100 columns/s, time left 00:06\n']);
  });
});
