import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { outputExtensionWarning } from '../../src/io/output-format.js';
import { runCliSync, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('typos');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const SWEEP = `name: typo-t1
axes:
  tp_c: { values: [1300, 1350] }
design: { kind: grid }
model: { thermal: isentropic }
`;
const sweep = writeSweep(dir, 't1.yaml', SWEEP);

describe('option typos', () => {
  it('a misspelt required option is named with a suggestion, not reported missing, and the help is one line', () => {
    const r = runCliSync(['run', sweep, '--ouput', path.join(dir, 'x.arrow')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("error: unknown option '--ouput'\n(Did you mean --output?)\n(run meltsweep run --help for its options)\n");
    expect(fs.existsSync(path.join(dir, 'x.arrow'))).toBe(false);
  });

  it('a missing required option is still reported, with commander\'s wording', () => {
    const r = runCliSync(['run', sweep]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("error: required option '-o, --output <file>' not specified\n(run meltsweep run --help for its options)\n");
  });

  it('nested commands get their own pointer', () => {
    const r = runCliSync(['plot', 'column', '--tpp', '1350', '-o', path.join(dir, 'c.svg')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe("error: unknown option '--tpp'\n(Did you mean --tp?)\n(run meltsweep plot column --help for its options)\n");
  });
});

describe('output extension and format', () => {
  it('warns when the extension names another format or none that meltsweep writes', () => {
    expect(outputExtensionWarning('r.xlsx')).toBe('r.xlsx: .xlsx is not a table format meltsweep writes, so it is written as an Arrow IPC file; use .arrow, .parquet or .csv, or give --format');
    expect(outputExtensionWarning('r.parquet', 'csv')).toBe('r.parquet: the extension .parquet names Parquet, but it is written as CSV (--format csv); rename the output or drop --format');
    expect(outputExtensionWarning('r.csv', 'arrow')).toBe('r.csv: the extension .csv names CSV, but it is written as an Arrow IPC file (--format arrow); rename the output or drop --format');
  });

  it('stays quiet when they agree, without an extension, or with an explicit format for an unknown extension', () => {
    expect(outputExtensionWarning('r.parquet')).toBeNull();
    expect(outputExtensionWarning('r.feather', 'arrow')).toBeNull();
    expect(outputExtensionWarning('r7')).toBeNull();
    expect(outputExtensionWarning('r.dat', 'csv')).toBeNull();
  });

  it('run prints the warning on stderr and still writes the table', () => {
    const out = path.join(dir, 'r.xlsx');
    const r = runCliSync(['run', sweep, '-o', out, '-q', '--no-summary', '-w', '1']);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toBe(`warning: ${out}: .xlsx is not a table format meltsweep writes, so it is written as an Arrow IPC file; use .arrow, .parquet or .csv, or give --format\n`);
    expect(fs.existsSync(out)).toBe(true);
  });
});
