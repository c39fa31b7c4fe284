import { useState } from 'react';
import { EXCLUSION_REASON_LABELS, STAGE_REASONS, type ExclusionReason, type ScreeningStage } from '../../../../shared/vocabulary/screening';
import { screeningSettleSchema, type ScreeningConflicts } from '../../../../shared/schemas/screening';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { useConflicts } from '../api/get-conflicts';
import { useSettle } from '../api/settle';

type Item = ScreeningConflicts['items'][number];
const voteText = (v: Item['votes'][number]) =>
  v.decision === 'included' ? '✓ Include' : `✕ Exclude${v.reason ? `: ${EXCLUSION_REASON_LABELS[v.reason as ExclusionReason] ?? v.reason}` : ' (no reason)'}`;

/** One disagreement: both screeners' decisions side by side, and the curator's settlement with why. */
function Disagreement({ item, stage, settle }: { item: Item; stage: ScreeningStage; settle: ReturnType<typeof useSettle> }) {
  const [choice, setChoice] = useState('');
  const [rationale, setRationale] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const submit = () => {
    const [decision, reason] = choice.split(':');
    const parsed = screeningSettleSchema.safeParse({ stage, decision: decision || undefined, ...(reason ? { reason } : {}), rationale, version: item.version });
    if (!parsed.success) return setProblem(parsed.error.issues[0]?.message ?? 'check the form');
    setProblem(null);
    settle.mutate({ refId: item.id, input: parsed.data });
  };
  return (
    <li className="mb-3 rounded border border-paper-edge bg-white/60 p-3" aria-label={`Disagreement on ${item.title}`}>
      <p className="m-0 font-medium">
        {item.title} <span className="text-sm text-ink-soft">({item.year ?? 'n.d.'}) · #{item.id}</span>
      </p>
      <p className="m-0 text-xs text-ink-faint">⚑ conflict: the two screeners disagree</p>
      {item.abstract && <p className="my-1 line-clamp-3 text-sm text-ink-soft">{item.abstract}</p>}
      <table className="my-2 w-auto text-sm" aria-label="The two decisions">
        <tbody>
          {item.votes.map((v) => (
            <tr key={v.id}>
              <th scope="row" className="bg-transparent font-normal">{v.screener?.login ?? 'someone'}</th>
              <td>{voteText(v)}</td>
              <td className="text-ink-soft">{v.note ?? ''}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
        noValidate
        className="flex flex-wrap items-end gap-2 text-sm"
      >
        <label>
          Outcome
          <select className="ml-1 rounded border border-paper-edge bg-white px-1 py-0.5" value={choice} onChange={(e) => setChoice(e.target.value)}>
            <option value="">pick…</option>
            <option value="included">Include</option>
            {STAGE_REASONS[stage].map((r) => (
              <option key={r} value={`excluded:${r}`}>
                Exclude: {EXCLUSION_REASON_LABELS[r]}
              </option>
            ))}
            {stage === 'title_abstract' && <option value="excluded">Exclude without a reason</option>}
          </select>
        </label>
        <label className="min-w-[16rem] flex-1">
          Why (kept with the decision)
          <input className="ml-1 w-full rounded border border-paper-edge bg-white px-1 py-0.5" value={rationale} onChange={(e) => setRationale(e.target.value)} />
        </label>
        <Button type="submit" variant="primary" disabled={settle.isPending}>
          {settle.isPending && settle.variables?.refId === item.id ? 'Settling…' : 'Settle'}
        </Button>
      </form>
      {problem && <p className="text-sm text-refusal">✕ {problem}</p>}
    </li>
  );
}

/** The curator's disagreement queue at a stage (records the curator screened themselves are left to another curator). */
export function DisagreementList({ stage }: { stage: ScreeningStage }) {
  const { data, error, isLoading } = useConflicts(stage);
  // One mutation for the list: a refusal stays in view above it even when a stale one reloads the queue and drops the record.
  const settle = useSettle();
  if (isLoading) return <Loading what="Loading disagreements" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  return (
    <div>
      <p className="text-sm" role="status">
        {data.total} {data.total === 1 ? 'disagreement' : 'disagreements'} to settle
        {data.ownVotes ? ` · ${data.ownVotes} more where you were a screener (another curator settles those)` : ''}
      </p>
      <ErrorNote error={settle.error} />
      {!data.items.length ? (
        <EmptyState>No disagreement is waiting at this stage.</EmptyState>
      ) : (
        <ul className="list-none pl-0">
          {data.items.map((it) => (
            <Disagreement key={`${it.id}-${it.version}`} item={it} stage={stage} settle={settle} />
          ))}
        </ul>
      )}
    </div>
  );
}
