/**
 * The worker thread: a thin adapter. Receive (spec, index range), call the pure physics
 * through computeChunk, move the typed arrays back to the main thread (no copies, no
 * per-point messages).
 */
import { move, transferableSymbol, valueSymbol } from 'piscina';
import { computeChunk, chunkTransferables, makeChunkContext, type ChunkContext, type ChunkResult } from '../src/run/compute-chunk.js';
import { loadProcessModules } from '../src/process/registry.js';
import type { ChunkTask } from '../src/run/task.js';

// One context per sweep seen by this thread (a pool serves one sweep at a time; the key
// names the profile grid too).
const contexts = new Map<string, ChunkContext>();

function contextFor(task: ChunkTask): ChunkContext {
  let ctx = contexts.get(task.specKey);
  if (ctx === undefined) {
    contexts.clear();
    ctx = makeChunkContext(task.spec, task.profiles);
    contexts.set(task.specKey, ctx);
  }
  return ctx;
}

/** Process modules already registered in this thread. */
const loadedModules = new Set<string>();

/** Register the processes a task brings (RunOptions.processModules) once per thread. */
async function loadModules(modules: readonly string[]): Promise<void> {
  const fresh = modules.filter((m) => !loadedModules.has(m));
  if (fresh.length === 0) return;
  await loadProcessModules(fresh);
  for (const m of fresh) loadedModules.add(m);
}

/** Compute a chunk and hand its buffers back as transferables (piscina unwraps the value). */
export default async function runChunk(task: ChunkTask): Promise<ChunkResult> {
  if (task.processModules !== undefined) await loadModules(task.processModules);
  const result = computeChunk(contextFor(task), task.start, task.end);
  const movable = { [transferableSymbol]: chunkTransferables(result), [valueSymbol]: result };
  return move(movable) as unknown as ChunkResult;
}
