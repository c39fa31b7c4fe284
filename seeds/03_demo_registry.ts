import type { Knex } from 'knex';
import type { SheetInput } from '../shared/schemas/extraction.js';
import { sheetDraftSchema } from '../shared/schemas/extraction.js';
import { compareSheets, mergeSheets } from '../server/services/comparison.js';
import { ensureVocabulary } from '../server/services/manipulations.js';
import { createReference } from '../server/services/references.js';
import { includeThroughFullText } from '../server/services/screening.js';
import { createSettledRecord, saveSheet } from '../server/services/settlement.js';
import { mulberry32 } from '../tests/support/random.js';

// An invented registry: labs, authors, journals, papers and numbers are made up; DOIs use the test prefix 10.5555.

let rand = mulberry32(20261201);
// Between-study differences in true effect (labs, stimuli, samples), drawn from a stream of their own so
// that every other seeded value stays as it was.
let labRand = mulberry32(424242);
/** One lab's offset from the typical effect, in [-1, 1]: drawn once per paper, shared by its studies and effects. */
const labDraw = () => (labRand() - 0.5) * 2;
// Correlations between conditions of within-subject designs, from a stream of their own too.
let withinRand = mulberry32(515151);
const between = (lo: number, hi: number) => lo + (hi - lo) * rand();
const int = (lo: number, hi: number) => Math.round(between(lo, hi));
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];
const r1 = (x: number) => Math.round(x * 10) / 10;
const r2 = (x: number) => Math.round(x * 100) / 100;

const SURNAMES = [
  'Achterberg', 'Balogun', 'Castellano', 'Dahlgren', 'Eze', 'Fontaine', 'Gallardo', 'Halvorsen', 'Iwasaki', 'Jankowski', 'Kiprono', 'Laurent',
  'Marchetti', 'Nakagawa', 'Oyelaran', 'Petrov', 'Quintero', 'Rasmussen', 'Sandoval', 'Thorvaldsen', 'Uchenna', 'Valdivia', 'Wojcik', 'Xu',
  'Yilmaz', 'Zielinski', 'Abernethy', 'Brannigan', 'Coutinho', 'Devereux', 'Elmasry', 'Feldmann', 'Grimaldi', 'Hoekstra', 'Ibarra', 'Jovanovic',
  'Kowalczyk', 'Lindgren', 'Mwangi', 'Novak', 'Okoro', 'Pellegrini',
];
const GIVEN = ['A.', 'B.', 'C.', 'D.', 'E.', 'F.', 'G.', 'H.', 'I.', 'J.', 'K.', 'L.', 'M.', 'N.', 'O.', 'P.', 'R.', 'S.', 'T.', 'V.'];
const JOURNALS = ['Journal of Invented Psychophysics', 'Imaginary Review of Timing', 'Fictional Journal of Cognitive Timing', 'Invented Perception Letters', 'Annals of Made-up Neuroscience'];
const DIAGNOSES = ["Parkinson's disease", 'schizophrenia', 'ADHD', 'autism spectrum condition', 'major depressive disorder'];

type Outcome = 'duration_distortion' | 'simultaneity_window' | 'temporal_order' | 'recalibration_shift' | 'postdiction_window' | 'positional_lag';
interface Plan {
  manipulation: string;
  outcome: Outcome;
  title: string;
  modality: 'visual' | 'auditory' | 'tactile' | 'audiovisual';
  task: string;
  /** typical effect: Hedges' g for duration distortion (log units for log ratios), ms otherwise */
  size: [number, number];
  logRatio?: boolean;
  /**
   * Papers reporting in a unit of their own (seeded after the others, from streams of their own): a percentage of
   * over-reproduction (log ratio, unit percent; size in log units), or a bisection point shift in ms (size in ms),
   * which is lower when the manipulation lengthens perceived duration, so the sheet reverses its sign.
   */
  special?: 'percent_reproduction' | 'bisection_point_ms';
}

const P = (manipulation: string, outcome: Outcome, title: string, modality: Plan['modality'], task: string, size: [number, number], logRatio = false): Plan => ({ manipulation, outcome, title, modality, task, size, logRatio });

