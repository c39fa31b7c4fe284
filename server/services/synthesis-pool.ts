// Syntheses computed off the event loop: one worker thread (synthesis-thread.ts) does the pooling and writes the
// JSON, so cheap requests keep being answered while a large synthesis runs. Tasks wait in a FairQueue, one line
// per caller, so a caller sending many syntheses delays only its own.
import { Worker } from 'node:worker_threads';
import type { Knex } from 'knex';
import { AppError } from '../lib/errors.js';
import { FairQueue } from '../lib/fair-queue.js';
import { settledEffectsAt } from './settled-effects-cache.js';
import type { SynthesisRequest, SynthesisRowsQuery } from '../../shared/schemas/synthesis.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';

/** What the thread answers: the answer (first page of rows of a long one), or the answer with its rows as asked (?rows=). */
export type SynthesisTask = { kind: 'answer'; request: SynthesisRequest } | { kind: 'view'; request: SynthesisRequest; view: SynthesisRowsQuery };

export interface ThreadRequest {
  id: number;
  stamp: string;
  version: number;
  /** every settled effect of this registry version, sent when the thread holds another one */
  effects?: SettledEffect[];
  /** none: only take the effects */
  task?: SynthesisTask;
}

export type ThreadReply = { id: number; json: string } | { id: number; error: { status: number; code: string; message: string; details?: unknown } };

/** The thread module next to this file: TypeScript under tsx (registered in the thread), JavaScript when built. */
function spawnThread(): Worker {
  const here = import.meta.url;
  if (here.endsWith('.ts')) {
    const file = new URL('./synthesis-thread.ts', here).href;
    const code = `import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(file)}); })`;
    return new Worker(code, { eval: true });
  }
  return new Worker(new URL('./synthesis-thread.js', here));
}

export class SynthesisPool {
  private readonly queue = new FairQueue(1);
  private thread: Worker | undefined;
  private heldStamp: string | undefined;
  private nextId = 1;

  constructor(private readonly db: Knex) {}

  /** Runs a task for `caller` when its turn comes; resolves to the JSON text of the answer. */
  run(caller: string, task: SynthesisTask): Promise<string> {
    return this.queue.run(caller, async () => {
      const loaded = await settledEffectsAt(this.db);
      const thread = this.started();
      const send = this.heldStamp === loaded.stamp ? undefined : loaded.effects;
      this.heldStamp = loaded.stamp;
      return this.ask(thread, { id: this.nextId++, stamp: loaded.stamp, version: loaded.version, effects: send, task });
    });
  }

  /** Loads the settled effects and hands them to a started thread ahead of the first synthesis. */
  async warm(): Promise<void> {
    const loaded = await settledEffectsAt(this.db);
    if (this.heldStamp === loaded.stamp) return;
    const thread = this.started();
    this.heldStamp = loaded.stamp;
    await this.ask(thread, { id: this.nextId++, stamp: loaded.stamp, version: loaded.version, effects: loaded.effects });
  }

  /** Tasks of this caller waiting for their turn. */
  waiting(caller: string): number {
    return this.queue.waiting(caller);
  }

  async close() {
    const t = this.thread;
    this.thread = undefined;
    await t?.terminate();
  }

  private started(): Worker {
    if (this.thread) return this.thread;
    const thread = spawnThread();
    thread.unref(); // an idle thread never keeps the process alive
    thread.on('exit', () => {
      if (this.thread === thread) this.thread = undefined;
      this.heldStamp = undefined;
    });
    thread.on('error', (err) => console.error('[synthesis thread]', err));
    this.thread = thread;
    return thread;
  }

  private ask(thread: Worker, msg: ThreadRequest): Promise<string> {
    return new Promise<string>((resolve, reject) => {
      const onMessage = (reply: ThreadReply) => {
        if (reply.id !== msg.id) return;
        cleanup();
        if ('json' in reply) resolve(reply.json);
        else if (reply.error.status === 500) reject(new Error(reply.error.message));
        else reject(new AppError(reply.error.status, reply.error.code, reply.error.message, reply.error.details));
      };
      const onExit = (code: number) => {
        cleanup();
        this.heldStamp = undefined;
        reject(new Error(`synthesis thread stopped (exit code ${code})`));
      };
      const cleanup = () => {
        thread.off('message', onMessage);
        thread.off('exit', onExit);
      };
      thread.on('message', onMessage);
      thread.on('exit', onExit);
      thread.postMessage(msg);
    });
  }
}
