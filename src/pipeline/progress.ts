/** How pipeline code reports progress without touching the console. */
export interface ProgressSink {
  /** A new stage begins; `total` units of work (runs, points, …). */
  stage(name: string, total: number, estimateSeconds?: number): void;
  /**
   * `done` of the current stage's units are finished. `fraction`, when given,
   * is the estimated share of the stage's work done (0..1), for an ETA that
   * weighs long and short units and units still running.
   */
  tick(done: number, note?: string, fraction?: number): void;
  /** A notice for the user (dropped rows, clamped settings, …). */
  warn(message: string): void;
  info(message: string): void;
  /** The whole job ended (successfully or not). */
  end(): void;
}

export const silentProgress: ProgressSink = {
  stage() {},
  tick() {},
  warn() {},
  info() {},
  end() {},
};

/**
 * Estimated share of a stage's work that is done when units run
 * `concurrency` at a time in submission order: the estimated cost of the
 * finished units, plus half the cost of the first `concurrency` unfinished
 * ones (those are running, on average half-way), over the total cost.
 * Returns a number in [0, 1]; 0 when the total cost is not positive.
 */
export function workFraction(costs: readonly number[], finished: readonly boolean[], concurrency: number): number {
  let total = 0;
  let done = 0;
  let running = 0;
  let slots = Math.max(1, concurrency);
  for (let i = 0; i < costs.length; i++) {
    total += costs[i];
    if (finished[i]) done += costs[i];
    else if (slots > 0) {
      running += costs[i];
      slots--;
    }
  }
  return total > 0 ? Math.min(1, (done + running / 2) / total) : 0;
}