const PLANS: Plan[] = [
  P('luminance', 'duration_distortion', 'Brighter flashes are judged to last longer', 'visual', 'two_interval_comparison', [0.25, 0.7]),
  P('luminance', 'duration_distortion', 'Luminance contrast and reproduced duration of discs', 'visual', 'reproduction', [0.15, 0.55]),
  P('luminance', 'duration_distortion', 'Dim stimuli shorten bisection points', 'visual', 'bisection', [0.2, 0.6]),
  P('luminance', 'duration_distortion', 'Brightness and verbal estimates of seconds-long intervals', 'visual', 'verbal_estimation', [0.1, 0.45]),
  P('luminance', 'duration_distortion', 'Ratio of perceived to physical duration under varying luminance', 'visual', 'reproduction', [0.04, 0.12], true),
  P('size', 'duration_distortion', 'Larger squares seem to last longer', 'visual', 'two_interval_comparison', [0.2, 0.6]),
  P('size', 'duration_distortion', 'Stimulus area and reproduced duration', 'visual', 'reproduction', [0.15, 0.5]),
  P('size', 'duration_distortion', 'Retinal size versus perceived size in interval timing', 'visual', 'bisection', [0.1, 0.4]),
  P('numerosity', 'duration_distortion', 'More dots, longer intervals', 'visual', 'reproduction', [0.3, 0.8]),
  P('numerosity', 'duration_distortion', 'Numerosity and the bisection of sub-second durations', 'visual', 'bisection', [0.2, 0.6]),
  P('numerosity', 'duration_distortion', 'Counting-free numerosity effects on duration', 'visual', 'two_interval_comparison', [0.15, 0.5]),
  P('speed_motion', 'duration_distortion', 'Fast drifting gratings expand subjective time', 'visual', 'two_interval_comparison', [0.25, 0.75]),
  P('speed_motion', 'duration_distortion', 'Biological motion speed and reproduced duration', 'visual', 'reproduction', [0.15, 0.5]),
  P('speed_motion', 'positional_lag', 'Speed dependence of the flash-lag offset', 'visual', 'other', [40, 90]),
  P('speed_motion', 'positional_lag', 'Perceived position of a moving bar at offset', 'visual', 'other', [25, 70]),
  P('looming_receding', 'duration_distortion', 'Looming discs last longer than receding ones', 'visual', 'two_interval_comparison', [0.3, 0.8]),
  P('looming_receding', 'duration_distortion', 'Approaching sounds and interval estimates', 'auditory', 'verbal_estimation', [0.2, 0.6]),
  P('flicker_rate', 'duration_distortion', '10 Hz flicker lengthens perceived duration', 'visual', 'two_interval_comparison', [0.3, 0.7]),
  P('flicker_rate', 'duration_distortion', 'Auditory click trains and reproduced intervals', 'auditory', 'reproduction', [0.05, 0.14], true),
  P('loudness', 'duration_distortion', 'Louder tones are judged longer', 'auditory', 'two_interval_comparison', [0.2, 0.6]),
  P('loudness', 'duration_distortion', 'Intensity and bisection of empty auditory intervals', 'auditory', 'bisection', [0.1, 0.45]),
  P('loudness', 'simultaneity_window', 'Sound level and the audiovisual simultaneity window', 'audiovisual', 'simultaneity_judgement', [180, 320]),
  P('pitch', 'duration_distortion', 'High-pitched tones and subjective duration', 'auditory', 'two_interval_comparison', [0.1, 0.4]),
  P('repetition', 'duration_distortion', 'Repeated stimuli are judged shorter', 'visual', 'two_interval_comparison', [-0.6, -0.2]),
  P('repetition', 'duration_distortion', 'Repetition and reproduced duration of words', 'visual', 'reproduction', [-0.5, -0.15]),
  P('novelty_oddball', 'duration_distortion', 'The oddball seems to last longer', 'visual', 'two_interval_comparison', [0.35, 0.8]),
  P('novelty_oddball', 'duration_distortion', 'Auditory oddballs and temporal expansion', 'auditory', 'reproduction', [0.2, 0.6]),
  P('novelty_oddball', 'duration_distortion', 'Oddball position in a sequence and perceived duration', 'visual', 'bisection', [0.15, 0.5]),
  P('expectation', 'duration_distortion', 'Expected stimuli feel shorter', 'visual', 'two_interval_comparison', [-0.5, -0.1]),
  P('expectation', 'temporal_order', 'Temporal expectation sharpens order judgements', 'audiovisual', 'temporal_order_judgement', [8, 25]),
  P('emotional_arousal', 'duration_distortion', 'Angry faces lengthen subjective duration', 'visual', 'bisection', [0.2, 0.65]),
  P('emotional_arousal', 'duration_distortion', 'Arousing pictures and reproduced intervals', 'visual', 'reproduction', [0.15, 0.55]),
  P('emotional_arousal', 'duration_distortion', 'Emotional sounds and verbal duration estimates', 'auditory', 'verbal_estimation', [0.1, 0.45]),
  P('threat', 'duration_distortion', 'Anticipated shocks stretch perceived time', 'visual', 'reproduction', [0.3, 0.8]),
  P('threat', 'duration_distortion', 'Threatening contexts and interval bisection', 'visual', 'bisection', [0.2, 0.6]),
  P('delay_adaptation', 'recalibration_shift', 'Adapting to audiovisual lag shifts the point of simultaneity', 'audiovisual', 'simultaneity_judgement', [20, 60]),
  P('delay_adaptation', 'recalibration_shift', 'Recalibration of tactile–visual order after delay exposure', 'tactile', 'temporal_order_judgement', [15, 45]),
  P('delay_adaptation', 'simultaneity_window', 'Simultaneity windows after adaptation to delay', 'audiovisual', 'simultaneity_judgement', [220, 420]),
  P('saccade', 'duration_distortion', 'Perisaccadic compression of visual intervals', 'visual', 'two_interval_comparison', [-0.8, -0.3]),
  P('saccade', 'postdiction_window', 'How late information reshapes perisaccadic percepts', 'visual', 'other', [60, 180]),
  P('voluntary_action', 'temporal_order', 'Voluntary keypresses bind action and outcome in time', 'audiovisual', 'temporal_order_judgement', [15, 45]),
  P('voluntary_action', 'duration_distortion', 'Self-initiated tones and reproduced intervals', 'auditory', 'reproduction', [-0.45, -0.1]),
];

