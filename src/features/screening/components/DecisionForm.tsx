import { useRef } from 'react';
import { useForm, useWatch, type Resolver } from 'react-hook-form';
import type { ScreeningDecisionInput } from '../../../../shared/schemas/references';
import { EXCLUSION_REASON_LABELS, SCREENING_STAGE_LABELS, STAGE_REASONS, type ScreeningStage } from '../../../../shared/vocabulary/screening';
import { Button } from '../../../components/ui/Button';
import { FieldError } from '../../../components/ui/Field';
import { Caution, ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useDecide } from '../api/decide';
import { decisionDefaults, decisionFormSchema, type DecisionValues } from '../forms/decision';

type DecisionFields = Omit<ScreeningDecisionInput, 'version'>;

/** Include, or exclude with a reason (and a note when the reason is "other"), for one reference; starts from its current decision. */
export function DecisionForm({
  refId,
  stage,
  version,
  current,
  settledEffects = 0,
  curator = false,
  onDecided,
}: {
  refId: number;
  /** The stage the reference is decided at now. */
  stage: ScreeningStage;
  version: number;
  current?: Parameters<typeof decisionDefaults>[0];
  settledEffects?: number;
  curator?: boolean;
  onDecided?: () => void;
}) {
  const mutation = useDecide();
  // The stage moves on after a title/abstract inclusion; the form stays (with its "recorded" line) and checks the new stage's rules.
  const stageNow = useRef(stage);
  stageNow.current = stage;
  const resolver: Resolver<DecisionValues, unknown, DecisionFields> = (values, context, options) => formResolver(decisionFormSchema(stageNow.current))(values, context, options);
  const form = useForm<DecisionValues, unknown, DecisionFields>({ resolver, defaultValues: decisionDefaults(current) });
  const { errors } = form.formState;
  const [decision, reason] = useWatch({ control: form.control, name: ['decision', 'reason'] });
  const submit = form.handleSubmit((input) =>
    mutation.mutate(
      { refId, input: { ...input, version } },
      { onSuccess: () => (form.reset(form.getValues()), onDecided?.()), onError: (err) => showServerErrors(err, form.setError, ['decision', 'reason', 'note']) },
    ),
  );
  return (
    <form className="grid max-w-2xl gap-2 text-sm" onSubmit={submit} noValidate>
      <fieldset className="flex flex-wrap gap-4">
        <legend className="sr-only">Decision</legend>
        <span className="text-ink-soft">{SCREENING_STAGE_LABELS[stage]}:</span>
        <label className="flex items-center gap-1">
          <input type="radio" value="included" {...form.register('decision')} /> ✓ Include
        </label>
        <label className="flex items-center gap-1">
          <input type="radio" value="excluded" {...form.register('decision')} /> ✕ Exclude
        </label>
      </fieldset>
      {decision === 'excluded' && (
        <label>
          Reason
          <select
            className="ml-2 rounded border border-paper-edge bg-white px-2 py-1"
            {...form.register('reason')}
            aria-invalid={!!errors.reason}
            aria-describedby={`reason-${refId}-error`}
          >
            <option value="">{stage === 'title_abstract' ? 'none (optional here)' : 'choose…'}</option>
            {STAGE_REASONS[stage].map((r) => (
              <option key={r} value={r}>
                {EXCLUSION_REASON_LABELS[r]}
              </option>
            ))}
          </select>
          <FieldError id={`reason-${refId}-error`} message={errors.reason?.message} className="ml-2 text-refusal" />
        </label>
      )}
      {decision === 'excluded' && settledEffects > 0 && (
        <Caution title="Settled effects">
          {curator
            ? `Excluding this reference withdraws its ${settledEffects} settled ${settledEffects === 1 ? 'effect' : 'effects'} from every analysis, with the reason and note as the rationale.`
            : `This reference has ${settledEffects} settled ${settledEffects === 1 ? 'effect' : 'effects'}: only a curator may exclude it.`}
        </Caution>
      )}
      <label>
        Note {reason === 'other' && decision === 'excluded' ? '(required)' : '(optional)'}
        <input className="ml-2 w-80 max-w-full rounded border border-paper-edge bg-white px-2 py-1" {...form.register('note')} aria-invalid={!!errors.note} aria-describedby={`note-${refId}-error`} />
        <FieldError id={`note-${refId}-error`} message={errors.note?.message} className="ml-2 text-refusal" />
      </label>
      {errors.root?.server && <ErrorNote error={errors.root.server.message} />}
      {mutation.error && !Object.keys(errors).length && <ErrorNote error={mutation.error} />}
      <div>
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : 'Record decision'}
        </Button>
        {mutation.isSuccess && (
          <span className="ml-2">
            ✓ Recorded{mutation.data.withdrawnRecords.length ? `; settled record ${mutation.data.withdrawnRecords.map((id) => `#${id}`).join(', ')} withdrawn` : ''}
            {mutation.data.dual && !mutation.data.dual.settled ? ' as your blind decision: the record is settled once two screeners’ decisions are in' : ''}.
          </span>
        )}
      </div>
    </form>
  );
}
