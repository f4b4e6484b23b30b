/**
 * Executors run a list of runs and hand back their outputs. The local pool
 * (worker threads), the in-process executor (tests, --workers 0) and any
 * later distributed queue share this interface and the same `runOne`.
 */
import type { RunSpec } from '../core/types.js';
import type { RunOutput } from '../pipeline/run-one.js';

export type RunOutcome =
  | { id: string; ok: true; output: RunOutput }
  | { id: string; ok: false; error: string };

export interface Executor {
  /**
   * Run every spec. `onSettled` fires as each run ends (any order); the
   * promise resolves with the outcomes in the order of `specs`.
   */
  runAll(specs: readonly RunSpec[], onSettled: (o: RunOutcome, index: number) => void): Promise<RunOutcome[]>;
  close(): Promise<void>;
}

export function errorText(e: unknown): string {
  if (e instanceof Error) return e.message.split('\n')[0];
  return String(e);
}
