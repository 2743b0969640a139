/**
 * Where the compiled worker module lives. Worker threads load plain JavaScript (they do not
 * go through a test runner's TypeScript transform), so this always points into dist/, found
 * from the package root whether the caller runs from dist/ or from the sources.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { RunError } from '../errors.js';

export function packageRoot(): string {
  let dir = path.dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    const pkg = path.join(dir, 'package.json');
    if (fs.existsSync(pkg)) {
      try {
        if ((JSON.parse(fs.readFileSync(pkg, 'utf8')) as { name?: string }).name === 'meltsweep') return dir;
      } catch {
        // not ours; keep looking
      }
    }
    dir = path.dirname(dir);
  }
  throw new RunError('cannot find the meltsweep package root');
}

export function sweepWorkerFile(): string {
  const file = path.join(packageRoot(), 'dist', 'workers', 'sweep-worker.js');
  if (!fs.existsSync(file)) throw new RunError(`worker module ${file} is missing: run "npm run build" first`);
  return file;
}