// Seeded after every other paper, so the papers above keep their numbers.
const EXTRA_PLANS: Plan[] = [
  { ...P('pitch', 'duration_distortion', 'Tone pitch and over-reproduction of intervals, in percent', 'auditory', 'reproduction', [0.03, 0.1]), special: 'percent_reproduction' },
  { ...P('pitch', 'duration_distortion', 'High tones and reproduced duration as a percentage of the standard', 'auditory', 'reproduction', [0.03, 0.1]), special: 'percent_reproduction' },
  { ...P('pitch', 'duration_distortion', 'Pitch height and the relative error of reproduced tones', 'auditory', 'reproduction', [0.03, 0.1]), special: 'percent_reproduction' },
  { ...P('threat', 'duration_distortion', 'Threat of shock lowers the bisection point', 'visual', 'bisection', [15, 45]), special: 'bisection_point_ms' },
  { ...P('threat', 'duration_distortion', 'Bisection points of sub-second intervals under anticipated threat', 'visual', 'bisection', [15, 45]), special: 'bisection_point_ms' },
  { ...P('threat', 'duration_distortion', 'Fearful contexts move the temporal bisection point', 'auditory', 'bisection', [15, 45]), special: 'bisection_point_ms' },
];

type EffectIn = NonNullable<NonNullable<SheetInput['studies']>[number]['effects']>[number];

