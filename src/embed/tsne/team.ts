/**
 * The threads of one t-SNE run: the calling (main) thread plus
 * `threads − 1` worker threads (worker.ts) that share the run's arrays
 * through SharedArrayBuffers. Everything is synchronous on the main
 * thread: it announces a job, computes items itself, then blocks in
 * `Atomics.wait` until the workers have finished the items they took. Items
 * are handed out one by one (a compare-and-swap on a shared counter), so a
 * busy or late-starting worker only means the main thread does more of
 * them; since every item's result depends only on its index (kernels.ts),
 * the result is the same for any number of threads. With threads = 1 no
 * worker is started and the same items run in index order.
 *
 * A Team must be closed (`close`), which stops and terminates its workers.
 */
import { fileURLToPath } from 'node:url';
import { MessageChannel, receiveMessageOnPort, Worker } from 'node:worker_threads';
import type { MessagePort } from 'node:worker_threads';
import { InternalError } from '../../core/errors.js';
import { heapArrays, sharedArrays } from './arrays.js';
import type { ArrayFactory } from './arrays.js';
import {
  BUFVER, claimItem, CONTROL_SLOTS, DONE, FAILED, GATE, GEN, JOB, JOB_QUIT, LIMIT, newThreadState, OPEN_FROM, PARAM_SLOTS, READY, runItem,
  WORKER_ITEMS,
} from './jobs.js';
import type { BufferMessage, ThreadState, WorkerSetup, Workspace } from './jobs.js';
import { MAX_TREE_DEPTH } from './kernels.js';

/** Milliseconds the main thread polls the DONE counter before it sleeps in `Atomics.wait`. */
const SPIN_MS = 0.05;
/** The main thread gives up when no item finishes for this long while it waits. */
const STALL_MS = 120_000;

/** Counters over the life of the process, for tests and diagnostics. */
export interface WorkerThreadStats {
  /** Worker threads started. */
  started: number;
  /** Worker threads whose 'exit' event has been seen. */
  exited: number;
  /** Items computed by worker threads (of closed teams). */
  items: number;
  /** Message of the last error a worker thread reported outside a job, if any. */
  lastError: string | null;
}

const stats: WorkerThreadStats = { started: 0, exited: 0, items: 0, lastError: null };

/** A copy of the process-wide worker-thread counters. */
export function workerThreadStats(): WorkerThreadStats {
  return { ...stats };
}

/**
 * Where the compiled worker lives. When this module runs from TypeScript
 * sources (the test runner), worker threads cannot load .ts, so the build
 * output is used; `npm test` builds first.
 */
function workerFile(): string {
  const here = import.meta.url;
  if (here.endsWith('.ts')) return fileURLToPath(new URL('../../../dist/src/embed/tsne/worker.js', here));
  return fileURLToPath(new URL('./worker.js', here));
}

/**
 * The main thread's handle on one run's threads: publishes arrays
 * (`share`), announces jobs (`post`, `open`), takes part in them (`work`)
 * and stops the workers (`close`).
 */
export class Team {
  /** Threads taking part, the main thread included. */
  readonly threads: number;
  /** Where arrays the jobs read or write must be allocated. */
  readonly arrays: ArrayFactory;
  /** Job parameters; write them before `post`. */
  readonly params: Float64Array;
  private readonly control: Int32Array;
  private readonly claim: BigInt64Array;
  private readonly ws: Workspace = new Map();
  private readonly state: ThreadState;
  private readonly workers: Worker[] = [];
  private readonly ports: MessagePort[] = [];
  private pending: Array<readonly [string, SharedArrayBuffer | null, 'f64' | 'i32']> = [];
  private bufferVersion = 0;
  private gen = 0;
  private job = 0;
  private limit = 0;
  private closed = false;

  /** @param threads total threads (main included), an integer ≥ 1. */
  constructor(threads: number) {
    if (!Number.isInteger(threads) || threads < 1) throw new RangeError(`threads must be a positive integer; received ${threads}`);
    this.threads = threads;
    this.arrays = threads > 1 ? sharedArrays : heapArrays;
    const control = new SharedArrayBuffer(4 * CONTROL_SLOTS);
    const params = new SharedArrayBuffer(8 * PARAM_SLOTS);
    const claim = new SharedArrayBuffer(8);
    this.control = new Int32Array(control);
    this.params = new Float64Array(params);
    this.claim = new BigInt64Array(claim);
    this.state = newThreadState(this.ws, MAX_TREE_DEPTH);
    try {
      for (let t = 1; t < threads; t++) {
        const { port1, port2 } = new MessageChannel();
        const setup: WorkerSetup & { port: MessagePort } = { control, params, claim, port: port2 };
        const worker = new Worker(workerFile(), { workerData: setup, transferList: [port2] });
        stats.started++;
        worker.on('error', (e: unknown) => {
          stats.lastError = e instanceof Error ? e.message : String(e);
        });
        worker.on('exit', () => {
          stats.exited++;
        });
        this.workers.push(worker);
        this.ports.push(port1);
      }
    } catch (e) {
      this.close();
      throw e;
    }
  }

