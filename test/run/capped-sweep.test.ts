import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { CAPPED_ONSET_FIELDS, RESULT_NUMERIC_NAMES } from '../../src/physics/fields.js';
import { buildHtmlReport } from '../../src/report/html-report.js';
import { parseCappedOption } from '../../src/io/capped-rows.js';
import { fitResultsFile } from '../../src/io/fit-file.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { analyzeResultsFile } from '../../src/io/sensitivity-file.js';
import { sweepHash, validateSweep } from '../../src/spec/index.js';
import { InputError } from '../../src/errors.js';
import { findMeltOnset } from '../../src/physics/onset.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import { wtPctFromPpm } from '../../src/physics/units.js';
import { readTable, tmpDir } from '../helpers.js';

const dir = tmpDir('capped');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// water 2000 and 3000 ppm at Tp 1400-1450 degC start melting deeper than 8 GPa (capped-onset.test.ts)
const sweep = (deep?: string) =>
  validateSweep({
    name: 'back-arc B-9 capped onsets',
    axes: { tp_c: { values: [1350, 1400, 1450] }, water_ppm: { values: [200, 800, 2000, 3000] } },
    design: { kind: 'grid' },
    model: deep === undefined ? { thermal: 'isentropic' } : { thermal: 'isentropic', deep_onset: deep },
  });
// the scenarios whose onset lies beyond 8 GPa, found directly: 800 ppm at 1450 degC and every
// scenario with 2000 or 3000 ppm
const BEYOND = [1350, 1400, 1450]
  .flatMap((tp) => [200, 800, 2000, 3000].map((w) => findMeltOnset(tp, wtPctFromPpm(w), 0, DEFAULT_PARAMS).kind))
  .filter((k) => k === 'beyond').length;
const capped = path.join(dir, 'cap.arrow');
const dropped = path.join(dir, 'drop.arrow');

beforeAll(async () => {
  await runSweep({ spec: sweep('cap'), outPath: capped, workers: 1 });
  await runSweep({ spec: sweep(), outPath: dropped, workers: 1 });
});

describe('model.deep_onset', () => {
  it('the sweep has 7 onsets beyond the range', () => {
    expect(BEYOND).toBe(7);
  });

  it('drop (the default) is not written: the spec, its hash and the table columns stay those of older files', () => {
    expect(sweep('drop').model).toEqual(sweep().model);
    expect(sweepHash(sweep('drop'))).toBe(sweepHash(sweep()));
    expect(sweep('cap').model).toEqual({ thermal: 'isentropic', water: 'batch', params: {}, tolerance: 1e-4, deep_onset: 'cap' });
    const t = readTable(dropped);
    expect(t.schema.fields.map((f) => f.name).slice(-RESULT_NUMERIC_NAMES.length)).toEqual([...RESULT_NUMERIC_NAMES]);
    expect(t.getChild('status')!.toArray().filter((s: string) => s === 'onset_beyond_range')).toHaveLength(BEYOND);
  });

  it('an unknown value is refused with the allowed ones', () => {
    expect(() => sweep('clip')).toThrow('model.deep_onset: "clip" is not a deep-onset mode; did you mean cap? (allowed: drop, cap)');
  });

  it('cap: every row computed, capped rows marked, the two columns after the results', () => {
    const t = readTable(capped);
    const names = t.schema.fields.map((f) => f.name);
    expect(names.slice(-2)).toEqual(CAPPED_ONSET_FIELDS.map((f) => f.name));
    const status = t.getChild('status')!.toArray() as string[];
    const flag = Array.from(t.getChild('onset_capped')!.toArray() as Float64Array);
    const onset = Array.from(t.getChild('onset_p_gpa')!.toArray() as Float64Array);
    expect(status.every((s) => s === 'ok')).toBe(true);
    expect(flag.filter((v) => v === 1)).toHaveLength(BEYOND);
    flag.forEach((v, i) => expect(v === 1).toBe(onset[i] === 8));
  });
});

describe('--capped include|exclude', () => {
  it('sensitivity says how many and leaves them out on request', async () => {
    const inc = await analyzeResultsFile(capped, { outputs: ['crust_km'] });
    expect(inc.counts.included).toBe(12);
    expect(inc.notes[0]).toBe(
      'capped onsets: 7 rows with an onset deeper than 8 GPa, computed from 8 GPa up (onset_p_gpa = 8 and the melt amounts are lower bounds), are included; --capped exclude leaves them out',
    );
    const exc = await analyzeResultsFile(capped, { outputs: ['crust_km'], capped: 'exclude' });
    expect(exc.counts.included).toBe(5);
    expect(exc.counts.leftOut).toEqual({ onset_capped: 7 });
    expect(exc.notes[0]).toBe('capped onsets: 7 rows with an onset deeper than 8 GPa are left out (--capped exclude); --capped include uses them');
    // by default the marks themselves are not analysed as outputs
    expect((await analyzeResultsFile(capped)).outputs).not.toContain('onset_capped');
    // a file without the marks says nothing about them
    expect((await analyzeResultsFile(dropped, { outputs: ['crust_km'] })).notes.some((n) => n.startsWith('capped onsets'))).toBe(false);
  });

  it('fit counts capped rows apart, used or left out', async () => {
    const observations = [{ output: 'crust_km', value: 20, sd: 5 }];
    const inc = await fitResultsFile(capped, { observations });
    expect(inc.fit.usedByStatus).toEqual({ ok: 5, onset_capped: 7 });
    const exc = await fitResultsFile(capped, { observations, capped: 'exclude' });
    expect(exc.fit.usedByStatus).toEqual({ ok: 5 });
    expect(exc.fit.rowsLeftOut).toEqual({ onset_capped: 7 });
  });

  it('report notes the count and leaves capped cells grey with exclude', async () => {
    const inc = await buildHtmlReport(capped, { outputs: ['crust_km'] });
    expect(inc.notes).toContain(
      'capped onsets: 7 rows with an onset deeper than 8 GPa, computed from 8 GPa up (onset_p_gpa = 8 and the melt amounts are lower bounds), are included; --capped exclude leaves them out',
    );
    expect(inc.notes.filter((n) => n.startsWith('capped onsets'))).toHaveLength(1);
    const exc = await buildHtmlReport(capped, { outputs: ['crust_km'], capped: 'exclude' });
    expect(exc.notes).toContain('capped onsets: 7 rows with an onset deeper than 8 GPa are left out (--capped exclude); --capped include uses them');
  });

  it('the option parser names the allowed values', () => {
    expect(parseCappedOption('Exclude')).toBe('exclude');
    expect(() => parseCappedOption('drop')).toThrow(InputError);
    expect(() => parseCappedOption('drop')).toThrow('--capped: "drop" is not allowed; choose include or exclude (rows whose onset was capped at 8 GPa)');
  });
});
