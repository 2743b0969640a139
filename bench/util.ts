/** Small timing helpers shared by the benchmarks. */

/** Median of a non-empty list (mean of the two middle values for an even count). */
export function median(values: readonly number[]): number {
  if (values.length === 0) throw new Error('median of an empty list');
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 === 1 ? s[mid] : 0.5 * (s[mid - 1] + s[mid]);
}

/** One benchmark figure: the median and spread over repetitions. */
export interface BenchResult {
  readonly name: string;
  readonly unit: string;
  readonly median: number;
  readonly min: number;
  readonly max: number;
  readonly repetitions: number;
}

/** Summarise per-repetition rates into a BenchResult. */
export function summarise(name: string, unit: string, rates: readonly number[]): BenchResult {
  return { name, unit, median: median(rates), min: Math.min(...rates), max: Math.max(...rates), repetitions: rates.length };
}

/** Seconds elapsed since a process.hrtime.bigint() reading. */
export function secondsSince(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e9;
}

/** Whether the module with this import.meta.url is the script node was started with. */
export function isMain(moduleUrl: string): boolean {
  const entry = process.argv[1];
  if (entry === undefined) return false;
  try {
    return new URL(moduleUrl).pathname === new URL(`file://${entry}`).pathname;
  } catch {
    return false;
  }
}

/** Print a BenchResult as one readable line. */
export function formatBench(r: BenchResult): string {
  const f = (x: number): string => x.toLocaleString('en-US', { maximumFractionDigits: 0 });
  return `${r.name}: median ${f(r.median)} ${r.unit} (min ${f(r.min)}, max ${f(r.max)}, ${r.repetitions} repetitions)`;
}

/** Fractional parts of multiples of irrational numbers: deterministic, evenly spread points in [0, 1)^4. */
const RECURRENCE = [0.6180339887498949, 0.41421356237309515, 0.7320508075688772, 0.2360679774997898] as const;

/** Point i of the additive-recurrence fill of the unit box (four coordinates). */
export function recurrencePoint(i: number): [number, number, number, number] {
  return [0, 1, 2, 3].map((k) => (0.5 + i * RECURRENCE[k]) % 1) as [number, number, number, number];
}

/**
 * Call `once` (which processes `itemsPerCall` items) repeatedly for at least `minSeconds`, in
 * `repetitions` repetitions; returns items per second of process CPU time (user + system: other
 * load on a shared machine does not count against it) and of wall-clock time, per repetition.
 */
export async function measureRates(
  once: () => void,
  itemsPerCall: number,
  repetitions: number,
  minSeconds: number,
): Promise<{ cpu: number[]; wall: number[] }> {
  const cpu: number[] = [];
  const wall: number[] = [];
  for (let rep = 0; rep < repetitions; rep++) {
    let n = 0;
    const cpu0 = process.cpuUsage();
    const start = process.hrtime.bigint();
    let elapsed = 0;
    do {
      once();
      n += itemsPerCall;
      elapsed = secondsSince(start);
    } while (elapsed < minSeconds);
    const used = process.cpuUsage(cpu0);
    cpu.push(n / ((used.user + used.system) / 1e6));
    wall.push(n / elapsed);
    await new Promise((resolve) => setImmediate(resolve));
  }
  return { cpu, wall };
}

/** Options of a per-scenario rate benchmark (column benches). */
export interface ScenarioBenchOptions {
  readonly repetitions?: number;
  readonly minSeconds?: number;
  readonly scenarios?: number;
}

/**
 * Scenarios per second of `one` over a scenario set, on the calling thread: a warm-up pass (the JIT),
 * then measureRates (default 5 repetitions of at least 2 s). `one` returns a number that is summed
 * and checked finite, so the work cannot be optimised away. Figures: `NAME (CPU time, one core)`,
 * and `wall` = `NAME (wall clock)`.
 */
export async function benchScenarioRate<S>(
  name: string,
  scenarios: readonly S[],
  one: (s: S) => number,
  opts: ScenarioBenchOptions,
): Promise<BenchResult & { readonly wall: BenchResult }> {
  let sink = 0;
  const once = (): void => {
    for (const s of scenarios) sink += one(s);
  };
  once();
  const rates = await measureRates(once, scenarios.length, opts.repetitions ?? 5, opts.minSeconds ?? 2);
  if (!Number.isFinite(sink)) throw new Error(`bench: ${name}: a non-finite result`);
  return { ...summarise(`${name} (CPU time, one core)`, 'columns/s', rates.cpu), wall: summarise(`${name} (wall clock)`, 'columns/s', rates.wall) };
}
