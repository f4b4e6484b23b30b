/** How pipeline code reports progress without touching the console. */
export interface ProgressSink {
  /** A new stage begins; `total` units of work (runs, points, …). */
  stage(name: string, total: number, estimateSeconds?: number): void;
  /** `done` of the current stage's units are finished. */
  tick(done: number, note?: string): void;
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