/** What each outcome kind's demo effects measured, and in which unit (shared/vocabulary/parameters.ts). */
const QUANTITY: Record<Outcome, { parameter: string; unit: string }> = {
  duration_distortion: { parameter: 'duration_ratio', unit: 'ratio' },
  simultaneity_window: { parameter: 'window_width', unit: 'ms' },
  temporal_order: { parameter: 'pss', unit: 'ms' },
  recalibration_shift: { parameter: 'recalibration_shift', unit: 'ms' },
  postdiction_window: { parameter: 'window_width', unit: 'ms' },
  positional_lag: { parameter: 'lag', unit: 'ms' },
};

/**
 * Reported statistics in a form a paper of this kind would give, around the planned size moved by the paper's lab
 * (`lab` in [-1, 1], one draw per paper, so the between-study variance comes from labs, not from single effects).
 */
function makeEffect(plan: Plan, design: 'within' | 'between', n1: number, n2: number | undefined, standardMs: number, label: string, page: string, lab: number): EffectIn {
  let target = between(plan.size[0], plan.size[1]);
  const base = {
    label, outcome: plan.outcome, manipulation: plan.manipulation, ...QUANTITY[plan.outcome], page, locator: pick(['Table 1', 'Table 2', 'Figure 3', 'Figure 2B', 'Results, p. 2']), quote: '',
  };
  if (plan.special === 'percent_reproduction') {
    const lr = target + lab * 0.05;
    return { ...base, parameter: 'duration_ratio', unit: 'percent', form: 'percent_change', reported: { percent: r1((Math.exp(lr) - 1) * 100), se: r1(between(1.5, 3.5)), n: n1 }, quote: 'Reproduced durations as a percentage of the standard, with the SE of the change.' };
  }
  if (plan.special === 'bisection_point_ms') {
    const shift = target * (1 + 0.7 * lab);
    return { ...base, parameter: 'bisection_point', unit: 'ms', form: 'mean_diff', reported: { mean_diff: -r1(shift), sd_diff: r1(target * between(0.6, 1)), n: n1 }, quote: 'The bisection point was lower under the manipulation (ms), with the SD of the paired differences.' };
  }
  if (plan.outcome === 'duration_distortion') {
    if (plan.logRatio) {
      target += lab * 0.05;
      if (rand() < 0.5) {
        const m2 = r1(standardMs * between(0.92, 1.05));
        return { ...base, form: 'log_ratio_paired', reported: { mean1: r1(m2 * Math.exp(target)), sd1: r1(m2 * between(0.12, 0.2)), mean2: m2, sd2: r1(m2 * between(0.12, 0.2)), n: n1, r: r2(between(0.5, 0.8)) }, quote: 'Reproduced durations are given as means and SDs per condition.' };
      }
      return { ...base, form: 'percent_change', reported: { percent: r1((Math.exp(target) - 1) * 100), se: r1(between(1.5, 3.5)), n: n1 }, quote: 'Durations were over-reproduced by a stated percentage.' };
    }
    target += lab * 0.45;
    if (design === 'between') {
      const sd = r1(standardMs * between(0.12, 0.25));
      const m2 = r1(standardMs * between(0.9, 1.05));
      return { ...base, form: 'smd', reported: { mean1: r1(m2 + target * sd), sd1: r1(sd * between(0.9, 1.1)), n1, mean2: m2, sd2: sd, n2: n2! }, quote: 'Group means and SDs of reproduced duration (ms).' };
    }
    const variant = rand();
    if (variant < 0.45) {
      const sdDiff = r1(standardMs * between(0.08, 0.18));
      // with the correlation between conditions, so the effect is a raw-score g_rm (a paired t alone stays g_z)
      return { ...base, form: 'smd_paired', reported: { mean_diff: r1(target * sdDiff), sd_diff: sdDiff, n: n1, r: r2(0.5 + 0.4 * withinRand()) }, quote: 'Mean difference between conditions with the SD of the differences and their correlation.' };
    }
    if (variant < 0.75) {
      return { ...base, form: 'smd_paired', reported: { t: r2(target * Math.sqrt(n1) * between(0.9, 1.1)), n: n1 }, quote: 'A paired t test compared the two conditions.' };
    }
    const sd = r1(standardMs * between(0.12, 0.22));
    const m2 = r1(standardMs * between(0.92, 1.04));
    return { ...base, form: 'smd_paired', reported: { mean1: r1(m2 + target * sd), sd1: sd, mean2: m2, sd2: r1(sd * between(0.9, 1.1)), n: n1, r: r2(between(0.4, 0.8)) }, quote: 'Condition means, SDs and their correlation.' };
  }
  if (plan.outcome === 'simultaneity_window' || plan.outcome === 'postdiction_window') {
    return { ...base, form: 'raw_mean', reported: { mean: Math.round(target), sd: Math.round(target * between(0.2, 0.4)), n: n1 }, quote: 'Window width from the fitted psychometric function (ms).' };
  }
  // temporal order, recalibration, positional lag: mean differences in ms, a lab moving them by up to a third
  target *= 1 + lab / 3;
  if (rand() < 0.6) {
    return { ...base, form: 'mean_diff', reported: { mean_diff: r1(target), sd_diff: r1(target * between(0.8, 1.6)), n: n1 }, quote: 'Shift of the point of subjective simultaneity (ms).' };
  }
  const se = target * between(0.25, 0.45);
  return { ...base, form: 'mean_diff', reported: { mean_diff: r1(target), ci_lower: r1(target - 2.06 * se), ci_upper: r1(target + 2.06 * se), level: 0.95, df: n1 - 1 }, quote: 'Mean shift with its 95% confidence interval.' };
}

