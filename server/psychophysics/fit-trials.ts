// The fit job's work without the database: one bootstrapped fit per participant × condition on the pool,
// flagged for the fit table. The job (services/trials.ts) and the bench call this same function.
import type { BootstrapResult, PsychometricModel } from '../../shared/psychophysics/index.js';
import type { LevelCounts } from '../../shared/trials/csv.js';
import { flagFit, type CellFit, type TrialTask } from '../../shared/trials/fits.js';
import type { FitPool } from './fit-pool.js';

export interface FitCellsOptions {
  task: TrialTask;
  model: PsychometricModel;
  audiovisual: boolean;
  resamples: number;
}

/** Seeds are fixed per cell position, so a refit of the same data gives the same intervals. */
export const cellSeed = (position: number) => 15_000 + position;

export async function fitCells(pool: FitPool, cells: readonly LevelCounts[], opts: FitCellsOptions, onProgress?: (done: number, total: number) => void): Promise<CellFit[]> {
  const simultaneity = opts.task === 'simultaneity';
  const tasks = cells.map((c, i) => ({
    input: simultaneity ? { x: c.x, n: c.n, k: c.k } : { x: c.x, n: c.n, k: c.k, model: opts.model },
    options: { resamples: opts.resamples, seed: cellSeed(i + 1) },
  }));
  const results: BootstrapResult[] = await pool.run(tasks, onProgress);
  return results.map((r, i) => {
    const c = cells[i];
    return {
      participant: c.participant,
      condition: c.condition,
      kind: r.kind,
      x: c.x,
      n: c.n,
      k: c.k,
      fit: r.fit,
      ci: r.ci as CellFit['ci'],
      resamples: r.resamples,
      failed: r.failed,
      flags: flagFit(r.fit, c.x, opts.audiovisual),
    };
  });
}
