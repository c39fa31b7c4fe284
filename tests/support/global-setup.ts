import { execFileSync } from 'node:child_process';
import { startStandIns } from './stand-ins.js';

/** Runs once per vitest run: migrates the (fresh) test database and starts the local stand-ins, each in its own process. */
export default async function setup() {
  const url = process.env.DATABASE_URL;
  if (!url || !/chronometa_test/.test(url)) {
    throw new Error('Run the suite with `npm test`: it brings up a test PostgreSQL and sets DATABASE_URL to chronometa_test.');
  }
  // Migrations are TypeScript files: let tsx load them, as `npm run db:migrate` does.
  execFileSync('node_modules/.bin/tsx', ['scripts/db.ts', 'migrate'], { stdio: 'inherit' });
  const fakes = await startStandIns();
  return async () => {
    await fakes.stop();
  };
}