function makeSheet(plan: Plan): SheetInput {
  const lab = labDraw();
  const nStudies = pick([1, 2, 2, 3]);
  const studies: NonNullable<SheetInput['studies']> = [];
  for (let i = 0; i < nStudies; i++) {
    const clinical = plan.outcome === 'duration_distortion' && !plan.logRatio && !plan.special && rand() < 0.18;
    const older = !clinical && rand() < 0.12;
    const design: 'within' | 'between' = (clinical || older) && !plan.special ? 'between' : 'within';
    const n1 = int(12, 36);
    const n2 = design === 'between' ? int(12, 30) : undefined;
    const standardMs = plan.outcome === 'duration_distortion' ? pick([300, 500, 600, 800, 1000, 1200]) : pick([0, 0, 200]) || undefined;
    const nEffects = pick([1, 2, 2]);
    const effects = Array.from({ length: nEffects }, (_, j) =>
      makeEffect(plan, design, n1, n2, standardMs ?? 600, nEffects > 1 ? `${plan.manipulation.replace(/_/g, ' ')}, condition ${j + 1}` : plan.manipulation.replace(/_/g, ' '), String(int(100, 900)), lab),
    );
    studies.push({
      label: `Experiment ${i + 1}`,
      design,
      n1,
      n2,
      population: clinical ? 'clinical' : older ? 'older_adults' : rand() < 0.08 ? 'children' : 'healthy_adults',
      diagnosis: clinical ? pick(DIAGNOSES) : undefined,
      modality: plan.modality,
      task: plan.task as any,
      standardMs,
      effects,
    });
  }
  return { notes: '', studies };
}

/** A second coder's sheet: mostly the same, sometimes off in a detail a curator has to settle. */
function perturb(sheet: SheetInput, kind: number): SheetInput {
  const b = structuredClone(sheet);
  const s = b.studies![0];
  if (kind === 1) s.task = s.task === 'reproduction' ? 'bisection' : 'reproduction';
  if (kind === 2) {
    const e = s.effects![0];
    const rep = e.reported as Record<string, number>;
    const key = Object.keys(rep).find((k) => k.startsWith('mean') && k !== 'mean_diff') ?? Object.keys(rep)[0];
    rep[key] = r1(rep[key] * 1.08);
  }
  if (kind === 3) s.n1 = (s.n1 as number) + 2;
  return b;
}

async function userId(knex: Knex, login: string): Promise<number | null> {
  return (await knex('users').where({ login }).first('id'))?.id ?? null;
}

