import { useState } from 'react';
import { EXCLUSION_REASONS, EXCLUSION_REASON_LABELS, type ExclusionReason } from '../../../../shared/vocabulary/screening';
import { ApiRequestError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import { useDecide } from '../api/decide';

/** Include, or exclude with a reason (and a note when the reason is "other"), for one reference. */
export function DecisionForm({ refId, onDecided }: { refId: number; onDecided?: () => void }) {
  const [decision, setDecision] = useState<'included' | 'excluded'>('included');
  const [reason, setReason] = useState<ExclusionReason | ''>('');
  const [note, setNote] = useState('');
  const [local, setLocal] = useState<Record<string, string>>({});
  const mutation = useDecide();
  const errors = { ...(mutation.error instanceof ApiRequestError ? mutation.error.fieldErrors() : {}), ...local };
  const submit = () => {
    const problems: Record<string, string> = {};
    if (decision === 'excluded' && !reason) problems.reason = 'an exclusion needs a reason';
    if (reason === 'other' && decision === 'excluded' && !note.trim()) problems.note = 'say why, when the reason is "other"';
    setLocal(problems);
    if (Object.keys(problems).length) return;
    mutation.mutate(
      { refId, input: { decision, ...(decision === 'excluded' ? { reason: reason as ExclusionReason } : {}), ...(note.trim() ? { note: note.trim() } : {}) } },
      { onSuccess: () => (setNote(''), onDecided?.()) },
    );
  };
  return (
    <form
      className="grid max-w-2xl gap-2 text-sm"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <fieldset className="flex gap-4">
        <legend className="sr-only">Decision</legend>
        <label className="flex items-center gap-1">
          <input type="radio" name={`decision-${refId}`} checked={decision === 'included'} onChange={() => setDecision('included')} /> ✓ Include
        </label>
        <label className="flex items-center gap-1">
          <input type="radio" name={`decision-${refId}`} checked={decision === 'excluded'} onChange={() => setDecision('excluded')} /> ✕ Exclude
        </label>
      </fieldset>
      {decision === 'excluded' && (
        <label>
          Reason
          <select className="ml-2 rounded border border-paper-edge bg-white px-2 py-1" value={reason} onChange={(e) => setReason(e.target.value as ExclusionReason)} aria-invalid={!!errors.reason} aria-describedby={`reason-${refId}-error`}>
            <option value="">choose…</option>
            {EXCLUSION_REASONS.map((r) => (
              <option key={r} value={r}>
                {EXCLUSION_REASON_LABELS[r]}
              </option>
            ))}
          </select>
          {errors.reason && (
            <span id={`reason-${refId}-error`} className="ml-2 text-refusal">
              ✕ {errors.reason}
            </span>
          )}
        </label>
      )}
      <label>
        Note {reason === 'other' && decision === 'excluded' ? '(required)' : '(optional)'}
        <input className="ml-2 w-80 rounded border border-paper-edge bg-white px-2 py-1" value={note} onChange={(e) => setNote(e.target.value)} aria-invalid={!!errors.note} aria-describedby={`note-${refId}-error`} />
        {errors.note && (
          <span id={`note-${refId}-error`} className="ml-2 text-refusal">
            ✕ {errors.note}
          </span>
        )}
      </label>
      {mutation.error && !Object.keys(errors).length && <ErrorNote error={mutation.error} />}
      <div>
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : 'Record decision'}
        </Button>
        {mutation.isSuccess && <span className="ml-2">✓ Recorded.</span>}
      </div>
    </form>
  );
}