  /** Worker threads that have started running (for tests). */
  get workersReady(): number {
    return Atomics.load(this.control, READY);
  }

  /**
   * Make arrays available to the jobs under these names. With worker
   * threads they must come from `arrays` (shared memory); arrays already
   * published under the same name are not sent again.
   */
  share(arrays: Record<string, Float64Array | Int32Array>): void {
    for (const [name, a] of Object.entries(arrays)) {
      if (this.ws.get(name) === a) continue;
      this.ws.set(name, a);
      this.state.tree = null;
      if (this.workers.length === 0) continue;
      if (!(a.buffer instanceof SharedArrayBuffer)) throw new InternalError(`t-SNE array '${name}' is not in shared memory`);
      this.pending.push([name, a.buffer, a instanceof Float64Array ? 'f64' : 'i32']);
    }
  }

  /** Forget arrays published under these names (so their memory can be freed). */
  release(names: readonly string[]): void {
    for (const name of names) {
      if (!this.ws.delete(name)) continue;
      this.state.tree = null;
      if (this.workers.length > 0) this.pending.push([name, null, 'f64']);
    }
  }

  private flush(): void {
    if (this.pending.length === 0) return;
    const msg: BufferMessage = { version: this.bufferVersion + 1, entries: this.pending };
    for (const port of this.ports) port.postMessage(msg);
    this.pending = [];
    this.bufferVersion++;
    Atomics.store(this.control, BUFVER, this.bufferVersion);
  }

  /**
   * Announce job `job` with `limit` items, of which those from `openFrom`
   * on wait for `open` (default: none wait). Parameters must be set.
   */
  post(job: number, limit: number, openFrom = limit): void {
    if (this.closed) throw new InternalError('t-SNE team used after close');
    this.job = job;
    this.limit = limit;
    this.gen++;
    if (this.workers.length === 0) return;
    const c = this.control;
    this.flush();
    Atomics.store(c, JOB, job);
    Atomics.store(c, DONE, 0);
    Atomics.store(c, LIMIT, limit);
    Atomics.store(c, OPEN_FROM, openFrom);
    Atomics.store(this.claim, 0, BigInt(this.gen) << 32n);
    Atomics.store(c, GEN, this.gen);
    Atomics.notify(c, GEN);
  }

  /** Open the waiting items of the current job; `limit` is the final item count. */
  open(limit: number): void {
    this.limit = limit;
    if (this.workers.length === 0) return;
    const c = this.control;
    this.flush();
    Atomics.store(c, LIMIT, limit);
    Atomics.store(c, GATE, this.gen);
    Atomics.notify(c, GATE);
  }

  /** Compute items of the current job on this thread until none are left, then wait for the workers'. */
  work(): void {
    if (this.workers.length === 0) {
      for (let item = 0; item < this.limit; item++) runItem(this.job, item, this.params, this.state);
      return;
    }
    const c = this.control;
    for (;;) {
      const item = claimItem(this.claim, this.gen, this.limit);
      if (item < 0) break;
      runItem(this.job, item, this.params, this.state);
      Atomics.add(c, DONE, 1);
    }
    const t0 = performance.now();
    let spinning = true;
    let last = -1;
    let since = 0;
    for (let polls = 1; ; polls++) {
      const done = Atomics.load(c, DONE);
      if (done >= this.limit) break;
      if (spinning) {
        if ((polls & 255) === 0 && performance.now() - t0 > SPIN_MS) spinning = false;
        continue;
      }
      if (done !== last) {
        last = done;
        since = performance.now();
      } else if (performance.now() - since > STALL_MS) {
        throw new InternalError(`t-SNE worker thread made no progress for ${STALL_MS / 1000} s`);
      }
      Atomics.wait(c, DONE, done, 1000);
    }
    if (Atomics.load(c, FAILED) !== 0) {
      let text = 'unknown error';
      for (const port of this.ports) {
        const m = receiveMessageOnPort(port);
        if (m !== undefined) text = String(m.message);
      }
      throw new InternalError(`t-SNE worker thread failed: ${text}`);
    }
  }

  /** `post` then `work`, for jobs without waiting items. */
  run(job: number, limit: number): void {
    this.post(job, limit);
    this.work();
  }

  /** Stop and terminate the worker threads. Safe to call more than once. */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    if (this.workers.length === 0) return;
    const c = this.control;
    stats.items += Atomics.load(c, WORKER_ITEMS);
    Atomics.store(c, JOB, JOB_QUIT);
    Atomics.store(c, GEN, this.gen + 1);
    Atomics.store(c, GATE, -1);
    Atomics.notify(c, GEN);
    Atomics.notify(c, GATE);
    for (const w of this.workers) void w.terminate();
    for (const p of this.ports) p.close();
  }
}
