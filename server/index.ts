import { buildApp } from './app.js';
import { closeContext, createContext } from './context.js';
import { readEnv } from './env.js';
import { startWorkers } from './workers.js';

// A promise nobody awaited (a fire-and-forget write during a database restart) is logged, not fatal.
process.on('unhandledRejection', (reason) => console.error('[unhandled rejection]', reason));

let env;
try {
  env = readEnv();
} catch (err) {
  console.error((err as Error).message);
  process.exit(1);
}
const ctx = createContext(env);
await startWorkers(ctx);
const app = buildApp(ctx);
const server = app.listen(env.PORT, env.HOST, () => {
  console.log(`Chronometa is running at ${env.APP_ORIGIN}`);
});

const shutdown = () => {
  server.close();
  closeContext(ctx).finally(() => process.exit(0));
};
process.on('SIGINT', shutdown);
process.on('SIGTERM', shutdown);
