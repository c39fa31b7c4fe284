// The one mapping between an effect as coded (sheet shape) and its row in `effects`, both ways.
import type { EffectSheet } from '../../shared/schemas/extraction.js';
import type { ComputedEffect, Reported } from '../../shared/extraction/compute.js';
import type { StoredEffect } from '../../shared/extraction/stored-sheet.js';
import type { Derivation } from '../../shared/schemas/trials.js';
import { effectQuantity } from '../../shared/vocabulary/parameters.js';
import type { EffectRow } from './rows.js';

export type EffectColumns = Pick<
  EffectRow,
  'label' | 'outcome' | 'parameter' | 'unit' | 'manipulation_id' | 'report_form' | 'metric' | 'effect' | 'variance' | 'formula' | 'assumed_r' | 'n_total' | 'from_bound' | 'approximate' | 'sign_reversed' | 'page' | 'locator' | 'quote' | 'trial_set_id'
> & { reported: string; derivation: string | null };

/**
 * The columns of one coded effect. `computed` is the server's own computation from what was reported (null when
 * it cannot be computed yet: a draft); `keep` supplies provenance the edit did not send (a curator's correction).
 */
export function effectColumns(e: EffectSheet, manipulationId: number | null, computed: ComputedEffect | null, keep?: Pick<EffectRow, 'page' | 'locator' | 'quote'>): EffectColumns {
  // an effect that names no parameter or unit stands for its outcome kind's usual ones (the sheet shows which)
  const quantity = effectQuantity(e);
  return {
    label: e.label ?? '',
    outcome: e.outcome ?? null,
    parameter: quantity?.parameter ?? null,
    unit: quantity?.unit ?? null,
    manipulation_id: manipulationId,
    report_form: e.form ?? null,
    reported: JSON.stringify(e.reported ?? {}),
    metric: computed?.metric ?? null,
    effect: computed?.effect ?? null,
    variance: computed?.variance ?? null,
    formula: computed?.formula ?? null,
    assumed_r: computed ? computed.assumedR : (e.assumedR ?? null),
    n_total: computed?.n ?? null,
    from_bound: computed?.fromBound ?? false,
    approximate: computed?.approximate ?? false,
    sign_reversed: computed?.signReversed ?? false,
    page: e.page ?? keep?.page ?? null,
    locator: e.locator ?? keep?.locator ?? null,
    quote: e.quote ?? keep?.quote ?? null,
    derivation: e.derivation ? JSON.stringify(e.derivation) : null,
    trial_set_id: e.derivation?.trialSetId ?? null,
  };
}

const u = <T>(v: T | null | undefined): T | undefined => (v === null ? undefined : v);

/** A stored effect row (with its manipulation's term) in the sheet's stored shape. */
export function storedEffect(f: EffectRow & { term: string | null }): StoredEffect {
  return {
    id: f.id,
    label: f.label,
    outcome: u(f.outcome),
    manipulation: u(f.term),
    parameter: u(f.parameter),
    unit: u(f.unit),
    form: u(f.report_form),
    reported: (f.reported ?? {}) as Reported,
    // a stored assumed r is the value used; the form shows it as the assumption
    assumedR: f.assumed_r == null ? undefined : Number(f.assumed_r),
    page: u(f.page),
    locator: u(f.locator),
    quote: u(f.quote),
    version: f.version,
    withdrawnReason: f.withdrawn_at ? (f.withdrawn_reason ?? 'withdrawn') : null,
    derivation: f.derivation ? (f.derivation as unknown as Derivation) : undefined,
    computed:
      f.effect == null
        ? null
        : { metric: f.metric!, effect: Number(f.effect), variance: Number(f.variance), formula: f.formula!, assumedR: f.assumed_r == null ? null : Number(f.assumed_r), n: f.n_total, fromBound: f.from_bound, approximate: f.approximate, signReversed: f.sign_reversed },
  };
}
