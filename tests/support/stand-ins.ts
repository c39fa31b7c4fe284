import { spawn, type ChildProcess } from 'node:child_process';
import { FAKE_NAMES, type FakeName } from '../../server/fakes/run.js';

export interface StandIns {
  processes: Record<FakeName, ChildProcess>;
  stop(): Promise<void>;
}

/** Each stand-in in its own process (`node --import tsx server/fakes/run.ts <name>`: one OS process each), as `npm start` runs them; env names the ports. */
export async function startStandIns(env: NodeJS.ProcessEnv = process.env, names: readonly FakeName[] = FAKE_NAMES): Promise<StandIns> {
  const processes = {} as Record<FakeName, ChildProcess>;
  await Promise.all(
    names.map(
      (name) =>
        new Promise<void>((resolve, reject) => {
          const child = spawn(process.execPath, ['--import', 'tsx', 'server/fakes/run.ts', name], { env, stdio: ['ignore', 'pipe', 'pipe'] });
          processes[name] = child;
          let out = '';
          child.stdout!.on('data', (d) => {
            out += d;
            if (out.includes('Local stand-in')) resolve();
          });
          child.stderr!.on('data', (d) => (out += d));
          child.on('exit', (code) => reject(new Error(`the ${name} stand-in exited (${code}):\n${out}`)));
        }),
    ),
  );
  return {
    processes,
    async stop() {
      await Promise.all(
        Object.values(processes).map(
          (p) => new Promise<void>((r) => (p.exitCode !== null || p.signalCode !== null ? r() : (p.once('exit', () => r()), p.kill('SIGTERM')))),
        ),
      );
    },
  };
}
