// Invented trial data for tests, the bench and the demo seed: observers with their own PSS (or window) and
// spread, a shift between conditions, binomial responses at fixed levels. Seeded (tests/support/random.ts).
import { normalTwoTailed } from '../../shared/stats/normal.js';
import { gaussian, mulberry32 } from './random.js';

const phi = (z: number) => (z < 0 ? 0.5 * normalTwoTailed(z) : 1 - 0.5 * normalTwoTailed(z));

export interface InventedTrials {
  task: 'order' | 'simultaneity';
  participants: number;
  /** condition name → shift of the PSS (order) or of the window's half-width (simultaneity), ms */
  conditions: Record<string, number>;
  levels: number[];
  trialsPerLevel: number;
  seed: number;
  /** participant id prefix */
  prefix?: string;
}

export interface TrialLine {
  participant: string;
  condition: string;
  level: number;
  response: 0 | 1;
}

/**
 * One line per trial. Order task: p("second first") = Φ((x − PSS)/σ), PSS ~ N(15, 25²) plus the condition's
 * shift, σ ~ U(50, 90). Simultaneity: p("simultaneous") = 0.95·exp(−(x − c)²/(2s²)), c ~ N(20, 15²), the
 * half-width of the window (where p = 0.5) ~ N(110, 20²) plus the shift.
 */
export function inventTrials(spec: InventedTrials): TrialLine[] {
  const rnd = mulberry32(spec.seed);
  const z = gaussian(rnd);
  const out: TrialLine[] = [];
  for (let p = 1; p <= spec.participants; p++) {
    const id = `${spec.prefix ?? 'P'}${String(p).padStart(2, '0')}`;
    const pss = 15 + 25 * z();
    const sigma = 50 + 40 * rnd();
    const centre = 20 + 15 * z();
    const half = 110 + 20 * z();
    for (const [condition, shift] of Object.entries(spec.conditions)) {
      for (const x of spec.levels) {
        let prob: number;
        if (spec.task === 'order') prob = phi((x - pss - shift) / sigma);
        else {
          const h = Math.max(30, half + shift);
          const s = h / Math.sqrt(2 * Math.log(0.95 / 0.5));
          prob = 0.95 * Math.exp(-((x - centre) ** 2) / (2 * s * s));
        }
        for (let t = 0; t < spec.trialsPerLevel; t++) out.push({ participant: id, condition, level: x, response: rnd() < prob ? 1 : 0 });
      }
    }
  }
  return out;
}

export function trialsCsv(lines: readonly TrialLine[]): string {
  return ['participant,condition,level,response', ...lines.map((l) => `${l.participant},${l.condition},${l.level},${l.response}`)].join('\n') + '\n';
}

/** The same data summed per level (participant, condition, level, n, k). */
export function countsCsv(lines: readonly TrialLine[]): string {
  const cells = new Map<string, { n: number; k: number }>();
  for (const l of lines) {
    const key = `${l.participant},${l.condition},${l.level}`;
    const c = cells.get(key) ?? { n: 0, k: 0 };
    c.n += 1;
    c.k += l.response;
    cells.set(key, c);
  }
  return ['participant,condition,level,n,k', ...[...cells].map(([key, c]) => `${key},${c.n},${c.k}`)].join('\n') + '\n';
}

export const ORDER_SOAS = [-240, -180, -120, -60, 0, 60, 120, 180, 240];
export const SJ_SOAS = [-300, -225, -150, -75, 0, 75, 150, 225, 300];
