/**
 * Entry point of a worker thread (see parallel.ts): runs each task it is
 * sent, then records the task number and its status in the shared control
 * words and wakes the waiting thread.
 */
import { parentPort, workerData } from 'node:worker_threads';

import { runTask, type ThreadTask } from './tasks.js';

const control = (workerData as { control: Int32Array }).control;
const port = parentPort;
if (port === null) throw new Error('parallel-worker must run as a worker thread');

port.on('message', (msg: { seq: number; task: ThreadTask }) => {
  let status = 0;
  try {
    runTask(msg.task);
  } catch {
    status = 1;
  }
  Atomics.store(control, 2, status);
  Atomics.store(control, 1, msg.seq);
  Atomics.notify(control, 1);
});

Atomics.store(control, 0, 1);
Atomics.notify(control, 0);
