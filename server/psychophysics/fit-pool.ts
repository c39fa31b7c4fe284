// A fixed pool of worker threads that runs bootstrapFit calls in parallel: the tasks are cut into batches,
// each idle worker takes the next batch, and results come back in the order of the tasks.
import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import type { BootstrapOptions, BootstrapResult, PsychometricInput, SimultaneityInput } from '../../shared/psychophysics/index.js';

export interface BootstrapTask {
  input: PsychometricInput | SimultaneityInput;
  options?: BootstrapOptions;
}

export interface WorkerRequest {
  id: number;
  tasks: BootstrapTask[];
}

export type WorkerReply = { id: number; results: BootstrapResult[] } | { id: number; error: string };

export interface FitPool {
  readonly size: number;
  /** Runs every task; `onProgress(done, total)` after each batch. Rejects with the first task error. */
  run(tasks: BootstrapTask[], onProgress?: (done: number, total: number) => void): Promise<BootstrapResult[]>;
  close(): Promise<void>;
}

/** The worker module next to this file: TypeScript under tsx (registered in the thread), JavaScript when built. */
function spawnWorker(): Worker {
  const here = import.meta.url;
  if (here.endsWith('.ts')) {
    const file = new URL('./fit-worker.ts', here).href;
    const code = `import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(file)}); })`;
    return new Worker(code, { eval: true });
  }
  return new Worker(new URL('./fit-worker.js', here));
}

export function createFitPool(options: { size?: number; batchSize?: number } = {}): FitPool {
  const size = Math.max(1, options.size ?? Math.min(2, availableParallelism()));
  const workers = Array.from({ length: size }, spawnWorker);
  let nextId = 1;
  let busy = false;

  const send = (worker: Worker, tasks: BootstrapTask[]) =>
    new Promise<BootstrapResult[]>((resolve, reject) => {
      const id = nextId++;
      const onMessage = (reply: WorkerReply) => {
        if (reply.id !== id) return;
        cleanup();
        if ('error' in reply) reject(new Error(reply.error));
        else resolve(reply.results);
      };
      const onError = (err: Error) => {
        cleanup();
        reject(err);
      };
      const onExit = (code: number) => {
        cleanup();
        reject(new Error(`fit worker stopped (exit code ${code})`));
      };
      const cleanup = () => {
        worker.off('message', onMessage);
        worker.off('error', onError);
        worker.off('exit', onExit);
      };
      worker.on('message', onMessage);
      worker.on('error', onError);
      worker.on('exit', onExit);
      worker.postMessage({ id, tasks } satisfies WorkerRequest);
    });

  return {
    size,
    async run(tasks, onProgress) {
      if (busy) throw new Error('the fit pool is already running a job');
      busy = true;
      try {
        const batchSize = options.batchSize ?? Math.max(1, Math.min(16, Math.ceil(tasks.length / (size * 8))));
        const results = new Array<BootstrapResult>(tasks.length);
        let next = 0;
        let done = 0;
        const loop = async (worker: Worker) => {
          while (next < tasks.length) {
            const start = next;
            next = Math.min(tasks.length, next + batchSize);
            let out: BootstrapResult[];
            try {
              out = await send(worker, tasks.slice(start, next));
            } catch (err) {
              next = tasks.length; // the other workers stop after their batch
              throw err;
            }
            for (let i = 0; i < out.length; i++) results[start + i] = out[i];
            done += out.length;
            onProgress?.(done, tasks.length);
          }
        };
        await Promise.all(workers.map(loop));
        return results;
      } finally {
        busy = false;
      }
    },
    async close() {
      await Promise.all(workers.map((w) => w.terminate()));
    },
  };
}
