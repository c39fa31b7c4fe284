import { useState } from 'react';
import type { Sheet } from '../../../../shared/schemas/extraction';
import type { TrialSet } from '../../../../shared/schemas/trials';
import { CONTRAST_MEASURES, type ContrastMeasure, type ContrastRequest } from '../../../../shared/trials/contrast';
import { PARAMETERS_OF_TASK, parameterLabel, RATIO_PARAMETERS, type TrialParameter, type TrialTask } from '../../../../shared/trials/fits';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { useContrast } from '../api/get-contrast';

export type SheetEffect = Sheet['studies'][number]['effects'][number];

/** Where a derived effect goes on the sheet: the caller adds it to a study (or a new one) and saves. */
export interface SheetTarget {
  studies: string[];
  addEffect: (studyIndex: number | null, effect: SheetEffect, newStudy: { label: string; n1: number; modality: TrialSet['modality']; task: NonNullable<Sheet['studies'][number]['task']> }) => void;
}

const OUTCOME_OF_TASK: Record<TrialTask, NonNullable<SheetEffect['outcome']>> = {
  order: 'temporal_order',
  simultaneity: 'simultaneity_window',
  duration: 'duration_distortion',
};

const STUDY_TASK_OF: Record<TrialTask, NonNullable<Sheet['studies'][number]['task']>> = {
  order: 'temporal_order_judgement',
  simultaneity: 'simultaneity_judgement',
  duration: 'two_interval_comparison',
};

const MEASURE_LABELS: Record<ContrastMeasure, string> = {
  mean_diff: 'Difference A − B in ms (paired)',
  log_ratio: 'Log ratio ln(A / B) (paired)',
};

const num = (v: number | null | undefined, d = 1) => (v == null || !Number.isFinite(v) ? '—' : v.toFixed(d));
const selectCls = 'w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm';

/**
 * Pick the fitted parameter and two conditions; the product pairs each participant's values and shows the
 * within-subject effect (observed r, no assumed one), then codes it on the sheet with its provenance.
 */
export function ContrastChooser({ set, target }: { set: TrialSet; target?: SheetTarget }) {
  const params = PARAMETERS_OF_TASK[set.task];
  const [parameter, setParameter] = useState<TrialParameter>(params[0]);
  const [conditionA, setA] = useState(set.conditions[1] ?? set.conditions[0] ?? '');
  const [conditionB, setB] = useState(set.conditions[0] ?? '');
  const [measure, setMeasure] = useState<ContrastMeasure>('mean_diff');
  const [study, setStudy] = useState<string>('new');
  const [coded, setCoded] = useState<string | null>(null);
  const ratioOk = RATIO_PARAMETERS.includes(parameter);
  const usedMeasure = ratioOk ? measure : 'mean_diff';
  const req: ContrastRequest | null = conditionA && conditionB && conditionA !== conditionB ? { parameter, conditionA, conditionB, measure: usedMeasure } : null;
  const contrast = useContrast(set.id, req);
  const c = contrast.data;

  const code = () => {
    if (!c || !target) return;
    const label = `${c.conditionA} vs ${c.conditionB}: ${parameterLabel(c.parameter, set.task)}`;
    const effect: SheetEffect = {
      label: label.slice(0, 200),
      outcome: OUTCOME_OF_TASK[set.task],
      form: c.form,
      reported: c.reported,
      locator: `trial data: ${set.label}`.slice(0, 120),
      derivation: { source: 'trial_data', trialSetId: set.id, parameter: c.parameter, conditionA: c.conditionA, conditionB: c.conditionB, measure: c.measure },
    };
    const at = study === 'new' ? null : Number(study);
    target.addEffect(at, effect, { label: set.label.slice(0, 120), n1: c.summary.n, modality: set.modality, task: STUDY_TASK_OF[set.task] });
    setCoded(`✓ Coded "${label}" on ${at === null ? 'a new study' : `study ${at + 1}`}; choose its manipulation there. The sheet saves by itself.`);
  };

  return (
    <section className="mt-3 rounded border border-paper-edge p-3" aria-label={`Effect from ${set.label}`}>
      <h4 className="text-sm font-bold">The effect two conditions give</h4>
      <div className="mt-2 grid grid-cols-1 gap-2 sm:grid-cols-2 lg:grid-cols-4">
        <Field label="Parameter">
          <select className={selectCls} value={parameter} onChange={(e) => setParameter(e.target.value as TrialParameter)}>
            {params.map((p) => (
              <option key={p} value={p}>
                {parameterLabel(p, set.task)}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Condition A">
          <select className={selectCls} value={conditionA} onChange={(e) => setA(e.target.value)}>
            {set.conditions.map((x) => (
              <option key={x}>{x}</option>
            ))}
          </select>
        </Field>
        <Field label="Condition B (reference)" error={conditionA === conditionB ? 'choose two different conditions' : undefined}>
          <select className={selectCls} value={conditionB} onChange={(e) => setB(e.target.value)}>
            {set.conditions.map((x) => (
              <option key={x}>{x}</option>
            ))}
          </select>
        </Field>
        <Field label="Effect" hint={ratioOk ? undefined : 'a log ratio is offered for the JND and the window width (values on a ratio scale)'}>
          <select className={selectCls} value={usedMeasure} onChange={(e) => setMeasure(e.target.value as ContrastMeasure)} disabled={!ratioOk}>
            {CONTRAST_MEASURES.map((m) => (
              <option key={m} value={m} disabled={m === 'log_ratio' && !ratioOk}>
                {MEASURE_LABELS[m]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      {contrast.isFetching && !c && <p className="mt-2 text-sm text-ink-faint">◌ Pairing the fits…</p>}
      <ErrorNote error={contrast.error} title="No effect" />
      {c && (
        <div className="mt-2 text-sm" data-testid="contrast-result">
          <p>
            <strong>
              {c.effect.metric === 'mean_diff' ? `${num(c.effect.effect)} ms` : `ln ratio ${num(c.effect.effect, 3)}`}
            </strong>{' '}
            (SE {num(Math.sqrt(c.effect.variance), c.effect.metric === 'mean_diff' ? 1 : 3)}) from {c.summary.n} participants: A {num(c.summary.mean1)} ms (SD {num(c.summary.sd1)}), B{' '}
            {num(c.summary.mean2)} ms (SD {num(c.summary.sd2)}), observed r = {num(c.summary.r, 2)} between conditions.
          </p>
          <p className="text-xs text-ink-soft">Formula: {c.effect.formula}. The correlation is the one in these data; none is assumed.</p>
          {c.excluded.length > 0 && (
            <details className="mt-1 text-xs">
              <summary>
                {c.excluded.length} participant{c.excluded.length === 1 ? '' : 's'} left out
              </summary>
              <ul className="list-disc pl-5">
                {c.excluded.map((x) => (
                  <li key={x.participant}>
                    {x.participant}: {x.reason}
                  </li>
                ))}
              </ul>
            </details>
          )}
          {target && set.editable && (
            <div className="mt-2 flex flex-wrap items-end gap-2">
              <Field label="Add to">
                <select className={selectCls} value={study} onChange={(e) => setStudy(e.target.value)}>
                  <option value="new">a new study ({set.label})</option>
                  {target.studies.map((s, i) => (
                    <option key={i} value={i}>
                      study {i + 1}: {s}
                    </option>
                  ))}
                </select>
              </Field>
              <Button variant="primary" onClick={code}>
                Code this effect on the sheet
              </Button>
            </div>
          )}
          {coded && (
            <p role="status" className="mt-1">
              {coded}
            </p>
          )}
        </div>
      )}
    </section>
  );
}
