/** Worker-thread entry point of the local pool: runs one RunSpec with the shared context. */
import { workerData } from 'piscina';
import type { RunSpec } from '../core/types.js';
import { runOne, type RunContext, type RunOutput } from '../pipeline/run-one.js';
import { fromShared, type SharedContext } from './shared.js';

let ctx: RunContext | null = null;

/** The returned embedding (2n doubles) is small; structured cloning it costs well under a millisecond. */
export default function task(spec: RunSpec): RunOutput {
  ctx ??= fromShared(workerData as SharedContext);
  return runOne(ctx, spec);
}
