import type { Knex } from 'knex';
import type { Sheet } from '../../shared/schemas/extraction.js';
import { tryComputeReported, type Reported } from '../../shared/extraction/compute.js';
import type { StoredEffect, StoredStudy } from '../../shared/extraction/stored-sheet.js';

export type { StoredEffect, StoredStudy };
import { resolveManipulations } from '../services/manipulations.js';

const u = <T>(v: T | null | undefined): T | undefined => (v === null ? undefined : v);

/**
 * Replaces the studies and effects of one extraction with the sheet's, computing every effect that can be
 * computed (the server never trusts numbers sent by a client). `studyIds` gives the stable study
 * identity of each study by position (settled records only).
 */
export async function writeSheet(trx: Knex.Transaction, extractionId: number, sheet: Sheet, opts: { studyIds?: (number | null)[]; actorId?: number | null } = {}) {
  await trx('extraction_studies').where({ extraction_id: extractionId }).delete();
  const terms = sheet.studies.flatMap((s) => s.effects.map((e) => e.manipulation).filter((t): t is string => !!t));
  const ids = await resolveManipulations(trx, terms);
  for (const [i, s] of sheet.studies.entries()) {
    const [study] = await trx('extraction_studies')
      .insert({
        extraction_id: extractionId,
        study_id: opts.studyIds?.[i] ?? null,
        position: i + 1,
        label: s.label ?? '',
        design: s.design ?? null,
        n1: s.n1 ?? null,
        n2: s.n2 ?? null,
        population: s.population ?? null,
        diagnosis: s.diagnosis ?? null,
        modality: s.modality ?? null,
        task: s.task ?? null,
        standard_ms: s.standardMs ?? null,
      })
      .returning('id');
    if (!s.effects.length) continue;
    await trx('effects').insert(
      s.effects.map((e, j) => {
        const c = e.form ? tryComputeReported(e.form, e.reported as Reported, e.assumedR ?? null) : null;
        return {
          extraction_id: extractionId,
          extraction_study_id: study.id,
          position: j + 1,
          label: e.label ?? '',
          outcome: e.outcome ?? null,
          manipulation_id: e.manipulation ? ids.get(e.manipulation) : null,
          report_form: e.form ?? null,
          reported: JSON.stringify(e.reported ?? {}),
          metric: c?.ok ? c.result!.metric : null,
          effect: c?.ok ? c.result!.effect : null,
          variance: c?.ok ? c.result!.variance : null,
          formula: c?.ok ? c.result!.formula : null,
          assumed_r: c?.ok ? c.result!.assumedR : (e.assumedR ?? null),
          n_total: c?.ok ? c.result!.n : null,
          page: e.page ?? null,
          locator: e.locator ?? null,
          quote: e.quote ?? null,
          updated_by: opts.actorId ?? null,
        };
      }),
    );
  }
}

/** The stored studies and effects of an extraction, in sheet order. */
export async function readSheet(db: Knex | Knex.Transaction, extractionId: number): Promise<StoredStudy[]> {
  const studies = await db('extraction_studies').where({ extraction_id: extractionId }).orderBy('position');
  const effects = await db('effects as f')
    .leftJoin('manipulations as m', 'm.id', 'f.manipulation_id')
    .where('f.extraction_id', extractionId)
    .orderBy(['f.extraction_study_id', 'f.position'])
    .select('f.*', 'm.term');
  return studies.map((s: Record<string, any>) => ({
    id: s.id,
    studyId: s.study_id,
    label: s.label,
    design: u(s.design),
    n1: u(s.n1),
    n2: u(s.n2),
    population: u(s.population),
    diagnosis: u(s.diagnosis),
    modality: u(s.modality),
    task: u(s.task),
    standardMs: s.standard_ms == null ? undefined : Number(s.standard_ms),
    effects: effects
      .filter((f: Record<string, any>) => f.extraction_study_id === s.id)
      .map((f: Record<string, any>) => ({
        id: f.id,
        label: f.label,
        outcome: u(f.outcome),
        manipulation: u(f.term),
        form: u(f.report_form),
        reported: f.reported ?? {},
        // a stored assumed r is the value used; the form shows it as the assumption
        assumedR: f.assumed_r == null ? undefined : Number(f.assumed_r),
        page: u(f.page),
        locator: u(f.locator),
        quote: u(f.quote),
        version: f.version,
        withdrawnReason: f.withdrawn_at ? (f.withdrawn_reason ?? 'withdrawn') : null,
        computed:
          f.effect == null
            ? null
            : { metric: f.metric, effect: Number(f.effect), variance: Number(f.variance), formula: f.formula, assumedR: f.assumed_r == null ? null : Number(f.assumed_r), n: f.n_total },
      })),
  }));
}

/** A stored sheet back in the sheet shape (for comparison, copying and settling). */
export function toSheet(studies: StoredStudy[], notes = ''): Sheet {
  return {
    notes,
    studies: studies.map((s) => ({
      label: s.label,
      design: s.design as any,
      n1: s.n1,
      n2: s.n2,
      population: s.population as any,
      diagnosis: s.diagnosis,
      modality: s.modality as any,
      task: s.task as any,
      standardMs: s.standardMs,
      effects: s.effects.map((e) => ({
        label: e.label,
        outcome: e.outcome as any,
        manipulation: e.manipulation,
        form: e.form,
        reported: e.reported as any,
        assumedR: e.assumedR,
        page: e.page,
        locator: e.locator,
        quote: e.quote,
      })),
    })),
  };
}
