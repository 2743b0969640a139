/**
 * `npm run bench`: every benchmark in one run, one table on stdout, and bench/results.json.
 * Each figure is the median over several repetitions with its spread (min-max).
 *
 *   node dist/bench/run-all.js            full run (10-million-point sweep for peak memory)
 *   node dist/bench/run-all.js --quick    a 1-million-point big sweep and shorter repetitions
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchColumn } from './column.js';
import { benchConductive } from './conductive.js';
import { benchFluxColumn } from './flux-column.js';
import { benchSweep } from './sweep.js';
import { benchWriter } from './writer.js';
import { benchBigSweep } from './big-sweep.js';
import { benchBaseline, ACCURACY_TARGET } from './baseline-rk.js';
import { benchFitCore, benchFitFile } from './fit.js';
import type { BenchResult } from './util.js';

interface Row {
  readonly figure: string;
  readonly median: string;
  readonly spread: string;
  readonly target: string;
  readonly met: string;
}

const f0 = (x: number): string => Math.round(x).toLocaleString('en-US');

function row(r: BenchResult, target: number | null, targetText = ''): Row {
  return {
    figure: `${r.name} [${r.unit}]`,
    median: f0(r.median),
    spread: `${f0(r.min)} - ${f0(r.max)} (n=${r.repetitions})`,
    target: target === null ? '' : targetText || `>= ${f0(target)}`,
    met: target === null ? '' : r.median >= target ? 'yes' : 'NO',
  };
}

function printTable(rows: readonly Row[]): string {
  const head: Row = { figure: 'figure', median: 'median', spread: 'spread (min - max)', target: 'target', met: 'met' };
  const all = [head, ...rows];
  const keys: (keyof Row)[] = ['figure', 'median', 'spread', 'target', 'met'];
  const widths = keys.map((k) => Math.max(...all.map((r) => r[k].length)));
  const line = (r: Row): string => keys.map((k, i) => (k === 'figure' ? r[k].padEnd(widths[i]) : r[k].padStart(widths[i]))).join('  ');
  return [line(head), widths.map((w) => '-'.repeat(w)).join('  '), ...rows.map(line)].join('\n');
}

async function main(): Promise<void> {
  const quick = process.argv.includes('--quick');
  const bigPoints = quick ? 1_000_000 : 10_000_000;
  const cores = os.availableParallelism();
  const header = `meltsweep benchmarks: ${cores} cores (${os.cpus()[0]?.model ?? 'unknown cpu'}), Node ${process.version}, ${new Date().toISOString()}, load average at start ${os.loadavg()[0].toFixed(2)}`;
  process.stdout.write(`${header}\n`);
  const log = (s: string): void => void process.stderr.write(`  running: ${s}\n`);

  log('isentropic column');
  const column = await benchColumn({ repetitions: quick ? 3 : 5 });
  const columnFixed = await benchColumn({ repetitions: quick ? 3 : 5, stepGpa: 0.05 });
  log('flux column');
  const flux = await benchFluxColumn({ repetitions: quick ? 3 : 5 });
  log('conductive column');
  const conductive = await benchConductive({ repetitions: quick ? 3 : 5 });
  const conductiveFixed = await benchConductive({ repetitions: quick ? 3 : 5, resolution: 1 });
  log('sweep scaling');
  const sweep = await benchSweep(quick ? 100_000 : 200_000, 3);
  log('Arrow writer');
  const writer = await benchWriter(2_000_000, 4096, 3);
  log('baseline');
  const baseline = await benchBaseline(400, quick ? 3 : 5);
  log(`big sweep (${bigPoints.toLocaleString('en-US')} points)`);
  const big = benchBigSweep(bigPoints);
  log(`fit (${bigPoints.toLocaleString('en-US')}-row results file)`);
  const fitCore = await benchFitCore(2_000_000, quick ? 3 : 5);
  const fitFile = await benchFitFile(bigPoints);

  const two = sweep.efficiency.find((e) => e.workers === 2);
  const rows: Row[] = [
    row(column, 100_000),
    row(column.wall, null),
    row(columnFixed, null),
    row(conductive, 10_000),
    row(conductiveFixed, null),
    row(flux, 20_000),
    row(flux.wall, null),
    ...sweep.byWorkers.map((b) => row(b, null)),
    ...sweep.efficiency.map((e) => ({
      figure: `speed-up with ${e.workers} workers over one [x]`,
      median: e.speedup.toFixed(2),
      spread: `efficiency ${(100 * e.efficiency).toFixed(0)} %`,
      target: e.workers === 2 ? '>= 1.80' : '',
      met: e.workers === 2 ? (e.speedup >= 1.8 ? 'yes' : 'NO') : '',
    })),
    (() => {
      const one = sweep.byWorkers.find((b) => b.workers === 1);
      const ratio = one === undefined ? Number.NaN : one.median / column.median;
      return {
        figure: 'sweep with 1 worker / bare column rate [%]',
        median: (100 * ratio).toFixed(0),
        spread: 'wall-clock sweep rate over the CPU-time column rate',
        target: '>= 90',
        met: ratio >= 0.9 ? 'yes' : 'NO',
      };
    })(),
    {
      figure: 'main thread busy time per row, 1 worker [us]',
      median: sweep.mainThreadUsPerRow.median.toFixed(3),
      spread: `${sweep.mainThreadUsPerRow.min.toFixed(3)} - ${sweep.mainThreadUsPerRow.max.toFixed(3)} (n=${sweep.mainThreadUsPerRow.repetitions})`,
      target: '<= 0.300',
      met: sweep.mainThreadUsPerRow.median <= 0.3 ? 'yes' : 'NO',
    },
    row(writer.batches, 2_000_000),
    row(writer.engine, null),
    row(baseline.engine, null),
    row(baseline.baseline, null),
    {
      figure: 'speed-up of the engine over the RK45 baseline [x]',
      median: baseline.speedup.toFixed(1),
      spread: `crust error: engine ${(100 * baseline.engineCrustError).toFixed(4)} %, baseline ${(100 * baseline.baselineCrustError).toFixed(4)} % (target ${100 * ACCURACY_TARGET} %)`,
      target: '',
      met: '',
    },
    {
      figure: `peak RSS, ${big.points.toLocaleString('en-US')}-point sweep [MiB]`,
      median: big.peakRssMiB.toFixed(0),
      spread: `wall ${big.seconds.toFixed(1)} s, ${f0(big.columnsPerSecond)} columns/s, output ${big.outputMiB.toFixed(0)} MiB`,
      target: '<= 400 MiB, <= 100 s',
      met: big.peakRssMiB <= 400 && big.seconds <= 100 ? 'yes' : 'NO',
    },
    row(fitCore, null),
    {
      figure: `fit of a ${fitFile.rows.toLocaleString('en-US')}-row results file [rows per CPU s]`,
      median: f0(fitFile.rowsPerCpuSecond),
      spread: `CPU ${fitFile.cpuSeconds.toFixed(2)} s, wall ${fitFile.wallSeconds.toFixed(2)} s, input ${fitFile.inputMiB.toFixed(0)} MiB`,
      target: '>= 5,000,000',
      met: fitFile.rowsPerCpuSecond >= 5_000_000 ? 'yes' : 'NO',
    },
    {
      figure: `peak RSS, fit of a ${fitFile.rows.toLocaleString('en-US')}-row results file [MiB]`,
      median: fitFile.peakRssMiB.toFixed(0),
      spread: '',
      target: '< 1024',
      met: fitFile.peakRssMiB < 1024 ? 'yes' : 'NO',
    },
  ];
  process.stdout.write(`${printTable(rows)}\n`);
  const results = { header, quick, cores, node: process.version, column, columnFixed, conductive, conductiveFixed, flux, sweep, writer, baseline, big, fitCore, fitFile, efficiencyTwoWorkers: two ?? null };
  const out = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..', 'bench', 'results.json');
  fs.writeFileSync(out, `${JSON.stringify(results, null, 2)}\n`);
  process.stdout.write(`results written to ${path.relative(process.cwd(), out) || out}\n`);
}

await main();
