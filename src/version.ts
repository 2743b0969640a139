import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

function readVersion(): string {
  // dist/src/version.js and src/version.ts both sit two levels below the package root or one.
  for (const rel of ['../package.json', '../../package.json']) {
    try {
      const pkg = require(rel) as { name?: string; version?: string };
      if (pkg.name === 'meltsweep' && typeof pkg.version === 'string') return pkg.version;
    } catch {
      // try the next location
    }
  }
  return '0.0.0';
}

/** The tool version, written into every output's metadata. */
export const TOOL_VERSION: string = readVersion();
