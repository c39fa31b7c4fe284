// The worker thread of synthesis-pool.ts: keeps its own copy of the settled effects (sent once per registry
// version) and the whole outputs of recent syntheses, and answers each task with the JSON text to send.
import { parentPort } from 'node:worker_threads';
import { AppError } from '../lib/errors.js';
import { filterLoaded, indexByManipulation } from './settled-effects-cache.js';
import { requestFilters, synthesisRowsView, synthesize } from './synthesis.js';
import { answerRows } from '../../shared/synthesis/answer-rows.js';
import type { SynthesisAnswer, SynthesisRequest } from '../../shared/schemas/synthesis.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';
import type { SynthesisTask, ThreadReply, ThreadRequest } from './synthesis-pool.js';

let held: { stamp: string; version: number; effects: SettledEffect[]; byManipulation: Map<string, SettledEffect[]>; filtered: Map<string, SettledEffect[]> } | undefined;
// whole outputs of this registry version: at most 16, and 200,000 rows in all
let outputs = new Map<string, SynthesisAnswer>();
let rowsKept = 0;

function output(request: SynthesisRequest): SynthesisAnswer {
  const key = JSON.stringify(request);
  const kept = outputs.get(key);
  if (kept) return kept;
  const out: SynthesisAnswer = { registryVersion: held!.version, ...synthesize(filterLoaded(held!, requestFilters(request)), request) };
  if (outputs.size >= 16 || rowsKept >= 200_000) {
    outputs = new Map();
    rowsKept = 0;
  }
  outputs.set(key, out);
  rowsKept += out.rows.length;
  return out;
}

function answer(task: SynthesisTask): string {
  if (task.kind === 'answer') return JSON.stringify(answerRows(output(task.request)));
  return JSON.stringify(synthesisRowsView(output(task.request), task.view));
}

parentPort!.on('message', (msg: ThreadRequest) => {
  let reply: ThreadReply;
  try {
    if (msg.effects) {
      held = { stamp: msg.stamp, version: msg.version, effects: msg.effects, byManipulation: indexByManipulation(msg.effects), filtered: new Map() };
      outputs = new Map();
      rowsKept = 0;
    }
    if (held?.stamp !== msg.stamp) throw new Error('synthesis thread: effects of another registry version');
    reply = { id: msg.id, json: msg.task ? answer(msg.task) : '' };
  } catch (err) {
    reply =
      err instanceof AppError
        ? { id: msg.id, error: { status: err.status, code: err.code, message: err.message, details: err.details } }
        : { id: msg.id, error: { status: 500, code: 'internal', message: err instanceof Error ? `${err.name}: ${err.message}` : String(err) } };
  }
  parentPort!.postMessage(reply);
});
