// Worker thread of the fit pool (fit-pool.ts): runs batches of bootstrapFit calls from the pure engine.
import { parentPort } from 'node:worker_threads';
import { bootstrapFit } from '../../shared/psychophysics/index.js';
import type { BootstrapTask, WorkerReply, WorkerRequest } from './fit-pool.js';

function run(task: BootstrapTask) {
  return bootstrapFit(task.input, task.options);
}

parentPort!.on('message', (request: WorkerRequest) => {
  let reply: WorkerReply;
  try {
    reply = { id: request.id, results: request.tasks.map(run) };
  } catch (err) {
    reply = { id: request.id, error: err instanceof Error ? `${err.name}: ${err.message}` : String(err) };
  }
  parentPort!.postMessage(reply);
});
