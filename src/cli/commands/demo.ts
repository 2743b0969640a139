import type { Command } from 'commander';
import fs from 'node:fs';
import path from 'node:path';
import { packageRoot } from '../../run/worker-file.js';
import { executeRun, reportRun } from './run.js';
import { parseWorkers } from '../options.js';
import { reportPathFor } from './report.js';

/** The built-in demo sweep (an invented ridge segment) and where its results go. */
const DEMO_SWEEP = path.join('sweeps', 'demo-ridge-r7.yaml');
const DEMO_OUTPUT = path.join('out', 'demo-ridge-r7.arrow');

export function registerDemo(program: Command): void {
  program
    .command('demo')
    .description(`run the built-in demo sweep (${DEMO_SWEEP}) into ${DEMO_OUTPUT} with its sensitivity table and HTML report, replacing earlier demo results`)
    .option('-w, --workers <n>', 'worker threads (default: all available cores)', parseWorkers)
    .option('-q, --quiet', 'no progress output')
    .action(async (o: { workers?: number; quiet?: boolean }) => {
      const root = packageRoot();
      const sweep = path.join(root, DEMO_SWEEP);
      const output = path.resolve(DEMO_OUTPUT);
      fs.mkdirSync(path.dirname(output), { recursive: true });
      process.stdout.write(`demo sweep: ${sweep}\n`);
      const opts = { output, workers: o.workers, quiet: o.quiet, force: true };
      const summary = await executeRun(sweep, opts);
      await reportRun(summary, opts, 'meltsweep demo');
      if (summary.interrupted) return;
      // the pictures too, so the demo shows the whole path from sweep file to report
      const html = reportPathFor(output);
      const { writeHtmlReport } = await import('../../report/html-report.js');
      const report = await writeHtmlReport(output, html, {});
      process.stdout.write(`report: ${html} (${report.plots.length} pictures; open it in a browser)\n`);
    });
}
