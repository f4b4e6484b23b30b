/**
 * Worker threads for the dense kernels (products, exact neighbour tiles),
 * driven synchronously: the calling thread hands each worker one task, does
 * its own share, then blocks in `Atomics.wait` until the workers are done.
 * Callers split work into fixed, disjoint pieces whose results do not depend
 * on which thread computes them, so outputs are the same bytes for any thread
 * count. If a worker cannot be started (for example the compiled worker file
 * is missing), or a task fails on it, the calling thread runs that task
 * itself — slower, never different.
 *
 * Workers are started on first use, kept for later calls and `unref`'d, so
 * they never keep the process alive. Every typed array in a task must live
 * in a SharedArrayBuffer (see `sharedFloat64` / `sharedInt32`).
 */
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';

import { InternalError } from '../core/errors.js';
import { runTask, type ThreadTask } from './tasks.js';

/** Milliseconds to wait for a new worker to load before doing its work on the calling thread. */
const READY_TIMEOUT_MS = 10_000;
/** A task that has not finished after this long is treated as a lost worker thread (InternalError). */
const TASK_TIMEOUT_MS = 3_600_000;

/** Control words, one Int32Array per worker: [ready, finished task number, status of that task]. */
const READY = 0;
const DONE = 1;
const STATUS = 2;

interface PoolThread {
  worker: Worker;
  control: Int32Array;
  /** Number of the last task posted. */
  posted: number;
  /** false once the worker failed to load in time; its tasks then run locally. */
  usable: boolean;
  /** Whether the ready flag has been seen. */
  ready: boolean;
}

const pool: PoolThread[] = [];

/**
 * Where the compiled worker lives. When this module runs from TypeScript
 * sources (the test runner), worker threads cannot load .ts, so the build
 * output is used; `npm test` builds first.
 */
function workerFile(): string {
  const here = import.meta.url;
  if (here.endsWith('.ts')) return fileURLToPath(new URL('../../dist/src/preprocess/parallel-worker.js', here));
  return fileURLToPath(new URL('./parallel-worker.js', here));
}

function startThread(): PoolThread {
  const control = new Int32Array(new SharedArrayBuffer(4 * 4));
  const worker = new Worker(workerFile(), { workerData: { control } });
  worker.unref();
  const thread: PoolThread = { worker, control, posted: 0, usable: true, ready: false };
  // Errors surface on the event loop, which may be blocked; the ready timeout covers load failures.
  worker.on('error', () => {
    thread.usable = false;
  });
  worker.on('exit', () => {
    thread.usable = false;
  });
  return thread;
}

function waitReady(h: PoolThread): boolean {
  if (!h.usable) return false;
  if (h.ready) return true;
  const t0 = Date.now();
  while (Atomics.load(h.control, READY) === 0) {
    const left = READY_TIMEOUT_MS - (Date.now() - t0);
    if (left <= 0) {
      h.usable = false;
      return false;
    }
    Atomics.wait(h.control, READY, 0, left);
  }
  h.ready = true;
  return true;
}

/** A Float64Array of the given length in a SharedArrayBuffer (zero-filled). */
export function sharedFloat64(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(8 * length));
}

/** An Int32Array of the given length in a SharedArrayBuffer (zero-filled). */
export function sharedInt32(length: number): Int32Array {
  return new Int32Array(new SharedArrayBuffer(4 * length));
}

/** A shared copy of `a` (or `a` itself when it already lives in a SharedArrayBuffer). */
export function toSharedFloat64(a: Float64Array): Float64Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const s = sharedFloat64(a.length);
  s.set(a);
  return s;
}

function checkShared(task: ThreadTask): void {
  for (const v of Object.values(task) as unknown[]) {
    for (const x of Array.isArray(v) ? v : [v]) {
      if (ArrayBuffer.isView(x) && !(x.buffer instanceof SharedArrayBuffer)) {
        throw new InternalError(`worker task '${task.kind}' holds an array outside shared memory`);
      }
    }
  }
}

/**
 * Run `tasks[0]` on the calling thread and each further task on its own
 * worker thread, concurrently; return when all are done. Tasks must write to
 * disjoint memory. Runs everything on the calling thread when there is a
 * single task.
 */
export function runTasks(tasks: readonly ThreadTask[]): void {
  if (tasks.length === 0) return;
  const remote = tasks.slice(1);
  for (const t of remote) checkShared(t);
  startWorkers(remote.length);
  const posted: Array<{ h: PoolThread; seq: number; task: ThreadTask }> = [];
  const local: ThreadTask[] = [tasks[0]];
  remote.forEach((task, i) => {
    const h = pool[i];
    if (!waitReady(h)) {
      local.push(task);
      return;
    }
    const seq = ++h.posted;
    h.worker.postMessage({ seq, task });
    posted.push({ h, seq, task });
  });
  for (const t of local) runTask(t);
  for (const { h, seq, task } of posted) {
    const t0 = Date.now();
    for (;;) {
      const done = Atomics.load(h.control, DONE);
      if (done === seq) break;
      const left = TASK_TIMEOUT_MS - (Date.now() - t0);
      if (left <= 0) throw new InternalError(`a worker thread did not finish its '${task.kind}' task`);
      Atomics.wait(h.control, DONE, done, Math.min(left, 1000));
    }
    // A task that threw on the worker is repeated here: same inputs, same bytes, and a real error surfaces.
    if (Atomics.load(h.control, STATUS) !== 0) runTask(task);
  }
}

/**
 * Have at least `count` worker threads loading or loaded, without waiting:
 * callers that know they will split work soon can let the threads start up
 * while they prepare.
 */
export function startWorkers(count: number): void {
  while (pool.length < count) pool.push(startThread());
}

/**
 * Start one worker thread if none is running and report whether it loaded.
 * Meant for tests and diagnostics: a false answer means multi-threaded calls
 * quietly run on one thread.
 */
export function workerThreadsAvailable(): boolean {
  startWorkers(1);
  return waitReady(pool[0]);
}
