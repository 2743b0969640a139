import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { parseShardArg, shardRange } from '../../src/plan/index.js';
import { problemsOf } from '../spec/helpers.js';

describe('shardRange', () => {
  it('n contiguous slices cover [0, count) exactly once, sizes within one', () => {
    for (const count of [0, 1, 7, 960, 1001, 2 ** 40]) {
      for (const n of [1, 2, 3, 8, 13, 1000]) {
        let next = 0;
        let min = Infinity;
        let max = 0;
        let contiguous = true;
        for (let k = 1; k <= n; k++) {
          const { start, end } = shardRange(count, k, n);
          contiguous &&= start === next && end >= start;
          min = Math.min(min, end - start);
          max = Math.max(max, end - start);
          next = end;
        }
        expect(contiguous, `count ${count}, n ${n}`).toBe(true);
        expect(next).toBe(count);
        expect(max - min).toBeLessThanOrEqual(1);
      }
    }
  });

  it('is deterministic and 1-based', () => {
    expect(shardRange(10, 1, 3)).toEqual({ start: 0, end: 4 });
    expect(shardRange(10, 2, 3)).toEqual({ start: 4, end: 7 });
    expect(shardRange(10, 3, 3)).toEqual({ start: 7, end: 10 });
  });

  it('refuses k outside 1..n', () => {
    expect(problemsOf(() => shardRange(10, 0, 3))).toEqual(['--shard: 0/3: k must be a whole number from 1 to n (3); shards are numbered from 1']);
    expect(() => shardRange(10, 4, 3)).toThrow(InputError);
    expect(() => shardRange(10, 1, 0)).toThrow(InputError);
  });
});

describe('parseShardArg', () => {
  it('reads k/n', () => {
    expect(parseShardArg('2/8', {})).toEqual({ k: 2, n: 8, source: '--shard' });
    expect(parseShardArg(' 8 / 8 ', {})).toEqual({ k: 8, n: 8, source: '--shard' });
  });

  it('refuses malformed values', () => {
    expect(problemsOf(() => parseShardArg('2-8', {}))).toEqual(['--shard: "2-8" is not k/n (for example 2/8) or auto']);
    expect(problemsOf(() => parseShardArg('9/8', {}))).toEqual(['--shard: 9/8: k must be a whole number from 1 to n (8); shards are numbered from 1']);
    expect(() => parseShardArg('0/8', {})).toThrow(InputError);
  });

  it('auto: Slurm array (from MIN, with STEP)', () => {
    const env = { SLURM_ARRAY_TASK_ID: '3', SLURM_ARRAY_TASK_MIN: '0', SLURM_ARRAY_TASK_MAX: '7', SLURM_ARRAY_TASK_COUNT: '8', SLURM_ARRAY_TASK_STEP: '1' };
    expect(parseShardArg('auto', env)).toEqual({ k: 4, n: 8, source: 'SLURM_ARRAY_TASK_ID' });
    expect(parseShardArg('auto', { SLURM_ARRAY_TASK_ID: '1', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_COUNT: '4' })).toEqual({
      k: 1,
      n: 4,
      source: 'SLURM_ARRAY_TASK_ID',
    });
    const stepped = { SLURM_ARRAY_TASK_ID: '8', SLURM_ARRAY_TASK_MIN: '0', SLURM_ARRAY_TASK_MAX: '12', SLURM_ARRAY_TASK_STEP: '4', SLURM_ARRAY_TASK_COUNT: '4' };
    expect(parseShardArg('auto', stepped)).toEqual({ k: 3, n: 4, source: 'SLURM_ARRAY_TASK_ID' });
  });

  it('auto: a Slurm list that is not a plain range is refused', () => {
    const env = { SLURM_ARRAY_TASK_ID: '7', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_MAX: '7', SLURM_ARRAY_TASK_COUNT: '3' };
    expect(problemsOf(() => parseShardArg('auto', env))).toEqual([
      '--shard auto: Slurm array job found, but SLURM_ARRAY_TASK_COUNT=3 does not match the array 1-7:1; use a plain range such as --array=1-3',
    ]);
  });

  it('auto: Grid Engine and LSF', () => {
    expect(parseShardArg('AUTO', { SGE_TASK_ID: '5', SGE_TASK_FIRST: '1', SGE_TASK_LAST: '10', SGE_TASK_STEPSIZE: '1' })).toEqual({
      k: 5,
      n: 10,
      source: 'SGE_TASK_ID',
    });
    expect(parseShardArg('auto', { LSB_JOBINDEX: '2', LSB_JOBINDEX_END: '6' })).toEqual({ k: 2, n: 6, source: 'LSB_JOBINDEX' });
  });

  it('auto: Grid Engine outside an array job is ignored ("undefined")', () => {
    expect(() => parseShardArg('auto', { SGE_TASK_ID: 'undefined' })).toThrow(/no array-job variables found/);
  });

  it('auto: PBS does not give the array size; the message says what to write', () => {
    expect(problemsOf(() => parseShardArg('auto', { PBS_ARRAY_INDEX: '3' }))).toEqual([
      '--shard auto: PBS array job found, but PBS does not export the array size; write --shard $PBS_ARRAY_INDEX/N with N the array size (array indices 1..N)',
    ]);
  });

  it('auto: nothing found', () => {
    expect(problemsOf(() => parseShardArg('auto', { HOME: '/home/x' }))).toEqual([
      '--shard auto: no array-job variables found (looked for SLURM_ARRAY_TASK_ID, SGE_TASK_ID, LSB_JOBINDEX, PBS_ARRAY_INDEX, PBS_ARRAYID); write --shard k/n instead',
    ]);
  });
});