/** Seeds a double-coded pair; `settle` reconciles it (taking coder A on every discrepancy). */
async function seedPair(knex: Knex, refId: number, a: SheetInput, b: SheetInput, who: { c1: number; c2: number; curator: number }, mode: 'settled' | 'disputed' | 'coding') {
  await knex.transaction(async (trx) => {
    const [asg] = await trx('assignments').insert({ reference_id: refId, coder1_id: who.c1, coder2_id: who.c2, assigned_by: who.curator, state: 'coding' }).returning('id');
    const state = mode === 'coding' ? 'draft' : 'submitted';
    const [xa] = await trx('extractions').insert({ reference_id: refId, assignment_id: asg.id, kind: 'coding', coder_id: who.c1, state, updated_by: who.c1, submitted_at: mode === 'coding' ? null : trx.fn.now() }).returning('id');
    const [xb] = await trx('extractions').insert({ reference_id: refId, assignment_id: asg.id, kind: 'coding', coder_id: who.c2, state: mode === 'coding' ? 'draft' : 'submitted', updated_by: who.c2, submitted_at: mode === 'coding' ? null : trx.fn.now() }).returning('id');
    const sa = sheetDraftSchema.parse(a);
    const sb = sheetDraftSchema.parse(b);
    await saveSheet(trx, xa.id, sa, { actorId: who.c1 });
    await saveSheet(trx, xb.id, sb, { actorId: who.c2 });
    if (mode === 'coding') return;
    const found = compareSheets(sa, sb);
    if (found.length) {
      await trx('discrepancies').insert(
        found.map((d) => ({
          assignment_id: asg.id, path: d.path, field: d.field, label: d.label, value_a: JSON.stringify(d.valueA), value_b: JSON.stringify(d.valueB),
          ...(mode === 'settled' ? { status: 'resolved', resolution: 'a', resolved_value: JSON.stringify(d.valueA), rationale: 'Checked against the paper: coder A read it correctly.', resolved_by: who.curator, resolved_at: trx.fn.now() } : {}),
        })),
      );
    }
    if (mode === 'disputed' && found.length) {
      await trx('extractions').whereIn('id', [xa.id, xb.id]).update({ state: 'disputed' });
      await trx('assignments').where({ id: asg.id }).update({ state: 'disputed' });
      return;
    }
    const merged = mergeSheets(sa, sb, found.map((d) => ({ path: d.path, field: d.field, value: d.valueA, structural: 'a' })));
    await createSettledRecord(trx, {
      referenceId: refId, sheet: merged, actorId: found.length ? who.curator : null, kind: found.length ? 'reconciled' : 'matched', assignmentId: asg.id,
      rationale: found.length ? 'Reconciled against the paper.' : 'Both coders agreed on every compared field.',
    });
    await trx('extractions').whereIn('id', [xa.id, xb.id]).update({ state: 'settled', settled_at: trx.fn.now() });
    await trx('assignments').where({ id: asg.id }).update({ state: 'settled' });
  });
}

