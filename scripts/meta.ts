// The statistics CLI: `npm run --silent meta -- pool|effect|trimfill|leave1out|cumulative` reads one JSON object on
// stdin and prints one JSON object on stdout. Input is checked with the same schemas as the compute routes.
// Bad input: exit status 2 and { "error": { "message" } } on stdout.
import type { z } from 'zod';
import { pool, computeEffect, trimFill, leaveOneOut, cumulative, StatsInputError } from '../shared/stats/index.js';
import { effectInputSchema, poolInputSchema, sensitivityInputSchema, trimFillInputSchema } from '../shared/schemas/compute.js';

const command = <S extends z.ZodType>(schema: S, run: (input: z.infer<S>) => unknown) => ({ schema, run: run as (input: unknown) => unknown });

const commands: Record<string, { schema: z.ZodType; run: (input: unknown) => unknown }> = {
  pool: command(poolInputSchema, (input) => pool(input)),
  effect: command(effectInputSchema, (input) => computeEffect(input)),
  trimfill: command(trimFillInputSchema, (input) => trimFill(input)),
  leave1out: command(sensitivityInputSchema, (input) => leaveOneOut(input)),
  cumulative: command(sensitivityInputSchema, (input) => cumulative(input)),
};

function fail(message: string): never {
  process.stdout.write(JSON.stringify({ error: { message } }) + '\n');
  process.exit(2);
}

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

async function main() {
  const name = process.argv[2];
  const entry = name ? commands[name] : undefined;
  if (!entry) fail(`usage: meta <${Object.keys(commands).join('|')}> < input.json`);
  let raw: unknown;
  try {
    raw = JSON.parse(await readStdin());
  } catch (e) {
    fail(`stdin is not valid JSON: ${(e as Error).message}`);
  }
  const parsed = entry.schema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = issue.path.map(String).join('.');
    fail(path ? `${path}: ${issue.message}` : issue.message);
  }
  try {
    process.stdout.write(JSON.stringify(entry.run(parsed.data)) + '\n');
  } catch (e) {
    if (e instanceof StatsInputError || e instanceof RangeError || e instanceof TypeError) fail(e.message);
    throw e;
  }
}

main();
