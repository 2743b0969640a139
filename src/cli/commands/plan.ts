import type { Command } from 'commander';
import os from 'node:os';
import { loadSweepFile, sweepHash } from '../../spec/index.js';
import { describePlan, parseShardArg, planSweep, shardRange } from '../../plan/index.js';
import { estimateRun, formatBytes } from '../../run/estimate.js';
import { formatDuration } from '../../run/progress.js';
import { parseWorkers } from '../options.js';

/** A rate with 2 significant digits: 1,600 or 47 or 0.52. */
function formatRate(v: number): string {
  if (!Number.isFinite(v)) return 'more than 1e6';
  return Number(v.toPrecision(2)).toLocaleString('en-US');
}

export function registerPlan(program: Command): void {
  program
    .command('plan')
    .description('show what a sweep file will compute (points, axes, design), a time estimate and the output size, without running it')
    .argument('<sweep>', 'sweep file (YAML or JSON)')
    .option('-w, --workers <n>', 'worker threads to estimate for (default: all available cores)', parseWorkers)
    .option('--shard <k/n>', 'estimate one shard (k of n, or "auto")')
    .action(async (sweep: string, o: { workers?: number; shard?: string }) => {
      const spec = await loadSweepFile(sweep);
      const plan = planSweep(spec);
      const workers = o.workers ?? os.availableParallelism();
      const shard = o.shard === undefined ? undefined : parseShardArg(o.shard, process.env);
      const range = shard ? shardRange(plan.count, shard.k, shard.n) : { start: 0, end: plan.count };
      const rows = range.end - range.start;
      const lines = [...describePlan(spec, plan), `sweep hash: ${sweepHash(spec)}`];
      if (shard) lines.push(`shard ${shard.k}/${shard.n}: rows ${range.start}-${range.end} (${rows.toLocaleString('en-US')} rows)`);
      const est = estimateRun(spec, rows, workers, { range });
      lines.push(
        `timing probe: ${est.calibrationColumns} columns of this sweep computed here, ${formatRate(est.columnsPerSecondPerCore)} columns per CPU second ` +
          `(this sweep's mix of columns; the README's figures are for fixed reference columns)`,
        `estimated time: ${formatDuration(est.seconds)} with ${workers} worker${workers === 1 ? '' : 's'} on an idle machine ` +
          `(${formatDuration(est.cpuSeconds)} of CPU time; slower when the cores are shared)`,
        `estimated output: ${formatBytes(est.bytes)} as Arrow IPC (${est.bytesPerRow.toFixed(0)} bytes per row)`,
      );
      process.stdout.write(`${lines.join('\n')}\n`);
    });
}
