/**
 * Splitting a sweep over independent jobs: `--shard k/n` (k 1-based) or `--shard auto`, which
 * reads the array-job variables of common cluster schedulers.
 */
import { InputError } from '../errors.js';

/** A contiguous slice [start, end) of the point indices. */
export interface IndexRange {
  readonly start: number;
  readonly end: number;
}

/** Shard k of n (1 <= k <= n), and where it was found. */
export interface ShardSpec {
  readonly k: number;
  readonly n: number;
  /** '--shard' for an explicit k/n, else the environment variable that gave k */
  readonly source: string;
}

/** Most shards a sweep may be split into. */
export const MAX_SHARDS = 1_000_000;

/**
 * Slice k of n of [0, count): contiguous, deterministic, sizes differ by at most one (the first
 * count mod n shards get one more point), and the n slices cover [0, count) exactly once.
 * @param k 1-based, as users write `--shard 2/8`
 * @throws InputError when k or n are not whole numbers with 1 <= k <= n.
 */
export function shardRange(count: number, k: number, n: number): IndexRange {
  if (!Number.isSafeInteger(count) || count < 0) throw new InputError(`shard: the point count ${count} must be a whole number >= 0`);
  checkShard(k, n, `${k}/${n}`);
  const q = Math.floor(count / n);
  const r = count - q * n;
  const start = (k - 1) * q + Math.min(k - 1, r);
  const end = start + q + (k <= r ? 1 : 0);
  return { start, end };
}

function checkShard(k: number, n: number, shown: string): void {
  if (!Number.isSafeInteger(n) || n < 1 || n > MAX_SHARDS) {
    throw new InputError(`--shard: ${shown}: n must be a whole number from 1 to ${MAX_SHARDS}`);
  }
  if (!Number.isSafeInteger(k) || k < 1 || k > n) {
    throw new InputError(`--shard: ${shown}: k must be a whole number from 1 to n (${n}); shards are numbered from 1`);
  }
}

/** One scheduler's array-job variables. */
interface SchedulerRule {
  readonly name: string;
  /** variable whose presence marks an array task of this scheduler */
  readonly indexVar: string;
  /** k and n from the environment, or a reason they cannot be known */
  readonly read: (env: NodeJS.ProcessEnv) => { k: number; n: number } | string;
}

function num(env: NodeJS.ProcessEnv, name: string): number | undefined {
  const raw = env[name];
  if (raw === undefined || !/^\s*\d+\s*$/.test(raw)) return undefined;
  return Number(raw);
}

/**
 * k and n from an index running first, first + step, ... last. Returns a reason when the
 * index is not on that ladder.
 */
function fromLadder(what: string, index: number, first: number, last: number, step: number): { k: number; n: number } | string {
  if (step < 1 || last < first) return `${what} describes an empty or reversed array`;
  if ((index - first) % step !== 0 || index < first || index > last) {
    return `${what}: index ${index} is not one of ${first}, ${first + step}, ... ${last}`;
  }
  return { k: (index - first) / step + 1, n: Math.floor((last - first) / step) + 1 };
}