export async function seed(knex: Knex): Promise<void> {
  rand = mulberry32(20261201);
  labRand = mulberry32(424242);
  withinRand = mulberry32(515151);
  await ensureVocabulary(knex);
  const curator = await userId(knex, 'curator');
  const c1 = await userId(knex, 'coder1');
  const c2 = await userId(knex, 'coder2');
  if (!curator || !c1 || !c2) return;
  const who = { c1, c2, curator };
  // Three extra papers wait in the reconciliation queue, two are still being coded.
  const plans = [...PLANS, PLANS[0], PLANS[8], PLANS[35], PLANS[19], PLANS[11]];
  for (const [i, plan] of plans.entries()) {
    // Draw every paper's numbers whether or not it is new, so re-runs see the same sequence.
    const year = int(2006, 2025);
    const surname = SURNAMES[i % SURNAMES.length];
    const coauthor = SURNAMES[(i * 7 + 3) % SURNAMES.length];
    const sheet = makeSheet(plan);
    const journal = pick(JOURNALS);
    const given = pick(GIVEN);
    const role = i >= PLANS.length + 3 ? 'coding' : i >= PLANS.length ? 'disputed' : i % 3 === 0 ? 'paired' : 'direct';
    const title = i >= PLANS.length ? `${plan.title}: a replication` : plan.title;
    const doi = `10.5555/chrono.demo.${year}.${String(i + 1).padStart(3, '0')}`;
    const ref = await createReference(
      knex,
      {
        type: 'article-journal', title, DOI: doi, 'container-title': journal, issued: { 'date-parts': [[year]] },
        author: [{ family: surname, given }, { family: coauthor, given: pick(GIVEN) }], volume: String(int(3, 40)), page: `${int(1, 400)}-${int(401, 800)}`,
      } as any,
      { source: 'seed', createdBy: curator },
    );
    if (!ref.created) continue;
    await includeThroughFullText(knex, ref.id, { id: curator, roles: ['curator'] });
    if (role === 'direct') {
      await knex.transaction((trx) => createSettledRecord(trx, { referenceId: ref.id, sheet, actorId: curator, kind: 'direct', rationale: 'Entered from the published tables by a curator.' }));
    } else if (role === 'paired') {
      await seedPair(knex, ref.id, sheet, perturb(sheet, i % 4), who, 'settled');
    } else if (role === 'disputed') {
      await seedPair(knex, ref.id, sheet, perturb(sheet, 1 + (i % 3)), who, 'disputed');
    } else {
      const partial: SheetInput = { notes: '', studies: [{ ...sheet.studies![0], effects: sheet.studies![0].effects!.slice(0, 1) }] };
      await seedPair(knex, ref.id, partial, { notes: '', studies: [] }, who, 'coding');
    }
  }
  // Papers in a unit of their own (percent; a bisection point in ms, its sign reversed), from streams of their own.
  rand = mulberry32(20261207);
  labRand = mulberry32(434343);
  for (const [i, plan] of EXTRA_PLANS.entries()) {
    const year = int(2008, 2025);
    const surname = SURNAMES[(i * 5 + 11) % SURNAMES.length];
    const coauthor = SURNAMES[(i * 3 + 20) % SURNAMES.length];
    const sheet = makeSheet(plan);
    const journal = pick(JOURNALS);
    const given = pick(GIVEN);
    const ref = await createReference(
      knex,
      {
        type: 'article-journal', title: plan.title, DOI: `10.5555/chrono.demo.${year}.u${String(i + 1).padStart(2, '0')}`, 'container-title': journal, issued: { 'date-parts': [[year]] },
        author: [{ family: surname, given }, { family: coauthor, given: pick(GIVEN) }], volume: String(int(3, 40)), page: `${int(1, 400)}-${int(401, 800)}`,
      } as any,
      { source: 'seed', createdBy: curator },
    );
    if (!ref.created) continue;
    await includeThroughFullText(knex, ref.id, { id: curator, roles: ['curator'] });
    if (i % 2 === 0) await knex.transaction((trx) => createSettledRecord(trx, { referenceId: ref.id, sheet, actorId: curator, kind: 'direct', rationale: 'Entered from the published tables by a curator.' }));
    else await seedPair(knex, ref.id, sheet, perturb(sheet, 3), who, 'settled');
  }
  // Included papers nobody codes yet: contributors claim them from My coding, curators pair them.
  for (const [i, w] of WAITING.entries()) {
    const ref = await createReference(
      knex,
      { type: 'article-journal', title: w.title, DOI: `10.5555/chrono.demo.waiting.${i + 1}`, 'container-title': 'Journal of Invented Psychophysics', issued: { 'date-parts': [[w.year]] }, author: [{ family: w.family, given: w.given }] } as any,
      { source: 'seed', createdBy: curator },
    );
    if (ref.created) await includeThroughFullText(knex, ref.id, { id: curator, roles: ['curator'] });
  }
}

const WAITING = [
  { title: 'Flicker rate and the reproduction of half-second intervals', family: 'Aaltonen', given: 'Riikka', year: 2021 },
  { title: 'Looming sounds and judged duration in older adults', family: 'Abernathy', given: 'Cole', year: 2022 },
  { title: 'Tactile numerosity and perceived interval length', family: 'Acheampong', given: 'Efua', year: 2023 },
];
