/** Local executor: a piscina pool of worker threads over the shared dataset. */
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { RunSpec } from '../core/types.js';
import type { RunContext, RunOutput } from '../pipeline/run-one.js';
import { errorText, type Executor, type RunOutcome } from './executor.js';
import { toShared } from './shared.js';

/**
 * Where the compiled worker lives. When this module runs from TypeScript
 * sources (the test runner), worker threads cannot load .ts, so use the
 * build output; `npm test` builds first.
 */
function workerFile(): string {
  const here = import.meta.url;
  if (here.endsWith('.ts')) return fileURLToPath(new URL('../../dist/src/exec/worker.js', here));
  return fileURLToPath(new URL('./worker.js', here));
}

export class PoolExecutor implements Executor {
  private readonly pool: Piscina;
  private poolError: Error | null = null;

  constructor(ctx: RunContext, workers: number) {
    this.pool = new Piscina({
      filename: workerFile(),
      minThreads: workers,
      maxThreads: workers,
      idleTimeout: 60_000,
      workerData: toShared(ctx),
    });
    // A pool-level error must not kill the process; it fails the runs instead.
    this.pool.on('error', (e: unknown) => {
      this.poolError = e instanceof Error ? e : new Error(String(e));
    });
  }

  async runAll(specs: readonly RunSpec[], onSettled: (o: RunOutcome, index: number) => void): Promise<RunOutcome[]> {
    return Promise.all(
      specs.map(async (spec, i): Promise<RunOutcome> => {
        let outcome: RunOutcome;
        try {
          const output = (await this.pool.run(spec)) as RunOutput;
          outcome = { id: spec.id, ok: true, output };
        } catch (e) {
          outcome = { id: spec.id, ok: false, error: errorText(this.poolError ?? e) };
        }
        onSettled(outcome, i);
        return outcome;
      }),
    );
  }

  async close(): Promise<void> {
    await this.pool.destroy();
  }
}

/** Runs everything on the calling thread, one after another. */
export class InlineExecutor implements Executor {
  constructor(private readonly ctx: RunContext, private readonly run: (ctx: RunContext, spec: RunSpec) => RunOutput) {}

  async runAll(specs: readonly RunSpec[], onSettled: (o: RunOutcome, index: number) => void): Promise<RunOutcome[]> {
    const out: RunOutcome[] = [];
    for (let i = 0; i < specs.length; i++) {
      const spec = specs[i];
      let o: RunOutcome;
      try {
        o = { id: spec.id, ok: true, output: this.run(this.ctx, spec) };
      } catch (e) {
        o = { id: spec.id, ok: false, error: errorText(e) };
      }
      onSettled(o, i);
      out.push(o);
      // Let progress output and signals through between runs.
      await new Promise((r) => setImmediate(r));
    }
    return out;
  }

  async close(): Promise<void> {}
}