/** Scheduler variables, checked in this order. */
const SCHEDULERS: readonly SchedulerRule[] = [
  {
    name: 'Slurm',
    indexVar: 'SLURM_ARRAY_TASK_ID',
    read(env) {
      const id = num(env, 'SLURM_ARRAY_TASK_ID');
      const min = num(env, 'SLURM_ARRAY_TASK_MIN') ?? 0;
      const step = num(env, 'SLURM_ARRAY_TASK_STEP') ?? 1;
      const count = num(env, 'SLURM_ARRAY_TASK_COUNT');
      const max = num(env, 'SLURM_ARRAY_TASK_MAX');
      if (id === undefined) return 'SLURM_ARRAY_TASK_ID is not a whole number';
      if (count === undefined && max === undefined) return 'SLURM_ARRAY_TASK_COUNT and SLURM_ARRAY_TASK_MAX are not set';
      const last = max !== undefined ? max : min + ((count ?? 1) - 1) * step;
      const got = fromLadder(`SLURM_ARRAY_TASK_ID=${id} (min ${min}, step ${step})`, id, min, last, step);
      if (typeof got !== 'string' && count !== undefined && got.n !== count) {
        return `SLURM_ARRAY_TASK_COUNT=${count} does not match the array ${min}-${last}:${step}; use a plain range such as --array=1-${count}`;
      }
      return got;
    },
  },
  {
    name: 'Grid Engine',
    indexVar: 'SGE_TASK_ID',
    read(env) {
      const id = num(env, 'SGE_TASK_ID');
      const first = num(env, 'SGE_TASK_FIRST') ?? 1;
      const last = num(env, 'SGE_TASK_LAST');
      const step = num(env, 'SGE_TASK_STEPSIZE') ?? 1;
      if (id === undefined) return 'SGE_TASK_ID is not a whole number (not an array job?)';
      if (last === undefined) return 'SGE_TASK_LAST is not set';
      return fromLadder(`SGE_TASK_ID=${id} (first ${first}, step ${step})`, id, first, last, step);
    },
  },
  {
    name: 'LSF',
    indexVar: 'LSB_JOBINDEX',
    read(env) {
      const id = num(env, 'LSB_JOBINDEX');
      const end = num(env, 'LSB_JOBINDEX_END');
      const step = num(env, 'LSB_JOBINDEX_STEP') ?? 1;
      if (id === undefined || id === 0) return 'LSB_JOBINDEX is 0 or not a whole number (not an array job?)';
      if (end === undefined) return 'LSB_JOBINDEX_END is not set';
      // LSF does not export the first index; arrays are taken to start at 1 (name[1-N])
      return fromLadder(`LSB_JOBINDEX=${id} (arrays are read as name[1-${end}:${step}])`, id, 1, end, step);
    },
  },
  {
    name: 'PBS',
    indexVar: 'PBS_ARRAY_INDEX',
    read: () => 'PBS does not export the array size; write --shard $PBS_ARRAY_INDEX/N with N the array size (array indices 1..N)',
  },
  {
    name: 'Torque',
    indexVar: 'PBS_ARRAYID',
    read: () => 'Torque does not export the array size; write --shard $PBS_ARRAYID/N with N the array size (array indices 1..N)',
  },
];

/**
 * Parse a `--shard` value: `k/n` (e.g. `2/8`, k from 1 to n) or `auto`, which reads the
 * array-job variables of the scheduler running this process:
 * - Slurm: SLURM_ARRAY_TASK_ID with SLURM_ARRAY_TASK_MIN, _STEP, _COUNT / _MAX;
 * - Grid Engine (SGE/UGE/OGE): SGE_TASK_ID with SGE_TASK_FIRST, SGE_TASK_LAST, SGE_TASK_STEPSIZE;
 * - LSF: LSB_JOBINDEX with LSB_JOBINDEX_END, LSB_JOBINDEX_STEP (arrays starting at 1);
 * - PBS Pro (PBS_ARRAY_INDEX) and Torque (PBS_ARRAYID) do not export the array size: `auto`
 *   refuses with a hint to write `--shard $PBS_ARRAY_INDEX/N`.
 * @throws InputError for a malformed value, k outside 1..n, or `auto` without a usable scheduler.
 */
export function parseShardArg(arg: string, env: NodeJS.ProcessEnv): ShardSpec {
  const text = arg.trim();
  if (text.toLowerCase() === 'auto') return shardFromEnv(env);
  const m = /^(\d+)\s*\/\s*(\d+)$/.exec(text);
  if (m === null) throw new InputError(`--shard: ${JSON.stringify(arg)} is not k/n (for example 2/8) or auto`);
  const k = Number(m[1]);
  const n = Number(m[2]);
  checkShard(k, n, text);
  return { k, n, source: '--shard' };
}

function shardFromEnv(env: NodeJS.ProcessEnv): ShardSpec {
  for (const rule of SCHEDULERS) {
    const raw = env[rule.indexVar];
    if (raw === undefined || raw.trim() === '' || raw.trim() === 'undefined') continue;
    const got = rule.read(env);
    if (typeof got === 'string') throw new InputError(`--shard auto: ${rule.name} array job found, but ${got}`);
    checkShard(got.k, got.n, `${got.k}/${got.n} from ${rule.indexVar}`);
    return { k: got.k, n: got.n, source: rule.indexVar };
  }
  throw new InputError(
    `--shard auto: no array-job variables found (looked for ${SCHEDULERS.map((r) => r.indexVar).join(', ')}); write --shard k/n instead`,
  );
}
