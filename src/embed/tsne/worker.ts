/**
 * Worker thread of a multi-threaded t-SNE run (started by team.ts). It waits
 * in `Atomics.wait` for a job, takes items until none are left, and stops
 * on JOB_QUIT. See jobs.ts for the protocol. Plain JavaScript after `tsc`;
 * imports only jobs.ts and kernels.ts.
 */
import { receiveMessageOnPort, workerData } from 'node:worker_threads';
import type { MessagePort } from 'node:worker_threads';
import {
  BUFVER, claimItem, DONE, FAILED, GATE, GEN, JOB, JOB_QUIT, LIMIT, newThreadState, OPEN_FROM, peekItem, READY, runItem, WORKER_ITEMS,
} from './jobs.js';
import type { BufferMessage, ThreadState, WorkerSetup, Workspace } from './jobs.js';
import { MAX_TREE_DEPTH } from './kernels.js';

/** Milliseconds a worker polls for the next job before it sleeps. */
const SPIN_MS = 0.05;

const setup = workerData as WorkerSetup & { port: MessagePort };
const control = new Int32Array(setup.control);
const params = new Float64Array(setup.params);
const claim = new BigInt64Array(setup.claim);
const port = setup.port;
const ws: Workspace = new Map();
const state: ThreadState = newThreadState(ws, MAX_TREE_DEPTH);
let bufferVersion = 0;

/** Read published arrays until our copy matches BUFVER. */
function syncBuffers(): void {
  const want = Atomics.load(control, BUFVER);
  while (bufferVersion !== want) {
    const got = receiveMessageOnPort(port);
    if (got === undefined) throw new Error(`t-SNE worker: array version ${want} announced but not received`);
    const msg = got.message as BufferMessage;
    for (const [name, buffer, kind] of msg.entries) {
      if (buffer === null) ws.delete(name);
      else ws.set(name, kind === 'f64' ? new Float64Array(buffer) : new Int32Array(buffer));
    }
    bufferVersion = msg.version;
    state.tree = null;
  }
}

/** Wait until the gated items of `gen` are open; false if the job was replaced meanwhile. */
function waitForGate(gen: number): boolean {
  for (;;) {
    const g = Atomics.load(control, GATE);
    if (g === gen) return true;
    if (Atomics.load(control, GEN) !== gen) return false;
    Atomics.wait(control, GATE, g, 100);
  }
}

function work(gen: number): void {
  const job = Atomics.load(control, JOB);
  syncBuffers();
  const openFrom = Atomics.load(control, OPEN_FROM);
  let limit = openFrom;
  let gateOpen = false;
  for (;;) {
    const next = peekItem(claim, gen);
    if (next < 0) return;
    if (next >= openFrom && !gateOpen) {
      if (!waitForGate(gen)) return;
      gateOpen = true;
      limit = Atomics.load(control, LIMIT);
      syncBuffers();
      continue;
    }
    if (next >= limit) return;
    // Another thread may take the item first: then look again.
    const item = claimItem(claim, gen, limit);
    if (item < 0) continue;
    try {
      runItem(job, item, params, state);
    } catch (e) {
      Atomics.store(control, FAILED, 1);
      port.postMessage(e instanceof Error ? `${e.message}\n${e.stack ?? ''}` : String(e));
    }
    Atomics.add(control, WORKER_ITEMS, 1);
    Atomics.add(control, DONE, 1);
    Atomics.notify(control, DONE);
  }
}

/**
 * Wait for a generation other than `seen`: poll for up to SPIN_MS first (the
 * next job usually follows within a fraction of a millisecond, and waking a
 * sleeping thread costs tens of microseconds), then sleep.
 */
function nextGeneration(seen: number): number {
  const t0 = performance.now();
  for (let polls = 1; ; polls++) {
    const gen = Atomics.load(control, GEN);
    if (gen !== seen) return gen;
    if ((polls & 255) === 0 && performance.now() - t0 > SPIN_MS) break;
  }
  for (;;) {
    Atomics.wait(control, GEN, seen);
    const gen = Atomics.load(control, GEN);
    if (gen !== seen) return gen;
  }
}

Atomics.add(control, READY, 1);
let seen = 0;
for (;;) {
  const gen = nextGeneration(seen);
  seen = gen;
  if (Atomics.load(control, JOB) === JOB_QUIT) break;
  work(gen);
}
port.close();
