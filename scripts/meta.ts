// The statistics CLI: `npm run --silent meta -- pool|effect|trimfill` reads one JSON object on stdin and
// prints one JSON object on stdout. Bad input: exit status 2 and { "error": { "message" } } on stdout.
import { pool, computeEffect, trimFill, leaveOneOut, cumulative, StatsInputError } from '../shared/stats/index.js';

const commands: Record<string, (input: any) => unknown> = {
  pool: (input) => pool(input),
  effect: (input) => computeEffect(input),
  trimfill: (input) => trimFill(input),
  leave1out: (input) => leaveOneOut(input),
  cumulative: (input) => cumulative(input),
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
  const command = name ? commands[name] : undefined;
  if (!command) fail(`usage: meta <${Object.keys(commands).join('|')}> < input.json`);
  let input: unknown;
  try {
    input = JSON.parse(await readStdin());
  } catch (e) {
    fail(`stdin is not valid JSON: ${(e as Error).message}`);
  }
  try {
    const out = command(input);
    process.stdout.write(JSON.stringify(out) + '\n');
  } catch (e) {
    if (e instanceof StatsInputError || e instanceof RangeError || e instanceof TypeError) fail(e.message);
    throw e;
  }
}

main();
